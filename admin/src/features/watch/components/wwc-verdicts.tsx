import { Badge } from '@/components/ui/badge';
import { SelectField } from '@/components/ui/select-field';
import type { AttritionReport, WwcPair } from '../api/get-attrition-report';
import {
  asWwcVerdict,
  dropoutTestSentence,
  formatPoints,
  formatPointsInterval,
  formatShare,
  wwcVerdictDetail,
  wwcVerdictSentence,
  type WwcBoundary,
  type WwcVerdict,
} from '../utils/watch-format';

const tone = (verdict: WwcVerdict) =>
  verdict === 'low-attrition' ? 'success' : verdict === 'not-computable' ? 'neutral' : 'danger';
const badgeText = (verdict: WwcVerdict) =>
  verdict === 'low-attrition'
    ? 'Low attrition'
    : verdict === 'high-attrition'
      ? 'High attrition'
      : verdict === 'not-computable'
        ? 'Not yet'
        : 'Outside the table';

function pairName(pair: WwcPair, names: Map<string, string>): string {
  return `${names.get(pair.conditionId) ?? '?'} vs ${names.get(pair.comparisonConditionId) ?? '?'}`;
}

function VerdictCard({
  boundary,
  verdict,
  pair,
  names,
}: {
  boundary: WwcBoundary;
  verdict: WwcVerdict;
  pair: WwcPair | null;
  names: Map<string, string>;
}) {
  const side = pair ? pair[boundary] : undefined;
  return (
    <div className="flex flex-col gap-1 rounded-md border border-line bg-canvas px-3 py-2.5">
      <div className="flex items-start justify-between gap-2">
        <p className="text-base font-semibold text-ink">{wwcVerdictSentence(verdict, boundary)}</p>
        <Badge tone={tone(verdict)}>{badgeText(verdict)}</Badge>
      </div>
      {pair && side && (
        <p className="text-sm text-ink-muted" data-testid={`worst-pair-${boundary}`}>
          <span className="font-semibold text-ink">{pairName(pair, names)}:</span>{' '}
          {wwcVerdictDetail(asWwcVerdict(side.verdict), {
            overallAttritionRate: pair.overallAttritionRate,
            differentialAttritionRate: pair.differentialAttritionRate,
            overallPercentRow: side.overallPercentRow ?? pair.overallPercentRow,
            maxDifferentialPercent: side.maxDifferentialPercent,
          })}
        </p>
      )}
    </div>
  );
}

function PairLine({ pair, names }: { pair: WwcPair; names: Map<string, string> }) {
  const ratio = pair.riskRatio;
  return (
    <li>
      <span className="font-semibold">{pairName(pair, names)}</span>: overall {formatShare(pair.overallAttritionRate)},
      differential {formatPoints(pair.differentialAttritionRate)} (95% CI of {names.get(pair.conditionId) ?? '?'} −{' '}
      {names.get(pair.comparisonConditionId) ?? '?'}: {formatPointsInterval(pair.differenceInterval)}
      {ratio ? `; risk ratio ${ratio.estimate.toFixed(2)}, ${ratio.lower.toFixed(2)}–${ratio.upper.toFixed(2)}` : ''}) —
      cautious {badgeText(asWwcVerdict(pair.cautious.verdict)).toLowerCase()}, optimistic{' '}
      {badgeText(asWwcVerdict(pair.optimistic.verdict)).toLowerCase()}
    </li>
  );
}

export interface WwcVerdictsProps {
  report: AttritionReport;
  comparisonConditionId: string | null;
  onComparisonChange: (conditionId: string) => void;
}

export function WwcVerdicts({ report, comparisonConditionId, onComparisonChange }: WwcVerdictsProps) {
  const names = new Map(report.conditions.map((condition) => [condition.conditionId, condition.name]));
  const comparisonId = report.wwc.comparisonConditionId ?? comparisonConditionId;
  const cautious = asWwcVerdict(report.wwc.cautious);
  const optimistic = asWwcVerdict(report.wwc.optimistic);
  const many = report.conditions.length > 2;

  return (
    <div className="flex flex-col gap-4">
      <div className="grid gap-3 md:grid-cols-2">
        <VerdictCard boundary="cautious" verdict={cautious} pair={report.wwc.worstPair.cautious} names={names} />
        <VerdictCard boundary="optimistic" verdict={optimistic} pair={report.wwc.worstPair.optimistic} names={names} />
      </div>
      {many && (
        <p className="max-w-prose text-xs text-ink-muted">
          With more than two conditions every pair is judged; each headline is the least favourable pair, whichever
          condition you compare with below.
        </p>
      )}
      {report.wwc.allPairs.length > 0 && (
        <ul className="flex flex-col gap-0.5 text-sm text-ink" aria-label="Every pair">
          {report.wwc.allPairs.map((pair) => (
            <PairLine key={`${pair.conditionId}-${pair.comparisonConditionId}`} pair={pair} names={names} />
          ))}
        </ul>
      )}
      {many && (
        <div className="flex flex-col gap-2 rounded-md border border-line px-3 py-2.5">
          <SelectField
            className="w-56"
            label="Compare the others with"
            value={comparisonId ?? undefined}
            onChange={onComparisonChange}
            options={report.conditions.map((condition) => ({
              value: condition.conditionId,
              label: `Condition ${condition.name}`,
            }))}
          />
          <ul className="flex flex-col gap-0.5 text-sm text-ink" aria-label="Each pair">
            {report.wwc.pairs.map((pair) => (
              <PairLine key={pair.conditionId} pair={pair} names={names} />
            ))}
          </ul>
        </div>
      )}
      <p className="text-sm text-ink">
        <span className="font-semibold">Overall attrition</span> {formatShare(report.overall.attritionRate)} (
        {report.overall.attrited} of {report.overall.windowEndedRandomized} whose window has ended) ·{' '}
        <span className="font-semibold">differential</span> {formatPoints(report.differentialAttrition)} (largest minus
        smallest condition)
      </p>
      <p className="text-xs text-ink-muted">
        <span className="font-semibold text-ink">Table row.</span> {report.wwcRowRule}
      </p>
      <p className="text-sm text-ink" data-testid="dropout-test">
        {dropoutTestSentence(report.dropoutTest)}
      </p>
    </div>
  );
}
