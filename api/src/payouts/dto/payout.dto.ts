import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { Type } from 'class-transformer';
import {
  ArrayMaxSize,
  ArrayMinSize,
  IsArray,
  IsIn,
  IsInt,
  IsOptional,
  IsString,
  IsUUID,
  Matches,
  Max,
  MaxLength,
  Min,
} from 'class-validator';
import { PAYOUT_STAGES, PayoutStage } from '../pay-totals';
import { PAYOUT_STATUSES, PayoutStatus } from '../entities/payout.entity';
import { MAX_PAGE } from '../../common/http/paging';

export class PayoutDto {
  @ApiProperty() id: string;
  @ApiProperty() enrollmentId: string;
  @ApiProperty() reference: string;
  @ApiProperty({ nullable: true, type: String, description: 'Condition code, or its name once unblinded' }) condition:
    string | null;
  @ApiProperty({ enum: ['step', 'bonus'] }) kind: 'step' | 'bonus';
  @ApiProperty({ nullable: true, type: String }) stepTitle: string | null;
  @ApiProperty() amountMinor: number;
  @ApiProperty() currency: string;
  @ApiProperty({ description: 'A recorded per-condition pay exception applies' }) payOverride: boolean;
  @ApiProperty({ enum: PAYOUT_STATUSES }) status: PayoutStatus;
  @ApiProperty({ nullable: true, type: String }) failureReason: string | null;
  @ApiProperty({ enum: PAYOUT_STAGES, description: 'What staff must do next about it' }) stage: PayoutStage;
  @ApiProperty({
    nullable: true,
    type: String,
    description: 'Our receipt number, once paid: what the participant sees',
  })
  receiptNumber: string | null;
  @ApiProperty({
    nullable: true,
    type: String,
    description: "The provider's transfer id: for staff only, never shown to participants",
  })
  providerTransferId: string | null;
  @ApiProperty() payoutAccountReady: boolean;
  @ApiProperty() createdAt: string;
  @ApiProperty({ nullable: true, type: String }) approvedAt: string | null;
  @ApiProperty({ nullable: true, type: String }) paidAt: string | null;
}

export class StageTotalDto {
  @ApiProperty() count: number;
  @ApiProperty() amountMinor: number;
  @ApiProperty({ description: 'Distinct participants with a payout in this stage' }) participants: number;
}

export class PayoutStagesDto {
  @ApiProperty({ type: StageTotalDto, description: 'Owed, and the participant can receive money' })
  'to-approve': StageTotalDto;
  @ApiProperty({ type: StageTotalDto, description: 'Owed, and the participant has not finished payout set-up' })
  'awaiting-setup': StageTotalDto;
  @ApiProperty({ type: StageTotalDto, description: 'Failed: staff must look' }) 'needs-attention': StageTotalDto;
  @ApiProperty({ type: StageTotalDto, description: 'Approved or being sent' }) 'on-its-way': StageTotalDto;
  @ApiProperty({ type: StageTotalDto }) paid: StageTotalDto;
  @ApiProperty({ type: StageTotalDto, description: 'Cancelled or reversed' }) closed: StageTotalDto;
}

export class PayoutPageDto {
  @ApiProperty({ type: [PayoutDto] }) items: PayoutDto[];
  @ApiProperty() total: number;
  @ApiProperty() page: number;
  @ApiProperty() pageSize: number;
  @ApiProperty({ type: 'object', additionalProperties: { type: 'number' } }) countsByStatus: Record<string, number>;
  @ApiProperty({ type: 'object', additionalProperties: { type: 'number' } }) amountByStatus: Record<string, number>;
  @ApiProperty({
    type: PayoutStagesDto,
    description: 'Every payout of the study by stage (whatever the filter), from the same sums as the budget',
  })
  stages: PayoutStagesDto;
}

export const PAYOUT_SORTS = ['newest', 'oldest', 'amount-desc', 'amount-asc', 'participant'] as const;
export type PayoutSort = (typeof PAYOUT_SORTS)[number];

