import { describe, expect, it } from 'vitest';
import { isFutureApprovalDate } from './approval-date';

describe('isFutureApprovalDate', () => {
  const now = new Date('2026-12-05T23:00:00Z');

  it('accepts today and earlier days', () => {
    expect(isFutureApprovalDate('2026-12-05', now)).toBe(false);
    expect(isFutureApprovalDate('2026-11-20', now)).toBe(false);
  });

  it('accepts tomorrow’s date while it is already tomorrow somewhere (UTC+14 at 23:00 UTC is 13:00 next day)', () => {
    expect(isFutureApprovalDate('2026-12-06', now)).toBe(false);
  });

  it('refuses a day that has not begun anywhere', () => {
    expect(isFutureApprovalDate('2026-12-07', now)).toBe(true);
    expect(isFutureApprovalDate('2027-01-01', new Date('2026-12-05T09:00:00Z'))).toBe(true);
    expect(isFutureApprovalDate('2026-12-06', new Date('2026-12-05T09:00:00Z'))).toBe(true);
  });
});
