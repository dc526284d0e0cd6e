import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { Transform, Type } from 'class-transformer';
import {
  ArrayMaxSize,
  IsArray,
  IsBoolean,
  IsIn,
  IsInt,
  IsObject,
  IsOptional,
  IsString,
  IsUUID,
  Length,
  Matches,
  Max,
  MaxLength,
  Min,
} from 'class-validator';
import { ScreeningQuestionDto } from '../../studies';
import { STEP_VERIFICATIONS, type CompletionVerifiedBy, type StepVerification } from '../../steps';
import { ENROLLMENT_STATUSES, EnrollmentStatus } from '../entities/enrollment.entity';
import { MAX_PAGE } from '../../common/http/paging';

export const STEP_STATUSES = ['done', 'open', 'overdue', 'upcoming', 'waiting', 'locked'] as const;
export type StepStatus = (typeof STEP_STATUSES)[number];

const trimmed = ({ value }: { value: unknown }) => (typeof value === 'string' ? value.trim() : value);

export class ScreeningStateDto {
  @ApiProperty({ type: [ScreeningQuestionDto] }) questions: ScreeningQuestionDto[];
  @ApiProperty({ nullable: true, type: 'object', additionalProperties: true }) answers: Record<
    string,
    number | string | boolean
  > | null;
  @ApiProperty({ nullable: true, type: String }) exclusionReason: string | null;
}

export class ConsentStateDto {
  @ApiProperty({ nullable: true, type: String }) activeVersionId: string | null;
  @ApiProperty({ nullable: true, type: String }) signedVersionId: string | null;
  @ApiProperty() needsSignature: boolean;
  @ApiProperty({ nullable: true, type: String }) signedAt: string | null;
}

export class ParticipantAssignmentDto {
  @ApiProperty({ description: 'The participant-facing label; never the internal name' }) label: string;
  @ApiProperty() instructions: string;
}

export class MyStepDto {
  @ApiProperty() id: string;
  @ApiProperty() position: number;
  @ApiProperty() title: string;
  @ApiProperty() description: string;
  @ApiProperty() payMinor: number;
  @ApiProperty({
    enum: STEP_STATUSES,
    description:
      'done; open (can be done now); overdue (open, past its due date); upcoming (opens later); waiting (opens after the previous step); locked (not taking part, or a new consent form to sign first)',
  })
  status: StepStatus;
  @ApiProperty({ nullable: true, type: String }) completedAt: string | null;
  @ApiProperty({
    description:
      'Whether the participant finishes this step by entering a code; otherwise a return link or staff mark it done.',
  })
  hasCompletionCode: boolean;
  @ApiProperty({ enum: STEP_VERIFICATIONS }) verification: StepVerification;
  @ApiProperty({ description: "Whether the step is done in the lab's external task, opened through the start route" })
  hasTask: boolean;
  @ApiProperty({
    nullable: true,
    type: String,
    description: 'When the step opens; null while it waits for the previous step',
  })
  opensAt: string | null;
  @ApiProperty({ nullable: true, type: String, description: 'Until when it can be done; null for no due date' }) dueAt:
    string | null;
}

export class StepStartDto {
  @ApiProperty({
    description: 'The external task, with the reference, the signed return address and, for code steps, the code',
  })
  url: string;
}

export class RosterNextStepDto {
  @ApiProperty() stepId: string;
  @ApiProperty() title: string;
  @ApiProperty({ nullable: true, type: String }) opensAt: string | null;
  @ApiProperty({ nullable: true, type: String }) dueAt: string | null;
  @ApiProperty({ enum: ['waiting', 'upcoming', 'open', 'overdue'] }) timing:
    'waiting' | 'upcoming' | 'open' | 'overdue';
}

export class RecordCompletionDto {
  @ApiProperty() id: string;
  @ApiProperty() completedAt: string;
  @ApiProperty({ enum: [...STEP_VERIFICATIONS, 'staff-list'] }) verifiedBy: CompletionVerifiedBy;
  @ApiProperty({ nullable: true, type: String }) recordedByEmail: string | null;
  @ApiProperty({ type: 'object', additionalProperties: true }) evidence: Record<string, unknown>;
  @ApiProperty({
    nullable: true,
    type: String,
    enum: ['owed', 'approved', 'sending', 'paid', 'failed', 'cancelled', 'reversed'],
  })
  payoutStatus: string | null;
  @ApiProperty({ description: 'True while its payout has not been approved' }) canUndo: boolean;
}

