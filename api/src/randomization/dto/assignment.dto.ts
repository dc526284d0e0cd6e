import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { Transform } from 'class-transformer';
import {
  ArrayMaxSize,
  ArrayMinSize,
  IsArray,
  IsBoolean,
  IsIn,
  IsInt,
  IsNumber,
  IsObject,
  IsOptional,
  IsString,
  Length,
  Matches,
  Max,
  Min,
} from 'class-validator';
import { SCHEME_METHODS, SchemeMethod } from '../scheme-parameters';

export class PutAssignmentSchemeDto {
  @ApiProperty({ enum: SCHEME_METHODS })
  @IsIn(SCHEME_METHODS, { message: `method must be one of ${SCHEME_METHODS.join(', ')}` })
  method: SchemeMethod;

  @ApiPropertyOptional({
    type: [Number],
    description: 'permuted and stratified blocks: allowed block sizes, each a multiple of the total weight',
  })
  @IsOptional()
  @IsArray()
  @ArrayMinSize(1)
  @ArrayMaxSize(10)
  @IsInt({ each: true, message: 'each block size must be a whole number' })
  blockSizes?: number[];

  @ApiPropertyOptional({ enum: ['range', 'variance'], description: 'minimization: how imbalance is measured' })
  @IsOptional()
  @IsIn(['range', 'variance'])
  measure?: 'range' | 'variance';

  @ApiPropertyOptional({ description: 'minimization: probability of the least-imbalanced condition (0.5–1)' })
  @IsOptional()
  @IsNumber()
  coinProbability?: number;

  @ApiPropertyOptional({ description: 'matched pairs: the numeric pretest factor used to pair people' })
  @IsOptional()
  @IsString()
  pretestKey?: string;

  @ApiPropertyOptional({ type: [Number], description: 'within-subjects: block sizes in whole copies of the design' })
  @IsOptional()
  @IsArray()
  @ArrayMinSize(1)
  @ArrayMaxSize(10)
  @IsInt({ each: true })
  squaresPerBlock?: number[];

  @ApiPropertyOptional({ description: 'within-subjects: hand out orders separately per stratum' })
  @IsOptional()
  @IsBoolean()
  stratify?: boolean;
}

export class ArmCountDto {
  @ApiProperty({ description: 'Condition id, or the order of condition ids joined by ">"' }) armId: string;
  @ApiProperty() count: number;
}

export class StratumBalanceDto {
  @ApiProperty() stratumKey: string;
  @ApiProperty() total: number;
  @ApiProperty({ type: [ArmCountDto] }) counts: ArmCountDto[];
}

export class AssignmentDto {
  @ApiProperty({ nullable: true, type: String, enum: SCHEME_METHODS }) method: string | null;
  @ApiProperty({ type: 'object', additionalProperties: true }) settings: Record<string, unknown>;
  @ApiProperty({
    nullable: true,
    type: String,
    description: 'SHA-256 over the sealed seed and the canonical parameters',
  })
  commitment: string | null;
  @ApiProperty({ nullable: true, type: String, format: 'date-time' }) committedAt: string | null;
  @ApiProperty({
    nullable: true,
    type: 'object',
    additionalProperties: true,
    description: 'The canonical parameters the commitment covers',
  })
  sealedParameters: Record<string, unknown> | null;
  @ApiProperty({ nullable: true, type: String, description: 'Revealed only after closure or unblinding' }) seed:
    string | null;
  @ApiProperty({ nullable: true, type: String, format: 'date-time' }) seedRevealedAt: string | null;
  @ApiProperty({ nullable: true, type: String, format: 'date-time' }) unblindedAt: string | null;
  @ApiProperty({ nullable: true, type: String }) unblindReason: string | null;
  @ApiProperty() allocated: number;
  @ApiProperty({ type: [StratumBalanceDto] }) balance: StratumBalanceDto[];
  @ApiProperty() pretestNote: string;
}

export class DryRunRequestDto {
  @ApiProperty({ minimum: 1, maximum: 100000 })
  @IsInt()
  @Min(1)
  @Max(100_000)
  arrivals: number;

  @ApiPropertyOptional({
    description: '64 hex characters; a fresh throwaway seed when omitted. Never the study’s sealed seed.',
  })
  @IsOptional()
  @Matches(/^[0-9a-fA-F]{64}$/, { message: 'seed must be 64 hexadecimal characters' })
  seed?: string;

