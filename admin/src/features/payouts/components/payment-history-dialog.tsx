import { Button } from '@/components/ui/button';
import { DialogActions, ModalDialog } from '@/components/ui/modal-dialog';
import { tableRecipe } from '@/components/ui/recipes';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { cx } from '@/components/ui/cx';
import { ApiError } from '@/lib/api-error';
import { formatMinor } from '@/lib/money';
import { usePaymentHistory } from '../api/get-payouts';
import { formatDay } from '../utils/payout-stages';
import { PayoutStatusBadge } from './payout-status-badge';

export interface PaymentHistoryDialogProps {
  studyId: string;
  participant: { enrollmentId: string; reference: string } | null;
  onClose: () => void;
}

const stillOwed = new Set(['owed', 'approved', 'sending', 'failed']);

/**
 * Everything one participant earned in this study and what became of it. The provider's transfer id shows here,
 * for staff tracing a payment with the provider; participants only ever see our receipt number.
 */
export function PaymentHistoryDialog({ studyId, participant, onClose }: PaymentHistoryDialogProps) {
  const history = usePaymentHistory(studyId, participant?.enrollmentId ?? null);
  const items = history.data?.items ?? [];
  const currency = items[0]?.currency ?? 'USD';
  const money = (minor: number) => formatMinor(minor, currency, 'en-US');
  const earned = items
    .filter((p) => p.status !== 'cancelled' && p.status !== 'reversed')
    .reduce((sum, p) => sum + p.amountMinor, 0);
  const paid = items.filter((p) => p.status === 'paid').reduce((sum, p) => sum + p.amountMinor, 0);
  const owed = items.filter((p) => stillOwed.has(p.status)).reduce((sum, p) => sum + p.amountMinor, 0);
  return (
    <ModalDialog
      open={participant !== null}
      onClose={onClose}
      title={`Payments to ${participant?.reference ?? ''}`}
      size="wide"
    >
      {history.isPending ? (
        <LoadingState label="Loading the payment history…" className="py-4" />
      ) : history.isError ? (
        <ErrorState
          message={
            history.error instanceof ApiError ? history.error.message : 'The payment history could not be loaded.'
          }
          onRetry={() => void history.refetch()}
        />
      ) : (
        <div className="flex flex-col gap-3">
          <dl className="grid grid-cols-3 gap-2 text-sm">
            {[
              ['Earned', earned],
              ['Paid', paid],
              ['Still to pay', owed],
            ].map(([label, value]) => (
              <div key={label} className="rounded-md border border-line px-3 py-2">
                <dt className="text-xs font-semibold text-ink-muted">{label}</dt>
                <dd className="font-semibold tabular-nums text-ink">{money(value as number)}</dd>
              </div>
            ))}
          </dl>
          {/* Focusable, so the table can be scrolled sideways by keyboard on a narrow screen. */}
          <div className={tableRecipe.frame} tabIndex={0} role="region" aria-label="Payouts of this participant">
            <table className={tableRecipe.table}>
              <caption className="sr-only">Every payout of {participant?.reference}, oldest first</caption>
              <thead>
                <tr>
                  <th scope="col" className={tableRecipe.headCell}>
                    Earned
                  </th>
                  <th scope="col" className={tableRecipe.headCell}>
                    For
                  </th>
                  <th scope="col" className={cx(tableRecipe.headCell, 'text-right')}>
                    Amount
                  </th>
                  <th scope="col" className={tableRecipe.headCell}>
                    State
                  </th>
                  <th scope="col" className={tableRecipe.headCell}>
                    Paid
                  </th>
                  <th scope="col" className={tableRecipe.headCell}>
                    Receipt and provider reference
                  </th>
                </tr>
              </thead>
              <tbody>
                {items.map((payout) => (
                  <tr key={payout.id} className={tableRecipe.row}>
                    <td className={cx(tableRecipe.cell, 'whitespace-nowrap')}>{formatDay(payout.createdAt)}</td>
                    <td className={tableRecipe.cell}>
                      {payout.kind === 'bonus' ? 'Completion bonus' : payout.stepTitle}
                    </td>
                    <td className={cx(tableRecipe.cell, 'text-right tabular-nums')}>{money(payout.amountMinor)}</td>
                    <td className={tableRecipe.cell}>
                      <PayoutStatusBadge status={payout.status} />
                    </td>
                    <td className={cx(tableRecipe.cell, 'whitespace-nowrap')}>{formatDay(payout.paidAt)}</td>
                    <td className={cx(tableRecipe.cell, 'text-xs')}>
                      {payout.receiptNumber ? (
                        <div className="flex flex-col">
                          <span className="font-mono">{payout.receiptNumber}</span>
                          {payout.providerTransferId && (
                            <span className="text-ink-muted">
                              Provider transfer <span className="font-mono">{payout.providerTransferId}</span>
                            </span>
                          )}
                        </div>
                      ) : (
                        '—'
                      )}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </div>
      )}
      <DialogActions>
        <Button onClick={onClose}>Close</Button>
      </DialogActions>
    </ModalDialog>
  );
}