export class UndoneCompletionDto {
  @ApiProperty() completedAt: string;
  @ApiProperty() undoneAt: string;
  @ApiProperty() reason: string;
  @ApiProperty({ nullable: true, type: String }) undoneByEmail: string | null;
}

export class RecordStepDto {
  @ApiProperty() stepId: string;
  @ApiProperty() position: number;
  @ApiProperty() title: string;
  @ApiProperty() payMinor: number;
  @ApiProperty({ enum: STEP_VERIFICATIONS }) verification: StepVerification;
  @ApiProperty({ enum: STEP_STATUSES }) status: StepStatus;
  @ApiProperty({ nullable: true, type: String }) opensAt: string | null;
  @ApiProperty({ nullable: true, type: String }) dueAt: string | null;
  @ApiProperty({ type: RecordCompletionDto, nullable: true }) completion: RecordCompletionDto | null;
  @ApiProperty({ type: [UndoneCompletionDto] }) undone: UndoneCompletionDto[];
  @ApiProperty({ nullable: true, type: String, description: "This participant's own code, for participant-code steps" })
  code: string | null;
}

export class UndoCompletionDto {
  @ApiProperty({ description: 'Why the completion is undone; kept in the audit trail' })
  @Transform(trimmed)
  @IsString()
  @Length(5, 1000, { message: 'reason must say in at least 5 characters why the completion is undone' })
  reason: string;
}

export class StepCodeDto {
  @ApiProperty() stepId: string;
  @ApiProperty() position: number;
  @ApiProperty() title: string;
  @ApiProperty() code: string;
}

export class StepCodesDto {
  @ApiProperty() reference: string;
  @ApiProperty({ type: [StepCodeDto] }) items: StepCodeDto[];
}

export class EarnedDto {
  @ApiProperty() earnedMinor: number;
  @ApiProperty() paidMinor: number;
  @ApiProperty() stillToBePaidMinor: number;
}

export class MyEnrollmentDto {
  @ApiProperty() id: string;
  @ApiProperty() reference: string;
  @ApiProperty() studyId: string;
  @ApiProperty() studyTitle: string;
  @ApiProperty() studySlug: string;
  @ApiProperty() currency: string;
  @ApiProperty({ enum: ENROLLMENT_STATUSES }) status: EnrollmentStatus;
  @ApiProperty({ enum: ['screening', 'consent', 're-consent', 'steps', 'done', 'excluded', 'withdrawn'] })
  next: 'screening' | 'consent' | 're-consent' | 'steps' | 'done' | 'excluded' | 'withdrawn';
  @ApiProperty({ type: ScreeningStateDto }) screening: ScreeningStateDto;
  @ApiProperty({ type: ConsentStateDto }) consent: ConsentStateDto;
  @ApiProperty({ type: ParticipantAssignmentDto, nullable: true }) assignment: ParticipantAssignmentDto | null;
  @ApiProperty({ type: [MyStepDto] }) steps: MyStepDto[];
  @ApiProperty({ type: EarnedDto }) earned: EarnedDto;
  @ApiProperty({ nullable: true, type: String }) withdrewAt: string | null;
}

export class SubmitScreeningDto {
  @ApiProperty({
    type: 'object',
    additionalProperties: true,
    description: 'Answer per question key: true/false, a number or an option',
  })
  @IsObject()
  answers: Record<string, number | string | boolean>;
}

export class ScreeningResultDto {
  @ApiProperty() eligible: boolean;
  @ApiProperty({ type: [String] }) reasons: string[];
  @ApiProperty({ type: MyEnrollmentDto }) enrollment: MyEnrollmentDto;
}

export class ReadingSectionDto {
  @ApiProperty() id: string;
  @ApiProperty() heading: string;
  @ApiProperty() html: string;
}

export class ApprovalDto {
  @ApiProperty() reference: string;
  @ApiProperty() approvedAt: string;
}

