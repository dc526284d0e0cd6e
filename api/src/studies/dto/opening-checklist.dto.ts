import { ApiProperty } from '@nestjs/swagger';

export class OpeningChecklistItemDto {
  @ApiProperty({ enum: ['conditions', 'assignmentScheme', 'steps', 'consent'] }) key: string;
  @ApiProperty() label: string;
  @ApiProperty() met: boolean;
  @ApiProperty({ nullable: true, type: String, description: 'What is missing, when not met' }) detail: string | null;
}

/** What a study needs before it opens; opening is refused, naming each missing item, until every one is met. */
export class OpeningChecklistDto {
  @ApiProperty() ready: boolean;
  @ApiProperty({ type: [OpeningChecklistItemDto] }) items: OpeningChecklistItemDto[];
}
