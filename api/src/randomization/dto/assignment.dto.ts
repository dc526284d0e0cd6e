import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { Transform } from 'class-transformer';
import { IsString, Length } from 'class-validator';
import { schemaRef, type SchemeParameters, type SchemeSettings } from '@evenhand/contract/schemas';
import { SCHEME_METHODS } from '../scheme-parameters';

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
  @ApiProperty({ allOf: [schemaRef('SchemeSettings')], description: 'The method’s settings as saved' })
  settings: SchemeSettings;
  @ApiProperty({
    nullable: true,
    type: String,
    description: 'SHA-256 over the sealed seed and the canonical parameters',
  })
  commitment: string | null;
  @ApiProperty({ nullable: true, type: String, format: 'date-time' }) committedAt: string | null;
  @ApiProperty({
    nullable: true,
    allOf: [schemaRef('SchemeParameters')],
    description: 'The canonical parameters the commitment covers',
  })
  sealedParameters: SchemeParameters | null;
  @ApiProperty({ nullable: true, type: String, description: 'Revealed only after closure or unblinding' }) seed:
    string | null;
  @ApiProperty({ nullable: true, type: String, format: 'date-time' }) seedRevealedAt: string | null;
  @ApiProperty({ nullable: true, type: String, format: 'date-time' }) unblindedAt: string | null;
  @ApiProperty({ nullable: true, type: String }) unblindReason: string | null;
  @ApiProperty() allocated: number;
  @ApiProperty({ type: [StratumBalanceDto] }) balance: StratumBalanceDto[];
  @ApiProperty() pretestNote: string;
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
