import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { Transform } from 'class-transformer';
import {
  ArrayMaxSize,
  ArrayMinSize,
  IsArray,
  IsIn,
  IsInt,
  IsOptional,
  IsString,
  IsUrl,
  Length,
  Max,
  MaxLength,
  Min,
  ValidateIf,
} from 'class-validator';
import { STEP_VERIFICATIONS, type StepOpensFrom, type StepVerification } from '../step-window';

const trimmed = ({ value }: { value: unknown }) => (typeof value === 'string' ? value.trim() : value);

export class PayOverrideDto {
  @ApiProperty({ format: 'uuid' }) conditionId: string;
  @ApiProperty({ description: 'Minor units' }) payMinor: number;
  @ApiProperty() reason: string;
  @ApiProperty({ format: 'date-time' }) recordedAt: string;
}

export class StepDto {
  @ApiProperty({ format: 'uuid' }) id: string;
  @ApiProperty() position: number;
  @ApiProperty() title: string;
  @ApiProperty() description: string;
  @ApiProperty({ description: 'Minor units of the study currency; the same in every condition unless overridden' })
  payMinor: number;
  @ApiProperty({ description: 'Whether a code shared by everyone has been set for this step' })
  hasCompletionCode: boolean;
  @ApiProperty({ enum: STEP_VERIFICATIONS, description: 'How a completion is checked' }) verification: StepVerification;
  @ApiProperty({ nullable: true, type: String, description: "The lab's external task, for return-link steps" })
  taskUrl: string | null;
  @ApiProperty({ description: 'Days after assignment or after the previous step at which the step opens' })
  opensAfterDays: number;
  @ApiProperty({ enum: ['assignment', 'previous-step'] }) opensFrom: StepOpensFrom;
  @ApiProperty({
    nullable: true,
    type: Number,
    description: 'Days after opening by which it is due; null for no due date',
  })
  dueWithinDays: number | null;
  @ApiProperty({
    type: [PayOverrideDto],
    description: 'Recorded exceptions to equal pay; each is flagged in the parity view',
  })
  payOverrides: PayOverrideDto[];
}

export class StepListDto {
  @ApiProperty({ type: [StepDto] }) items: StepDto[];
  @ApiProperty() currency: string;
  @ApiProperty({ description: 'Sum of every step at its base pay' }) totalPayMinor: number;
  @ApiProperty({ description: 'True when any step pays differently in some condition' }) hasPayOverrides: boolean;
}

export class CreateStepDto {
  @ApiProperty({ example: 'Session 1: learning the route' })
  @Transform(trimmed)
  @IsString()
  @Length(1, 200, { message: 'title is required (at most 200 characters)' })
  title: string;

  @ApiPropertyOptional()
  @IsOptional()
  @IsString()
  @MaxLength(4000)
  description?: string;

  @ApiProperty({ description: 'Minor units, e.g. 1500 for 15.00', minimum: 0 })
  @IsInt({ message: 'payMinor must be a whole number of minor units (cents)' })
  @Min(0)
  @Max(100_000_000)
  payMinor: number;

  @ApiPropertyOptional({ description: 'Where the step goes; default last' })
  @IsOptional()
  @IsInt()
  @Min(1)
  position?: number;
}

export class UpdateStepDto {
  @ApiPropertyOptional() @IsOptional() @Transform(trimmed) @IsString() @Length(1, 200) title?: string;
  @ApiPropertyOptional() @IsOptional() @IsString() @MaxLength(4000) description?: string;
  @ApiPropertyOptional()
  @IsOptional()
  @IsInt({ message: 'payMinor must be a whole number of minor units (cents)' })
  @Min(0)
  @Max(100_000_000)
  payMinor?: number;
}

export class SetPayOverrideDto {
  @ApiProperty({ minimum: 0 })
  @IsInt({ message: 'payMinor must be a whole number of minor units (cents)' })
  @Min(0)
  @Max(100_000_000)
  payMinor: number;

  @ApiProperty({ description: 'Why this condition is paid differently; kept in the record and shown with the flag' })
  @Transform(trimmed)
  @IsString()
  @Length(10, 1000, { message: 'reason must explain the exception in at least 10 characters' })
  reason: string;
}

export class SetCompletionCodeDto {
  @ApiProperty({
    example: 'WAY-42',
    description: 'Shown to participants at the end of the external task; stored only as a hash',
  })
  @Transform(trimmed)
  @IsString()
  @Length(4, 64, { message: 'code must be 4 to 64 characters' })
  code: string;
}

