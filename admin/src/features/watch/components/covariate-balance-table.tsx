import { Badge } from '@/components/ui/badge';
import { tableRecipe } from '@/components/ui/recipes';
import { EmptyState } from '@/components/ui/states';
import type { AttritionReport, CovariateBalanceRow } from '../api/get-attrition-report';

type Difference = CovariateBalanceRow['allRandomized'];

function Difference({ difference }: { difference: Difference }) {
  const { d, chanceRange, imbalanced } = difference;
  if (d === null) return <span className="text-ink-muted">{imbalanced ? 'differs (no spread)' : '—'}</span>;
  return (
    <span className="inline-flex flex-col items-end">
      <span className="inline-flex items-center gap-1.5">
        <span className="tabular-nums">{d.toFixed(2)}</span>
        {imbalanced && <Badge tone="caution">beyond chance</Badge>}
      </span>
      {chanceRange !== null && (
        <span className="text-2xs text-ink-muted tabular-nums">chance ±{chanceRange.toFixed(2)}</span>
      )}
    </span>
  );
}

function VarianceRatio({ difference }: { difference: Difference }) {
  const { varianceRatio, varianceRatioRange, varianceRatioImbalanced } = difference;
  if (varianceRatio === null || varianceRatio === undefined) return <span className="text-ink-muted">—</span>;
  return (
    <span className="inline-flex flex-col items-end">
      <span className="inline-flex items-center gap-1.5">
        <span className="tabular-nums">{varianceRatio.toFixed(2)}</span>
        {varianceRatioImbalanced && <Badge tone="caution">beyond chance</Badge>}
      </span>
      {varianceRatioRange && (
        <span className="text-2xs text-ink-muted tabular-nums">
          chance {varianceRatioRange[0]!.toFixed(2)}–{varianceRatioRange[1]!.toFixed(2)}
        </span>
      )}
    </span>
  );
}

export function CovariateBalanceTable({ report }: { report: AttritionReport }) {
  const names = new Map(report.conditions.map((condition) => [condition.conditionId, condition.name]));
  if (report.covariateBalance.length === 0) {
    return (
      <EmptyState title="No covariates to compare">
        The study records no numeric or categorical covariates, or nobody has been randomized yet.
      </EmptyState>
    );
  }
  return (
    <div className="flex flex-col gap-2">
      <div className={tableRecipe.frame}>
        <table className={tableRecipe.table}>
          <caption className="sr-only">Standardized mean differences per covariate</caption>
          <thead>
            <tr>
              <th scope="col" className={tableRecipe.headCell}>
                Covariate
              </th>
              <th scope="col" className={tableRecipe.headCell}>
                Comparison
              </th>
              <th scope="col" className={`${tableRecipe.headCell} text-right`}>
                All randomized
              </th>
              <th scope="col" className={`${tableRecipe.headCell} text-right`}>
                Completers
              </th>
              <th scope="col" className={`${tableRecipe.headCell} text-right`}>
                Variance ratio
              </th>
            </tr>
          </thead>
          <tbody>
            {report.covariateBalance.map((row) => (
              <tr key={`${row.covariate}-${row.conditionId}`} className={tableRecipe.row}>
                <th scope="row" className={`${tableRecipe.cell} text-left font-medium`}>
                  {row.covariate} <span className="text-2xs font-normal text-ink-muted">{row.kind}</span>
                </th>
                <td className={tableRecipe.cell}>
                  {names.get(row.conditionId) ?? '?'} vs {names.get(row.comparisonConditionId) ?? '?'}
                </td>
                <td className={`${tableRecipe.cell} text-right`}>
                  <Difference difference={row.allRandomized} />
                </td>
                <td className={`${tableRecipe.cell} text-right`}>
                  <Difference difference={row.completers} />
                </td>
                <td className={`${tableRecipe.cell} text-right`}>
                  <VarianceRatio difference={row.allRandomized} />
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <p className="text-xs text-ink-muted">
        Standardized mean differences (Austin 2009). A difference is flagged only beyond the range that re-randomizing
        the same people produces 95% of the time (its permutation distribution) — the usual |d| ≥ 0.1 convention would
        fire by chance most of the time in a small study. Variance ratios (all randomized) are flagged outside their 95%
        range under equal variances (F distribution). With many rows, about one in twenty still crosses by chance. A
        covariate balanced among all randomized but not among completers suggests dropout is selective.
      </p>
    </div>
  );
}
