import { parse } from 'csv-parse/sync';

export interface RosterFactor {
  key: string;
  kind: 'numeric' | 'categorical';
  categories: string[] | null;
}

export interface RosterRow {
  line: number;
  email: string;
  name: string | null;
  covariates: Record<string, number | string>;
}

export interface RosterRowError {
  line: number;
  field: string;
  message: string;
}

export interface ParsedRoster {
  rows: RosterRow[];
  errors: RosterRowError[];
  /** Columns that are neither e-mail, name nor a factor of the study; reported once, otherwise ignored. */
  ignoredColumns: string[];
}

export const MAX_ROSTER_ROWS = 20_000;
/** The longest display name kept for a roster row, as for a staff member's name. */
export const MAX_DISPLAY_NAME_LENGTH = 200;
const MAX_EMAIL_LENGTH = 254;
// NUL cannot be stored in PostgreSQL text; other control characters have no place in a name or an address.
const CONTROL_CHARACTERS = /[\u0000-\u001f\u007f]/;
const EMAIL = /^[^\s@,;]+@[^\s@,;]+\.[^\s@,;]+$/;

/**
 * Reads a roster CSV: a header row with `email`, optionally `name`, and one column per stratification factor (the
 * pretest answers). Every bad row is reported with its line number and field; good rows are returned as they are.
 */
export function parseRoster(csv: string, factors: RosterFactor[]): ParsedRoster {
  let records: string[][];
  try {
    records = parse(csv.replace(/^\uFEFF/, ''), { skip_empty_lines: true, relax_column_count: true, trim: true });
  } catch (error) {
    return {
      rows: [],
      errors: [{ line: 1, field: 'file', message: `is not readable as CSV: ${(error as Error).message}` }],
      ignoredColumns: [],
    };
  }
  if (records.length === 0)
    return { rows: [], errors: [{ line: 1, field: 'file', message: 'is empty' }], ignoredColumns: [] };
  const header = records[0].map((h) => h.trim().toLowerCase());
  const emailColumn = header.findIndex((h) => h === 'email' || h === 'e-mail');
  if (emailColumn < 0)
    return {
      rows: [],
      errors: [{ line: 1, field: 'email', message: 'the header row needs an "email" column' }],
      ignoredColumns: [],
    };
  const nameColumn = header.indexOf('name');
  const factorColumns = factors.map((f) => ({ factor: f, column: header.indexOf(f.key) }));
  const ignoredColumns = header.filter(
    (h, i) => i !== emailColumn && i !== nameColumn && !factors.some((f) => f.key === h),
  );
  const errors: RosterRowError[] = factorColumns
    .filter((c) => c.column < 0)
    .map((c) => ({
      line: 1,
      field: c.factor.key,
      message: `the header row has no "${c.factor.key}" column; those answers will be asked at screening`,
    }));
  if (records.length - 1 > MAX_ROSTER_ROWS) {
    return {
      rows: [],
      errors: [
        { line: 1, field: 'file', message: `has ${records.length - 1} rows; at most ${MAX_ROSTER_ROWS} per import` },
      ],
      ignoredColumns,
    };
  }

  const rows: RosterRow[] = [];
  const seen = new Map<string, number>();
  records.slice(1).forEach((record, index) => {
    const line = index + 2;
    const email = (record[emailColumn] ?? '').trim().toLowerCase();
    if (email.length > MAX_EMAIL_LENGTH || CONTROL_CHARACTERS.test(email)) {
      errors.push({
        line,
        field: 'email',
        message: `is not an e-mail address (at most ${MAX_EMAIL_LENGTH} characters, no control characters)`,
      });
      return;
    }
    if (!EMAIL.test(email)) {
      errors.push({ line, field: 'email', message: email ? `"${email}" is not an e-mail address` : 'is empty' });
      return;
    }
    if (seen.has(email)) {
      errors.push({ line, field: 'email', message: `${email} already appears on line ${seen.get(email)}` });
      return;
    }
    seen.set(email, line);
    const name = nameColumn >= 0 ? record[nameColumn]?.trim() || null : null;
    if (name !== null && name.length > MAX_DISPLAY_NAME_LENGTH) {
      errors.push({ line, field: 'name', message: `is longer than ${MAX_DISPLAY_NAME_LENGTH} characters` });
      return;
    }
    if (name !== null && CONTROL_CHARACTERS.test(name)) {
      errors.push({ line, field: 'name', message: 'contains control characters' });
      return;
    }
    const covariates: Record<string, number | string> = {};
    let rowOk = true;
    for (const { factor, column } of factorColumns) {
      if (column < 0) continue;
      const raw = (record[column] ?? '').trim();
      if (raw === '') continue;
      if (raw.length > MAX_DISPLAY_NAME_LENGTH || CONTROL_CHARACTERS.test(raw)) {
        errors.push({
          line,
          field: factor.key,
          message: `is not a readable answer (at most ${MAX_DISPLAY_NAME_LENGTH} characters, no control characters)`,
        });
        rowOk = false;
        continue;
      }
      if (factor.kind === 'numeric') {
        const value = Number(raw.replace(',', '.'));
        if (!Number.isFinite(value)) {
          errors.push({ line, field: factor.key, message: `"${raw}" is not a number` });
          rowOk = false;
        } else covariates[factor.key] = value;
      } else if (!(factor.categories ?? []).includes(raw)) {
        errors.push({
          line,
          field: factor.key,
          message: `"${raw}" is not one of ${(factor.categories ?? []).join(', ')}`,
        });
        rowOk = false;
      } else covariates[factor.key] = raw;
    }
    if (rowOk) rows.push({ line, email, name, covariates });
  });
  return { rows, errors, ignoredColumns };
}
