import { Module } from '@nestjs/common';
import { AuditModule } from '../audit/audit.module';
import { StepsModule } from '../steps/steps.module';
import { StudiesModule } from '../studies/studies.module';
import { ConsentController } from './consent.controller';
import { ConsentService } from './consent.service';

@Module({ imports: [AuditModule, StudiesModule, StepsModule], controllers: [ConsentController], providers: [ConsentService], exports: [ConsentService] })
export class ConsentModule {}
