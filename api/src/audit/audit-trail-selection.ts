import { ACTION_FAMILIES, ActionFamily } from './audit-sentences';

/** Which events an auditor asked for; every part optional, combined with AND (families with OR among themselves). */
export interface AuditSelection {
  chain?: string;
  participant?: string;
  staff?: string;
  from?: string;
  to?: string;
  family?: ActionFamily[];
  action?: string;
}

const DAY = /^\d{4}-\d{2}-\d{2}$/;

/**
 * The selection's time window as instants: `from` inclusive, `before` exclusive. A bare day in `to` counts to the
 * end of that day (UTC), so "to 2026-12-05" includes everything on the 5th.
 */
export function selectionBounds(selection: Pick<AuditSelection, 'from' | 'to'>): {
  from: Date | null;
  before: Date | null;
} {
  const from = selection.from
    ? new Date(DAY.test(selection.from) ? `${selection.from}T00:00:00Z` : selection.from)
    : null;
  let before: Date | null = null;
  if (selection.to) {
    before = DAY.test(selection.to) ? new Date(`${selection.to}T00:00:00Z`) : new Date(selection.to);
    before = new Date(before.getTime() + (DAY.test(selection.to) ? 86_400_000 : 1));
  }
  return { from, before };
}

/** Problems the field checks cannot see: a window that ends before it starts. */
export function selectionProblems(selection: AuditSelection): Array<{ field: string; message: string }> {
  const { from, before } = selectionBounds(selection);
  if (from && before && before.getTime() <= from.getTime())
    return [{ field: 'to', message: 'must not be before from' }];
  return [];
}

/** The selection in words, for the export's summary. */
export function selectionInWords(
  selection: AuditSelection,
  names: { study: string | null; staff: string | null },
): string[] {
  const lines: string[] = [];
  lines.push(
    `Study: ${selection.chain ? (selection.chain === 'lab' ? 'lab-wide events' : (names.study ?? selection.chain)) : 'every study and the lab-wide events'}`,
  );
  if (selection.participant) lines.push(`Participant: ${selection.participant}`);
  if (selection.staff) lines.push(`Staff member: ${names.staff ?? selection.staff}`);
  if (selection.from || selection.to)
    lines.push(`Dates: ${selection.from ?? 'the beginning'} to ${selection.to ?? 'now'}`);
  if (selection.family?.length) {
    lines.push(
      `Kinds of action: ${selection.family.map((key) => ACTION_FAMILIES.find((family) => family.key === key)?.label ?? key).join(', ')}`,
    );
  }
  if (selection.action) lines.push(`One action code: ${selection.action}`);
  return lines;
}

/** `audit-trail-wayfinding-cues-2026-12-05.csv`: the study's slug (or lab / all-studies) and the day of export. */
export function exportFileName(scope: string, now: Date, extension: 'csv' | 'txt', suffix = ''): string {
  const safe =
    scope
      .toLowerCase()
      .replace(/[^a-z0-9-]+/g, '-')
      .replace(/^-+|-+$/g, '') || 'all-studies';
  return `audit-trail-${safe}-${now.toISOString().slice(0, 10)}${suffix}.${extension}`;
}
