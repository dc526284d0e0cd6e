import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { Transform, Type } from 'class-transformer';
import {
  ArrayMaxSize,
  IsArray,
  IsIn,
  IsInt,
  IsISO8601,
  IsObject,
  IsOptional,
  IsString,
  IsUUID,
  Matches,
  Max,
  MaxLength,
  Min,
} from 'class-validator';
import { ACTION_FAMILY_KEYS, type ActionFamily } from '../audit-sentences';
import { MAX_PAGE } from '../../common/http/paging';

const UUID_OR_LAB = /^(lab|[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12})$/i;
/** A day (2026-12-05) or a moment (2026-12-05T09:30:00Z); a day in `to` counts to its end. */
const DAY_OR_MOMENT = /^\d{4}-\d{2}-\d{2}(T\d{2}:\d{2}(:\d{2}(\.\d{1,6})?)?(Z|[+-]\d{2}:\d{2}))?$/;

const asList = ({ value }: { value: unknown }): unknown =>
  value === undefined
    ? undefined
    : (Array.isArray(value) ? value : [value])
        .flatMap((item) => (typeof item === 'string' ? item.split(',') : [item]))
        .map((item) => (typeof item === 'string' ? item.trim() : item))
        .filter((item) => item !== '');

/** Which events: every filter is optional and they combine with AND (families with OR among themselves). */
export class AuditSelectionDto {
  @ApiPropertyOptional({ description: 'A study id, or "lab" for lab-wide events' })
  @IsOptional()
  @IsString()
  @Matches(UUID_OR_LAB, { message: 'must be a study id or "lab"' })
  chain?: string;

  @ApiPropertyOptional({ description: 'A participant reference as shown on the roster, e.g. P-7KQ2XA' })
  @IsOptional()
  @Transform(({ value }) => (typeof value === 'string' ? value.trim().toUpperCase() : value))
  @IsString()
  @Matches(/^[A-Z0-9][A-Z0-9-]{0,39}$/, { message: 'must be a participant reference such as P-7KQ2XA' })
  participant?: string;

  @ApiPropertyOptional({ description: 'The id of the staff member who acted' })
  @IsOptional()
  @IsUUID('all', { message: 'must be the id of a staff member' })
  staff?: string;

  @ApiPropertyOptional({ description: 'From this day or moment on (ISO 8601)', example: '2026-12-01' })
  @IsOptional()
  @IsString()
  @Matches(DAY_OR_MOMENT, { message: 'must be a date such as 2026-12-01 or an ISO 8601 moment' })
  @IsISO8601({ strict: true }, { message: 'must be a real date' })
  from?: string;

  @ApiPropertyOptional({ description: 'Up to and including this day or moment (ISO 8601)', example: '2026-12-31' })
  @IsOptional()
  @IsString()
  @Matches(DAY_OR_MOMENT, { message: 'must be a date such as 2026-12-31 or an ISO 8601 moment' })
  @IsISO8601({ strict: true }, { message: 'must be a real date' })
  to?: string;

  @ApiPropertyOptional({
    description: 'Families of action; several may be given',
    enum: ACTION_FAMILY_KEYS,
    isArray: true,
  })
  @IsOptional()
  @Transform(asList)
  @IsArray()
  @ArrayMaxSize(ACTION_FAMILY_KEYS.length)
  @IsIn(ACTION_FAMILY_KEYS, { each: true, message: `each must be one of ${ACTION_FAMILY_KEYS.join(', ')}` })
  family?: ActionFamily[];

  @ApiPropertyOptional({
    description: 'One stored action code (kept for links made before families)',
    example: 'auth.signed-in',
  })
  @IsOptional()
  @IsString()
  @Matches(/^[a-z][a-z-]*(\.[a-z][a-z-]*)+$/, { message: 'must be an action code such as auth.signed-in' })
  @MaxLength(80)
  action?: string;
}

export class AuditQueryDto extends AuditSelectionDto {
  @ApiPropertyOptional({ default: 1 })
  @IsOptional()
  @Type(() => Number)
  @IsInt()
  @Min(1)
  @Max(MAX_PAGE)
  page: number = 1;

  @ApiPropertyOptional({ default: 50, maximum: 200 })
  @IsOptional()
  @Type(() => Number)
  @IsInt()
  @Min(1)
  @Max(200)
  pageSize: number = 50;
}

export class AmountDto {
  @ApiProperty({ description: 'integer minor units' }) minor: number;
  @ApiProperty() currency: string;
}

export class AuditEventDto {
  @ApiProperty() id: string;
  @ApiProperty() chain: string;
  @ApiProperty() sequence: number;
  @ApiProperty({ format: 'date-time' }) at: string;
  @ApiProperty({ nullable: true, type: String }) actorId: string | null;
  @ApiProperty({ nullable: true, type: String }) actorEmail: string | null;
  @ApiProperty({ description: 'The code as stored (covered by the hash); people read `name` and `sentence`' })
  action: string;
  @ApiProperty({ nullable: true, type: String }) subjectType: string | null;
  @ApiProperty({ nullable: true, type: String }) subjectId: string | null;
  @ApiProperty({ type: 'object', additionalProperties: true }) data: Record<string, unknown>;
  @ApiProperty() previousHash: string;
  @ApiProperty() hash: string;
  @ApiProperty({ nullable: true, type: String }) keyId: string | null;
  @ApiProperty({ enum: ACTION_FAMILY_KEYS }) family: ActionFamily;
  @ApiProperty({ description: 'Our own short name of the action', example: 'Payouts approved' }) name: string;
  @ApiProperty({ example: 'Coordinator C. Vasquez-Hale approved 3 payouts, $36.00 in all.' }) sentence: string;
  @ApiProperty({ description: 'Who acted, in words', example: 'Coordinator C. Vasquez-Hale' }) actorPhrase: string;
  @ApiProperty({ nullable: true, type: String }) participantReference: string | null;
  @ApiProperty({ nullable: true, type: String, description: 'The study of the chain; null for lab-wide events' })
  studyTitle: string | null;
  @ApiProperty({ type: AmountDto, nullable: true }) amount: AmountDto | null;
}

