import { Module } from '@nestjs/common';
import { ReportingModule } from '../reporting';
import { StudiesModule } from '../studies';
import { AssignmentController } from './assignment.controller';
import { RandomizationModule } from './randomization.module';

/** The assignment routes, which combine a study's design (studies) with the engine (randomization). */
@Module({ imports: [StudiesModule, RandomizationModule, ReportingModule], controllers: [AssignmentController] })
export class AssignmentModule {}
