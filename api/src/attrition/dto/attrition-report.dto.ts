import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { IsOptional, IsString, Length } from 'class-validator';

const RATE = 'share between 0 and 1; null when nobody is in the denominator';
const VERDICTS = ['low-attrition', 'high-attrition', 'outside-published-range', 'not-computable'];

export class AttritionQueryDto {
  @ApiPropertyOptional({
    description:
      'The arm the others are compared with (WWC pairs, covariate balance): a condition id, or for a within-subjects study an order id. The first condition when absent.',
  })
  @IsOptional()
  @IsString()
  @Length(1, 2000)
  comparisonConditionId?: string;
}

export class IntervalDto {
  @ApiProperty() lower: number;
  @ApiProperty() upper: number;
}

export class RiskRatioDto {
  @ApiProperty() estimate: number;
  @ApiProperty() lower: number;
  @ApiProperty() upper: number;
}

export class WindowEndedDto {
  @ApiProperty({ description: 'Randomized participants whose participation window has ended' }) randomized: number;
  @ApiProperty({ description: 'Completers among them' }) completed: number;
}

export class ConditionAttritionDto {
  @ApiProperty({ description: 'Condition id; for a within-subjects study the order, as condition ids joined by ">"' })
  conditionId: string;
  @ApiProperty({
    description: 'The code (A, B…) while the study is blinded, else the internal name; orders joined by " → "',
  })
  name: string;
  @ApiProperty() randomized: number;
  @ApiProperty({ description: 'Assigned or active: still in follow-up' }) active: number;
  @ApiProperty() completed: number;
  @ApiProperty() withdrew: number;
  @ApiProperty({ description: 'Lost to follow-up' }) lost: number;
  @ApiProperty() excludedAfterRandomization: number;
  @ApiProperty({
    description: 'Still active when the study closed: did not complete, counted as dropped (countingRule)',
  })
  incompleteAtClose: number;
  @ApiProperty({ description: 'withdrew + lost + excluded after randomization + incomplete at the close' })
  dropped: number;
  @ApiProperty({
    type: Number,
    nullable: true,
    description: `Dropout so far: dropped / randomized, active people counting as not (yet) dropped; ${RATE}`,
  })
  dropoutRateSoFar: number | null;
  @ApiProperty({
    type: Number,
    nullable: true,
    description: `WWC attrition: (randomized − completed) / randomized among those whose window has ended; ${RATE}`,
  })
  attritionRate: number | null;
  @ApiProperty({ description: 'Numerator of attritionRate' }) attrited: number;
  @ApiProperty({ type: IntervalDto, nullable: true, description: '95 % Wilson interval for attritionRate' })
  attritionInterval: IntervalDto | null;
  @ApiProperty({ type: WindowEndedDto }) windowEnded: WindowEndedDto;
}

export class OverallAttritionDto {
  @ApiProperty() randomized: number;
  @ApiProperty() dropped: number;
  @ApiProperty({ type: Number, nullable: true }) dropoutRateSoFar: number | null;
  @ApiProperty() windowEndedRandomized: number;
  @ApiProperty() attrited: number;
  @ApiProperty({ type: Number, nullable: true, description: `Overall WWC attrition; ${RATE}` }) attritionRate:
    number | null;
}

export class WwcBoundaryVerdictDto {
  @ApiProperty({ enum: VERDICTS }) verdict: string;
  @ApiProperty({
    type: Number,
    nullable: true,
    description: 'Highest tolerable differential attrition on the row used, in percentage points',
  })
  maxDifferentialPercent: number | null;
  @ApiProperty({ type: Number, nullable: true, description: 'The table row whose boundary was used (wwcRowRule)' })
  overallPercentRow: number | null;
}

