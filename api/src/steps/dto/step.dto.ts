import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { Transform } from 'class-transformer';
import { IsInt, IsOptional, IsString, Length, Max, MaxLength, Min } from 'class-validator';

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
  @ApiProperty({ description: 'Minor units of the study currency; the same in every condition unless overridden' }) payMinor: number;
  @ApiProperty({ description: 'Whether participants confirm this step with a completion code' }) hasCompletionCode: boolean;
  @ApiProperty({ type: [PayOverrideDto], description: 'Recorded exceptions to equal pay; each is flagged in the parity view' })
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
  @ApiProperty({ example: 'WAY-42', description: 'Shown to participants at the end of the external task; stored only as a hash' })
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
