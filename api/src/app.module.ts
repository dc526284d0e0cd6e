import { Module } from '@nestjs/common';
import { APP_FILTER } from '@nestjs/core';
import { TypeOrmModule } from '@nestjs/typeorm';
import { AttritionModule } from './attrition/attrition.module';
import { AuditModule } from './audit/audit.module';
import { AuthModule } from './auth/auth.module';
import { ProblemFilter } from './common/errors/problem.filter';
import { AppConfig } from './config/app-config';
import { ConfigModule } from './config/config.module';
import { dataSourceOptions } from './database/data-source-options';
import { HealthModule } from './health/health.module';
import { JobsModule } from './jobs/jobs.module';
import { MailModule } from './mail/mail.module';
import { PaymentsModule } from './payments/payments.module';
import { AssignmentModule } from './randomization/assignment.module';
import { StepsModule } from './steps/steps.module';
import { PublicStudyModule } from './studies/public-study.module';
import { StudiesModule } from './studies/studies.module';
import { ConsentModule } from './consent/consent.module';
import { RemindersModule } from './reminders/reminders.module';
import { EnrollmentsModule } from './enrollments/enrollments.module';
import { PayoutsModule } from './payouts/payouts.module';
import { UsersModule } from './users/users.module';

@Module({
  imports: [
    ConfigModule,
    TypeOrmModule.forRootAsync({
      inject: [AppConfig],
      useFactory: (config: AppConfig) => dataSourceOptions(config.databaseUrl, config.databasePoolMax),
    }),
    JobsModule,
    AuditModule,
    MailModule,
    UsersModule,
    AuthModule,
    StudiesModule,
    StepsModule,
    PublicStudyModule,
    AssignmentModule,
    ConsentModule,
    RemindersModule,
    EnrollmentsModule,
    PayoutsModule,
    PaymentsModule,
    AttritionModule,
    HealthModule,
  ],
  providers: [{ provide: APP_FILTER, useClass: ProblemFilter }],
})
export class AppModule {}
