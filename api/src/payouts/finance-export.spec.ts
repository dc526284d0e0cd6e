import { parse } from 'csv-parse/sync';
import { describe, expect, it } from 'vitest';
import { financeExportCsv, financeExportFileName, thresholdStanding, unitsFromMinor } from './finance-export';

describe('unitsFromMinor', () => {
  // ISO 4217's minor-unit table (from memory): USD 2 decimals, JPY 0, BHD 3; Intl carries the same table.
  it('writes minor units as currency units with the currency’s own decimals', () => {
    expect(unitsFromMinor(1000, 'USD')).toBe('10.00');
    expect(unitsFromMinor(5, 'USD')).toBe('0.05');
    expect(unitsFromMinor(1500, 'JPY')).toBe('1500');
    expect(unitsFromMinor(12345, 'BHD')).toBe('12.345');
    expect(unitsFromMinor(Number.MAX_SAFE_INTEGER, 'USD')).toBe('90071992547409.91');
  });
});

describe('financeExportCsv', () => {
  it('starts with a byte-order mark and reads back, with a reference CSV parser, to the same rows', () => {
    const csv = financeExportCsv(
      [
        { participantReference: 'P-0001', paymentsInPeriod: 2, paidInPeriodMinor: 2500, paidThisYearMinor: 170_000 },
        { participantReference: 'P-0002', paymentsInPeriod: 1, paidInPeriodMinor: 1000, paidThisYearMinor: 250_000 },
      ],
      'USD',
      200_000,
    );
    expect([...csv.subarray(0, 3)]).toEqual([0xef, 0xbb, 0xbf]);
    const records = parse(csv, { bom: true, columns: true }) as Array<Record<string, string>>;
    expect(records[0]).toEqual({
      participant_reference: 'P-0001',
      payments_in_period: '2',
      paid_in_period: '25.00',
      paid_in_period_minor: '2500',
      currency: 'USD',
      paid_this_year_all_studies: '1700.00',
      paid_this_year_all_studies_minor: '170000',
      tax_reporting_threshold: '2000.00',
      tax_threshold_standing: 'near',
    });
    expect(records[1].tax_threshold_standing).toBe('over');
  });

  it('is named by the study slug and the period', () => {
    expect(financeExportFileName('harbor-memory', '2026-01-01', '2026-03-31')).toBe(
      'harbor-memory-payments-2026-01-01-to-2026-03-31.csv',
    );
  });

  it('calls 80 % of the threshold near and the threshold itself over', () => {
    expect(thresholdStanding(159_999, 200_000)).toBe('under');
    expect(thresholdStanding(160_000, 200_000)).toBe('near');
    expect(thresholdStanding(200_000, 200_000)).toBe('over');
  });
});
