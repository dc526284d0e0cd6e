import { describe, expect, it } from 'vitest';
import { maxRosterBytes, percentDone, rosterFileProblem } from './roster-file-checks';

describe('rosterFileProblem', () => {
  it('accepts a CSV file as browsers label it', () => {
    // RFC 4180 registers text/csv; spreadsheet programs on some systems report application/vnd.ms-excel (common practice).
    expect(rosterFileProblem({ name: 'invitees.csv', size: 120, type: 'text/csv' })).toBeNull();
    expect(rosterFileProblem({ name: 'INVITEES.CSV', size: 120, type: 'application/vnd.ms-excel' })).toBeNull();
    expect(rosterFileProblem({ name: 'invitees.csv', size: 120, type: '' })).toBeNull();
  });

  it('refuses a spreadsheet or an image with the reason', () => {
    expect(
      rosterFileProblem({
        name: 'invitees.xlsx',
        size: 120,
        type: 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet',
      }),
    ).toMatch(/is not a CSV file/);
    expect(rosterFileProblem({ name: 'photo.csv', size: 120, type: 'image/png' })).toMatch(/is not a CSV file/);
  });

  it('refuses an empty file and anything over the api’s 5 MB', () => {
    // The api's limit is 5 × 1024 × 1024 bytes (MAX_ROSTER_BYTES in enrollments.controller.ts).
    expect(maxRosterBytes).toBe(5_242_880);
    expect(rosterFileProblem({ name: 'a.csv', size: 0, type: 'text/csv' })).toBe('a.csv is empty.');
    expect(rosterFileProblem({ name: 'a.csv', size: 5_242_880, type: 'text/csv' })).toBeNull();
    expect(rosterFileProblem({ name: 'a.csv', size: 5_242_881, type: 'text/csv' })).toMatch(/larger than 5 MB/);
  });
});

describe('percentDone', () => {
  it('rounds down so 100 % means finished', () => {
    expect(percentDone(0, 200)).toBe(0);
    expect(percentDone(199, 200)).toBe(99);
    expect(percentDone(200, 200)).toBe(100);
    expect(percentDone(1, 3)).toBe(33);
  });

  it('stays within 0–100 and says 0 when the size is unknown', () => {
    expect(percentDone(250, 200)).toBe(100);
    expect(percentDone(10, 0)).toBe(0);
    expect(percentDone(10, Number.NaN)).toBe(0);
  });
});
