import type { components } from '@evenhand/contract';

export type ActionFamily = components['schemas']['FamilyOptionDto']['key'];

/** What the auditor asked to see, as it lives in the page's address (so a selection can be bookmarked or shared). */
export interface AuditSelection {
  /** A study id, "lab" for lab-wide events, or null for everything. */
  chain: string | null;
  participant: string | null;
  staff: string | null;
  /** Days as YYYY-MM-DD, both ends included. */
  from: string | null;
  to: string | null;
  families: ActionFamily[];
}

export const labChain = 'lab';

const DAY = /^\d{4}-\d{2}-\d{2}$/;

export function selectionFromParams(params: URLSearchParams): AuditSelection {
  const day = (value: string | null) => (value && DAY.test(value) ? value : null);
  return {
    chain: params.get('chain') || null,
    participant: params.get('participant')?.trim() || null,
    staff: params.get('staff') || null,
    from: day(params.get('from')),
    to: day(params.get('to')),
    families: params.getAll('family') as ActionFamily[],
  };
}

/** The query the api takes for this selection (list and export alike); empty parts are left out. */
export function selectionQuery(selection: AuditSelection) {
  return {
    ...(selection.chain ? { chain: selection.chain } : {}),
    ...(selection.participant ? { participant: selection.participant } : {}),
    ...(selection.staff ? { staff: selection.staff } : {}),
    ...(selection.from ? { from: selection.from } : {}),
    ...(selection.to ? { to: selection.to } : {}),
    ...(selection.families.length ? { family: selection.families } : {}),
  };
}

/** An export link for the current selection, e.g. `/api/audit/export.csv?chain=…&family=payouts&family=steps`. */
export function exportHref(
  path: '/api/audit/export.csv' | '/api/audit/export-summary.txt',
  selection: AuditSelection,
): string {
  const params = new URLSearchParams();
  for (const [key, value] of Object.entries(selectionQuery(selection))) {
    for (const item of Array.isArray(value) ? value : [value]) params.append(key, item);
  }
  const query = params.toString();
  return query ? `${path}?${query}` : path;
}

export function isFiltered(selection: AuditSelection): boolean {
  return Boolean(
    selection.chain ||
    selection.participant ||
    selection.staff ||
    selection.from ||
    selection.to ||
    selection.families.length,
  );
}

/** A chain as staff know it: the study's title, or "Lab-wide" for events outside any study. */
export function chainLabel(chain: string, studyTitles: ReadonlyMap<string, string>): string {
  if (chain === labChain) return 'Lab-wide';
  return studyTitles.get(chain) ?? `Study ${chain.slice(0, 8)}`;
}
