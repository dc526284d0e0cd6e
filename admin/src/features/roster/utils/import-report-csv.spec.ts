import { parse } from 'csv-parse/sync';
import { describe, expect, it } from 'vitest';
import { importReportCsv } from './import-report-csv';

const errors = [
  {
    line: 1,
    field: 'sense_of_direction',
    message: 'the header row has no "sense_of_direction" column; those answers will be asked at screening',
  },
  { line: 4, field: 'email', message: '"not-an-address" is not an e-mail address' },
  { line: 7, field: 'email', message: 'a@b.test already appears on line 3, and again\non line 5' },
];

describe('importReportCsv', () => {
  it('reads back field for field with a general-purpose CSV parser (csv-parse, as the api uses)', () => {
    const rows = parse(importReportCsv(errors)) as string[][];
    expect(rows).toEqual([
      ['line', 'column', 'problem'],
      ...errors.map((error) => [String(error.line), error.field, error.message]),
    ]);
  });

  it('quotes only fields that need it and doubles inner quotes (RFC 4180, section 2, rules 6 and 7)', () => {
    const csv = importReportCsv(errors.slice(1, 2));
    expect(csv).toBe('line,column,problem\r\n4,email,"""not-an-address"" is not an e-mail address"\r\n');
  });

  it('writes only the header when there is nothing to report', () => {
    expect(importReportCsv([])).toBe('line,column,problem\r\n');
  });
});
