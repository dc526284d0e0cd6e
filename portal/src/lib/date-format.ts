import { PORTAL_LOCALE } from './money';

/** "March 4, 2026" in the reader's own time zone. */
export function formatDate(iso: string): string {
  return new Intl.DateTimeFormat(PORTAL_LOCALE, { dateStyle: 'long' }).format(new Date(iso));
}

/** "March 4, 2026 at 2:05 PM EST": the zone is named, since a signature time means little without it. */
export function formatDateTime(iso: string): string {
  return new Intl.DateTimeFormat(PORTAL_LOCALE, {
    year: 'numeric',
    month: 'long',
    day: 'numeric',
    hour: 'numeric',
    minute: '2-digit',
    timeZoneName: 'short',
  }).format(new Date(iso));
}