export class PayoutQueryDto {
  @ApiPropertyOptional({ enum: PAYOUT_STATUSES }) @IsOptional() @IsIn(PAYOUT_STATUSES) status?: PayoutStatus;
  @ApiPropertyOptional({ enum: PAYOUT_STAGES })
  @IsOptional()
  @IsIn(PAYOUT_STAGES, { message: `stage must be one of ${PAYOUT_STAGES.join(', ')}` })
  stage?: PayoutStage;
  @ApiPropertyOptional() @IsOptional() @IsUUID('4') conditionId?: string;
  @ApiPropertyOptional({ description: "One participant's payouts (their payment history)" })
  @IsOptional()
  @IsUUID('4', { message: 'enrollmentId must be an enrollment id' })
  enrollmentId?: string;
  @ApiPropertyOptional({ description: 'Participant reference, step title or receipt number (part of it)' })
  @IsOptional()
  @IsString()
  @MaxLength(100, { message: 'search must be at most 100 characters' })
  search?: string;
  @ApiPropertyOptional({ enum: PAYOUT_SORTS, default: 'newest' })
  @IsOptional()
  @IsIn(PAYOUT_SORTS, { message: `sort must be one of ${PAYOUT_SORTS.join(', ')}` })
  sort: PayoutSort = 'newest';
  @ApiPropertyOptional({ default: 1 }) @IsOptional() @Type(() => Number) @IsInt() @Min(1) @Max(MAX_PAGE) page: number =
    1;
  @ApiPropertyOptional({ default: 50 }) @IsOptional() @Type(() => Number) @IsInt() @Min(1) @Max(500) pageSize: number =
    50;
}

export class ApprovePayoutsDto {
  @ApiProperty({ type: [String] })
  @IsArray()
  @ArrayMinSize(1, { message: 'payoutIds must name at least one payout' })
  @ArrayMaxSize(10_000)
  @IsUUID('4', { each: true, message: 'each payout id must be a UUID' })
  payoutIds: string[];
}

export class ApprovalResultDto {
  @ApiProperty() approved: number;
  @ApiProperty() amountMinor: number;
  @ApiProperty({ description: 'Funded balance left after this approval' }) remainingMinor: number;
}

export class BudgetDto {
  @ApiProperty() currency: string;
  @ApiProperty({ description: 'The planned budget set on the study' }) plannedMinor: number;
  @ApiProperty({ description: 'Money put in by card and confirmed' }) fundedMinor: number;
  @ApiProperty({ description: 'Approved or being sent' }) committedMinor: number;
  @ApiProperty() paidMinor: number;
  @ApiProperty({ description: 'Earned by participants, not yet approved (the owed rows of the queue)' })
  owedMinor: number;
  @ApiProperty({ description: 'Failed payouts, to be retried (the needs-attention rows of the queue)' })
  needsAttentionMinor: number;
  @ApiProperty({ description: 'funded − committed − paid' }) remainingMinor: number;
  @ApiProperty({ type: 'array', items: { type: 'object', additionalProperties: true } }) fundings: Array<
    Record<string, unknown>
  >;
}

export class CreateFundingDto {
  @ApiProperty({ description: 'Minor units, e.g. 50000 for 500.00', minimum: 100 })
  @IsInt({ message: 'amountMinor must be a whole number of minor units' })
  @Min(100)
  @Max(100_000_000)
  amountMinor: number;
}

export class FundingIntentDto {
  @ApiProperty() fundingId: string;
  @ApiProperty() clientSecret: string;
  @ApiProperty() publishableKey: string;
  @ApiProperty({ description: "The provider's browser script to load before confirming" }) scriptUrl: string;
  @ApiProperty() amountMinor: number;
  @ApiProperty() currency: string;
}

