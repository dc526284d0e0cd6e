import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { Type } from 'class-transformer';
import { IsInt, IsObject, IsOptional, IsString, Max, MaxLength, Min } from 'class-validator';
import { MAX_PAGE } from '../../common/http/paging';

export class AuditQueryDto {
  @ApiPropertyOptional({ description: 'A study id, or "lab" for lab-wide events' })
  @IsOptional()
  @IsString()
  @MaxLength(80)
  chain?: string;

  @ApiPropertyOptional({ example: 'auth.signed-in' })
  @IsOptional()
  @IsString()
  @MaxLength(80)
  action?: string;

  @ApiPropertyOptional({ default: 1 })
  @IsOptional()
  @Type(() => Number)
  @IsInt()
  @Min(1)
  @Max(MAX_PAGE)
  page: number = 1;

  @ApiPropertyOptional({ default: 50 })
  @IsOptional()
  @Type(() => Number)
  @IsInt()
  @Min(1)
  @Max(200)
  pageSize: number = 50;
}

export class AuditEventDto {
  @ApiProperty() id: string;
  @ApiProperty() chain: string;
  @ApiProperty() sequence: number;
  @ApiProperty({ format: 'date-time' }) at: string;
  @ApiProperty({ nullable: true, type: String }) actorId: string | null;
  @ApiProperty({ nullable: true, type: String }) actorEmail: string | null;
  @ApiProperty() action: string;
  @ApiProperty({ nullable: true, type: String }) subjectType: string | null;
  @ApiProperty({ nullable: true, type: String }) subjectId: string | null;
  @ApiProperty({ type: 'object', additionalProperties: true }) data: Record<string, unknown>;
  @ApiProperty() previousHash: string;
  @ApiProperty() hash: string;
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

export class AuditFindingDto {
  @ApiProperty({ nullable: true, type: String, description: 'null when the finding is about the receipt' }) chain: string | null;
  @ApiProperty({ nullable: true, type: Number }) sequence: number | null;
  @ApiProperty() reason: string;
  @ApiProperty() message: string;
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
  @ApiProperty({ type: 'object', additionalProperties: true, description: 'An audit receipt exactly as downloaded or e-mailed' })
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