export class AuditPageDto {
  @ApiProperty({ type: [AuditEventDto] }) items: AuditEventDto[];
  @ApiProperty() total: number;
  @ApiProperty() page: number;
  @ApiProperty() pageSize: number;
}

export class ChainBreakDto {
  @ApiProperty() sequence: number;
  @ApiProperty() reason: string;
}

export class ChainVerdictDto {
  @ApiProperty() chain: string;
  @ApiProperty() events: number;
  @ApiProperty() intact: boolean;
  @ApiProperty({ type: ChainBreakDto, nullable: true }) firstBreak: ChainBreakDto | null;
}

export class AuditVerificationDto {
  @ApiProperty() intact: boolean;
  @ApiProperty({ format: 'date-time' }) checkedAt: string;
  @ApiProperty({ type: [ChainVerdictDto] }) chains: ChainVerdictDto[];
}

export class FailingEventDto {
  @ApiProperty({ format: 'date-time' }) at: string;
  @ApiProperty() name: string;
  @ApiProperty() sentence: string;
}

export class AuditFindingDto {
  @ApiProperty({ nullable: true, type: String, description: 'null when the finding is about the receipt' }) chain:
    string | null;
  @ApiProperty({ nullable: true, type: String, description: 'The study of the chain, when it is one' }) studyTitle?:
    string | null;
  @ApiProperty({ nullable: true, type: Number }) sequence: number | null;
  @ApiProperty() reason: string;
  @ApiProperty() message: string;
  @ApiProperty({
    type: FailingEventDto,
    nullable: true,
    description: 'The first failing event in words, when it is still stored',
  })
  event?: FailingEventDto | null;
}

export class ReceiptCheckDto {
  @ApiProperty({ nullable: true, type: String }) id: string | null;
  @ApiProperty({ nullable: true, type: Number }) number: number | null;
  @ApiProperty({ nullable: true, type: String }) issuedAt: string | null;
  @ApiProperty({ enum: ['latest', 'given'] }) source: 'latest' | 'given';
  @ApiProperty() valid: boolean;
}

export class AuditReportDto extends AuditVerificationDto {
  @ApiProperty({ type: ReceiptCheckDto, nullable: true }) receipt: ReceiptCheckDto | null;
  @ApiProperty({ type: [AuditFindingDto] }) findings: AuditFindingDto[];
}

export class VerifyAgainstReceiptDto {
  @ApiProperty({
    type: 'object',
    additionalProperties: true,
    description: 'An audit receipt exactly as downloaded or e-mailed',
  })
  @IsObject()
  receipt: Record<string, unknown>;
}

export class ChainHeadDto {
  @ApiProperty() chain: string;
  @ApiProperty() sequence: number;
  @ApiProperty() hash: string;
  @ApiProperty({ format: 'date-time' }) at: string;
}

export class ReceiptLinkDto {
  @ApiProperty() id: string;
  @ApiProperty() mac: string;
}

export class AuditReceiptDto {
  @ApiProperty({ example: 'evenhand-audit-receipt/1' }) format: string;
  @ApiProperty() id: string;
  @ApiProperty() number: number;
  @ApiProperty({ format: 'date-time' }) issuedAt: string;
  @ApiProperty({ enum: ['scheduled', 'on-demand'] }) reason: string;
  @ApiProperty({ type: ReceiptLinkDto, nullable: true }) previous: ReceiptLinkDto | null;
  @ApiProperty({ type: [ChainHeadDto] }) chains: ChainHeadDto[];
  @ApiProperty() keyId: string;
  @ApiProperty({ description: 'hex HMAC-SHA-256 over the canonical JSON of every other field' }) mac: string;
}

export class AuditReceiptSummaryDto {
  @ApiProperty() id: string;
  @ApiProperty() number: number;
  @ApiProperty({ format: 'date-time' }) issuedAt: string;
  @ApiProperty() reason: string;
  @ApiProperty() chains: number;
}

export class AuditReceiptListDto {
  @ApiProperty({ type: [AuditReceiptSummaryDto] }) items: AuditReceiptSummaryDto[];
}

export class FamilyOptionDto {
  @ApiProperty({ enum: ACTION_FAMILY_KEYS }) key: ActionFamily;
  @ApiProperty() label: string;
  @ApiProperty() description: string;
}

export class StaffOptionDto {
  @ApiProperty() id: string;
  @ApiProperty() name: string;
  @ApiProperty() email: string;
  @ApiProperty() role: string;
  @ApiProperty({ description: 'How the trail names them', example: 'Coordinator C. Vasquez-Hale' }) phrase: string;
}

export class StudyOptionDto {
  @ApiProperty({ description: 'The study id, which is also its chain' }) id: string;
  @ApiProperty() title: string;
  @ApiProperty() slug: string;
}

export class AuditFilterOptionsDto {
  @ApiProperty({ type: [FamilyOptionDto] }) families: FamilyOptionDto[];
  @ApiProperty({ type: [StaffOptionDto] }) staff: StaffOptionDto[];
  @ApiProperty({ type: [StudyOptionDto] }) studies: StudyOptionDto[];
}
