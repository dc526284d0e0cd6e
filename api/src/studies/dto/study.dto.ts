import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { Transform, Type } from 'class-transformer';
import {
  ArrayMaxSize,
  IsArray,
  IsBoolean,
  IsEmail,
  IsIn,
  IsInt,
  IsNumber,
  IsOptional,
  IsString,
  Length,
  Matches,
  Max,
  MaxLength,
  Min,
  MinLength,
  ValidateNested,
} from 'class-validator';
import { STAFF_ROLES, StaffRole } from '../../users';
import { STUDY_DESIGNS, STUDY_STATUSES, StudyDesign, StudyStatus } from '../entities/study.entity';

const trimmed = ({ value }: { value: unknown }) => (typeof value === 'string' ? value.trim() : value);

export class StudySummaryDto {
  @ApiProperty({ format: 'uuid' }) id: string;
  @ApiProperty() slug: string;
  @ApiProperty() title: string;
  @ApiProperty({ enum: STUDY_STATUSES }) status: StudyStatus;
  @ApiProperty({ enum: STUDY_DESIGNS }) design: StudyDesign;
  @ApiProperty({ format: 'date-time', nullable: true, type: String, description: 'When the closed study was archived' })
  archivedAt: string | null;
}

export class ListStudiesQueryDto {
  @ApiPropertyOptional({
    enum: ['true', 'false'],
    description: 'true lists only archived studies; by default they are left out',
  })
  @IsOptional()
  @IsIn(['true', 'false'], { message: 'archived must be true or false' })
  archived?: 'true' | 'false';
}

export class StudyListDto {
  @ApiProperty({ type: [StudySummaryDto] }) items: StudySummaryDto[];
}

export class StudyDto extends StudySummaryDto {
  @ApiProperty({ nullable: true, type: String }) protocolNumber: string | null;
  @ApiProperty() summary: string;
  @ApiProperty({ nullable: true, type: Number }) estimatedMinutes: number | null;
  @ApiProperty({ nullable: true, type: Number }) targetSize: number | null;
  @ApiProperty({ description: 'Minor units of currency' }) budgetMinor: number;
  @ApiProperty({ example: 'USD' }) currency: string;
  @ApiProperty() blinded: boolean;
  @ApiProperty() labName: string;
  @ApiProperty({ nullable: true, type: String }) contactEmail: string | null;
  @ApiProperty({
    nullable: true,
    type: String,
    description: 'The ethics board approval reference (not the protocol number)',
  })
  ethicsApprovalReference: string | null;
  @ApiProperty({ description: 'People assigned so far; the target size may not go below it' }) assignedCount: number;
  @ApiProperty({ type: [String], description: 'What may change in the details, and when, in plain words' })
  editRules: string[];
  @ApiProperty({ format: 'date-time', nullable: true, type: String }) openedAt: string | null;
  @ApiProperty({ format: 'date-time', nullable: true, type: String }) closedAt: string | null;
  @ApiProperty({ format: 'date-time' }) createdAt: string;
  @ApiProperty({ description: 'Whether anyone has been assigned yet; the design is fixed from then on' })
  designLocked: boolean;
}

export class CreateStudyDto {
  @ApiProperty({
    example: 'wayfinding-cues',
    description: 'Lower-case letters, digits and dashes; used in the study link',
  })
  @Transform(trimmed)
  @Matches(/^[a-z0-9]+(-[a-z0-9]+)*$/, {
    message: 'slug must be lower-case letters and digits separated by single dashes',
  })
  @Length(3, 60, { message: 'slug must be 3 to 60 characters' })
  slug: string;

  @ApiProperty({ example: 'Wayfinding cues' })
  @Transform(trimmed)
  @IsString()
  @Length(1, 200, { message: 'title is required (at most 200 characters)' })
  title: string;

  @ApiPropertyOptional({ example: 'HLCL-2026-014' })
  @IsOptional()
  @Transform(trimmed)
  @IsString()
  @MaxLength(80)
  protocolNumber?: string;

  @ApiProperty({ enum: STUDY_DESIGNS })
  @IsIn(STUDY_DESIGNS, { message: 'design must be between or within' })
  design: StudyDesign;

  @ApiPropertyOptional({ description: 'What taking part involves, in plain words' })
  @IsOptional()
  @IsString()
  @MaxLength(4000)
  summary?: string;

