import { Module } from '@nestjs/common';
import { AuditModule } from '../audit/audit.module';
import { StudiesModule } from '../studies/studies.module';
import { PublicStudyController } from '../studies/public-study.controller';
import { StepsController } from './steps.controller';
import { StepsService } from './steps.service';

@Module({ imports: [AuditModule, StudiesModule], controllers: [StepsController, PublicStudyController], providers: [StepsService], exports: [StepsService] })
export class StepsModule {}
