import { render, screen, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import type { AttritionReport } from '../api/get-attrition-report';
import { StratifiedTests } from './stratified-tests';

const conditions = [
  { conditionId: 'a', name: 'A' },
  { conditionId: 'b', name: 'B' },
];

function reportWith(stratified: AttritionReport['stratified']): AttritionReport {
  return { conditions, stratified } as unknown as AttritionReport;
}

describe('StratifiedTests', () => {
  it('names the strata and gives both stratified tests with observed and expected dropouts', () => {
    render(
      <StratifiedTests
        report={reportWith({
          strata: ['age=<30', 'age=≥30'],
          stratified: true,
          cmh: { method: 'cochran-mantel-haenszel', statistic: 5.012, df: 1, pValue: 0.0252, strataUsed: 2 },
          logRank: {
            method: 'stratified-log-rank',
            statistic: 6.5,
            df: 1,
            pValue: 0.0108,
            strataUsed: 2,
            groups: [
              { conditionId: 'a', observed: 3, expected: 6.25 },
              { conditionId: 'b', observed: 9, expected: 5.75 },
            ],
          },
        })}
      />,
    );
    const strata = screen.getByRole('list', { name: 'Randomization strata' });
    expect(
      within(strata)
        .getAllByRole('listitem')
        .map((item) => item.textContent),
    ).toEqual(['age <30', 'age ≥30']);
    expect(screen.getByTestId('stratified-tests')).toHaveTextContent(
      'Cochran–Mantel–Haenszel test of dropout by condition within strata: χ²(1) = 5.01, p = 0.025.',
    );
    expect(screen.getByTestId('stratified-tests')).toHaveTextContent(
      'Stratified log-rank test of time to dropout within strata: χ²(1) = 6.50, p = 0.011.',
    );
    expect(screen.getByText(/A 3 vs 6\.3, B 9 vs 5\.8/)).toBeInTheDocument();
    expect(screen.getByText(/Screening aids, not the study's analysis/)).toBeInTheDocument();
  });

  it('says there is nothing to stratify by when everyone is in one stratum', () => {
    render(<StratifiedTests report={reportWith({ strata: ['all'], stratified: false, cmh: null, logRank: null })} />);
    expect(screen.queryByRole('list', { name: 'Randomization strata' })).toBeNull();
    expect(screen.getByTestId('stratified-tests')).toHaveTextContent(/This study has no randomization strata/);
  });
});
