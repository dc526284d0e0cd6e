import { stringify } from 'csv-stringify/sync';

/** Share of the tax-reporting threshold at which staff are told someone is getting near it. */
export const NEAR_THRESHOLD = 0.8;

export type ThresholdStanding = 'under' | 'near' | 'over';

export function thresholdStanding(paidMinor: number, thresholdMinor: number): ThresholdStanding {
  return paidMinor >= thresholdMinor ? 'over' : paidMinor >= NEAR_THRESHOLD * thresholdMinor ? 'near' : 'under';
}

/** How many decimals the currency's minor unit has (2 for USD and EUR, 0 for JPY), as Intl knows it. */
export function minorDigits(currency: string): number {
  return new Intl.NumberFormat('en', { style: 'currency', currency }).resolvedOptions().maximumFractionDigits ?? 2;
}

/** Minor units as a plain decimal in currency units ("12.50"), exact for any safe integer (no floating point). */
export function unitsFromMinor(amountMinor: number, currency: string): string {
  const digits = minorDigits(currency);
  const sign = amountMinor < 0 ? '-' : '';
  const text = String(Math.abs(amountMinor)).padStart(digits + 1, '0');
  return digits === 0 ? sign + text : `${sign}${text.slice(0, -digits)}.${text.slice(-digits)}`;
}

export interface FinanceExportRow {
  participantReference: string;
  paymentsInPeriod: number;
  paidInPeriodMinor: number;
  /** Paid in the calendar year of the period's end, across every study, up to the period's end. */
  paidThisYearMinor: number;
}

export const FINANCE_EXPORT_COLUMNS = [
  'participant_reference',
  'payments_in_period',
  'paid_in_period',
  'paid_in_period_minor',
  'currency',
  'paid_this_year_all_studies',
  'paid_this_year_all_studies_minor',
  'tax_reporting_threshold',
  'tax_threshold_standing',
];

/**
 * The finance office's CSV: one row per participant paid in the period. UTF-8 with a byte-order mark, so
 * spreadsheet programs read it as UTF-8; amounts both in currency units and in minor units.
 */
export function financeExportCsv(rows: FinanceExportRow[], currency: string, thresholdMinor: number): Buffer {
  const body = stringify(
    rows.map((row) => [
      row.participantReference,
      row.paymentsInPeriod,
      unitsFromMinor(row.paidInPeriodMinor, currency),
      row.paidInPeriodMinor,
      currency,
      unitsFromMinor(row.paidThisYearMinor, currency),
      row.paidThisYearMinor,
      unitsFromMinor(thresholdMinor, currency),
      thresholdStanding(row.paidThisYearMinor, thresholdMinor),
    ]),
    { header: true, columns: FINANCE_EXPORT_COLUMNS, record_delimiter: 'windows' },
  );
  return Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from(body, 'utf8')]);
}

export function financeExportFileName(studySlug: string, from: string, to: string): string {
  return `${studySlug}-payments-${from}-to-${to}.csv`;
}
