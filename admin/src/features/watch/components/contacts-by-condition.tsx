import { tableRecipe } from '@/components/ui/recipes';
import type { AttritionReport } from '../api/get-attrition-report';
import { formatStatistic, welchTestSentence } from '../utils/watch-format';

/**
 * Whether every condition was reminded and contacted alike: unequal contact can itself cause unequal dropout.
 * Counts are contacts after randomization (reminders, re-consent requests, staff messages).
 */
export function ContactsByCondition({ report }: { report: AttritionReport }) {
  const contacts = report.contacts;
  const total = contacts.conditions.reduce((sum, row) => sum + row.contacts, 0);
  const numbers = (value: number) => value.toLocaleString();

  return (
    <div className="flex flex-col gap-3">
      <div className={tableRecipe.frame}>
        <table className={tableRecipe.table}>
          <caption className="sr-only">Contacts after randomization, per condition</caption>
          <thead>
            <tr>
              {[
                'Condition',
                'Participants',
                'Contacts',
                'Mean per participant',
                'Reminders',
                'Re-consent requests',
                'Staff messages',
              ].map((label, index) => (
                <th key={label} scope="col" className={`${tableRecipe.headCell} ${index > 0 ? 'text-right' : ''}`}>
                  {label}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {contacts.conditions.map((row) => (
              <tr key={row.conditionId} className={tableRecipe.row}>
                <th scope="row" className={`${tableRecipe.cell} text-left font-semibold`}>
                  {row.name}
                </th>
                <td className={`${tableRecipe.cell} text-right tabular-nums`}>{numbers(row.participants)}</td>
                <td className={`${tableRecipe.cell} text-right tabular-nums`}>{numbers(row.contacts)}</td>
                <td className={`${tableRecipe.cell} text-right font-medium tabular-nums`}>
                  {row.meanPerParticipant === null ? (
                    <span className="text-ink-faint">—</span>
                  ) : (
                    formatStatistic(row.meanPerParticipant)
                  )}
                </td>
                <td className={`${tableRecipe.cell} text-right tabular-nums`}>{numbers(row.reminders)}</td>
                <td className={`${tableRecipe.cell} text-right tabular-nums`}>{numbers(row.reconsentRequests)}</td>
                <td className={`${tableRecipe.cell} text-right tabular-nums`}>{numbers(row.staffMessages)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <ul className="flex flex-col gap-0.5 text-sm text-ink" data-testid="contacts-test">
        <li>
          <span className="font-semibold">Largest difference in mean contacts per participant:</span>{' '}
          {contacts.largestMeanDifference === null
            ? 'not computable yet'
            : formatStatistic(contacts.largestMeanDifference)}
          .
        </li>
        <li>{welchTestSentence(contacts.test, 'everyone in a condition had the same number of contacts')}</li>
      </ul>
      {total === 0 && (
        <p className="text-sm text-ink-muted">
          No reminders, re-consent requests or staff messages have been sent since randomization.
        </p>
      )}
      <p className="text-xs text-ink-muted">
        Invitations are left out: they go before randomization. The reminder plan is the same for every condition by
        design, so a difference here comes from who needed reminding, re-consent requests or staff messages. Welch's
        one-way ANOVA compares the means without assuming the conditions vary equally. Like every flag on this page, it
        is a screening aid, not the study's analysis.
      </p>
    </div>
  );
}
