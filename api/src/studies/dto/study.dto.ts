import { ApiProperty } from '@nestjs/swagger';
import { STUDY_DESIGNS, STUDY_STATUSES, StudyDesign, StudyStatus } from '../entities/study.entity';

export class StudySummaryDto {
  @ApiProperty({ format: 'uuid' }) id: string;
  @ApiProperty() slug: string;
  @ApiProperty() title: string;
  @ApiProperty({ enum: STUDY_STATUSES }) status: StudyStatus;
  @ApiProperty({ enum: STUDY_DESIGNS }) design: StudyDesign;
}

export class StudyListDto {
  @ApiProperty({ type: [StudySummaryDto] }) items: StudySummaryDto[];
}