export class WwcPairDto {
  @ApiProperty() conditionId: string;
  @ApiProperty() comparisonConditionId: string;
  @ApiProperty({ type: Number, nullable: true, description: 'Pooled over the two arms of the pair' })
  overallAttritionRate: number | null;
  @ApiProperty({ type: Number, nullable: true }) differentialAttritionRate: number | null;
  @ApiProperty({ type: Number, nullable: true, description: 'Row of the WWC boundary table the cautious verdict used' })
  overallPercentRow: number | null;
  @ApiProperty({
    type: [Number],
    description: 'The rows around the overall rate: one at an exact whole percent, else two (wwcRowRule)',
  })
  overallPercentRows: number[];
  @ApiProperty({ type: WwcBoundaryVerdictDto }) cautious: WwcBoundaryVerdictDto;
  @ApiProperty({ type: WwcBoundaryVerdictDto }) optimistic: WwcBoundaryVerdictDto;
  @ApiProperty({
    type: IntervalDto,
    nullable: true,
    description: '95 % Newcombe interval for the difference in attrition rates (arm minus comparison)',
  })
  differenceInterval: IntervalDto | null;
  @ApiProperty({
    type: RiskRatioDto,
    nullable: true,
    description: 'Attrition risk ratio (arm over comparison) with its 95 % Katz interval',
  })
  riskRatio: RiskRatioDto | null;
}

export class WorstWwcPairsDto {
  @ApiProperty({ type: WwcPairDto, nullable: true }) cautious: WwcPairDto | null;
  @ApiProperty({ type: WwcPairDto, nullable: true }) optimistic: WwcPairDto | null;
}

export class WwcAssessmentDto {
  @ApiProperty({ type: String, nullable: true }) comparisonConditionId: string | null;
  @ApiProperty({ enum: VERDICTS, description: 'Least favourable of every pair of arms under the cautious boundary' })
  cautious: string;
  @ApiProperty({ enum: VERDICTS, description: 'Least favourable of every pair of arms under the optimistic boundary' })
  optimistic: string;
  @ApiProperty({ type: [WwcPairDto], description: 'A view: each other arm against the comparison arm' })
  pairs: WwcPairDto[];
  @ApiProperty({ type: [WwcPairDto], description: 'Every pair of arms' }) allPairs: WwcPairDto[];
  @ApiProperty({ type: WorstWwcPairsDto, description: 'The pair behind each headline' }) worstPair: WorstWwcPairsDto;
}

export class ChiSquareDto {
  @ApiProperty({ enum: ['chi-square'] }) method: 'chi-square';
  @ApiProperty({ type: Number, nullable: true }) statistic: number | null;
  @ApiProperty() df: number;
  @ApiProperty({ type: Number, nullable: true }) pValue: number | null;
  @ApiProperty({ type: 'array', items: { type: 'array', items: { type: 'number' } } }) expected: number[][];
  @ApiProperty({ enum: [false] }) continuityCorrection: false;
  @ApiProperty({ description: 'Some expected count is below 5' }) smallExpectedCounts: boolean;
}

export class FisherExactDto {
  @ApiProperty({ enum: ['fisher-exact'] }) method: 'fisher-exact';
  @ApiProperty() pValueTwoSided: number;
  @ApiProperty() pValueGreater: number;
  @ApiProperty() pValueLess: number;
}

export class ExactTableTestDto {
  @ApiProperty({ enum: ['freeman-halton-exact', 'monte-carlo-exact'] }) method: string;
  @ApiProperty() pValue: number;
  @ApiProperty({ type: Number, nullable: true, description: 'Tables with the observed margins that were listed' })
  tablesEnumerated: number | null;
  @ApiProperty({ type: Number, nullable: true, description: 'Monte Carlo only' }) replicates: number | null;
  @ApiProperty({ type: String, nullable: true, description: 'Monte Carlo only' }) seed: string | null;
  @ApiProperty({ type: Number, nullable: true, description: 'Monte Carlo only: √(p(1 − p)/B)' }) standardError:
    number | null;
}

