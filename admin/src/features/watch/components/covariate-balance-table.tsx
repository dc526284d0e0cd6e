import { Badge } from '@/components/ui/badge';
import { tableRecipe } from '@/components/ui/recipes';
import { EmptyState } from '@/components/ui/states';
import type { AttritionReport } from '../api/get-attrition-report';

function Difference({ d, imbalanced }: { d: number | null; imbalanced: boolean | null }) {
  if (d === null) return <span className="text-ink-muted">—</span>;
  return (
    <span className="inline-flex items-center gap-1.5">
      <span className="tabular-nums">{d.toFixed(2)}</span>
      {imbalanced && <Badge tone="caution">|d| ≥ 0.1</Badge>}
    </span>
  );
}

export function CovariateBalanceTable({ report }: { report: AttritionReport }) {
  const names = new Map(report.conditions.map((condition) => [condition.conditionId, condition.name]));
  if (report.covariateBalance.length === 0) {
    return <EmptyState title="No covariates to compare">The study records no numeric or categorical covariates, or nobody has been randomized yet.</EmptyState>;
  }
  return (
    <div className="flex flex-col gap-2">
      <div className={tableRecipe.frame}>
        <table className={tableRecipe.table}>
          <caption className="sr-only">Standardized mean differences per covariate</caption>
          <thead>
            <tr>
              <th scope="col" className={tableRecipe.headCell}>Covariate</th>
              <th scope="col" className={tableRecipe.headCell}>Comparison</th>
              <th scope="col" className={`${tableRecipe.headCell} text-right`}>All randomized</th>
              <th scope="col" className={`${tableRecipe.headCell} text-right`}>Completers</th>
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
                  <Difference {...row.allRandomized} />
                </td>
                <td className={`${tableRecipe.cell} text-right`}>
                  <Difference {...row.completers} />
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <p className="text-xs text-ink-muted">
        Standardized mean differences (Austin 2009); |d| of 0.1 or more is flagged. A covariate balanced among all randomized but not among completers
        suggests dropout is selective.
      </p>
    </div>
  );
}
