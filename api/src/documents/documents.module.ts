import { Module } from '@nestjs/common';
import { ConsentModule } from '../consent';
import { EnrollmentsModule } from '../enrollments';
import { MailModule } from '../mail/mail.module';
import { StudiesModule } from '../studies';
import { DocumentsService } from './documents.service';

@Module({
  imports: [ConsentModule, EnrollmentsModule, StudiesModule, MailModule],
  providers: [DocumentsService],
  exports: [DocumentsService],
})
export class DocumentsModule {}