export class DropoutTestDto {
  @ApiProperty({
    enum: ['chi-square', 'fisher-exact', 'freeman-halton-exact', 'monte-carlo-exact'],
    description:
      "An exact test when an expected count is below 5: Fisher's for two arms, Freeman–Halton (or its Monte Carlo estimate) for more",
  })
  method: string;
  @ApiProperty({ enum: ['small-expected-counts', 'expected-counts-adequate', 'not-computable'] }) reason: string;
  @ApiProperty({ type: Number, nullable: true, description: 'Smallest expected cell count' }) smallestExpected:
    number | null;
  @ApiProperty({ type: Number, nullable: true, description: 'X²; null for the exact tests' }) statistic: number | null;
  @ApiProperty({ type: Number, nullable: true }) df: number | null;
  @ApiProperty({ type: Number, nullable: true }) pValue: number | null;
  @ApiProperty({ enum: [false], description: 'No Yates continuity correction is applied' }) continuityCorrection: false;
  @ApiProperty({
    type: [String],
    description: 'Rows of the arm × dropped / not dropped table: the arms with anyone randomized',
  })
  tableConditionIds: string[];
  @ApiProperty({ type: ChiSquareDto, nullable: true }) chiSquare: ChiSquareDto | null;
  @ApiProperty({ type: FisherExactDto, nullable: true, description: 'Only for two arms' })
  fisherExact: FisherExactDto | null;
  @ApiProperty({
    type: ExactTableTestDto,
    nullable: true,
    description: 'Three or more arms with small expected counts',
  })
  exact: ExactTableTestDto | null;
}

export class SurvivalPointDto {
  @ApiProperty({ description: 'Days since assignment, exact (fractions of a day, not rounded)' }) time: number;
  @ApiProperty({ description: 'Kaplan–Meier share not dropped out just after this time' }) survival: number;
  @ApiProperty({ type: Number, nullable: true }) lower: number | null;
  @ApiProperty({ type: Number, nullable: true }) upper: number | null;
  @ApiProperty({ type: Number, nullable: true, description: 'Greenwood standard error' }) standardError: number | null;
  @ApiProperty() atRisk: number;
  @ApiProperty({ description: 'Dropouts at this time' }) events: number;
  @ApiProperty({ description: 'Completers and still-active participants censored at this time' }) censored: number;
}

export class SurvivalCurveDto {
  @ApiProperty() conditionId: string;
  @ApiProperty() atStart: number;
  @ApiProperty() confidenceLevel: number;
  @ApiProperty({ enum: ['log-log'] }) bandForm: 'log-log';
  @ApiProperty({
    type: Number,
    nullable: true,
    description: 'Median days to dropout; null while the curve stays above 0.5',
  })
  median: number | null;
  @ApiProperty({ type: [SurvivalPointDto], description: 'Survival is 1 before the first point' })
  points: SurvivalPointDto[];
}

export class LogRankGroupDto {
  @ApiProperty() conditionId: string;
  @ApiProperty() observed: number;
  @ApiProperty() expected: number;
}

export class LogRankPermutationDto {
  @ApiProperty() pValue: number;
  @ApiProperty() replicates: number;
  @ApiProperty() standardError: number;
  @ApiProperty() seed: string;
}

export class LogRankDto {
  @ApiProperty({ enum: ['log-rank'] }) method: 'log-rank';
  @ApiProperty({ type: Number, nullable: true }) statistic: number | null;
  @ApiProperty() df: number;
  @ApiProperty({ type: Number, nullable: true, description: 'Asymptotic (chi-square) p' }) pValue: number | null;
  @ApiProperty({ type: [LogRankGroupDto] }) groups: LogRankGroupDto[];
  @ApiProperty({ description: 'Some arm expects fewer than 5 dropouts: the asymptotic p is doubtful' })
  fewEvents: boolean;
  @ApiProperty({
    type: LogRankPermutationDto,
    nullable: true,
    description: 'Seeded Monte Carlo permutation test, when events are few',
  })
  permutation: LogRankPermutationDto | null;
  @ApiProperty({ type: String, nullable: true, enum: ['too-many-participants'] }) permutationSkipped: string | null;
}

