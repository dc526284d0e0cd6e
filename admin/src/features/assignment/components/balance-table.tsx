import { tableRecipe } from '@/components/ui/recipes';
import { armLabel, stratumLabel, type ArmCondition } from '../utils/arm-labels';

export interface BalanceRow {
  stratumKey: string;
  total: number;
  counts: { armId: string; count: number }[];
  imbalance?: number;
}

export interface BalanceTableProps {
  caption: string;
  rows: readonly BalanceRow[];
  conditions: readonly ArmCondition[];
  /** Arms in column order; for a between design every condition, so empty ones show 0. */
  armIds: readonly string[];
  /** Labels from the api for arms it names itself (a dry run’s "order-1"). */
  armLabels?: Readonly<Record<string, string>>;
  /** Name of the first column ("Stratum", "Level"). */
  rowHeader?: string;
  rowLabel?: (row: BalanceRow) => string;
  showImbalance?: boolean;
}

/** Counts per stratum (or factor level) and condition (or order), with row totals. */
export function BalanceTable({
  caption,
  rows,
  conditions,
  armIds,
  armLabels,
  rowHeader = 'Stratum',
  rowLabel,
  showImbalance = false,
}: BalanceTableProps) {
  return (
    <div className={tableRecipe.frame}>
      <table className={tableRecipe.table}>
        <caption className="sr-only">{caption}</caption>
        <thead>
          <tr>
            <th scope="col" className={tableRecipe.headCell}>
              {rowHeader}
            </th>
            {armIds.map((armId) => {
              const label = armLabel(conditions, armId, armLabels?.[armId]);
              return (
                <th key={armId} scope="col" className={`${tableRecipe.headCell} text-right normal-case`}>
                  <span className="font-mono text-xs tracking-normal text-ink">{label.code}</span>
                  {label.name && <span className="block font-normal tracking-normal">{label.name}</span>}
                </th>
              );
            })}
            <th scope="col" className={`${tableRecipe.headCell} text-right`}>
              Total
            </th>
            {showImbalance && (
              <th scope="col" className={`${tableRecipe.headCell} text-right`}>
                Imbalance
              </th>
            )}
          </tr>
        </thead>
        <tbody>
          {rows.map((row) => (
            <tr key={row.stratumKey} className={tableRecipe.row}>
              <th scope="row" className={`${tableRecipe.cell} text-left font-medium`}>
                {rowLabel ? rowLabel(row) : stratumLabel(row.stratumKey)}
              </th>
              {armIds.map((armId) => (
                <td key={armId} className={`${tableRecipe.cell} text-right tabular-nums`}>
                  {(row.counts.find((count) => count.armId === armId)?.count ?? 0).toLocaleString()}
                </td>
              ))}
              <td className={`${tableRecipe.cell} text-right font-semibold tabular-nums`}>
                {row.total.toLocaleString()}
              </td>
              {showImbalance && (
                <td
                  className={`${tableRecipe.cell} text-right tabular-nums ${row.imbalance && row.imbalance > 2 ? 'font-semibold text-caution' : ''}`}
                >
                  {formatImbalance(row.imbalance ?? 0)}
                </td>
              )}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

export function formatImbalance(value: number): string {
  return Number.isInteger(value) ? String(value) : value.toFixed(2);
}