  @ApiPropertyOptional({ minimum: 1 })
  @IsOptional()
  @IsInt()
  @Min(1)
  @Max(10000)
  estimatedMinutes?: number;

  @ApiPropertyOptional({ minimum: 1 })
  @IsOptional()
  @IsInt()
  @Min(1)
  @Max(1_000_000)
  targetSize?: number;

  @ApiPropertyOptional({ description: 'Minor units', minimum: 0 })
  @IsOptional()
  @IsInt()
  @Min(0)
  @Max(Number.MAX_SAFE_INTEGER)
  budgetMinor?: number;

  @ApiPropertyOptional({ example: 'USD' })
  @IsOptional()
  @Matches(/^[A-Z]{3}$/, { message: 'currency must be a three-letter ISO 4217 code such as USD' })
  currency?: string;

  @ApiPropertyOptional({ default: true })
  @IsOptional()
  @IsBoolean()
  blinded?: boolean;

  @ApiPropertyOptional({ example: 'Harbor Lane Cognition Lab' })
  @IsOptional()
  @Transform(trimmed)
  @IsString()
  @MaxLength(200)
  labName?: string;

  @ApiPropertyOptional({ example: 'study-team@lab.test' })
  @IsOptional()
  @IsEmail({}, { message: 'contactEmail must be a valid e-mail address' })
  contactEmail?: string;
}

export class UpdateStudyDto {
  @ApiPropertyOptional() @IsOptional() @Transform(trimmed) @IsString() @Length(1, 200) title?: string;
  @ApiPropertyOptional() @IsOptional() @Transform(trimmed) @IsString() @MaxLength(80) protocolNumber?: string;
  @ApiPropertyOptional({ enum: STUDY_DESIGNS }) @IsOptional() @IsIn(STUDY_DESIGNS) design?: StudyDesign;
  @ApiPropertyOptional() @IsOptional() @IsString() @MaxLength(4000) summary?: string;
  @ApiPropertyOptional() @IsOptional() @IsInt() @Min(1) @Max(10000) estimatedMinutes?: number;
  @ApiPropertyOptional() @IsOptional() @IsInt() @Min(1) @Max(1_000_000) targetSize?: number;
  @ApiPropertyOptional() @IsOptional() @IsInt() @Min(0) @Max(Number.MAX_SAFE_INTEGER) budgetMinor?: number;
  @ApiPropertyOptional()
  @IsOptional()
  @Matches(/^[A-Z]{3}$/, { message: 'currency must be a three-letter ISO 4217 code such as USD' })
  currency?: string;
  @ApiPropertyOptional() @IsOptional() @IsBoolean() blinded?: boolean;
  @ApiPropertyOptional() @IsOptional() @Transform(trimmed) @IsString() @MaxLength(200) labName?: string;
  @ApiPropertyOptional()
  @IsOptional()
  @IsEmail({}, { message: 'contactEmail must be a valid e-mail address' })
  contactEmail?: string;
  @ApiPropertyOptional({ description: 'The ethics board approval reference; empty clears it' })
  @IsOptional()
  @Transform(trimmed)
  @IsString()
  @MaxLength(80)
  ethicsApprovalReference?: string;
}

export class ConditionDto {
  @ApiProperty({ format: 'uuid' }) id: string;
  @ApiProperty({ description: 'Neutral code shown while blinded' }) code: string;
  @ApiProperty({
    description: 'Staff-only name; hidden behind the code while the study is blinded',
    nullable: true,
    type: String,
  })
  internalName: string | null;
  @ApiProperty() participantLabel: string;
  @ApiProperty() participantInstructions: string;
  @ApiProperty() allocationWeight: number;
  @ApiProperty() position: number;
}

export class ConditionListDto {
  @ApiProperty({ type: [ConditionDto] }) items: ConditionDto[];
}

export class CreateConditionDto {
  @ApiProperty({ example: 'audio cues' })
  @Transform(trimmed)
  @IsString()
  @Length(1, 120, { message: 'internalName is required (at most 120 characters)' })
  internalName: string;

  @ApiProperty({ example: 'Route guide, version 1', description: 'What participants see' })
  @Transform(trimmed)
  @IsString()
  @Length(1, 120, { message: 'participantLabel is required (at most 120 characters)' })
  participantLabel: string;

