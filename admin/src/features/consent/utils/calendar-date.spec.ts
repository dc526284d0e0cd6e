import { describe, expect, it } from 'vitest';
import { isCalendarDate, localToday } from './calendar-date';

describe('isCalendarDate', () => {
  it('accepts ISO 8601 calendar dates in the extended format (YYYY-MM-DD)', () => {
    expect(isCalendarDate('2026-11-20')).toBe(true);
    expect(isCalendarDate('2026-12-31')).toBe(true);
  });

  it('follows the Gregorian leap-year rule: every 4th year, not centuries, except every 400th', () => {
    // Rule from the Gregorian calendar (ISO 8601 uses it): 2000 and 2024 are leap years, 1900 and 2026 are not.
    expect(isCalendarDate('2024-02-29')).toBe(true);
    expect(isCalendarDate('2000-02-29')).toBe(true);
    expect(isCalendarDate('1900-02-29')).toBe(false);
    expect(isCalendarDate('2026-02-29')).toBe(false);
  });

  it('refuses days and months that do not exist and other spellings', () => {
    expect(isCalendarDate('2026-04-31')).toBe(false);
    expect(isCalendarDate('2026-13-01')).toBe(false);
    expect(isCalendarDate('2026-00-10')).toBe(false);
    expect(isCalendarDate('20/11/2026')).toBe(false);
    expect(isCalendarDate('2026-11-20T00:00:00Z')).toBe(false);
    expect(isCalendarDate('')).toBe(false);
  });
});

describe('localToday', () => {
  it('writes the local calendar day as YYYY-MM-DD, zero-padded', () => {
    expect(localToday(new Date(2026, 0, 5, 23, 30))).toBe('2026-01-05');
    expect(localToday(new Date(2026, 11, 31, 0, 5))).toBe('2026-12-31');
  });
});
