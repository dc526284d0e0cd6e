/**
 * An ethics approval date is the date printed on a letter already received, so it cannot lie ahead. "Today" is
 * taken in the time zone furthest ahead (UTC+14, Line Islands), so a lab anywhere can enter its own today.
 */
const FURTHEST_AHEAD_MS = 14 * 60 * 60 * 1000;

/** True when the calendar date (YYYY-MM-DD) is after today everywhere on Earth. */
export function isFutureApprovalDate(date: string, now: Date = new Date()): boolean {
  const latestToday = new Date(now.getTime() + FURTHEST_AHEAD_MS).toISOString().slice(0, 10);
  return date > latestToday;
}
