import { describe, expect, it } from 'vitest';
import { firstCell, parseReferenceList } from './reference-list';

describe('parseReferenceList', () => {
  it('reads one reference per line, trimming spaces and skipping blank lines', () => {
    expect(parseReferenceList('  P-ABC234\n\nP-XYZ789  \r\n\r\nP-QQQ111\n')).toEqual([
      'P-ABC234',
      'P-XYZ789',
      'P-QQQ111',
    ]);
  });

  it('takes the first column of a CSV file and drops its header row and byte-order mark', () => {
    const csv = '\uFEFFreference,email,attended\r\nP-ABC234,a@example.org,yes\r\n"P-XYZ789","b@example.org",yes\r\n';
    expect(parseReferenceList(csv)).toEqual(['P-ABC234', 'P-XYZ789']);
  });

  it('reads semicolon and tab separated files too', () => {
    expect(parseReferenceList('Participant reference;room\nP-ABC234;2\nP-XYZ789\t3')).toEqual(['P-ABC234', 'P-XYZ789']);
  });

  it('keeps repeated references, so the report can point at the second line', () => {
    expect(parseReferenceList('P-ABC234\nP-ABC234')).toEqual(['P-ABC234', 'P-ABC234']);
  });

  it('does not take a real reference on the first line for a header', () => {
    expect(parseReferenceList('P-REF001\nP-ABC234')).toEqual(['P-REF001', 'P-ABC234']);
  });
});

describe('firstCell', () => {
  it('unquotes a quoted cell with a comma and a doubled quote inside', () => {
    expect(firstCell('"P-1, ""odd""",x')).toBe('P-1, "odd"');
  });
});
