import { useState } from 'react';
import { tableRecipe } from '@/components/ui/recipes';
import { Notice } from '@/components/ui/states';
import { formatMinor } from '@/lib/money';
import type { AttritionReport, MeanDifference, WelchAnova } from '../api/get-attrition-report';
import { formatPValue, formatStatistic } from '../utils/watch-format';

function testLine(test: WelchAnova): string {
  if (test.notComputable === 'no-variation-within-a-condition')
    return "Welch's test: not computable (everyone in a condition has the same pay).";
  if (test.notComputable) return "Welch's test: not computable (needs two conditions with at least two people).";
  return `Welch's test: F(${formatStatistic(test.df1, 0)}, ${formatStatistic(test.df2, 1)}) = ${formatStatistic(test.statistic)}, ${formatPValue(test.pValue)}.`;
}

function differenceLine(
  difference: MeanDifference,
  nameOf: (id: string) => string,
  money: (minor: number | null) => string,
): string {
  const pair = `${nameOf(difference.conditionId)} minus ${nameOf(difference.comparisonConditionId)}`;
  if (difference.lower === null || difference.upper === null) {
    const why =
      difference.notComputable === 'no-variation-in-either-condition'
        ? 'everyone in both conditions has the same pay'
        : 'needs at least two people in each condition';
    return `${pair}: ${money(difference.difference)} (no interval: ${why}).`;
  }
  return `${pair}: ${money(difference.difference)} (95% CI ${money(difference.lower)} to ${money(difference.upper)}, Welch t on ${formatStatistic(difference.df, 1)} df).`;
}

export function PayParityTable({ report }: { report: AttritionReport }) {
  const [basis, setBasis] = useState<'earned' | 'paid'>('earned');
  const pay = report.payParity;
  const data = pay[basis];
  const names = new Map(report.conditions.map((condition) => [condition.conditionId, condition.name]));
  const money = (minor: number | null) => (minor === null ? '—' : formatMinor(Math.round(minor), pay.currency));
  const nameOf = (id: string) => names.get(id) ?? '?';

  return (
    <div className="flex flex-col gap-3">
      {pay.payOverrideRecorded && (
        <Notice tone="caution">
          A per-condition pay override is recorded for this study, so unequal pay may be by design.
        </Notice>
      )}
      <fieldset className="flex flex-wrap gap-4 text-sm">
        <legend className="sr-only">Which pay to show</legend>
        {(['earned', 'paid'] as const).map((option) => (
          <label key={option} className="flex items-center gap-1.5">
            <input
              type="radio"
              name="pay-basis"
              value={option}
              checked={basis === option}
              onChange={() => setBasis(option)}
              className="accent-spruce"
            />
            {option === 'earned' ? 'Earned (owed, approved, sending, failed for now, or paid)' : 'Paid out'}
          </label>
        ))}
      </fieldset>
      <div className={tableRecipe.frame}>
        <table className={tableRecipe.table}>
          <caption className="sr-only">Mean pay per condition, {basis}</caption>
          <thead>
            <tr>
              <th scope="col" className={tableRecipe.headCell}>
                Condition
              </th>
              <th scope="col" className={`${tableRecipe.headCell} text-right`}>
                Per randomized
              </th>
              <th scope="col" className={`${tableRecipe.headCell} text-right`}>
                Per completer
              </th>
            </tr>
          </thead>
          <tbody>
            {data.conditions.map((row) => (
              <tr key={row.conditionId} className={tableRecipe.row}>
                <th scope="row" className={`${tableRecipe.cell} text-left font-semibold`}>
                  {names.get(row.conditionId) ?? '?'}
                </th>
                <td className={`${tableRecipe.cell} text-right tabular-nums`}>
                  {money(row.perRandomized.mean)}{' '}
                  <span className="text-2xs text-ink-muted">n = {row.perRandomized.n}</span>
                </td>
                <td className={`${tableRecipe.cell} text-right tabular-nums`}>
                  {money(row.perCompleter.mean)}{' '}
                  <span className="text-2xs text-ink-muted">n = {row.perCompleter.n}</span>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <ul className="flex flex-col gap-0.5 text-sm text-ink">
        <li>
          <span className="font-semibold">Per randomized:</span> largest difference{' '}
          {money(data.perRandomized.largestMeanDifference)}. {testLine(data.perRandomized.test)}
          <ul className="list-disc pl-5" aria-label="Differences per randomized">
            {data.perRandomized.differences.map((difference) => (
              <li key={difference.conditionId}>{differenceLine(difference, nameOf, money)}</li>
            ))}
          </ul>
        </li>
        <li>
          <span className="font-semibold">Per completer:</span> largest difference{' '}
          {money(data.perCompleter.largestMeanDifference)}. {testLine(data.perCompleter.test)}
          <ul className="list-disc pl-5" aria-label="Differences per completer">
            {data.perCompleter.differences.map((difference) => (
              <li key={difference.conditionId}>{differenceLine(difference, nameOf, money)}</li>
            ))}
          </ul>
        </li>
      </ul>
      <p className="text-xs text-ink-muted">
        Welch's one-way ANOVA compares mean pay without assuming the conditions vary equally; each difference from the
        comparison condition has a 95% Welch t interval (unequal variances, Welch–Satterthwaite degrees of freedom).
        Unpaid randomized participants count as zero. Screening aids, not the study's analysis; pay rules defer to your
        institution's finance office.
      </p>
    </div>
  );
}
