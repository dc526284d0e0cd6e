import { describe, expect, it } from 'vitest';
import {
  formatCalendarDate,
  formatDay,
  formatExactMoment,
  formatMoment,
  formatShortDay,
  formatTimeOfDay,
} from './dates';

// Expected strings are the Unicode CLDR medium patterns as ICU prints them (Node's full ICU).
describe('dates', () => {
  // Noon UTC is Dec 4 from UTC−11 to UTC+11, so the day holds wherever the test runs.
  const moment = '2026-12-04T12:05:00Z';

  it('writes a day in the medium style of the locale, never all in figures', () => {
    expect(formatDay(moment, 'en-US')).toBe('Dec 4, 2026');
    expect(formatDay(moment, 'en-GB')).toBe('4 Dec 2026');
    expect(formatDay(new Date(moment), 'en-US')).toBe('Dec 4, 2026');
    expect(formatDay(moment, 'en-US')).not.toMatch(/\d+\/\d+\/\d+/);
  });

  it('uses the browser’s locale when none is given', () => {
    const browserDefault = new Intl.DateTimeFormat(undefined, { dateStyle: 'medium' }).format(new Date(moment));
    expect(formatDay(moment)).toBe(browserDefault);
  });

  it('keeps a letter’s calendar date on its own day in every time zone', () => {
    expect(formatCalendarDate('2026-11-20', 'en-US')).toBe('Nov 20, 2026');
    expect(formatCalendarDate('2026-01-01', 'en-GB')).toBe('1 Jan 2026');
  });

  it('writes a moment as the same day style with the time beside it', () => {
    const day = formatDay(moment, 'en-US');
    expect(formatMoment(moment, 'en-US').startsWith(day)).toBe(true);
    expect(formatMoment(moment, 'en-US')).toMatch(/\d:05\s?[AP]M$/);
    expect(formatExactMoment(moment, 'en-US').startsWith(day)).toBe(true);
    expect(formatExactMoment(moment, 'en-US')).toMatch(/:05:00\s?[AP]M \S+/);
  });

  it('writes a time of day and a short day for lists already dated', () => {
    expect(formatTimeOfDay(moment, 'en-US')).toMatch(/^\d{1,2}:05\s?[AP]M$/);
    expect(formatShortDay(moment, 'en-GB')).toMatch(/^\d{1,2} Dec$/);
  });
});
