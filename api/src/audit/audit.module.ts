import { Module } from '@nestjs/common';
import { MailModule } from '../mail/mail.module';
import { AuditReceiptsService } from './audit-receipts.service';
import { AuditTrailReadModel } from './audit-trail.read-model';
import { AuditTrailService } from './audit-trail.service';
import { AuditController } from './audit.controller';
import { AuditService } from './audit.service';

@Module({
  imports: [MailModule],
  controllers: [AuditController],
  providers: [AuditService, AuditReceiptsService, AuditTrailReadModel, AuditTrailService],
  exports: [AuditService],
})
export class AuditModule {}
