import { Fragment, useState } from 'react';
import { tableRecipe } from '@/components/ui/recipes';
import { cx } from '@/components/ui/cx';
import type { AuditEvent } from '../api/get-audit-events';
import { auditActionLabel, chainLabel } from '../utils/audit-labels';

const momentFormat = new Intl.DateTimeFormat(undefined, { dateStyle: 'medium', timeStyle: 'medium' });

export interface AuditEventsTableProps {
  events: readonly AuditEvent[];
  studyTitles: ReadonlyMap<string, string>;
  busy?: boolean;
}

export function AuditEventsTable({ events, studyTitles, busy = false }: AuditEventsTableProps) {
  const [expanded, setExpanded] = useState<ReadonlySet<string>>(new Set());
  const toggle = (id: string) =>
    setExpanded((open) => {
      const next = new Set(open);
      if (next.has(id)) next.delete(id);
      else next.add(id);
      return next;
    });

  return (
    <div className={tableRecipe.frame}>
      <table className={tableRecipe.table} aria-busy={busy}>
        <caption className="sr-only">Audit events, newest first</caption>
        <thead>
          <tr>
            <th scope="col" className={`${tableRecipe.headCell} w-8`}>
              <span className="sr-only">Details</span>
            </th>
            <th scope="col" className={tableRecipe.headCell}>When</th>
            <th scope="col" className={tableRecipe.headCell}>Chain</th>
            <th scope="col" className={`${tableRecipe.headCell} text-right`}>Link</th>
            <th scope="col" className={tableRecipe.headCell}>Action</th>
            <th scope="col" className={tableRecipe.headCell}>By</th>
            <th scope="col" className={tableRecipe.headCell}>Subject</th>
          </tr>
        </thead>
        <tbody>
          {events.map((event) => {
            const open = expanded.has(event.id);
            const detailsId = `audit-event-${event.id}`;
            return (
              <Fragment key={event.id}>
                <tr className={cx(tableRecipe.row, open && 'border-b-0 bg-canvas')}>
                  <td className={tableRecipe.cell}>
                    <button
                      type="button"
                      aria-expanded={open}
                      aria-controls={detailsId}
                      onClick={() => toggle(event.id)}
                      className="flex size-6 items-center justify-center rounded-sm text-ink-muted hover:bg-sunken hover:text-ink focus-visible:outline-2 focus-visible:outline-spruce"
                    >
                      <svg className={cx('size-3.5 transition-transform', open && 'rotate-90')} viewBox="0 0 16 16" fill="none" aria-hidden="true">
                        <path d="m6 3.5 4.5 4.5L6 12.5" stroke="currentColor" strokeWidth="1.8" strokeLinecap="round" strokeLinejoin="round" />
                      </svg>
                      <span className="sr-only">
                        {open ? 'Hide' : 'Show'} details of event {event.sequence} in {chainLabel(event.chain, studyTitles)}
                      </span>
                    </button>
                  </td>
                  <td className={`${tableRecipe.cell} whitespace-nowrap tabular-nums text-ink-muted`}>
                    <time dateTime={event.at}>{momentFormat.format(new Date(event.at))}</time>
                  </td>
                  <td className={`${tableRecipe.cell} whitespace-nowrap`}>{chainLabel(event.chain, studyTitles)}</td>
                  <td className={`${tableRecipe.cell} text-right tabular-nums text-ink-muted`}>{event.sequence}</td>
                  <td className={tableRecipe.cell}>
                    <span className="block font-medium">{auditActionLabel(event.action)}</span>
                    <code className="block font-mono text-2xs text-ink-muted">{event.action}</code>
                  </td>
                  <td className={`${tableRecipe.cell} max-w-48 truncate text-ink-muted`} title={event.actorEmail ?? undefined}>
                    {event.actorEmail ?? 'System'}
                  </td>
                  <td className={`${tableRecipe.cell} whitespace-nowrap text-ink-muted`}>
                    {event.subjectType ? (
                      <>
                        {event.subjectType} <span className="font-mono text-2xs">{event.subjectId?.slice(0, 8)}</span>
                      </>
                    ) : (
                      '—'
                    )}
                  </td>
                </tr>
                <tr id={detailsId} hidden={!open} className="border-b border-line bg-canvas">
                  <td />
                  <td colSpan={6} className="px-3 pt-1 pb-3">
                    {open && <EventDetails event={event} />}
                  </td>
                </tr>
              </Fragment>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}

function EventDetails({ event }: { event: AuditEvent }) {
  return (
    <dl className="grid gap-x-4 gap-y-1.5 text-xs sm:grid-cols-[max-content_1fr]">
      <dt className="text-ink-muted">Data</dt>
      <dd>
        <pre className="max-h-64 overflow-auto rounded-sm border border-line bg-surface px-2 py-1.5 font-mono text-2xs whitespace-pre-wrap break-all text-ink">
          {JSON.stringify(event.data, null, 2)}
        </pre>
      </dd>
      <dt className="text-ink-muted">Previous hash</dt>
      <dd className="font-mono break-all text-ink">{event.previousHash}</dd>
      <dt className="text-ink-muted">Hash</dt>
      <dd className="font-mono break-all text-ink">{event.hash}</dd>
      {event.subjectId && (
        <>
          <dt className="text-ink-muted">Subject id</dt>
          <dd className="font-mono break-all text-ink">{event.subjectId}</dd>
        </>
      )}
      {event.actorId && (
        <>
          <dt className="text-ink-muted">Actor id</dt>
          <dd className="font-mono break-all text-ink">{event.actorId}</dd>
        </>
      )}
    </dl>
  );
}