export class HazardRatioDto {
  @ApiProperty() conditionId: string;
  @ApiProperty({ type: Number, nullable: true, description: 'log hazard ratio against the comparison condition' })
  coefficient: number | null;
  @ApiProperty({ type: Number, nullable: true }) standardError: number | null;
  @ApiProperty({
    type: Number,
    nullable: true,
    description: 'Hazard of dropping out, this condition over the comparison',
  })
  hazardRatio: number | null;
  @ApiProperty({ type: Number, nullable: true, description: 'Wald interval exp(β ± z·SE)' }) lower: number | null;
  @ApiProperty({ type: Number, nullable: true }) upper: number | null;
  @ApiProperty({ type: Number, nullable: true, description: 'Wald test of equal hazards' }) pValue: number | null;
  @ApiProperty({
    type: String,
    nullable: true,
    enum: ['nobody-randomized', 'no-dropouts', 'comparison-has-no-dropouts', 'did-not-converge', 'infinite-estimate'],
  })
  notEstimable: string | null;
}

export class CoxModelDto {
  @ApiProperty({ enum: ['cox-proportional-hazards'] }) method: 'cox-proportional-hazards';
  @ApiProperty({ enum: ['efron', 'breslow'], description: 'How tied dropout times are handled' }) ties: string;
  @ApiProperty() comparisonConditionId: string;
  @ApiProperty() confidenceLevel: number;
  @ApiProperty({ type: [HazardRatioDto], description: 'Each other condition against the comparison condition' })
  hazardRatios: HazardRatioDto[];
  @ApiProperty({ description: 'Newton–Raphson iterations' }) iterations: number;
  @ApiProperty() converged: boolean;
  @ApiProperty({ type: Number, nullable: true, description: 'Log partial likelihood at the estimate' }) logLikelihood:
    number | null;
}

export class CumulativeDropoutDto {
  @ApiProperty({ description: '1 − S(t), Kaplan–Meier' }) cumulative: number;
  @ApiProperty({ type: Number, nullable: true }) lower: number | null;
  @ApiProperty({ type: Number, nullable: true }) upper: number | null;
}

export class PlannedLengthConditionDto {
  @ApiProperty() conditionId: string;
  @ApiProperty({
    type: CumulativeDropoutDto,
    nullable: true,
    description: 'Null while follow-up does not reach the planned length',
  })
  cumulative: CumulativeDropoutDto | null;
  @ApiProperty({ type: Number, nullable: true, description: 'Longest follow-up so far, days' }) longestFollowUp:
    number | null;
}

export class PlannedLengthDto {
  @ApiProperty({
    type: Number,
    nullable: true,
    description: 'Last due day of the schedule when every step is done on its due day',
  })
  days: number | null;
  @ApiProperty({ type: String, nullable: true, enum: ['no-steps', 'a-step-has-no-due-date'] }) unknown: string | null;
  @ApiProperty({ type: [PlannedLengthConditionDto] }) conditions: PlannedLengthConditionDto[];
}

export class SurvivalDto {
  @ApiProperty({ enum: ['days'] }) timeUnit: 'days';
  @ApiProperty({
    description: 'When still-active participants are censored (now, or when the study closed)',
    format: 'date-time',
  })
  censoredAt: string;
  @ApiProperty({ type: [SurvivalCurveDto] }) curves: SurvivalCurveDto[];
  @ApiProperty({ type: LogRankDto }) logRank: LogRankDto;
  @ApiProperty({
    type: CoxModelDto,
    description: 'Cox proportional-hazards hazard ratios against the comparison condition',
  })
  cox: CoxModelDto;
  @ApiProperty({ type: PlannedLengthDto, description: 'Cumulative dropout at the planned study length' })
  plannedLength: PlannedLengthDto;
}

export class CochranMantelHaenszelDto {
  @ApiProperty({ enum: ['cochran-mantel-haenszel'] }) method: 'cochran-mantel-haenszel';
  @ApiProperty({ type: Number, nullable: true }) statistic: number | null;
  @ApiProperty() df: number;
  @ApiProperty({ type: Number, nullable: true }) pValue: number | null;
  @ApiProperty({ description: 'Strata that carried information' }) strataUsed: number;
}