export class ReconciliationDifferenceDto {
  @ApiProperty({ enum: ['missing-at-provider', 'unknown-at-provider', 'amount-differs', 'reversal-differs'] })
  kind: string;
  @ApiProperty({ nullable: true, type: String }) payoutId: string | null;
  @ApiProperty({ nullable: true, type: String }) transferId: string | null;
  @ApiProperty({ nullable: true, type: Number }) ledgerAmountMinor: number | null;
  @ApiProperty({ nullable: true, type: Number }) providerAmountMinor: number | null;
  @ApiProperty() message: string;
}

export class ReconciliationDto {
  @ApiProperty() checkedAt: string;
  @ApiProperty() ledgerPaidCount: number;
  @ApiProperty() ledgerPaidMinor: number;
  @ApiProperty() providerTransferCount: number;
  @ApiProperty() providerTransferMinor: number;
  @ApiProperty({ type: [ReconciliationDifferenceDto] }) differences: ReconciliationDifferenceDto[];
}

export class PayoutAccountStatusDto {
  @ApiProperty() exists: boolean;
  @ApiProperty() payoutsEnabled: boolean;
  @ApiProperty({ enum: ['none', 'started', 'complete'] }) onboarding: 'none' | 'started' | 'complete';
}

export class OnboardingLinkDto {
  @ApiProperty() url: string;
  @ApiProperty({ type: PayoutAccountStatusDto }) account: PayoutAccountStatusDto;
}

export class MyPayoutDto {
  @ApiProperty() id: string;
  @ApiProperty() studyTitle: string;
  @ApiProperty({ nullable: true, type: String }) stepTitle: string | null;
  @ApiProperty({ enum: ['step', 'bonus'] }) kind: 'step' | 'bonus';
  @ApiProperty() amountMinor: number;
  @ApiProperty() currency: string;
  @ApiProperty({ enum: PAYOUT_STATUSES }) status: PayoutStatus;
  @ApiProperty() createdAt: string;
  @ApiProperty({ nullable: true, type: String }) paidAt: string | null;
  @ApiProperty({ nullable: true, type: String, description: 'Our receipt number (study slug and a count), once paid' })
  receipt: string | null;
}

export class MyPayoutsDto {
  @ApiProperty({ type: [MyPayoutDto] }) items: MyPayoutDto[];
  @ApiProperty({ type: PayoutAccountStatusDto }) account: PayoutAccountStatusDto;
  @ApiProperty({
    description: 'Paid this calendar year, per currency',
    type: 'object',
    additionalProperties: { type: 'number' },
  })
  paidThisYearMinor: Record<string, number>;
  @ApiProperty({
    description: 'Owed or on its way, per currency',
    type: 'object',
    additionalProperties: { type: 'number' },
  })
  pendingMinor: Record<string, number>;
  @ApiProperty() taxNote: string;
}

export class TaxThresholdEntryDto {
  @ApiProperty() participantId: string;
  @ApiProperty() email: string;
  @ApiProperty() paidThisYearMinor: number;
  @ApiProperty({ enum: ['under', 'near', 'over'] }) standing: 'under' | 'near' | 'over';
}

export class TaxThresholdDto {
  @ApiProperty() year: number;
  @ApiProperty() thresholdMinor: number;
  @ApiProperty() currency: string;
  @ApiProperty() caution: string;
  @ApiProperty({ type: [TaxThresholdEntryDto] }) participants: TaxThresholdEntryDto[];
}

const ISO_DAY = /^\d{4}-\d{2}-\d{2}$/;

export class FinanceExportQueryDto {
  @ApiProperty({ description: 'First day of the period (YYYY-MM-DD, UTC)', example: '2026-01-01' })
  @Matches(ISO_DAY, { message: 'from must be a date written YYYY-MM-DD' })
  from: string;
  @ApiProperty({ description: 'Last day of the period (YYYY-MM-DD, UTC), included', example: '2026-03-31' })
  @Matches(ISO_DAY, { message: 'to must be a date written YYYY-MM-DD' })
  to: string;
}
