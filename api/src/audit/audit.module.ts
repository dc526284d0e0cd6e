import { Module } from '@nestjs/common';
import { MailModule } from '../mail/mail.module';
import { AuditReceiptsService } from './audit-receipts.service';
import { AuditController } from './audit.controller';
import { AuditService } from './audit.service';

@Module({ imports: [MailModule], controllers: [AuditController], providers: [AuditService, AuditReceiptsService], exports: [AuditService] })
export class AuditModule {}
