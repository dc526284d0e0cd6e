import { Module } from '@nestjs/common';
import { AccountEmailsReadModel } from './account-emails.read-model';
import { FinanceReadModel } from './finance.read-model';
import { ParticipantPayoutsReadModel } from './participant-payouts.read-model';
import { PayoutQueueReadModel } from './payout-queue.read-model';
import { RosterReadModel } from './roster.read-model';
import { ScreenedCovariatesReadModel } from './screened-covariates.read-model';
import { SignedCopyRecipientsReadModel } from './signed-copy-recipients.read-model';

const READ_MODELS = [
  AccountEmailsReadModel,
  FinanceReadModel,
  ParticipantPayoutsReadModel,
  PayoutQueueReadModel,
  RosterReadModel,
  ScreenedCovariatesReadModel,
  SignedCopyRecipientsReadModel,
];

/**
 * Reads that span domains (the roster with e-mails, the payout queue, the finance export…). They only read; each
 * domain that shows one asks here instead of querying another domain's tables. Imports no domain.
 */
@Module({ providers: READ_MODELS, exports: READ_MODELS })
export class ReportingModule {}
