import { Module } from '@nestjs/common';
import { AuditModule } from '../audit/audit.module';
import { ConsentModule } from '../consent/consent.module';
import { MailModule } from '../mail/mail.module';
import { RandomizationModule } from '../randomization/randomization.module';
import { StepsModule } from '../steps/steps.module';
import { StudiesModule } from '../studies/studies.module';
import { UsersModule } from '../users/users.module';
import { PayoutsModule } from '../payouts/payouts.module';
import { MyEnrollmentController, RosterController } from './enrollments.controller';
import { EnrollmentsService } from './enrollments.service';

@Module({
  imports: [AuditModule, StudiesModule, StepsModule, ConsentModule, RandomizationModule, UsersModule, MailModule, PayoutsModule],
  controllers: [MyEnrollmentController, RosterController],
  providers: [EnrollmentsService],
  exports: [EnrollmentsService],
})
export class EnrollmentsModule {}
