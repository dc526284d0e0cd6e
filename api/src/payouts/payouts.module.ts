import { Module } from '@nestjs/common';
import { AuditModule } from '../audit';
import { MailModule } from '../mail/mail.module';
import { PaymentsModule } from '../payments/payments.module';
import { StudiesModule } from '../studies';
import { UsersModule } from '../users';
import { PayoutsController, StudyPayoutsController } from './payouts.controller';
import { PayoutRecoveryService } from './payout-recovery.service';
import { ReportingModule } from '../reporting';
import { FundingService } from './funding.service';
import { PayoutAccountsService } from './payout-accounts.service';
import { PayoutApprovalService } from './payout-approval.service';
import { PayoutQueueService } from './payout-queue.service';
import { PayoutReceiptsService } from './payout-receipts.service';
import { PayoutReportsService } from './payout-reports.service';
import { PayoutSendingService } from './payout-sending.service';
import { PayoutsService } from './payouts.service';
import { ProviderWebhooksService } from './provider-webhooks.service';

@Module({
  imports: [AuditModule, MailModule, PaymentsModule, ReportingModule, StudiesModule, UsersModule],
  controllers: [StudyPayoutsController, PayoutsController],
  providers: [
    PayoutsService,
    PayoutQueueService,
    PayoutApprovalService,
    PayoutSendingService,
    PayoutReceiptsService,
    ProviderWebhooksService,
    PayoutAccountsService,
    FundingService,
    PayoutReportsService,
    PayoutRecoveryService,
  ],
  exports: [PayoutsService],
})
export class PayoutsModule {}
