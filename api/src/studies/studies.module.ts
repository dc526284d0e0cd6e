import { Module } from '@nestjs/common';
import { AuditModule } from '../audit';
import { RandomizationModule } from '../randomization';
import { StaffStudiesController, StudiesController } from './studies.controller';
import { StudiesService } from './studies.service';
import { StudyAccessGuard } from './study-access.guard';

@Module({
  imports: [AuditModule, RandomizationModule],
  controllers: [StudiesController, StaffStudiesController],
  providers: [StudiesService, StudyAccessGuard],
  exports: [StudiesService, StudyAccessGuard],
})
export class StudiesModule {}
