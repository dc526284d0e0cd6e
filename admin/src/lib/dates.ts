/**
 * Every date the staff app shows goes through here, so a screen never mixes "12/4/2026" with "Dec 4, 2026": the
 * browser's locale (or the one given) with the medium date style, and a short or long time beside it for moments.
 */

type Moment = Date | string;

const formats = new Map<string, Intl.DateTimeFormat>();

function formatter(locale: string | undefined, options: Intl.DateTimeFormatOptions): Intl.DateTimeFormat {
  const key = `${locale ?? ''}|${JSON.stringify(options)}`;
  let format = formats.get(key);
  if (!format) {
    format = new Intl.DateTimeFormat(locale, options);
    formats.set(key, format);
  }
  return format;
}

const asDate = (value: Moment) => (value instanceof Date ? value : new Date(value));

/** The day of a moment in the viewer's time zone, e.g. Dec 4, 2026 (en-US) or 4 Dec 2026 (en-GB). */
export function formatDay(value: Moment, locale?: string): string {
  return formatter(locale, { dateStyle: 'medium' }).format(asDate(value));
}

/** A calendar date written YYYY-MM-DD (an approval letter's date), shown as that same day wherever the viewer is. */
export function formatCalendarDate(date: string, locale?: string): string {
  return formatter(locale, { dateStyle: 'medium', timeZone: 'UTC' }).format(new Date(`${date}T00:00:00Z`));
}

/** A moment to the minute, e.g. Dec 4, 2026, 3:05 PM. */
export function formatMoment(value: Moment, locale?: string): string {
  return formatter(locale, { dateStyle: 'medium', timeStyle: 'short' }).format(asDate(value));
}

/** A moment with seconds and the time zone, for records where the exact instant matters. */
export function formatExactMoment(value: Moment, locale?: string): string {
  return formatter(locale, { dateStyle: 'medium', timeStyle: 'long' }).format(asDate(value));
}

/** The time of day alone, e.g. 3:05 PM, for lists already grouped under their day. */
export function formatTimeOfDay(value: Moment, locale?: string): string {
  return formatter(locale, { timeStyle: 'short' }).format(asDate(value));
}

/** A day close at hand without its year, e.g. Dec 4, for "due Dec 4" beside a step. */
export function formatShortDay(value: Moment, locale?: string): string {
  return formatter(locale, { month: 'short', day: 'numeric' }).format(asDate(value));
}
