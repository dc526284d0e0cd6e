import { useState } from 'react';
import { tableRecipe } from '@/components/ui/recipes';
import { Notice } from '@/components/ui/states';
import { formatMinor } from '@/lib/money';
import type { AttritionReport, WelchAnova } from '../api/get-attrition-report';
import { formatPValue, formatStatistic } from '../utils/watch-format';

function testLine(test: WelchAnova): string {
  if (test.notComputable === 'no-variation-within-a-condition') return "Welch's test: not computable (everyone in a condition has the same pay).";
  if (test.notComputable) return "Welch's test: not computable (needs two conditions with at least two people).";
  return `Welch's test: F(${formatStatistic(test.df1, 0)}, ${formatStatistic(test.df2, 1)}) = ${formatStatistic(test.statistic)}, ${formatPValue(test.pValue)}.`;
}

export function PayParityTable({ report }: { report: AttritionReport }) {
  const [basis, setBasis] = useState<'earned' | 'paid'>('earned');
  const pay = report.payParity;
  const data = pay[basis];
  const names = new Map(report.conditions.map((condition) => [condition.conditionId, condition.name]));
  const money = (minor: number | null) => (minor === null ? '—' : formatMinor(Math.round(minor), pay.currency));

  return (
    <div className="flex flex-col gap-3">
      {pay.payOverrideRecorded && (
        <Notice tone="caution">A per-condition pay override is recorded for this study, so unequal pay may be by design.</Notice>
      )}
      <fieldset className="flex flex-wrap gap-4 text-sm">
        <legend className="sr-only">Which pay to show</legend>
        {(['earned', 'paid'] as const).map((option) => (
          <label key={option} className="flex items-center gap-1.5">
            <input type="radio" name="pay-basis" value={option} checked={basis === option} onChange={() => setBasis(option)} className="accent-spruce" />
            {option === 'earned' ? 'Earned (owed, approved, sending, failed for now, or paid)' : 'Paid out'}
          </label>
        ))}
      </fieldset>
      <div className={tableRecipe.frame}>
        <table className={tableRecipe.table}>
          <caption className="sr-only">Mean pay per condition, {basis}</caption>
          <thead>
            <tr>
              <th scope="col" className={tableRecipe.headCell}>Condition</th>
              <th scope="col" className={`${tableRecipe.headCell} text-right`}>Per randomized</th>
              <th scope="col" className={`${tableRecipe.headCell} text-right`}>Per completer</th>
            </tr>
          </thead>
          <tbody>
            {data.conditions.map((row) => (
              <tr key={row.conditionId} className={tableRecipe.row}>
                <th scope="row" className={`${tableRecipe.cell} text-left font-semibold`}>{names.get(row.conditionId) ?? '?'}</th>
                <td className={`${tableRecipe.cell} text-right tabular-nums`}>
                  {money(row.perRandomized.mean)} <span className="text-2xs text-ink-muted">n = {row.perRandomized.n}</span>
                </td>
                <td className={`${tableRecipe.cell} text-right tabular-nums`}>
                  {money(row.perCompleter.mean)} <span className="text-2xs text-ink-muted">n = {row.perCompleter.n}</span>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <ul className="flex flex-col gap-0.5 text-sm text-ink">
        <li>
          <span className="font-semibold">Per randomized:</span> largest difference {money(data.perRandomized.largestMeanDifference)}. {testLine(data.perRandomized.test)}
        </li>
        <li>
          <span className="font-semibold">Per completer:</span> largest difference {money(data.perCompleter.largestMeanDifference)}. {testLine(data.perCompleter.test)}
        </li>
      </ul>
      <p className="text-xs text-ink-muted">
        Welch's one-way ANOVA compares mean pay without assuming the conditions vary equally; unpaid randomized participants count as zero.
      </p>
    </div>
  );
}
