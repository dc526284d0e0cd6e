import { ApiProperty } from '@nestjs/swagger';

export class StaffStudyDto {
  @ApiProperty({ format: 'uuid' }) studyId: string;
  @ApiProperty() title: string;
  @ApiProperty() slug: string;
  @ApiProperty({ enum: ['coordinator', 'researcher', 'auditor', 'admin'] }) role: string;
}

export class StaffStudyListDto {
  @ApiProperty({ type: [StaffStudyDto] }) items: StaffStudyDto[];
}
