import { Module } from '@nestjs/common';
import { ConsentModule } from '../consent/consent.module';
import { EnrollmentsModule } from '../enrollments/enrollments.module';
import { MailModule } from '../mail/mail.module';
import { StudiesModule } from '../studies/studies.module';
import { DocumentsService } from './documents.service';

@Module({ imports: [ConsentModule, EnrollmentsModule, StudiesModule, MailModule], providers: [DocumentsService], exports: [DocumentsService] })
export class DocumentsModule {}
