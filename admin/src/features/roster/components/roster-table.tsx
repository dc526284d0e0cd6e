import { Link } from 'react-router-dom';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { tableRecipe } from '@/components/ui/recipes';
import type { RosterEntry } from '../api/get-roster';
import type { ParticipationChange } from '../api/change-participation';
import { mayMarkLost, mayRecordWithdrawal, mayUndoLost } from '../utils/roster-actions';
import { nextStepTimingWording } from '../utils/step-wording';
import { EnrollmentStatusBadge } from './enrollment-status-badge';
import { formatDay, formatShortDay } from '@/lib/dates';

const day = (iso: string | null) => (iso ? formatDay(iso) : '—');

export interface RosterTableProps {
  entries: readonly RosterEntry[];
  blinded: boolean;
  canManage: boolean;
  recordHref: (enrollmentId: string) => string;
  onChange: (change: ParticipationChange, entry: RosterEntry) => void;
  busy?: boolean;
}

export function RosterTable({ entries, blinded, canManage, recordHref, onChange, busy = false }: RosterTableProps) {
  return (
    <div className={tableRecipe.frame}>
      <table className={tableRecipe.table} aria-busy={busy}>
        <caption className="sr-only">
          Roster{blinded ? '; conditions are shown as codes while the study is blinded' : ''}
        </caption>
        <thead>
          <tr>
            <th scope="col" className={tableRecipe.headCell}>
              Reference
            </th>
            <th scope="col" className={tableRecipe.headCell}>
              E-mail
            </th>
            <th scope="col" className={tableRecipe.headCell}>
              Name
            </th>
            <th scope="col" className={tableRecipe.headCell}>
              Status
            </th>
            <th
              scope="col"
              className={tableRecipe.headCell}
              title={blinded ? 'Codes only while the study is blinded' : undefined}
            >
              {blinded ? 'Condition (coded)' : 'Condition'}
            </th>
            <th scope="col" className={tableRecipe.headCell}>
              Next step
            </th>
            <th scope="col" className={tableRecipe.headCell}>
              Consent
            </th>
            <th scope="col" className={tableRecipe.headCell}>
              Invited
            </th>
            <th scope="col" className={tableRecipe.headCell}>
              Assigned
            </th>
            {canManage && (
              <th scope="col" className={tableRecipe.headCell}>
                <span className="sr-only">Actions</span>
              </th>
            )}
          </tr>
        </thead>
        <tbody>
          {entries.map((entry) => {
            const who = entry.name ?? entry.reference;
            return (
              <tr key={entry.id} className={tableRecipe.row}>
                <td className={`${tableRecipe.cell} whitespace-nowrap`}>
                  <Link
                    to={recordHref(entry.id)}
                    className="font-mono text-xs font-medium text-spruce-ink underline-offset-2 hover:underline"
                    aria-label={`Open the record of ${entry.reference}`}
                  >
                    {entry.reference}
                  </Link>
                </td>
                <td className={`${tableRecipe.cell} max-w-56 truncate text-ink-muted`} title={entry.email}>
                  {entry.email}
                </td>
                <td className={tableRecipe.cell}>{entry.name ?? <span className="text-ink-faint">—</span>}</td>
                <td className={`${tableRecipe.cell} whitespace-nowrap`}>
                  <span className="flex flex-col items-start gap-0.5">
                    <EnrollmentStatusBadge status={entry.status} />
                    {entry.suggestLost && (
                      <span title={`${entry.unansweredReminders} unanswered reminders`}>
                        <Badge tone="caution">Suggest: lost</Badge>
                        <span className="sr-only"> ({entry.unansweredReminders} unanswered reminders)</span>
                      </span>
                    )}
                  </span>
                </td>
                <td className={tableRecipe.cell}>{entry.condition ?? <span className="text-ink-faint">—</span>}</td>
                <td className={tableRecipe.cell}>
                  <NextStepCell entry={entry} />
                </td>
                <td className={`${tableRecipe.cell} whitespace-nowrap`}>
                  {entry.signedVersion !== null && (
                    <span className="mr-1.5 text-ink-muted">v{entry.signedVersion}</span>
                  )}
                  {entry.needsReconsent ? (
                    <Badge tone="caution">Re-consent needed</Badge>
                  ) : (
                    entry.signedVersion === null && <span className="text-ink-faint">Not signed</span>
                  )}
                </td>
                <td className={`${tableRecipe.cell} whitespace-nowrap text-ink-muted tabular-nums`}>
                  {day(entry.invitationSentAt)}
                </td>
                <td className={`${tableRecipe.cell} whitespace-nowrap text-ink-muted tabular-nums`}>
                  {day(entry.assignedAt)}
                </td>
                {canManage && (
                  <td className={`${tableRecipe.cell} text-right whitespace-nowrap`}>
                    {mayMarkLost(entry.status) && (
                      <Button
                        variant="quiet"
                        size="compact"
                        onClick={() => onChange('lost', entry)}
                        aria-label={`Mark ${who} lost to follow-up`}
                      >
                        Mark lost
                      </Button>
                    )}
                    {mayUndoLost(entry.status) && (
                      <Button
                        variant="quiet"
                        size="compact"
                        onClick={() => onChange('undo-lost', entry)}
                        aria-label={`Put ${who} back to taking part`}
                      >
                        Undo lost
                      </Button>
                    )}
                    {mayRecordWithdrawal(entry.status) && (
                      <Button
                        variant="quiet"
                        size="compact"
                        onClick={() => onChange('withdraw', entry)}
                        aria-label={`Record a withdrawal for ${who}`}
                      >
                        Withdraw
                      </Button>
                    )}
                  </td>
                )}
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}

function NextStepCell({ entry }: { entry: RosterEntry }) {
  const next = entry.nextStep;
  if (!next) return <span className="text-ink-faint">—</span>;
  const timing = nextStepTimingWording[next.timing];
  const at = next.timing === 'upcoming' ? next.opensAt : next.timing === 'waiting' ? null : next.dueAt;
  const when =
    next.timing === 'waiting'
      ? 'after the step before'
      : at
        ? `${next.timing === 'upcoming' ? 'opens' : 'due'} ${formatShortDay(at)}`
        : 'no due date';
  return (
    <span className="flex flex-col items-start gap-0.5">
      <span className="flex items-center gap-1.5 whitespace-nowrap">
        <Badge tone={timing.tone}>{timing.label}</Badge>
        <span className="text-xs text-ink-muted tabular-nums" title={at ? day(at) : undefined}>
          {when}
        </span>
      </span>
      <span className="max-w-48 truncate text-xs" title={next.title}>
        {next.title}
      </span>
    </span>
  );
}
