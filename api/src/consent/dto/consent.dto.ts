import { schemaRef, type ConsentTemplateValues } from '@evenhand/contract/schemas';
import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { Transform } from 'class-transformer';
import { IsDateString, IsOptional, IsString, Length } from 'class-validator';

const trimmed = ({ value }: { value: unknown }) => (typeof value === 'string' ? value.trim() : value);

export class ConsentTemplateDto {
  @ApiProperty() id: string;
  @ApiProperty() title: string;
  @ApiProperty() version: number;
  @ApiProperty({ type: [String] }) fields: string[];
  @ApiProperty({ description: 'For staff: a starting point for the ethics board, not legal advice' }) notice: string;
}

export class ConsentTemplateListDto {
  @ApiProperty({ type: [ConsentTemplateDto] }) items: ConsentTemplateDto[];
}

export class UpdateConsentVersionDto {
  @ApiPropertyOptional({ description: 'The whole form as Markdown' })
  @IsOptional()
  @IsString()
  @Length(1, 200_000)
  body?: string;

  @ApiPropertyOptional({ example: 'HLCL-IRB-2026-031' })
  @IsOptional()
  @Transform(trimmed)
  @IsString()
  @Length(1, 120)
  approvalReference?: string;

  @ApiPropertyOptional({ example: '2026-11-20', description: 'Date on the approval letter' })
  @IsOptional()
  @IsDateString({ strict: true }, { message: 'approvedAt must be a date such as 2026-11-20' })
  approvedAt?: string;
}

export class ConsentFindingDto {
  @ApiProperty() code: string;
  @ApiProperty({ nullable: true, type: String }) element: string | null;
  @ApiProperty({ nullable: true, type: String }) citation: string | null;
  @ApiProperty({ nullable: true, type: Number }) line: number | null;
  @ApiProperty() message: string;
}

export class ConsentCheckDto {
  @ApiProperty() passes: boolean;
  @ApiProperty({ type: [ConsentFindingDto] }) findings: ConsentFindingDto[];
  @ApiProperty({ type: 'array', items: { type: 'object', additionalProperties: true } }) required: Record<
    string,
    unknown
  >[];
  @ApiProperty({ type: 'array', items: { type: 'object', additionalProperties: true } }) optional: Record<
    string,
    unknown
  >[];
}

export class ConsentVersionDto {
  @ApiProperty({ format: 'uuid' }) id: string;
  @ApiProperty() version: number;
  @ApiProperty() templateId: string;
  @ApiProperty({
    allOf: [schemaRef('ConsentTemplateValues')],
    description: 'The values the text was last filled in with (not the study’s own fields)',
  })
  templateValues: ConsentTemplateValues;
  @ApiProperty({ enum: ['draft', 'active', 'retired'] }) status: 'draft' | 'active' | 'retired';
  @ApiProperty() body: string;
  @ApiProperty({ description: 'Sanitised HTML preview' }) previewHtml: string;
  @ApiProperty({ nullable: true, type: String }) approvalReference: string | null;
  @ApiProperty({ nullable: true, type: String }) approvedAt: string | null;
  @ApiProperty({ nullable: true, type: Object, description: 'The uploaded ethics approval letter' })
  approvalLetter: { name: string | null; size: number; sha256: string } | null;
  @ApiProperty({ nullable: true, type: String, description: 'SHA-256 of the rendered text, fixed at activation' })
  fingerprint: string | null;
  @ApiProperty({ nullable: true, type: String }) activeFrom: string | null;
  @ApiProperty({ nullable: true, type: String }) activeTo: string | null;
  @ApiProperty() readingMinutes: number;
  @ApiProperty({ description: 'Signatures on this version' }) signatures: number;
  @ApiProperty() notice: string;
}

export class ConsentVersionListDto {
  @ApiProperty({ type: [ConsentVersionDto] }) items: ConsentVersionDto[];
}
