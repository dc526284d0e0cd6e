import { Module } from '@nestjs/common';
import { AuditModule } from '../audit';
import { StepsModule } from '../steps';
import { MailModule } from '../mail/mail.module';
import { ReportingModule } from '../reporting';
import { StudiesModule } from '../studies';
import { ConsentController } from './consent.controller';
import { ConsentService } from './consent.service';
import { SignedCopyService } from './signed-copy/signed-copy.service';

@Module({
  imports: [AuditModule, StudiesModule, StepsModule, ReportingModule, MailModule],
  controllers: [ConsentController],
  providers: [ConsentService, SignedCopyService],
  exports: [ConsentService],
})
export class ConsentModule {}
