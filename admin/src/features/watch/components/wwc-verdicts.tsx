import { Badge } from '@/components/ui/badge';
import { SelectField } from '@/components/ui/select-field';
import type { AttritionReport, WwcPair } from '../api/get-attrition-report';
import { asWwcVerdict, dropoutTestSentence, formatPoints, formatShare, wwcVerdictDetail, wwcVerdictSentence, type WwcBoundary, type WwcVerdict } from '../utils/watch-format';

const tone = (verdict: WwcVerdict) => (verdict === 'low-attrition' ? 'success' : verdict === 'not-computable' ? 'neutral' : 'danger');
const badgeText = (verdict: WwcVerdict) =>
  verdict === 'low-attrition' ? 'Low attrition' : verdict === 'high-attrition' ? 'High attrition' : verdict === 'not-computable' ? 'Not yet' : 'Outside the table';

function VerdictCard({ boundary, verdict, pair, names }: { boundary: WwcBoundary; verdict: WwcVerdict; pair: WwcPair | undefined; names: Map<string, string> }) {
  const side = pair ? pair[boundary] : undefined;
  return (
    <div className="flex flex-col gap-1 rounded-md border border-line bg-canvas px-3 py-2.5">
      <div className="flex items-start justify-between gap-2">
        <p className="text-base font-semibold text-ink">{wwcVerdictSentence(verdict, boundary)}</p>
        <Badge tone={tone(verdict)}>{badgeText(verdict)}</Badge>
      </div>
      {pair && side && (
        <p className="text-sm text-ink-muted">
          <span className="font-semibold text-ink">
            {names.get(pair.conditionId) ?? '?'} vs {names.get(pair.comparisonConditionId) ?? '?'}:
          </span>{' '}
          {wwcVerdictDetail(asWwcVerdict(side.verdict), {
            overallAttritionRate: pair.overallAttritionRate,
            differentialAttritionRate: pair.differentialAttritionRate,
            overallPercentRow: pair.overallPercentRow,
            maxDifferentialPercent: side.maxDifferentialPercent,
          })}
        </p>
      )}
    </div>
  );
}

/** The least favourable pair decides each boundary's headline; its numbers stand behind it. */
function worstPair(pairs: readonly WwcPair[], boundary: WwcBoundary, verdict: WwcVerdict): WwcPair | undefined {
  const matching = pairs.filter((pair) => pair[boundary].verdict === verdict);
  return matching.sort((a, b) => (b.differentialAttritionRate ?? -1) - (a.differentialAttritionRate ?? -1))[0];
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
      {many && (
        <div className="flex flex-wrap items-end gap-3">
          <SelectField
            className="w-56"
            label="Compare the others with"
            value={comparisonId ?? undefined}
            onChange={onComparisonChange}
            options={report.conditions.map((condition) => ({ value: condition.conditionId, label: `Condition ${condition.name}` }))}
          />
          <p className="max-w-prose pb-1 text-xs text-ink-muted">
            With more than two conditions the WWC boundary is applied pairwise: each condition against the one you pick. The headline is the least
            favourable pair.
          </p>
        </div>
      )}
      <div className="grid gap-3 md:grid-cols-2">
        <VerdictCard boundary="cautious" verdict={cautious} pair={worstPair(report.wwc.pairs, 'cautious', cautious)} names={names} />
        <VerdictCard boundary="optimistic" verdict={optimistic} pair={worstPair(report.wwc.pairs, 'optimistic', optimistic)} names={names} />
      </div>
      {report.wwc.pairs.length > 0 && (
        <ul className="flex flex-col gap-0.5 text-sm text-ink" aria-label="Each pair">
          {report.wwc.pairs.map((pair) => (
            <li key={pair.conditionId}>
              <span className="font-semibold">
                {names.get(pair.conditionId) ?? '?'} vs {names.get(pair.comparisonConditionId) ?? '?'}
              </span>
              : overall {formatShare(pair.overallAttritionRate)}, differential {formatPoints(pair.differentialAttritionRate)} — cautious{' '}
              {badgeText(asWwcVerdict(pair.cautious.verdict)).toLowerCase()}, optimistic {badgeText(asWwcVerdict(pair.optimistic.verdict)).toLowerCase()}
            </li>
          ))}
        </ul>
      )}
      <p className="text-sm text-ink">
        <span className="font-semibold">Overall attrition</span> {formatShare(report.overall.attritionRate)} ({report.overall.attrited} of{' '}
        {report.overall.windowEndedRandomized} whose window has ended) · <span className="font-semibold">differential</span>{' '}
        {formatPoints(report.differentialAttrition)} (largest minus smallest condition)
      </p>
      <p className="text-sm text-ink" data-testid="dropout-test">
        {dropoutTestSentence(report.dropoutTest)}
      </p>
    </div>
  );
}