export class StratifiedLogRankDto {
  @ApiProperty({ enum: ['stratified-log-rank'] }) method: 'stratified-log-rank';
  @ApiProperty({ type: Number, nullable: true }) statistic: number | null;
  @ApiProperty() df: number;
  @ApiProperty({ type: Number, nullable: true }) pValue: number | null;
  @ApiProperty({ type: [LogRankGroupDto], description: 'Summed over strata' }) groups: LogRankGroupDto[];
  @ApiProperty({ description: 'Strata in which someone dropped out' }) strataUsed: number;
}

export class StratifiedDto {
  @ApiProperty({
    type: [String],
    description: 'Randomization strata keys (factor=level joined by "|"); "(none recorded)" for a missing key',
  })
  strata: string[];
  @ApiProperty({ description: 'False with fewer than two strata: nothing to stratify by' }) stratified: boolean;
  @ApiProperty({
    type: CochranMantelHaenszelDto,
    nullable: true,
    description: 'Dropped / not dropped by condition within strata',
  })
  cmh: CochranMantelHaenszelDto | null;
  @ApiProperty({
    type: StratifiedLogRankDto,
    nullable: true,
    description: 'Time to dropout by condition within strata',
  })
  logRank: StratifiedLogRankDto | null;
}

export class PaySummaryDto {
  @ApiProperty() n: number;
  @ApiProperty({ type: Number, nullable: true, description: 'Mean in minor units' }) mean: number | null;
  @ApiProperty({ type: Number, nullable: true }) standardDeviation: number | null;
}

export class ConditionPayDto {
  @ApiProperty() conditionId: string;
  @ApiProperty({ type: PaySummaryDto, description: 'Over every randomized participant, unpaid ones counting as 0' })
  perRandomized: PaySummaryDto;
  @ApiProperty({ type: PaySummaryDto }) perCompleter: PaySummaryDto;
}

export class WelchAnovaDto {
  @ApiProperty({ enum: ['welch-anova'] }) method: 'welch-anova';
  @ApiProperty({ type: Number, nullable: true }) statistic: number | null;
  @ApiProperty({ type: Number, nullable: true }) df1: number | null;
  @ApiProperty({ type: Number, nullable: true }) df2: number | null;
  @ApiProperty({ type: Number, nullable: true }) pValue: number | null;
  @ApiProperty({ type: [String] }) conditionIdsTested: string[];
  @ApiProperty({
    type: String,
    nullable: true,
    enum: ['fewer-than-two-conditions-with-two-or-more-participants', 'no-variation-within-a-condition'],
  })
  notComputable: string | null;
}

export class MeanDifferenceDto {
  @ApiProperty() conditionId: string;
  @ApiProperty() comparisonConditionId: string;
  @ApiProperty({ enum: ['welch-t'] }) method: 'welch-t';
  @ApiProperty({ type: Number, nullable: true, description: 'Mean of the condition minus the comparison, minor units' })
  difference: number | null;
  @ApiProperty() confidenceLevel: number;
  @ApiProperty({ type: Number, nullable: true }) lower: number | null;
  @ApiProperty({ type: Number, nullable: true }) upper: number | null;
  @ApiProperty({ type: Number, nullable: true, description: 'Welch–Satterthwaite degrees of freedom' }) df:
    number | null;
  @ApiProperty({ type: Number, nullable: true }) standardError: number | null;
  @ApiProperty({
    type: String,
    nullable: true,
    enum: ['fewer-than-two-in-a-condition', 'no-variation-in-either-condition'],
  })
  notComputable: string | null;
}

export class PayComparisonDto {
  @ApiProperty({ type: Number, nullable: true, description: 'Largest minus smallest arm mean, minor units' })
  largestMeanDifference: number | null;
  @ApiProperty({ type: WelchAnovaDto, description: "Welch's ANOVA: equal mean pay without assuming equal variances" })
  test: WelchAnovaDto;
  @ApiProperty({
    type: [MeanDifferenceDto],
    description: "Each other arm's mean minus the comparison arm's, with a 95 % Welch t interval",
  })
  differences: MeanDifferenceDto[];
}

