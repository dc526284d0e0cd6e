import { useState } from 'react';
import { Badge } from '@/components/ui/badge';
import { cx } from '@/components/ui/cx';
import type { AuditEvent } from '../api/get-audit-events';
import { formatDay, formatTimeOfDay } from '@/lib/dates';

// Under each day's heading, minutes are enough to read by; the exact moment is in the details.

export interface AuditEventListProps {
  events: readonly AuditEvent[];
  familyLabels: ReadonlyMap<string, string>;
  busy?: boolean;
}

/** The trail as sentences, newest first, under a heading per day; each event's stored fields one click away. */
export function AuditEventList({ events, familyLabels, busy = false }: AuditEventListProps) {
  const days: Array<{ day: string; events: AuditEvent[] }> = [];
  for (const event of events) {
    const day = formatDay(event.at);
    if (days.at(-1)?.day !== day) days.push({ day, events: [] });
    days.at(-1)!.events.push(event);
  }
  return (
    <div className="flex flex-col gap-4" aria-busy={busy}>
      {days.map(({ day, events: ofDay }) => (
        <section key={day} aria-label={day} className="flex flex-col gap-1.5">
          <h3 className="text-xs font-semibold tracking-wide text-ink-muted uppercase">{day}</h3>
          <ol className="divide-y divide-line rounded-lg border border-line bg-surface shadow-raised">
            {ofDay.map((event) => (
              <EventEntry key={event.id} event={event} familyLabel={familyLabels.get(event.family) ?? event.family} />
            ))}
          </ol>
        </section>
      ))}
    </div>
  );
}

function EventEntry({ event, familyLabel }: { event: AuditEvent; familyLabel: string }) {
  const [open, setOpen] = useState(false);
  const detailsId = `audit-event-${event.id}`;
  return (
    <li className="flex gap-3 px-3 py-2.5 sm:px-4">
      <time dateTime={event.at} className="w-16 shrink-0 pt-0.5 text-xs whitespace-nowrap text-ink-muted tabular-nums">
        {formatTimeOfDay(event.at)}
      </time>
      <div className="flex min-w-0 flex-1 flex-col gap-1">
        <p className="text-sm text-ink">{event.sentence}</p>
        <div className="flex flex-wrap items-center gap-x-2 gap-y-1 text-xs text-ink-muted">
          <Badge tone={event.family === 'payouts' || event.family === 'funding' ? 'spruce' : 'neutral'}>
            {familyLabel}
          </Badge>
          <span>{event.name}</span>
          <span aria-hidden="true">·</span>
          <span>{event.studyTitle ?? 'Lab-wide'}</span>
          <button
            type="button"
            aria-expanded={open}
            aria-controls={detailsId}
            onClick={() => setOpen((was) => !was)}
            aria-label={`${open ? 'Hide details' : 'Details'} of “${event.sentence}”`}
            className="ml-auto rounded-sm px-1.5 py-0.5 font-medium text-spruce-ink hover:bg-spruce-soft focus-visible:outline-2 focus-visible:outline-spruce"
          >
            {open ? 'Hide details' : 'Details'}
          </button>
        </div>
        <div id={detailsId} hidden={!open}>
          {open && <EventDetails event={event} />}
        </div>
      </div>
    </li>
  );
}

function EventDetails({ event }: { event: AuditEvent }) {
  const rows: Array<[string, React.ReactNode, boolean?]> = [
    ['Recorded as', event.action, true],
    ['Chain and link', `${event.chain} · link ${event.sequence}`, true],
    ['Moment (UTC)', event.at, true],
    ['By (as stored)', event.actorEmail ?? 'Evenhand itself'],
    ['Participant', event.participantReference ?? '—'],
    ['Subject', event.subjectType ? `${event.subjectType} ${event.subjectId ?? ''}` : '—', true],
    ['Key', event.keyId ?? 'written before keying', true],
    ['Previous hash', event.previousHash, true],
    ['Hash', event.hash, true],
  ];
  return (
    <dl className="mt-1 grid gap-x-4 gap-y-1 rounded-md border border-line bg-canvas p-2.5 text-xs sm:grid-cols-[max-content_1fr]">
      {rows.map(([term, value, mono]) => (
        <div key={term} className="contents">
          <dt className="text-ink-muted">{term}</dt>
          <dd className={cx('break-all text-ink', mono && 'font-mono')}>{value}</dd>
        </div>
      ))}
      <dt className="text-ink-muted">Data</dt>
      <dd>
        <pre className="max-h-64 overflow-auto rounded-sm border border-line bg-surface px-2 py-1.5 font-mono text-2xs whitespace-pre-wrap break-all text-ink">
          {JSON.stringify(event.data, null, 2)}
        </pre>
      </dd>
    </dl>
  );
}
