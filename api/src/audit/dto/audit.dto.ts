import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { Type } from 'class-transformer';
import { IsInt, IsOptional, IsString, Max, MaxLength, Min } from 'class-validator';

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
