import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { Type } from 'class-transformer';
import {
  IsBoolean,
  IsDefined,
  IsIn,
  IsInt,
  IsNumber,
  IsOptional,
  IsString,
  Length,
  Max,
  Min,
  ValidateNested,
} from 'class-validator';

export class DifferentialAttritionRuleDto {
  @ApiProperty({ description: 'E-mail when differential attrition is above the cautious WWC boundary' })
  @IsBoolean()
  enabled: boolean;

  @ApiPropertyOptional({
    type: String,
    nullable: true,
    description: 'Arm the others are compared with; the first condition when null',
  })
  @IsOptional()
  @IsString()
  @Length(1, 2000)
  comparisonConditionId?: string | null;
}

export class LogRankRuleDto {
  @ApiProperty({ description: 'E-mail when the log-rank p-value of time to dropout falls below pValueBelow' })
  @IsBoolean()
  enabled: boolean;

  @ApiProperty({ minimum: 0.0001, maximum: 0.5, example: 0.05 })
  @IsNumber({ allowNaN: false, allowInfinity: false }, { message: 'pValueBelow must be a number' })
  @Min(0.0001)
  @Max(0.5)
  pValueBelow: number;
}

export class PayDifferenceRuleDto {
  @ApiProperty({
    description: 'E-mail when mean pay per randomized participant differs between conditions by more than amountMinor',
  })
  @IsBoolean()
  enabled: boolean;

  @ApiProperty({ description: 'Minor units of the study currency', example: 500 })
  @IsInt({ message: 'amountMinor must be a whole number of minor units' })
  @Min(0)
  @Max(1_000_000_000)
  amountMinor: number;

  @ApiProperty({
    enum: ['paid', 'earned'],
    description: 'paid: payouts with status paid; earned: also owed, approved and sending',
  })
  @IsIn(['paid', 'earned'], { message: 'basis must be paid or earned' })
  basis: 'paid' | 'earned';
}

export class PutAttritionAlertsDto {
  @ApiProperty({ type: DifferentialAttritionRuleDto })
  @IsDefined()
  @ValidateNested()
  @Type(() => DifferentialAttritionRuleDto)
  differentialAttrition: DifferentialAttritionRuleDto;

  @ApiProperty({ type: LogRankRuleDto })
  @IsDefined()
  @ValidateNested()
  @Type(() => LogRankRuleDto)
  logRank: LogRankRuleDto;

  @ApiProperty({ type: PayDifferenceRuleDto })
  @IsDefined()
  @ValidateNested()
  @Type(() => PayDifferenceRuleDto)
  payDifference: PayDifferenceRuleDto;
}

export class AlertStateDto {
  @ApiProperty({ description: 'Above the threshold at the last evaluation; no new e-mail until it goes back below' })
  crossed: boolean;
  @ApiProperty({ type: Number, nullable: true }) lastValue: number | null;
  @ApiProperty({ type: Number, nullable: true }) lastThreshold: number | null;
  @ApiProperty({ type: String, nullable: true, format: 'date-time' }) evaluatedAt: string | null;
  @ApiProperty({ type: String, nullable: true, format: 'date-time' }) crossedAt: string | null;
  @ApiProperty({ type: String, nullable: true, format: 'date-time' }) notifiedAt: string | null;
  @ApiProperty({ description: 'How many times it has crossed since the rule was last changed' }) crossings: number;
}

export class DifferentialAttritionAlertDto {
  @ApiProperty() enabled: boolean;
  @ApiProperty({ type: String, nullable: true }) comparisonConditionId: string | null;
  @ApiProperty({ type: AlertStateDto }) state: AlertStateDto;
}

export class LogRankAlertDto {
  @ApiProperty() enabled: boolean;
  @ApiProperty() pValueBelow: number;
  @ApiProperty({ type: AlertStateDto }) state: AlertStateDto;
}

export class PayDifferenceAlertDto {
  @ApiProperty() enabled: boolean;
  @ApiProperty() amountMinor: number;
  @ApiProperty({ enum: ['paid', 'earned'] }) basis: 'paid' | 'earned';
  @ApiProperty() currency: string;
  @ApiProperty({ type: AlertStateDto }) state: AlertStateDto;
}

export class AttritionAlertsDto {
  @ApiProperty() studyId: string;
  @ApiProperty({ description: 'How often the rules are evaluated, in minutes' }) evaluatedEveryMinutes: number;
  @ApiProperty({ description: 'The screen the e-mails link to' }) watchUrl: string;
  @ApiProperty({ type: DifferentialAttritionAlertDto }) differentialAttrition: DifferentialAttritionAlertDto;
  @ApiProperty({ type: LogRankAlertDto }) logRank: LogRankAlertDto;
  @ApiProperty({ type: PayDifferenceAlertDto }) payDifference: PayDifferenceAlertDto;
}
