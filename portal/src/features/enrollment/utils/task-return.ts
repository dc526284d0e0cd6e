/** Why the api refused a return link (see `ReturnRefusal` in the api's step progress). */
export const RETURN_REFUSALS = [
  'malformed',
  'forged',
  'expired',
  'other-person',
  'not-open',
  'not-taking-part',
  'consent',
] as const;
export type ReturnRefusal = (typeof RETURN_REFUSALS)[number];

/**
 * How a return from the lab's task ended, as the api's return address reports it on the way back to `/return`:
 * `result=done|already-done` with `step`, or `result=refused` with `reason`; `study` (the slug) whenever it is known.
 * A reason this portal does not know yet reads as `other`; an address without a result reads as `unknown`.
 */
export type TaskReturn =
  | { result: 'done' | 'already-done'; studySlug: string | null; stepId: string | null }
  | { result: 'refused'; reason: ReturnRefusal | 'other'; studySlug: string | null }
  | { result: 'unknown'; studySlug: string | null };

export function readTaskReturn(search: URLSearchParams): TaskReturn {
  const studySlug = search.get('study')?.trim() || null;
  const result = search.get('result');
  if (result === 'done' || result === 'already-done') {
    return { result, studySlug, stepId: search.get('step')?.trim() || null };
  }
  if (result === 'refused') {
    const reason = search.get('reason');
    const known = RETURN_REFUSALS.find((refusal) => refusal === reason);
    return { result, reason: known ?? 'other', studySlug };
  }
  return { result: 'unknown', studySlug };
}