  @ApiPropertyOptional()
  @IsOptional()
  @IsString()
  @MaxLength(8000)
  participantInstructions?: string;

  @ApiPropertyOptional({ default: 1, minimum: 1, maximum: 100 })
  @IsOptional()
  @IsInt({ message: 'allocationWeight must be a whole number' })
  @Min(1)
  @Max(100)
  allocationWeight?: number;
}

export class UpdateConditionDto {
  @ApiPropertyOptional() @IsOptional() @Transform(trimmed) @IsString() @Length(1, 120) internalName?: string;
  @ApiPropertyOptional() @IsOptional() @Transform(trimmed) @IsString() @Length(1, 120) participantLabel?: string;
  @ApiPropertyOptional() @IsOptional() @IsString() @MaxLength(8000) participantInstructions?: string;
  @ApiPropertyOptional() @IsOptional() @IsInt() @Min(1) @Max(100) allocationWeight?: number;
}

export class StratificationFactorInputDto {
  @ApiProperty({ example: 'sense_of_direction' })
  @Matches(/^[a-z][a-z0-9_]{0,63}$/, {
    message: 'key must start with a letter and use lower-case letters, digits and _',
  })
  key: string;

  @ApiProperty({ example: 'How good is your sense of direction? (0–100)' })
  @Transform(trimmed)
  @IsString()
  @Length(1, 300)
  label: string;

  @ApiProperty({ enum: ['numeric', 'categorical'] })
  @IsIn(['numeric', 'categorical'])
  kind: 'numeric' | 'categorical';

  @ApiPropertyOptional({ type: [Number], description: 'numeric: a value at or above a cut falls in the upper level' })
  @IsOptional()
  @IsArray()
  @ArrayMaxSize(20)
  @IsNumber({}, { each: true })
  cutPoints?: number[];

  @ApiPropertyOptional({ type: [String] })
  @IsOptional()
  @IsArray()
  @ArrayMaxSize(50)
  @IsString({ each: true })
  categories?: string[];

  @ApiPropertyOptional({ default: 1, description: 'Weight in minimization' })
  @IsOptional()
  @IsNumber()
  @Min(0.01)
  @Max(100)
  minimizationWeight?: number;
}

export class ReplaceFactorsDto {
  @ApiProperty({ type: [StratificationFactorInputDto] })
  @IsArray()
  @ArrayMaxSize(8)
  @ValidateNested({ each: true })
  @Type(() => StratificationFactorInputDto)
  factors: StratificationFactorInputDto[];
}

export class StratificationFactorDto {
  @ApiProperty({ format: 'uuid' }) id: string;
  @ApiProperty() key: string;
  @ApiProperty() label: string;
  @ApiProperty({ enum: ['numeric', 'categorical'] }) kind: 'numeric' | 'categorical';
  @ApiProperty({ type: [Number], nullable: true }) cutPoints: number[] | null;
  @ApiProperty({ type: [String], nullable: true }) categories: string[] | null;
  @ApiProperty() minimizationWeight: number;
  @ApiProperty({ type: [String], description: 'The levels participants fall into' }) levels: string[];
}

export class StratificationFactorListDto {
  @ApiProperty({ type: [StratificationFactorDto] }) items: StratificationFactorDto[];
  @ApiProperty({ description: 'Why a pretest stratifies rather than deciding the condition' }) pretestNote: string;
}

export class MemberDto {
  @ApiProperty({ format: 'uuid' }) userId: string;
  @ApiProperty() email: string;
  @ApiProperty() name: string;
  @ApiProperty({ enum: STAFF_ROLES }) role: StaffRole;
}

export class MemberListDto {
  @ApiProperty({ type: [MemberDto] }) items: MemberDto[];
}

export class AddMemberDto {
  @ApiProperty({ example: 'someone@lab.test' })
  @Transform(({ value }) => (typeof value === 'string' ? value.trim().toLowerCase() : value))
  @IsString()
  @MinLength(3)
  email: string;

  @ApiProperty({ enum: ['coordinator', 'researcher', 'auditor'] })
  @IsIn(['coordinator', 'researcher', 'auditor'], { message: 'role must be coordinator, researcher or auditor' })
  role: 'coordinator' | 'researcher' | 'auditor';
}
