import { formatCalendarDate, formatMoment } from '@/lib/dates';

/** A date as written on the approval letter (YYYY-MM-DD), shown without shifting it by the viewer's time zone. */
export function formatLetterDate(date: string): string {
  return formatCalendarDate(date);
}

export { formatMoment };