export class PayBasisDto {
  @ApiProperty({ type: [ConditionPayDto] }) conditions: ConditionPayDto[];
  @ApiProperty({ type: PayComparisonDto }) perRandomized: PayComparisonDto;
  @ApiProperty({ type: PayComparisonDto }) perCompleter: PayComparisonDto;
}

export class PayParityDto {
  @ApiProperty({ description: 'ISO 4217; amounts are minor units of it' }) currency: string;
  @ApiProperty({ description: 'A per-condition pay override is recorded, so unequal pay may be by design' })
  payOverrideRecorded: boolean;
  @ApiProperty({ type: PayBasisDto, description: 'Payouts with status paid' }) paid: PayBasisDto;
  @ApiProperty({ type: PayBasisDto, description: 'Owed, approved, sending or paid' }) earned: PayBasisDto;
}

export class StandardizedDifferenceDto {
  @ApiProperty({ type: Number, nullable: true }) d: number | null;
  @ApiProperty({
    type: Number,
    nullable: true,
    description: '|d| that re-randomizing the same people exceeds 5 % of the time',
  })
  chanceRange: number | null;
  @ApiProperty({ type: Boolean, nullable: true, description: '|d| beyond chanceRange' }) imbalanced: boolean | null;
  @ApiPropertyOptional({
    type: Number,
    nullable: true,
    description: 'Continuous only: variance ratio, condition over comparison',
  })
  varianceRatio?: number | null;
  @ApiPropertyOptional({
    type: [Number],
    nullable: true,
    description: '95 % range of the ratio under equal variances (F distribution)',
  })
  varianceRatioRange?: [number, number] | null;
  @ApiPropertyOptional({ type: Boolean, nullable: true }) varianceRatioImbalanced?: boolean | null;
}

export class CovariateBalanceRowDto {
  @ApiProperty({ description: 'A numeric covariate key, or key=category for one category of a categorical covariate' })
  covariate: string;
  @ApiProperty({ enum: ['continuous', 'binary'] }) kind: string;
  @ApiProperty() conditionId: string;
  @ApiProperty() comparisonConditionId: string;
  @ApiProperty({ type: StandardizedDifferenceDto }) allRandomized: StandardizedDifferenceDto;
  @ApiProperty({ type: StandardizedDifferenceDto }) completers: StandardizedDifferenceDto;
}

export class ReasonCountDto {
  @ApiProperty({ type: String, nullable: true, description: 'Null when no reason was recorded' }) reason: string | null;
  @ApiProperty() count: number;
}

export class FlowBoxDto {
  @ApiProperty() total: number;
  @ApiProperty({ type: [ReasonCountDto], description: 'At most 10, most frequent first' }) reasons: ReasonCountDto[];
  @ApiProperty({ description: 'Participants whose reason is not listed' }) otherReasons: number;
}

export class AwaitingRandomizationDto {
  @ApiProperty() total: number;
  @ApiProperty() invited: number;
  @ApiProperty() screened: number;
  @ApiProperty() consented: number;
}

export class ArmFlowDto {
  @ApiProperty() conditionId: string;
  @ApiProperty() name: string;
  @ApiProperty() allocated: number;
  @ApiProperty({ description: 'Still active while the study runs; 0 once it is closed' }) stillInFollowUp: number;
  @ApiProperty({ description: 'Still active when the study closed: did not complete' }) incompleteAtClose: number;
  @ApiProperty({ type: FlowBoxDto }) withdrew: FlowBoxDto;
  @ApiProperty({ type: FlowBoxDto }) lostToFollowUp: FlowBoxDto;
  @ApiProperty({ type: FlowBoxDto }) excludedAfterRandomization: FlowBoxDto;
  @ApiProperty({ description: 'Analysed by intention to treat: everyone allocated' }) analysed: number;
  @ApiProperty({ description: 'Completers: participants with complete outcome data' }) completers: number;
}