export class ConsentToSignDto {
  @ApiProperty() versionId: string;
  @ApiProperty() version: number;
  @ApiProperty() fingerprint: string;
  @ApiProperty() readingMinutes: number;
  @ApiProperty() keyInformationHtml: string;
  @ApiProperty({ type: [ReadingSectionDto] }) sections: ReadingSectionDto[];
  @ApiProperty() signatureMeaning: string;
  @ApiProperty({ type: ApprovalDto }) approval: ApprovalDto;
  @ApiProperty({
    type: [String],
    description: 'What changed since the version this person signed, in plain sentences; empty on a first signing',
  })
  changesSinceSigned: string[];
}

export class SignConsentDto {
  @ApiProperty({ format: 'uuid' })
  @IsUUID('4', { message: 'versionId must be the id of a consent version' })
  versionId: string;

  @ApiProperty({ description: 'SHA-256 of the rendered text the person read' })
  @Matches(/^[0-9a-f]{64}$/, { message: 'fingerprint must be 64 lower-case hexadecimal characters' })
  fingerprint: string;

  @ApiProperty({ example: 'Sam Example' })
  @Transform(trimmed)
  @IsString()
  @Length(2, 200, { message: 'typedName must be your full name (2 to 200 characters)' })
  typedName: string;

  @ApiPropertyOptional({ description: 'A drawn mark as a PNG data URL' })
  @IsOptional()
  @IsString()
  @MaxLength(280_000, { message: 'mark is too large (at most about 200 KB)' })
  @Matches(/^data:image\/png;base64,[A-Za-z0-9+/]+=*$/, { message: 'mark must be a PNG image data URL' })
  mark?: string;

  @ApiPropertyOptional({ example: 'Europe/Berlin', description: "The signer's IANA time zone, from the browser" })
  @IsOptional()
  @IsString()
  @MaxLength(64)
  @Matches(/^[A-Za-z_]+(\/[A-Za-z0-9_+-]+)*$/, { message: 'timeZone must be an IANA time zone such as Europe/Berlin' })
  timeZone?: string;
}

export class SignatureResultDto {
  @ApiProperty() signatureId: string;
  @ApiProperty() signedAt: string;
  @ApiProperty({ type: ParticipantAssignmentDto, nullable: true }) assignment: ParticipantAssignmentDto | null;
  @ApiProperty({ type: MyEnrollmentDto }) enrollment: MyEnrollmentDto;
}

export class WithdrawDto {
  @ApiPropertyOptional({ description: 'Optional; never required to withdraw' })
  @IsOptional()
  @Transform(trimmed)
  @IsString()
  @MaxLength(1000)
  reason?: string;
}

export class WithdrawalResultDto {
  @ApiProperty() withdrewAt: string;
  @ApiProperty() earnedMinor: number;
  @ApiProperty() stillToBePaidMinor: number;
  @ApiProperty({ type: MyEnrollmentDto }) enrollment: MyEnrollmentDto;
}

export class RosterQueryDto {
  @ApiPropertyOptional({ enum: ENROLLMENT_STATUSES })
  @IsOptional()
  @IsIn(ENROLLMENT_STATUSES)
  status?: EnrollmentStatus;
  @ApiPropertyOptional({ description: 'E-mail, name or reference' })
  @IsOptional()
  @IsString()
  @MaxLength(200)
  search?: string;
  @ApiPropertyOptional({ description: 'Only people who still need to sign the newest consent version' })
  @IsOptional()
  @Transform(({ value }) => value === true || value === 'true')
  @IsBoolean()
  needsReconsent?: boolean;
  @ApiPropertyOptional({ default: 1 }) @IsOptional() @Type(() => Number) @IsInt() @Min(1) @Max(MAX_PAGE) page: number =
    1;
  @ApiPropertyOptional({ default: 25 }) @IsOptional() @Type(() => Number) @IsInt() @Min(1) @Max(200) pageSize: number =
    25;
}

