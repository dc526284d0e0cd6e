const dayFormat = new Intl.DateTimeFormat(undefined, { dateStyle: 'medium', timeZone: 'UTC' });
const momentFormat = new Intl.DateTimeFormat(undefined, { dateStyle: 'medium', timeStyle: 'short' });

/** A date as written on the approval letter (YYYY-MM-DD), shown without shifting it by the viewer's time zone. */
export function formatLetterDate(date: string): string {
  return dayFormat.format(new Date(`${date}T00:00:00Z`));
}

export function formatMoment(isoTime: string): string {
  return momentFormat.format(new Date(isoTime));
}
