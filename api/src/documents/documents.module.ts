import { Module } from '@nestjs/common';
import { ConsentModule } from '../consent';
import { ReportingModule } from '../reporting';
import { MailModule } from '../mail/mail.module';
import { StudiesModule } from '../studies';
import { DocumentsService } from './documents.service';

@Module({
  imports: [ConsentModule, ReportingModule, StudiesModule, MailModule],
  providers: [DocumentsService],
  exports: [DocumentsService],
})
export class DocumentsModule {}
