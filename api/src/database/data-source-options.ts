import { AuditOutbox1764700500000 } from './migrations/1764700500000-audit-outbox';
import { DataSourceOptions } from 'typeorm';
import { AuditEventEntity } from '../audit/entities/audit-event.entity';
import { RefreshTokenEntity } from '../auth/entities/refresh-token.entity';
import { SignInLinkEntity } from '../auth/entities/sign-in-link.entity';
import { RateLimitWindowEntity } from '../rate-limit/entities/rate-limit-window.entity';
import { StudyMembershipEntity } from '../studies/entities/study-membership.entity';
import { StudyEntity } from '../studies/entities/study.entity';
import { UserEntity } from '../users/entities/user.entity';
import { EnrollmentEntity } from '../enrollments/entities/enrollment.entity';
import { AllocationSlotEntity } from '../randomization/entities/allocation-slot.entity';
import { AllocationEntity } from '../randomization/entities/allocation.entity';
import { AssignmentSchemeEntity } from '../randomization/entities/assignment-scheme.entity';
import { StepPayOverrideEntity } from '../steps/entities/step-pay-override.entity';
import { StepEntity } from '../steps/entities/step.entity';
import { ConditionEntity } from '../studies/entities/condition.entity';
import { StratificationFactorEntity } from '../studies/entities/stratification-factor.entity';
import { Foundation1764600000000 } from './migrations/1764600000000-foundation';
import { StudyDesign1764600100000 } from './migrations/1764600100000-study-design';
import { ConsentAndEnrollment1764600200000 } from './migrations/1764600200000-consent-and-enrollment';
import { Pay1764600300000 } from './migrations/1764600300000-pay';
import { AttritionAlerts1764600400000 } from './migrations/1764600400000-attrition-alerts';
import { LostReason1764600500000 } from './migrations/1764600500000-lost-reason';
import { AttritionAlertRuleEntity } from '../attrition/entities/attrition-alert-rule.entity';
import { AttritionAlertStateEntity } from '../attrition/entities/attrition-alert-state.entity';
import { PayoutAccountEntity } from '../payouts/entities/payout-account.entity';
import { PayoutEntity } from '../payouts/entities/payout.entity';
import { ProviderEventEntity } from '../payouts/entities/provider-event.entity';
import { ProviderObjectVersionEntity } from '../payouts/entities/provider-object-version.entity';
import { PayoutRecovery1764600850000 } from './migrations/1764600850000-payout-recovery';
import { AuditTrailLookups1764700100000 } from './migrations/1764700100000-audit-trail-lookups';
import { StudyDetailsAndArchive1764700300000 } from './migrations/1764700300000-study-details-and-archive';
import { PasswordReset1764700310000 } from './migrations/1764700310000-password-reset';
import { ReceiptNumbers1764700400000 } from './migrations/1764700400000-receipt-numbers';
import { TwoFactor1764700630000 } from './migrations/1764700630000-two-factor';
import { SignedNames1764700700000 } from './migrations/1764700700000-signed-names';
import { AttritionSummary1764700800000 } from './migrations/1764700800000-attrition-summary';
import { StudyFundingEntity } from '../payouts/entities/study-funding.entity';
import { StepCompletionEntity } from '../steps/entities/step-completion.entity';
import { ConsentVersionEntity } from '../consent/entities/consent-version.entity';
import { SignatureEntity } from '../consent/entities/signature.entity';
import { StudyStepKeyEntity } from '../steps/entities/study-step-key.entity';
import { ReminderPlanEntity } from '../reminders/entities/reminder-plan.entity';
import { ContactEntity } from '../reminders/entities/contact.entity';
import { StepVerificationAndContact1764600600000 } from './migrations/1764600600000-step-verification-and-contact';
import { ScreeningQuestionEntity } from '../studies/entities/screening-question.entity';
import { AuditEvidence1764600700000 } from './migrations/1764600700000-audit-evidence';
import { AuditReceiptEntity } from '../audit/entities/audit-receipt.entity';

/** Every entity, listed by hand so nothing depends on file globs. */
export const ENTITIES = [
  UserEntity,
  SignInLinkEntity,
  RefreshTokenEntity,
  StudyEntity,
  StudyMembershipEntity,
  AuditEventEntity,
  AuditReceiptEntity,
  RateLimitWindowEntity,
  ConditionEntity,
  StratificationFactorEntity,
  StepEntity,
  StepPayOverrideEntity,
  AssignmentSchemeEntity,
  AllocationSlotEntity,
  AllocationEntity,
  EnrollmentEntity,
  ScreeningQuestionEntity,
  ConsentVersionEntity,
  SignatureEntity,
  StepCompletionEntity,
  PayoutEntity,
  PayoutAccountEntity,
  ProviderEventEntity,
  ProviderObjectVersionEntity,
  StudyFundingEntity,
  AttritionAlertRuleEntity,
  AttritionAlertStateEntity,
  StudyStepKeyEntity,
  ReminderPlanEntity,
  ContactEntity,
];

/** Every migration in order. Never edit one that has landed; add a new one. */
export const MIGRATIONS = [
  Foundation1764600000000,
  StudyDesign1764600100000,
  ConsentAndEnrollment1764600200000,
  Pay1764600300000,
  AttritionAlerts1764600400000,
  LostReason1764600500000,
  StepVerificationAndContact1764600600000,
  AuditEvidence1764600700000,
  PayoutRecovery1764600850000,
  AuditTrailLookups1764700100000,
  StudyDetailsAndArchive1764700300000,
  PasswordReset1764700310000,
  ReceiptNumbers1764700400000,
  AuditOutbox1764700500000,
  TwoFactor1764700630000,
  SignedNames1764700700000,
  AttritionSummary1764700800000,
];

/** `poolMax`: connections kept open (`DATABASE_POOL_MAX`); the benchmarks boot with more, never by rebuilding the pool. */
export function dataSourceOptions(databaseUrl: string, poolMax = 20): DataSourceOptions {
  return {
    type: 'postgres',
    url: databaseUrl,
    entities: ENTITIES,
    migrations: MIGRATIONS,
    migrationsTableName: 'schema_migration',
    synchronize: false,
    migrationsRun: false,
    extra: { max: poolMax },
  };
}
