import { screen } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { renderWithProviders } from '@/test/render-with-providers';
import type { AttritionReport, WwcPair } from '../api/get-attrition-report';
import type { WwcVerdict } from '../utils/watch-format';
import { WwcVerdicts } from './wwc-verdicts';

// Boundary rows from the WWC Procedures and Standards Handbook v5.0 attrition table (api/src/attrition/data):
// 24% overall → cautious 4.9, optimistic 9.5 points; 45% overall → cautious 1.8, optimistic 5.1 points.
function pair(
  conditionId: string,
  overallPercentRow: number | null,
  differential: number,
  cautious: [WwcVerdict, number | null],
  optimistic: [WwcVerdict, number | null],
  comparisonConditionId = 'a',
): WwcPair {
  return {
    conditionId,
    comparisonConditionId,
    overallPercentRows: overallPercentRow === null ? [] : [overallPercentRow],
    differenceInterval: { lower: differential - 0.05, upper: differential + 0.05 },
    riskRatio: null,
    overallAttritionRate: overallPercentRow === null ? 0.7 : overallPercentRow / 100,
    differentialAttritionRate: differential,
    overallPercentRow,
    cautious: { verdict: cautious[0], maxDifferentialPercent: cautious[1], overallPercentRow },
    optimistic: { verdict: optimistic[0], maxDifferentialPercent: optimistic[1], overallPercentRow },
  };
}

const severity = ['low-attrition', 'not-computable', 'outside-published-range', 'high-attrition'];
const worst = (pairs: WwcPair[], side: 'cautious' | 'optimistic') =>
  [...pairs].sort(
    (x, y) =>
      severity.indexOf(y[side].verdict) - severity.indexOf(x[side].verdict) ||
      (y.differentialAttritionRate ?? 0) - (x.differentialAttritionRate ?? 0),
  )[0] ?? null;

function report(
  pairs: WwcPair[],
  cautious: string,
  optimistic: string,
  names = ['A', 'B'],
  allPairs = pairs,
): AttritionReport {
  return {
    conditions: names.map((name, index) => ({ conditionId: String.fromCharCode(97 + index), name })),
    wwc: {
      comparisonConditionId: 'a',
      cautious,
      optimistic,
      pairs,
      allPairs,
      worstPair: { cautious: worst(allPairs, 'cautious'), optimistic: worst(allPairs, 'optimistic') },
    },
    wwcRowRule: 'A rate between two rows is judged on the stricter of the two.',
    overall: {
      randomized: 40,
      dropped: 10,
      dropoutRateSoFar: 0.25,
      windowEndedRandomized: 30,
      attrited: 7,
      attritionRate: 0.24,
    },
    differentialAttrition: pairs[0]?.differentialAttritionRate ?? null,
    dropoutTest: {
      method: 'chi-square',
      statistic: 30.07,
      df: 2,
      pValue: 2.954e-7,
      continuityCorrection: false,
      tableConditionIds: [],
      chiSquare: null,
      fisherExact: null,
    },
  } as unknown as AttritionReport;
}

describe('WwcVerdicts', () => {
  it('headlines the worst of every pair, even one the comparison picker does not show (20 %, 16 %, 24 %)', () => {
    // Against A: 18 % / 4 points and 22 % / 4 points, both low. B vs C: 20 % overall, 8 points: beyond 5.4 (cautious).
    const view = [
      pair('b', 18, 0.04, ['low-attrition', 5.7], ['low-attrition', 10.5]),
      pair('c', 22, 0.04, ['low-attrition', 5.2], ['low-attrition', 9.9]),
    ];
    const everyPair = [...view, pair('b', 20, 0.08, ['high-attrition', 5.4], ['low-attrition', 10.2], 'c')];
    const data = report(view, 'high-attrition', 'low-attrition', ['A', 'B', 'C'], everyPair);
    renderWithProviders(<WwcVerdicts report={data} comparisonConditionId={null} onComparisonChange={() => {}} />);
    expect(screen.getByText('Differential dropout is beyond the cautious WWC boundary')).toBeInTheDocument();
    expect(screen.getByTestId('worst-pair-cautious')).toHaveTextContent(
      /B vs C: Overall attrition 20\.0%, differential 8\.0 points; at 20% overall the boundary tolerates up to 5\.4 points/,
    );
    expect(screen.getByRole('list', { name: 'Every pair' })).toHaveTextContent(/B vs C/);
    expect(screen.getByText(/judged on the stricter of the two/)).toBeInTheDocument();
  });

  it('says beyond the cautious and within the optimistic boundary, with the numbers', () => {
    // 7.3 points at 24% overall: above 4.9 (cautious), below 9.5 (optimistic).
    const data = report(
      [pair('b', 24, 0.073, ['high-attrition', 4.9], ['low-attrition', 9.5])],
      'high-attrition',
      'low-attrition',
    );
    renderWithProviders(<WwcVerdicts report={data} comparisonConditionId={null} onComparisonChange={() => {}} />);
    expect(screen.getByText('Differential dropout is beyond the cautious WWC boundary')).toBeInTheDocument();
    expect(screen.getByText('Differential dropout is within the optimistic WWC boundary')).toBeInTheDocument();
    expect(screen.getByText(/at 24% overall the boundary tolerates up to 4\.9 points/)).toBeInTheDocument();
    expect(screen.getByText(/at 24% overall the boundary tolerates up to 9\.5 points/)).toBeInTheDocument();
    expect(screen.getByTestId('dropout-test')).toHaveTextContent(
      'without continuity correction: χ²(2) = 30.07, p < 0.001',
    );
    // Two conditions: no picker.
    expect(screen.queryByText('Compare the others with')).not.toBeInTheDocument();
  });

  it('says within both when the difference is under both lines', () => {
    // 1.0 point at 45% overall: below 1.8 and 5.1.
    const data = report(
      [pair('b', 45, 0.01, ['low-attrition', 1.8], ['low-attrition', 5.1])],
      'low-attrition',
      'low-attrition',
    );
    renderWithProviders(<WwcVerdicts report={data} comparisonConditionId={null} onComparisonChange={() => {}} />);
    expect(screen.getByText('Differential dropout is within the cautious WWC boundary')).toBeInTheDocument();
    expect(screen.getByText('Differential dropout is within the optimistic WWC boundary')).toBeInTheDocument();
  });

  it('explains an overall rate outside the published table and offers the comparison picker for three conditions', () => {
    // 70% overall is past the last cautious row (57%) and the last optimistic row of the handbook table.
    const data = report(
      [
        pair('b', 24, 0.02, ['low-attrition', 4.9], ['low-attrition', 9.5]),
        pair('c', null, 0.5, ['outside-published-range', null], ['outside-published-range', null]),
      ],
      'outside-published-range',
      'outside-published-range',
      ['A', 'B', 'C'],
    );
    renderWithProviders(<WwcVerdicts report={data} comparisonConditionId={null} onComparisonChange={() => {}} />);
    expect(
      screen.getByText('Overall attrition is outside the range the cautious WWC boundary covers'),
    ).toBeInTheDocument();
    expect(screen.getAllByText(/published table stops before this overall rate/)).toHaveLength(2);
    expect(screen.getByText('Compare the others with')).toBeInTheDocument();
    expect(screen.getByRole('button', { name: /Compare the others with/ })).toHaveTextContent('Condition A');
  });
});