export class CompleteStepDto {
  @ApiProperty({ example: 'WAY-42', description: 'The code shown at the end of the task' })
  @Transform(trimmed)
  @IsString()
  @Length(1, 64, { message: 'code is required' })
  code: string;
}

/** How a step is verified and when it can be done. */
export class StepSettingsDto {
  @ApiProperty({ enum: STEP_VERIFICATIONS })
  @IsIn(STEP_VERIFICATIONS, { message: `verification must be one of ${STEP_VERIFICATIONS.join(', ')}` })
  verification: StepVerification;

  @ApiPropertyOptional({
    nullable: true,
    type: String,
    example: 'https://tasks.example.org/wayfinding/session-1',
    description: 'Required for return-link steps',
  })
  @ValidateIf((o: StepSettingsDto) => o.taskUrl !== null && o.taskUrl !== undefined)
  @IsString()
  @MaxLength(2000)
  @IsUrl(
    { protocols: ['http', 'https'], require_protocol: true, require_tld: false },
    { message: 'taskUrl must be a web address starting with http:// or https://' },
  )
  taskUrl?: string | null;

  @ApiProperty({ minimum: 0, maximum: 3650 })
  @IsInt({ message: 'opensAfterDays must be a whole number of days' })
  @Min(0)
  @Max(3650)
  opensAfterDays: number;

  @ApiProperty({ enum: ['assignment', 'previous-step'] })
  @IsIn(['assignment', 'previous-step'], { message: 'opensFrom must be assignment or previous-step' })
  opensFrom: StepOpensFrom;

  @ApiPropertyOptional({
    nullable: true,
    type: Number,
    minimum: 0,
    maximum: 3650,
    description: 'Null or absent for no due date',
  })
  @ValidateIf((o: StepSettingsDto) => o.dueWithinDays !== null && o.dueWithinDays !== undefined)
  @IsInt({ message: 'dueWithinDays must be a whole number of days' })
  @Min(0)
  @Max(3650)
  dueWithinDays?: number | null;

  @ApiPropertyOptional({
    description: 'For shared-code steps: sets or replaces the code everyone types; stored only as a hash',
  })
  @IsOptional()
  @Transform(trimmed)
  @IsString()
  @Length(4, 64, { message: 'sharedCode must be 4 to 64 characters' })
  sharedCode?: string;
}

export class ReturnLinkParameterDto {
  @ApiProperty() name: string;
  @ApiProperty() meaning: string;
}

/** What a lab pastes into its external task so participants come back to Evenhand. */
export class ReturnLinkSetupDto {
  @ApiProperty({ description: 'The return address with {token} where the token passed to the task goes' })
  returnAddressTemplate: string;
  @ApiProperty({ type: [ReturnLinkParameterDto], description: 'What Evenhand adds to the task address' })
  parameters: ReturnLinkParameterDto[];
  @ApiProperty({ description: 'Which return key signs new links' }) keyId: number;
  @ApiProperty({ nullable: true, type: String }) rotatedAt: string | null;
  @ApiProperty({ description: 'Days links signed with the previous key keep working after a rotation' })
  graceDays: number;
  @ApiProperty({
    description: 'Days a return link stays valid after its step is due (or after it was issued, with no due date)',
  })
  validDays: number;
}

export class BulkCompletionDto {
  @ApiProperty({
    type: [String],
    description: 'Participant references, one per line as pasted or uploaded',
    example: ['P-ABC234', 'P-XYZ789'],
  })
  @IsArray()
  @ArrayMinSize(1, { message: 'references must list at least one participant reference' })
  @ArrayMaxSize(5000)
  @IsString({ each: true })
  @MaxLength(200, { each: true })
  references: string[];
}

export class BulkCompletionRowDto {
  @ApiProperty({ description: 'Line in the list, from 1' }) line: number;
  @ApiProperty() reference: string;
  @ApiProperty({ enum: ['completed', 'already-done', 'failed'] }) outcome: 'completed' | 'already-done' | 'failed';
  @ApiProperty({ nullable: true, type: String }) message: string | null;
}

export class BulkCompletionResultDto {
  @ApiProperty() completed: number;
  @ApiProperty() alreadyDone: number;
  @ApiProperty() failed: number;
  @ApiProperty({ type: [BulkCompletionRowDto] }) rows: BulkCompletionRowDto[];
}
