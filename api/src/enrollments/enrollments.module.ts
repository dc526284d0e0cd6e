import { Module } from '@nestjs/common';
import { AuditModule } from '../audit';
import { ConsentModule } from '../consent';
import { MailModule } from '../mail/mail.module';
import { RandomizationModule } from '../randomization';
import { StepsModule } from '../steps';
import { StudiesModule } from '../studies';
import { UsersModule } from '../users';
import { PayoutsModule } from '../payouts';
import {
  MyEnrollmentController,
  ReturnLinkController,
  RosterController,
  StepCompletionsController,
} from './enrollments.controller';
import { FollowUpService } from './follow-up.service';
import { StepProgressService } from './step-progress.service';
import { RemindersModule } from '../reminders';
import { EnrollmentsService } from './enrollments.service';

@Module({
  imports: [
    AuditModule,
    StudiesModule,
    StepsModule,
    ConsentModule,
    RandomizationModule,
    UsersModule,
    MailModule,
    PayoutsModule,
    RemindersModule,
  ],
  controllers: [MyEnrollmentController, RosterController, StepCompletionsController, ReturnLinkController],
  providers: [EnrollmentsService, StepProgressService, FollowUpService],
  exports: [EnrollmentsService],
})
export class EnrollmentsModule {}