export class RosterEntryDto {
  @ApiProperty() id: string;
  @ApiProperty() reference: string;
  @ApiProperty() email: string;
  @ApiProperty({ nullable: true, type: String }) name: string | null;
  @ApiProperty({ enum: ENROLLMENT_STATUSES }) status: EnrollmentStatus;
  @ApiProperty({
    nullable: true,
    type: String,
    description: 'Condition code (A, B…), or the internal name once unblinded',
  })
  condition: string | null;
  @ApiProperty({ nullable: true, type: String }) stratumKey: string | null;
  @ApiProperty({ type: 'object', additionalProperties: true }) covariates: Record<string, number | string | null>;
  @ApiProperty() needsReconsent: boolean;
  @ApiProperty({ nullable: true, type: Number }) signedVersion: number | null;
  @ApiProperty({ nullable: true, type: String }) invitationSentAt: string | null;
  @ApiProperty({ nullable: true, type: String }) assignedAt: string | null;
  @ApiProperty() createdAt: string;
  @ApiProperty({
    type: RosterNextStepDto,
    nullable: true,
    description: 'The first step not yet done, with its window; null when none is pending',
  })
  nextStep: RosterNextStepDto | null;
  @ApiProperty({ description: 'Reminders sent since the last step was done (or since assignment)' })
  unansweredReminders: number;
  @ApiProperty({
    description:
      "True when unanswered reminders reached the plan's threshold: Evenhand suggests marking lost to follow-up; staff decide",
  })
  suggestLost: boolean;
}

export class RosterPageDto {
  @ApiProperty({ type: [RosterEntryDto] }) items: RosterEntryDto[];
  @ApiProperty() total: number;
  @ApiProperty() page: number;
  @ApiProperty() pageSize: number;
  @ApiProperty({ type: 'object', additionalProperties: { type: 'number' } }) countsByStatus: Record<string, number>;
}

export class ImportResultDto {
  @ApiProperty() created: number;
  @ApiProperty({ description: 'Rows for people already on the roster; left unchanged' }) alreadyEnrolled: number;
  @ApiProperty({
    type: 'array',
    items: {
      type: 'object',
      properties: { line: { type: 'number' }, field: { type: 'string' }, message: { type: 'string' } },
    },
  })
  errors: Array<{ line: number; field: string; message: string }>;
  @ApiProperty({ type: [String] }) ignoredColumns: string[];
}

export class InviteDto {
  @ApiPropertyOptional({
    type: [String],
    description: 'Enrollments to invite; omit to invite everyone not yet invited',
  })
  @IsOptional()
  @IsArray()
  @ArrayMaxSize(5000)
  @IsUUID('4', { each: true })
  enrollmentIds?: string[];
}

export class CountDto {
  @ApiProperty() count: number;
}

export class MarkLostDto {
  @ApiPropertyOptional() @IsOptional() @Transform(trimmed) @IsString() @MaxLength(1000) reason?: string;
}

export class TimelineEventDto {
  @ApiProperty() at: string;
  @ApiProperty({ description: 'The stored code; people read `name` and `sentence`' }) action: string;
  @ApiProperty({ description: 'Our own short name of the action' }) name: string;
  @ApiProperty() sentence: string;
  @ApiProperty({ nullable: true, type: String }) actorEmail: string | null;
  @ApiProperty({ type: 'object', additionalProperties: true }) data: Record<string, unknown>;
}

export class SignatureSummaryDto {
  @ApiProperty() id: string;
  @ApiProperty() version: number;
  @ApiProperty() signedAt: string;
  @ApiProperty() typedName: string;
  @ApiProperty() meaning: string;
  @ApiProperty() textFingerprint: string;
  @ApiProperty({ nullable: true, type: String }) pdfSha256: string | null;
  @ApiProperty({ nullable: true, type: String }) ip: string | null;
  @ApiProperty({ nullable: true, type: String }) userAgent: string | null;
  @ApiProperty() hasMark: boolean;
}

export class ParticipantRecordDto {
  @ApiProperty({ type: RosterEntryDto }) enrollment: RosterEntryDto;
  @ApiProperty({ nullable: true, type: String }) withdrawalReason: string | null;
  @ApiProperty({
    nullable: true,
    type: String,
    description: 'What staff noted when marking this person lost to follow-up.',
  })
  lostReason: string | null;
  @ApiProperty({ nullable: true, type: String }) exclusionReason: string | null;
  @ApiProperty({ type: [SignatureSummaryDto] }) signatures: SignatureSummaryDto[];
  @ApiProperty({ type: [RecordStepDto] }) steps: RecordStepDto[];
  @ApiProperty({ type: [TimelineEventDto] }) timeline: TimelineEventDto[];
}

export class PairCohortResultDto {
  @ApiProperty({ description: 'People paired (everyone on the roster with a pretest who has not consented yet)' })
  cohort: number;
  @ApiProperty() pairs: number;
  @ApiProperty({ nullable: true, type: String, description: 'The odd one out, assigned by a coin of its own' })
  leftoverEnrollmentId: string | null;
}
