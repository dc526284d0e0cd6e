import { describe, expect, it } from 'vitest';
import { exportHref, isFiltered, selectionFromParams, selectionQuery } from './audit-selection';

describe('the audit selection in the address', () => {
  it('reads every filter, several families included, and ignores malformed days', () => {
    const selection = selectionFromParams(
      new URLSearchParams(
        'chain=lab&participant=%20P-7KQ2XA%20&staff=u1&from=2026-12-01&to=soon&family=payouts&family=steps',
      ),
    );
    expect(selection).toEqual({
      chain: 'lab',
      participant: 'P-7KQ2XA',
      staff: 'u1',
      from: '2026-12-01',
      to: null,
      families: ['payouts', 'steps'],
    });
    expect(isFiltered(selection)).toBe(true);
    expect(isFiltered(selectionFromParams(new URLSearchParams('page=2')))).toBe(false);
  });

  it('builds the api query and the export links from the same selection', () => {
    const selection = selectionFromParams(new URLSearchParams('participant=P-1&family=payouts&family=funding'));
    expect(selectionQuery(selection)).toEqual({ participant: 'P-1', family: ['payouts', 'funding'] });
    expect(exportHref('/api/audit/export.csv', selection)).toBe(
      '/api/audit/export.csv?participant=P-1&family=payouts&family=funding',
    );
    expect(exportHref('/api/audit/export-summary.txt', selectionFromParams(new URLSearchParams()))).toBe(
      '/api/audit/export-summary.txt',
    );
  });
});
