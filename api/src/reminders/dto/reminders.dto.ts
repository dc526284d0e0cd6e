import { ApiProperty } from '@nestjs/swagger';
import { Transform, Type } from 'class-transformer';
import {
  ArrayMaxSize,
  IsArray,
  IsBoolean,
  IsIn,
  IsInt,
  IsString,
  Length,
  Max,
  Min,
  ValidateNested,
} from 'class-validator';
import type { ContactKind } from '../entities/contact.entity';

const trimmed = ({ value }: { value: unknown }) => (typeof value === 'string' ? value.trim() : value);
export const CONTACT_KINDS: ContactKind[] = ['invitation', 'reminder', 'reconsent-request', 'staff-message'];

export class ReminderRuleDto {
  @ApiProperty({
    enum: ['opens', 'due'],
    description: 'Counted from the day the step opens, or back from its due date',
  })
  @IsIn(['opens', 'due'], { message: 'anchor must be opens or due' })
  anchor: 'opens' | 'due';

  @ApiProperty({ minimum: 0, maximum: 60, description: 'Days after opening, or days before the due date' })
  @IsInt({ message: 'days must be a whole number' })
  @Min(0)
  @Max(60)
  days: number;
}

export class ReminderPlanDto {
  @ApiProperty({ type: [ReminderRuleDto] }) rules: ReminderRuleDto[];
  @ApiProperty() suggestLostAfter: number;
  @ApiProperty() enabled: boolean;
  @ApiProperty({ nullable: true, type: String }) updatedAt: string | null;
  @ApiProperty({ description: 'The reminder e-mail as participants receive it, filled in for the first step' })
  previewSubject: string;
  @ApiProperty() previewText: string;
}

export class SaveReminderPlanDto {
  @ApiProperty({ type: [ReminderRuleDto], description: 'The same rules apply to every participant in every condition' })
  @IsArray()
  @ArrayMaxSize(10, { message: 'rules can list at most 10 reminders per step' })
  @ValidateNested({ each: true })
  @Type(() => ReminderRuleDto)
  rules: ReminderRuleDto[];

  @ApiProperty({ minimum: 1, maximum: 50 })
  @IsInt({ message: 'suggestLostAfter must be a whole number of reminders' })
  @Min(1)
  @Max(50)
  suggestLostAfter: number;

  @ApiProperty()
  @IsBoolean({ message: 'enabled must be true or false' })
  enabled: boolean;
}

export class ContactDto {
  @ApiProperty() id: string;
  @ApiProperty({ enum: CONTACT_KINDS }) kind: ContactKind;
  @ApiProperty() sentAt: string;
  @ApiProperty() subject: string;
  @ApiProperty({ nullable: true, type: String }) stepTitle: string | null;
  @ApiProperty({ nullable: true, type: String }) sentByEmail: string | null;
}

export class ContactLogDto {
  @ApiProperty({ type: [ContactDto] }) items: ContactDto[];
  @ApiProperty({ description: 'Reminders since the last step was done (or since assignment)' })
  unansweredReminders: number;
  @ApiProperty() suggestLostAfter: number;
  @ApiProperty() suggestLost: boolean;
}

export class SendStaffMessageDto {
  @ApiProperty({ example: 'Your next session' })
  @Transform(trimmed)
  @IsString()
  @Length(1, 200, { message: 'subject is required (at most 200 characters)' })
  subject: string;

  @ApiProperty()
  @Transform(trimmed)
  @IsString()
  @Length(1, 5000, { message: 'message is required (at most 5,000 characters)' })
  message: string;
}
