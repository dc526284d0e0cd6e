import { Module } from '@nestjs/common';
import { StepsModule } from '../steps';
import { PublicStudyController } from './public-study.controller';
import { StudiesModule } from './studies.module';

/** The public study page: it shows a study's steps, so it sits above both studies and steps. */
@Module({ imports: [StudiesModule, StepsModule], controllers: [PublicStudyController] })
export class PublicStudyModule {}
