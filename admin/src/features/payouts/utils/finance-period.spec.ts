import { describe, expect, it } from 'vitest';
import { periodProblems, thisMonth } from './finance-period';

describe('finance period', () => {
  it('starts on the first of the month and ends today', () => {
    expect(thisMonth(new Date('2026-12-05T02:00:00Z'))).toEqual({ from: '2026-12-01', to: '2026-12-05' });
  });

  it('names the field at fault in plain words', () => {
    expect(periodProblems({ from: '2026-12-01', to: '2026-12-05' })).toEqual({});
    expect(periodProblems({ from: '', to: '2026-12-05' })).toEqual({ from: 'Choose the first day of the period.' });
    expect(periodProblems({ from: '2026-12-05', to: '2026-12-01' })).toEqual({
      to: 'The last day must be on or after the first day.',
    });
    expect(periodProblems({ from: '2024-01-01', to: '2026-12-01' })).toEqual({
      to: 'Choose a period of at most a year.',
    });
  });
});
