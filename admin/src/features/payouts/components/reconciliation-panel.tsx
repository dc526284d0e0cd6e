import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { Panel } from '@/components/ui/panel';
import { tableRecipe } from '@/components/ui/recipes';
import { ErrorState, LoadingState, Notice } from '@/components/ui/states';
import { ApiError } from '@/lib/api-error';
import { formatMinor } from '@/lib/money';
import { useReconciliation, type ReconciliationDifference } from '../api/get-reconciliation';
import { formatMoment } from '@/lib/dates';

const differenceLabels: Record<string, string> = {
  'missing-at-provider': 'Paid here, no transfer at the provider',
  'unknown-at-provider': 'Transfer at the provider, not in our ledger',
  'amount-differs': 'Amounts differ',
  'reversal-differs': 'Reversal recorded differently',
};

export function ReconciliationPanel({ studyId, currency }: { studyId: string; currency: string }) {
  const [requested, setRequested] = useState(false);
  const check = useReconciliation(studyId, requested);
  const money = (minor: number | null) => (minor === null ? '—' : formatMinor(minor, currency, 'en-US'));

  return (
    <Panel
      id="reconciliation"
      title="Reconciliation"
      description="Compares every payout we recorded as paid with the provider's list of transfers."
      actions={
        <Button onClick={() => (requested ? void check.refetch() : setRequested(true))} pending={check.isFetching}>
          Check against the provider
        </Button>
      }
    >
      <div aria-live="polite">
        {!requested ? (
          <p className="text-sm text-ink-muted">Not checked yet.</p>
        ) : check.isPending ? (
          <LoadingState label="Asking the provider…" className="py-4" />
        ) : check.isError ? (
          <ErrorState
            message={check.error instanceof ApiError ? check.error.message : 'The check could not be run.'}
            onRetry={() => void check.refetch()}
          />
        ) : (
          <div className="flex flex-col gap-3">
            <p className="text-sm text-ink-muted">
              Checked {formatMoment(check.data.checkedAt)}: our ledger has {check.data.ledgerPaidCount} paid (
              {money(check.data.ledgerPaidMinor)}), the provider has {check.data.providerTransferCount} transfers (
              {money(check.data.providerTransferMinor)}).
            </p>
            {check.data.differences.length === 0 ? (
              <Notice tone="info">Every payout matches.</Notice>
            ) : (
              <DifferencesTable differences={check.data.differences} money={money} />
            )}
          </div>
        )}
      </div>
    </Panel>
  );
}

function DifferencesTable({
  differences,
  money,
}: {
  differences: ReconciliationDifference[];
  money: (minor: number | null) => string;
}) {
  return (
    <div className={tableRecipe.frame}>
      <table className={tableRecipe.table}>
        <caption className="sr-only">{differences.length} differences between our ledger and the provider</caption>
        <thead>
          <tr>
            <th scope="col" className={tableRecipe.headCell}>
              Difference
            </th>
            <th scope="col" className={tableRecipe.headCell}>
              Payout
            </th>
            <th scope="col" className={tableRecipe.headCell}>
              Transfer
            </th>
            <th scope="col" className={tableRecipe.headCell}>
              Our ledger
            </th>
            <th scope="col" className={tableRecipe.headCell}>
              Provider
            </th>
            <th scope="col" className={tableRecipe.headCell}>
              Details
            </th>
          </tr>
        </thead>
        <tbody>
          {differences.map((difference, index) => (
            <tr
              key={`${difference.kind}-${difference.payoutId ?? difference.transferId ?? index}`}
              className={tableRecipe.row}
            >
              <td className={tableRecipe.cell}>{differenceLabels[difference.kind] ?? difference.kind}</td>
              <td className={`${tableRecipe.cell} font-mono text-xs`}>{difference.payoutId ?? '—'}</td>
              <td className={`${tableRecipe.cell} font-mono text-xs`}>{difference.transferId ?? '—'}</td>
              <td className={`${tableRecipe.cell} tabular-nums`}>{money(difference.ledgerAmountMinor)}</td>
              <td className={`${tableRecipe.cell} tabular-nums`}>{money(difference.providerAmountMinor)}</td>
              <td className={tableRecipe.cell}>{difference.message}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
