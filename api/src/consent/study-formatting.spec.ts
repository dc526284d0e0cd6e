import { describe, expect, it } from 'vitest';
import { describeSigningTime, formatDuration, formatMoney } from './study-formatting';

describe('describeSigningTime', () => {
  // Offsets from the IANA time zone database (from memory): EU summer time starts on the last Sunday of March at
  // 01:00 UTC (Directive 2000/84/EC); India has no daylight saving time (UTC+05:30); Newfoundland is UTC−03:30 in winter.
  it('gives UTC and the local time with the offset in force at that instant', () => {
    expect(describeSigningTime(new Date('2025-03-30T00:59:59Z'), 'Europe/Berlin')).toEqual({
      iso: '2025-03-30T00:59:59.000Z',
      utc: '2025-03-30 00:59:59 UTC',
      timeZone: 'Europe/Berlin',
      local: '2025-03-30 01:59:59',
      offset: 'UTC+01:00',
      text: '2025-03-30 00:59:59 UTC (01:59:59 in Europe/Berlin, UTC+01:00)',
    });
    expect(describeSigningTime(new Date('2025-03-30T01:00:00Z'), 'Europe/Berlin').offset).toBe('UTC+02:00');
    expect(describeSigningTime(new Date('2025-07-01T20:00:00Z'), 'Asia/Kolkata').text).toBe(
      '2025-07-01 20:00:00 UTC (2025-07-02 01:30:00 in Asia/Kolkata, UTC+05:30)',
    );
    expect(describeSigningTime(new Date('2025-01-15T12:00:00Z'), 'America/St_Johns').offset).toBe('UTC-03:30');
  });

  it('says UTC alone when the signer is on UTC', () => {
    expect(describeSigningTime(new Date('2025-01-15T12:00:00Z')).text).toBe('2025-01-15 12:00:00 UTC');
    expect(describeSigningTime(new Date('2025-01-15T12:00:00Z'), 'Europe/London').text).toBe(
      '2025-01-15 12:00:00 UTC (12:00:00 in Europe/London, UTC+00:00)',
    );
  });

  it('refuses an unknown time zone or an invalid date, naming the field', () => {
    expect(() => describeSigningTime(new Date(), 'Mars/Olympus')).toThrow(
      'timeZone: must be an IANA time zone such as Europe/Berlin, got "Mars/Olympus"',
    );
    expect(() => describeSigningTime(new Date('nope'))).toThrow('signedAt: must be a valid date and time');
  });
});

describe('formatMoney and formatDuration', () => {
  it('formats minor units with the currency’s decimals (ISO 4217: USD 2, JPY 0, BHD 3)', () => {
    expect(formatMoney(1050, 'USD')).toBe('$10.50');
    expect(formatMoney(1050, 'JPY')).toBe('¥1,050');
    expect(formatMoney(1050, 'BHD')).toBe(
      new Intl.NumberFormat('en-US', { style: 'currency', currency: 'BHD' }).format(1.05),
    );
    expect(formatMoney(1050, 'BHD')).toMatch(/1\.050$/);
    expect(formatMoney(1050, 'EUR', 'de-DE')).toBe(
      new Intl.NumberFormat('de-DE', { style: 'currency', currency: 'EUR' }).format(10.5),
    );
  });

  it('refuses fractional minor units and unknown currencies', () => {
    expect(() => formatMoney(10.5, 'USD')).toThrow('amountMinor: must be a whole number of minor units, got 10.5');
    expect(() => formatMoney(100, 'XYZW')).toThrow(/^currency: must be an ISO 4217 code/);
  });

  it('writes durations in hours and minutes', () => {
    expect([
      formatDuration(1),
      formatDuration(45),
      formatDuration(60),
      formatDuration(90),
      formatDuration(125),
    ]).toEqual(['1 minute', '45 minutes', '1 hour', '1 hour 30 minutes', '2 hours 5 minutes']);
  });
});