  @ApiProperty({
    type: 'object',
    additionalProperties: true,
    description:
      'Per covariate key: {kind:"categorical",proportions}, {kind:"numeric-values",values:[{value,probability}]} or {kind:"normal",mean,sd}',
  })
  @IsObject()
  covariateMix: Record<string, never>;

  @ApiPropertyOptional({ enum: SCHEME_METHODS, description: 'Try another scheme than the saved one' })
  @IsOptional()
  @IsIn(SCHEME_METHODS)
  method?: SchemeMethod;

  @ApiPropertyOptional({
    type: 'object',
    additionalProperties: true,
    description: 'Settings for `method`, as in PUT assignment-scheme',
  })
  @IsOptional()
  @IsObject()
  settings?: Record<string, never>;
}

export class DryRunResultDto {
  @ApiProperty() arrivals: number;
  @ApiProperty({ type: 'array', items: { type: 'object', additionalProperties: true } }) arms: Record<
    string,
    unknown
  >[];
  @ApiProperty({ type: 'array', items: { type: 'object', additionalProperties: true } }) strata: Record<
    string,
    unknown
  >[];
  @ApiProperty({ type: 'array', items: { type: 'object', additionalProperties: true } }) factorLevels: Record<
    string,
    unknown
  >[];
  @ApiProperty({ type: 'array', items: { type: 'object', additionalProperties: true } }) imbalanceOverTime: Record<
    string,
    unknown
  >[];
  @ApiProperty({ type: 'object', additionalProperties: true }) largestImbalance: Record<string, unknown>;
  @ApiProperty({ type: 'object', additionalProperties: true }) finalImbalance: Record<string, unknown>;
  @ApiProperty({ type: 'object', nullable: true, additionalProperties: true }) matchedPairs: Record<
    string,
    unknown
  > | null;
  @ApiProperty() seed: string;
}

export class UnblindDto {
  @ApiProperty({ description: 'Why the allocation is being revealed; kept in the audit trail' })
  @Transform(({ value }) => (typeof value === 'string' ? value.trim() : value))
  @IsString()
  @Length(10, 2000, { message: 'reason must explain the unblinding in at least 10 characters' })
  reason: string;
}

export class AllocationCheckDto {
  @ApiProperty() arrivalPosition: number;
  @ApiProperty() enrollmentId: string;
  @ApiProperty() stratumKey: string;
  @ApiProperty({ type: 'object', additionalProperties: true }) expected: Record<string, unknown>;
  @ApiProperty({ type: 'object', additionalProperties: true }) recorded: Record<string, unknown>;
  @ApiProperty() matches: boolean;
  @ApiProperty({ description: "whether the enrollment's recorded condition and order equal its allocation" })
  enrollmentMatches: boolean;
}

export class EnrollmentMismatchDto {
  @ApiProperty() enrollmentId: string;
  @ApiProperty({ enum: ['differs-from-allocation', 'no-allocation', 'allocation-of-another-study'] }) reason: string;
  @ApiProperty({ type: 'object', additionalProperties: true }) enrollment: Record<string, unknown>;
  @ApiProperty({ type: 'object', additionalProperties: true, nullable: true }) allocation: Record<
    string,
    unknown
  > | null;
  @ApiProperty({ type: 'object', additionalProperties: true, nullable: true }) expected: Record<string, unknown> | null;
}

export class StratumSlotsDto {
  @ApiProperty() stratumKey: string;
  @ApiProperty({ description: 'positions taken' }) taken: number;
  @ApiProperty({ description: 'highest position taken' }) highest: number;
  @ApiProperty({ type: [Number], description: 'positions below the highest that nobody holds' }) skipped: number[];
  @ApiProperty({ type: [Number], description: 'positions held by more than one allocation' }) reused: number[];
}

export class VerificationDto {
  @ApiProperty() allMatch: boolean;
  @ApiProperty() commitmentMatches: boolean;
  @ApiProperty() matched: number;
  @ApiProperty() mismatched: number;
  @ApiProperty() seed: string;
  @ApiProperty() commitment: string;
  @ApiProperty({ type: [AllocationCheckDto] }) checks: AllocationCheckDto[];
  @ApiProperty({
    type: [EnrollmentMismatchDto],
    description: 'enrollments whose recorded condition differs from their allocation',
  })
  enrollmentMismatches: EnrollmentMismatchDto[];
  @ApiPropertyOptional({
    type: [StratumSlotsDto],
    description:
      'slot schemes: each stratum’s taken positions (verified by slot, since concurrent signings may claim out of arrival order)',
  })
  slots?: StratumSlotsDto[];
}
