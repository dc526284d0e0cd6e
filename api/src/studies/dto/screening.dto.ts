import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { Transform, Type } from 'class-transformer';
import {
  ArrayMaxSize,
  IsArray,
  IsIn,
  IsNumber,
  IsOptional,
  IsString,
  Length,
  Matches,
  MaxLength,
  ValidateNested,
} from 'class-validator';

const trimmed = ({ value }: { value: unknown }) => (typeof value === 'string' ? value.trim() : value);

export class ScreeningQuestionInputDto {
  @ApiProperty({ example: 'adult' })
  @Matches(/^[a-z][a-z0-9_]{0,63}$/, {
    message: 'key must start with a letter and use lower-case letters, digits and _',
  })
  key: string;

  @ApiProperty({ example: 'Are you 18 or older?' })
  @Transform(trimmed)
  @IsString()
  @Length(1, 300)
  label: string;

  @ApiProperty({ enum: ['yes-no', 'number', 'choice'] })
  @IsIn(['yes-no', 'number', 'choice'])
  kind: 'yes-no' | 'number' | 'choice';

  @ApiPropertyOptional({ type: [String] })
  @IsOptional()
  @IsArray()
  @ArrayMaxSize(50)
  @IsString({ each: true })
  options?: string[];
  @ApiPropertyOptional() @IsOptional() @IsNumber() minValue?: number;
  @ApiPropertyOptional() @IsOptional() @IsNumber() maxValue?: number;
  @ApiPropertyOptional() @IsOptional() @IsString() @MaxLength(500) help?: string;
  @ApiPropertyOptional({ description: 'The rule in plain words for the public page, e.g. "18 or older"' })
  @IsOptional()
  @IsString()
  @MaxLength(200)
  criterion?: string;
  @ApiPropertyOptional({
    description: 'yes-no: [true] or [false]; choice: the options that may take part',
    type: 'array',
    items: {},
  })
  @IsOptional()
  @IsArray()
  eligibleValues?: Array<string | boolean>;
  @ApiPropertyOptional() @IsOptional() @IsNumber() eligibleMin?: number;
  @ApiPropertyOptional() @IsOptional() @IsNumber() eligibleMax?: number;
}

export class ReplaceScreeningQuestionsDto {
  @ApiProperty({ type: [ScreeningQuestionInputDto] })
  @IsArray()
  @ArrayMaxSize(30)
  @ValidateNested({ each: true })
  @Type(() => ScreeningQuestionInputDto)
  questions: ScreeningQuestionInputDto[];
}

export class ScreeningQuestionDto {
  @ApiProperty() key: string;
  @ApiProperty() label: string;
  @ApiProperty({ enum: ['yes-no', 'number', 'choice'] }) kind: 'yes-no' | 'number' | 'choice';
  @ApiPropertyOptional({ type: [String] }) options?: string[];
  @ApiPropertyOptional() min?: number;
  @ApiPropertyOptional() max?: number;
  @ApiPropertyOptional() help?: string;
  @ApiProperty({
    enum: ['eligibility', 'stratification'],
    description: 'Stratification answers balance the assignment; they never exclude anyone',
  })
  purpose: 'eligibility' | 'stratification';
  // The rule itself is for staff only: participants are never shown which answer qualifies.
  @ApiPropertyOptional({ description: 'Staff view only' }) criterion?: string;
  @ApiPropertyOptional({ description: 'Staff view only', type: 'array', items: {} }) eligibleValues?: Array<
    string | boolean
  >;
  @ApiPropertyOptional({ description: 'Staff view only' }) eligibleMin?: number;
  @ApiPropertyOptional({ description: 'Staff view only' }) eligibleMax?: number;
}

export class ScreeningQuestionListDto {
  @ApiProperty({ type: [ScreeningQuestionDto] }) items: ScreeningQuestionDto[];
}

export class PublicStepDto {
  @ApiProperty() position: number;
  @ApiProperty() title: string;
  @ApiProperty() description: string;
  @ApiProperty() payMinor: number;
}

export class EligibilityCriterionDto {
  @ApiProperty() key: string;
  @ApiProperty() label: string;
}

export class PublicStudyDto {
  @ApiProperty({ format: 'uuid' }) id: string;
  @ApiProperty() slug: string;
  @ApiProperty() title: string;
  @ApiProperty() summary: string;
  @ApiProperty({ nullable: true, type: Number }) estimatedMinutes: number | null;
  @ApiProperty({ enum: ['recruiting', 'paused', 'closed'] }) status: 'recruiting' | 'paused' | 'closed';
  @ApiProperty({ nullable: true, type: String }) protocolNumber: string | null;
  @ApiProperty() labName: string;
  @ApiProperty({ nullable: true, type: String }) contactEmail: string | null;
  @ApiProperty() currency: string;
  @ApiProperty() totalPayMinor: number;
  @ApiProperty({ type: [PublicStepDto] }) steps: PublicStepDto[];
  @ApiProperty({ type: [EligibilityCriterionDto] }) eligibility: EligibilityCriterionDto[];
}
