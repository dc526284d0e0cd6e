import type { ImportRowError } from '../api/import-roster';

// RFC 4180, section 2: a field holding a comma, a double quote or a line break is enclosed in double quotes, and a
// double quote inside it is written twice. Lines end with CRLF.
function csvField(value: string | number): string {
  const text = String(value);
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/** The row report as a CSV file, so a long list of problems can be fixed in the spreadsheet it came from. */
export function importReportCsv(errors: readonly ImportRowError[]): string {
  const rows = [['line', 'column', 'problem'], ...errors.map((error) => [error.line, error.field, error.message])];
  return `${rows.map((row) => row.map(csvField).join(',')).join('\r\n')}\r\n`;
}
