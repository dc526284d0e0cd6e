import { CopyButton } from '@/components/ui/copy-button';
import { tableRecipe } from '@/components/ui/recipes';
import type { DryRunResult } from '../api/run-dry-run';
import { armLabel, type ArmCondition } from '../utils/arm-labels';
import { BalanceTable, formatImbalance } from './balance-table';
import { ImbalanceChart } from './imbalance-chart';
import { schemeMethodText } from './scheme-methods';
import type { SchemeMethod } from '../utils/scheme-settings';

const percent = new Intl.NumberFormat(undefined, {
  style: 'percent',
  minimumFractionDigits: 1,
  maximumFractionDigits: 1,
});

export interface DryRunResultsProps {
  result: DryRunResult;
  conditions: readonly ArmCondition[];
  method: string | null;
}

function toRows(
  items: readonly { stratumKey: string; total: number; counts: Record<string, number>; imbalance: number }[],
) {
  return items.map((item) => ({
    stratumKey: item.stratumKey,
    total: item.total,
    imbalance: item.imbalance,
    counts: Object.entries(item.counts).map(([armId, count]) => ({ armId, count })),
  }));
}

export function DryRunResults({ result, conditions, method }: DryRunResultsProps) {
  const armIds = result.arms.map((arm) => arm.armId);
  const armLabels = Object.fromEntries(result.arms.map((arm) => [arm.armId, arm.label]));
  const stratified = result.strata.length > 1;
  // With a single factor its levels are the strata, so a separate factor-level view would repeat them.
  const factorCount = new Set(result.factorLevels.map((level) => level.factorId)).size;
  const showLevels = factorCount > 1;
  const levelRows = result.factorLevels.map((level) => ({
    stratumKey: `${level.factorId}=${level.level}`,
    total: level.total,
    imbalance: level.imbalance,
    counts: Object.entries(level.counts).map(([armId, count]) => ({ armId, count })),
  }));

  return (
    <section aria-labelledby="dry-run-results-heading" className="flex flex-col gap-5">
      <div>
        <h3 id="dry-run-results-heading" className="text-lg font-semibold">
          Result: {result.arrivals.toLocaleString()} simulated arrivals
          {method && ` · ${schemeMethodText[method as SchemeMethod]?.label ?? method}`}
        </h3>
        <p className="text-sm text-ink-muted">Nothing was stored and no real participant was assigned.</p>
      </div>

      <dl className="grid gap-3 sm:grid-cols-3">
        {[
          { label: 'All participants', peak: result.largestImbalance.overall, final: result.finalImbalance.overall },
          ...(stratified
            ? [
                {
                  label: 'Worst stratum',
                  peak: result.largestImbalance.inStratum,
                  final: result.finalImbalance.inStratum,
                },
              ]
            : []),
          ...(showLevels
            ? [
                {
                  label: 'Worst factor level',
                  peak: result.largestImbalance.inFactorLevel,
                  final: result.finalImbalance.inFactorLevel,
                },
              ]
            : []),
        ].map((item) => (
          <div key={item.label} className="rounded-md border border-line bg-canvas px-3 py-2">
            <dt className="text-xs font-semibold text-ink-muted">{item.label}</dt>
            <dd className="mt-0.5 text-sm">
              <span className="text-xl font-semibold tabular-nums">{formatImbalance(item.peak)}</span> largest imbalance
              <span className="block text-xs text-ink-muted">{formatImbalance(item.final)} at the end</span>
            </dd>
          </div>
        ))}
      </dl>

      <div className="flex flex-col gap-2">
        <h4 className="text-sm font-semibold">Per condition</h4>
        <div className={tableRecipe.frame}>
          <table className={tableRecipe.table}>
            <caption className="sr-only">Simulated arrivals per condition</caption>
            <thead>
              <tr>
                <th scope="col" className={tableRecipe.headCell}>
                  {result.arms.some((arm) => arm.armId.startsWith('order-')) ? 'Order' : 'Condition'}
                </th>
                <th scope="col" className={`${tableRecipe.headCell} text-right`}>
                  Participants
                </th>
                <th scope="col" className={`${tableRecipe.headCell} text-right`}>
                  Share
                </th>
                <th scope="col" className={`${tableRecipe.headCell} text-right`}>
                  Target
                </th>
              </tr>
            </thead>
            <tbody>
              {result.arms.map((arm) => {
                const label = armLabel(conditions, arm.armId, arm.label);
                return (
                  <tr key={arm.armId} className={tableRecipe.row}>
                    <th scope="row" className={`${tableRecipe.cell} text-left font-medium`}>
                      <span className="font-mono">{label.code}</span>
                      {label.name && <span className="ml-2 font-normal text-ink-muted">{label.name}</span>}
                    </th>
                    <td className={`${tableRecipe.cell} text-right tabular-nums`}>{arm.count.toLocaleString()}</td>
                    <td className={`${tableRecipe.cell} text-right tabular-nums`}>{percent.format(arm.share)}</td>
                    <td className={`${tableRecipe.cell} text-right tabular-nums text-ink-muted`}>
                      {percent.format(arm.targetShare)}
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
      </div>

      <div className="flex flex-col gap-2">
        <h4 className="text-sm font-semibold">Per stratum</h4>
        <BalanceTable
          caption="Simulated balance per stratum"
          rows={toRows(result.strata)}
          conditions={conditions}
          armIds={armIds}
          armLabels={armLabels}
          showImbalance
        />
      </div>

      {factorCount === 1 && (
        <p className="-mt-3 text-xs text-ink-muted">With one stratification factor, its levels are the strata above.</p>
      )}

      {showLevels && (
        <div className="flex flex-col gap-2">
          <h4 className="text-sm font-semibold">Per factor level</h4>
          <BalanceTable
            caption="Simulated balance per factor level"
            rows={levelRows}
            conditions={conditions}
            armIds={armIds}
            armLabels={armLabels}
            rowHeader="Factor level"
            rowLabel={(row) => {
              const at = row.stratumKey.indexOf('=');
              return `${row.stratumKey.slice(0, at).replace(/_/g, ' ')} ${row.stratumKey.slice(at + 1)}`;
            }}
            showImbalance
          />
        </div>
      )}

      {result.matchedPairs && (
        <p className="text-sm">
          {result.matchedPairs.pairs.toLocaleString()} pairs
          {result.matchedPairs.leftoverParticipantId
            ? '; one person was left unpaired (odd number of arrivals).'
            : '; nobody was left unpaired.'}
        </p>
      )}

      <ImbalanceChart points={result.imbalanceOverTime} showStrata={stratified} showFactorLevels={showLevels} />

      <div className="flex flex-col gap-1 border-t border-line pt-3">
        <p className="text-xs font-semibold">Throwaway seed of this run</p>
        <p className="font-mono text-xs break-all text-ink-muted">{result.seed}</p>
        <div>
          <CopyButton value={result.seed} label="Copy seed" />
        </div>
        <p className="text-xs text-ink-muted">
          Paste it into the seed field to repeat exactly this simulation. It is never the study’s sealed seed.
        </p>
      </div>
    </section>
  );
}
