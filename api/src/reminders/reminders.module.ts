import { Module } from '@nestjs/common';
import { AuditModule } from '../audit';
import { MailModule } from '../mail/mail.module';
import { StepsModule } from '../steps';
import { StudiesModule } from '../studies';
import { ContactsService } from './contacts.service';
import { ReminderPlanService } from './reminder-plan.service';
import { ReminderSweepService } from './reminder-sweep.service';
import { RemindersController } from './reminders.controller';

@Module({
  imports: [AuditModule, MailModule, StepsModule, StudiesModule],
  controllers: [RemindersController],
  providers: [ContactsService, ReminderPlanService, ReminderSweepService],
  exports: [ContactsService, ReminderSweepService],
})
export class RemindersModule {}
