import { Module } from '@nestjs/common';
import { StudiesController } from './studies.controller';
import { StudiesService } from './studies.service';
import { StudyAccessGuard } from './study-access.guard';

@Module({ controllers: [StudiesController], providers: [StudiesService, StudyAccessGuard], exports: [StudiesService, StudyAccessGuard] })
export class StudiesModule {}
