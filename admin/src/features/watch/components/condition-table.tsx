import { tableRecipe } from '@/components/ui/recipes';
import type { ConditionAttrition, PlannedLength } from '../api/get-attrition-report';
import { formatShare, formatShareInterval, plannedLengthCell } from '../utils/watch-format';

export function ConditionTable({
  conditions,
  studyClosed,
  plannedLength,
}: {
  conditions: readonly ConditionAttrition[];
  studyClosed: boolean;
  plannedLength?: PlannedLength;
}) {
  const plannedLabel =
    plannedLength && plannedLength.days !== null
      ? `Cumulative dropout by day ${plannedLength.days} (Kaplan–Meier)`
      : null;
  return (
    <div className={tableRecipe.frame}>
      <table className={tableRecipe.table}>
        <caption className="sr-only">Participants per condition</caption>
        <thead>
          <tr>
            {[
              'Condition',
              'Randomized',
              studyClosed ? 'Did not complete by the close' : 'Active',
              'Completed',
              'Withdrew',
              'Lost',
              'Dropout so far',
              studyClosed ? 'Attrition (WWC)' : 'Attrition (WWC), window ended',
              ...(plannedLabel ? [plannedLabel] : []),
            ].map((label, index) => (
              <th key={label} scope="col" className={`${tableRecipe.headCell} ${index > 0 ? 'text-right' : ''}`}>
                {label}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {conditions.map((condition) => (
            <tr key={condition.conditionId} className={tableRecipe.row}>
              <th scope="row" className={`${tableRecipe.cell} text-left font-semibold`}>
                {condition.name}
              </th>
              {[
                condition.randomized,
                studyClosed ? condition.incompleteAtClose : condition.active,
                condition.completed,
                condition.withdrew,
                condition.lost,
              ].map((count, index) => (
                <td key={index} className={`${tableRecipe.cell} text-right tabular-nums`}>
                  {count.toLocaleString()}
                </td>
              ))}
              <td className={`${tableRecipe.cell} text-right tabular-nums`}>
                {formatShare(condition.dropoutRateSoFar)}
                <span className="block text-2xs text-ink-muted">
                  {condition.dropped} of {condition.randomized}
                </span>
              </td>
              <td className={`${tableRecipe.cell} text-right tabular-nums`}>
                {formatShare(condition.attritionRate)}
                <span className="block text-2xs text-ink-muted">
                  {condition.attrited} of {condition.windowEnded.randomized}
                </span>
                <span className="block text-2xs text-ink-muted">
                  95% CI {formatShareInterval(condition.attritionInterval)}
                </span>
              </td>
              {plannedLabel && plannedLength && (
                <td className={`${tableRecipe.cell} text-right tabular-nums`} data-testid="planned-length-cell">
                  {plannedLengthCell(
                    plannedLength,
                    plannedLength.conditions.find((entry) => entry.conditionId === condition.conditionId),
                  )}
                </td>
              )}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

export function RateDefinitions({ countingRule }: { countingRule: string }) {
  return (
    <dl className="grid gap-x-4 gap-y-1 text-xs text-ink-muted sm:grid-cols-[max-content_1fr]">
      <dt className="font-semibold text-ink">People still active</dt>
      <dd>{countingRule}</dd>
      <dt className="font-semibold text-ink">Dropout so far</dt>
      <dd>
        Withdrew, lost or excluded after randomization, out of everyone randomized. Active people count as not (yet)
        dropped.
      </dd>
      <dt className="font-semibold text-ink">Attrition (WWC)</dt>
      <dd>
        Not completed, out of the people whose participation window has ended, with its 95% Wilson interval. Active
        people are left out until their window ends.
      </dd>
    </dl>
  );
}
