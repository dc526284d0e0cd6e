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
import { ReportingModule } from '../reporting';
import { CohortService } from './cohort.service';
import { InvitationsService } from './invitations.service';
import { ParticipationService } from './participation.service';
import { ReconsentService } from './reconsent.service';
import { RosterService } from './roster.service';
import { SigningService } from './signing.service';
import { StepCompletionService } from './step-completion.service';
import { StepViewsService } from './step-views.service';
import { WithdrawalService } from './withdrawal.service';

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
    ReportingModule,
  ],
  controllers: [MyEnrollmentController, RosterController, StepCompletionsController, ReturnLinkController],
  providers: [
    ParticipationService,
    SigningService,
    WithdrawalService,
    ReconsentService,
    RosterService,
    CohortService,
    InvitationsService,
    StepProgressService,
    StepCompletionService,
    StepViewsService,
    FollowUpService,
  ],
})
export class EnrollmentsModule {}