export class ConsortFlowDto {
  @ApiProperty({ description: 'Everyone who joined or was imported' }) assessedForEligibility: number;
  @ApiProperty({ type: FlowBoxDto }) excludedBeforeRandomization: FlowBoxDto;
  @ApiProperty({ type: AwaitingRandomizationDto }) awaitingRandomization: AwaitingRandomizationDto;
  @ApiProperty() randomized: number;
  @ApiProperty({ type: [ArmFlowDto] }) arms: ArmFlowDto[];
}

export class ConditionContactsDto {
  @ApiProperty() conditionId: string;
  @ApiProperty() name: string;
  @ApiProperty({ description: 'Randomized participants' }) participants: number;
  @ApiProperty({ description: 'Contacts after randomization: reminders, re-consent requests and staff messages' })
  contacts: number;
  @ApiProperty({ type: Number, nullable: true }) meanPerParticipant: number | null;
  @ApiProperty() reminders: number;
  @ApiProperty() reconsentRequests: number;
  @ApiProperty() staffMessages: number;
}

export class ContactsByConditionDto {
  @ApiProperty({ type: [ConditionContactsDto] }) conditions: ConditionContactsDto[];
  @ApiProperty({
    type: Number,
    nullable: true,
    description: 'Largest minus smallest arm mean, contacts per participant',
  })
  largestMeanDifference: number | null;
  @ApiProperty({ type: WelchAnovaDto, description: "Welch's ANOVA: equal mean contacts per participant" })
  test: WelchAnovaDto;
}

export class AttritionReportDto {
  @ApiProperty() studyId: string;
  @ApiProperty({
    enum: ['between', 'within'],
    description: 'Within-subjects studies are reported by order: each order is an arm',
  })
  design: string;
  @ApiProperty({ enum: ['draft', 'recruiting', 'paused', 'closed'] }) studyStatus: string;
  @ApiProperty({ format: 'date-time' }) computedAt: string;
  @ApiProperty({ description: 'Condition names are hidden: `name` is the code' }) blinded: boolean;
  @ApiProperty({ description: 'How the participation window is decided' }) windowRule: string;
  @ApiProperty({ description: 'How people still active are counted, the same in every panel and the export' })
  countingRule: string;
  @ApiProperty({ description: 'How an overall rate finds its row of the WWC boundary table' }) wwcRowRule: string;
  @ApiProperty({ description: 'Why p-value alerts use a stricter level before the planned size is reached' })
  repeatedLooks: string;
  @ApiProperty({ type: Number, nullable: true, description: "The study's planned number of participants" })
  plannedSize: number | null;
  @ApiProperty({ type: [String] }) cautions: string[];
  @ApiProperty({ type: [ConditionAttritionDto] }) conditions: ConditionAttritionDto[];
  @ApiProperty({ type: OverallAttritionDto }) overall: OverallAttritionDto;
  @ApiProperty({ type: Number, nullable: true, description: 'Largest minus smallest arm attritionRate' })
  differentialAttrition: number | null;
  @ApiProperty({ type: WwcAssessmentDto }) wwc: WwcAssessmentDto;
  @ApiProperty({ type: DropoutTestDto }) dropoutTest: DropoutTestDto;
  @ApiProperty({ type: SurvivalDto }) survival: SurvivalDto;
  @ApiProperty({ type: StratifiedDto, description: 'Dropout tests within the randomization strata' })
  stratified: StratifiedDto;
  @ApiProperty({ type: PayParityDto }) payParity: PayParityDto;
  @ApiProperty({ type: [CovariateBalanceRowDto] }) covariateBalance: CovariateBalanceRowDto[];
  @ApiProperty({ type: ConsortFlowDto }) flow: ConsortFlowDto;
  @ApiProperty({
    type: ContactsByConditionDto,
    description: 'Whether every condition was reminded and contacted alike',
  })
  contacts: ContactsByConditionDto;
}
