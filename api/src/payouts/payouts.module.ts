import { Module } from '@nestjs/common';
import { AuditModule } from '../audit';
import { MailModule } from '../mail/mail.module';
import { PaymentsModule } from '../payments/payments.module';
import { StudiesModule } from '../studies';
import { UsersModule } from '../users';
import { PayoutsController, StudyPayoutsController } from './payouts.controller';
import { PayoutRecoveryService } from './payout-recovery.service';
import { PayoutsService } from './payouts.service';

@Module({
  imports: [AuditModule, MailModule, PaymentsModule, StudiesModule, UsersModule],
  controllers: [StudyPayoutsController, PayoutsController],
  providers: [PayoutsService, PayoutRecoveryService],
  exports: [PayoutsService],
})
export class PayoutsModule {}
