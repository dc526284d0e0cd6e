import { Module } from '@nestjs/common';
import { AuditModule } from '../audit/audit.module';
import { ConsentModule } from '../consent/consent.module';
import { MailModule } from '../mail/mail.module';
import { RandomizationModule } from '../randomization/randomization.module';
import { StepsModule } from '../steps/steps.module';
import { StudiesModule } from '../studies/studies.module';
import { UsersModule } from '../users/users.module';
import { PayoutsModule } from '../payouts/payouts.module';
import { MyEnrollmentController, ReturnLinkController, RosterController, StepCompletionsController } from './enrollments.controller';
import { StepProgressService } from './step-progress.service';
import { RemindersModule } from '../reminders/reminders.module';
import { EnrollmentsService } from './enrollments.service';

@Module({
  imports: [AuditModule, StudiesModule, StepsModule, ConsentModule, RandomizationModule, UsersModule, MailModule, PayoutsModule, RemindersModule],
  controllers: [MyEnrollmentController, RosterController, StepCompletionsController, ReturnLinkController],
  providers: [EnrollmentsService, StepProgressService],
  exports: [EnrollmentsService],
})
export class EnrollmentsModule {}
