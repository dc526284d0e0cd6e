import { Button } from '@/components/ui/button';
import { DialogActions, ModalDialog } from '@/components/ui/modal-dialog';
import { formatMinor } from '@/lib/money';
import type { Payout } from '../api/get-payouts';
import { plural, type SelectionSummary } from '../utils/payout-stages';

/** What is about to move money: the ticked rows, everything waiting for approval, or one failed payout again. */
export type PendingSend =
  | { kind: 'selected'; now: SelectionSummary }
  | { kind: 'all'; now: SelectionSummary; waiting: SelectionSummary }
  | { kind: 'retry'; now: SelectionSummary; payout: Payout };

export interface ConfirmSendDialogProps {
  pending: PendingSend | null;
  currency: string;
  onCancel: () => void;
  onConfirm: (send: PendingSend) => void;
}

/** The last step before money moves: exactly how many payouts, to how many people, for how much, and who waits. */
export function ConfirmSendDialog({ pending, currency, onCancel, onConfirm }: ConfirmSendDialogProps) {
  if (!pending) return null;
  const money = (minor: number) => formatMinor(minor, currency, 'en-US');
  const amount = money(pending.now.amountMinor);
  const retry = pending.kind === 'retry';
  const title = retry ? `Send ${amount} to ${pending.payout.reference} again?` : `Send ${amount} now?`;
  return (
    <ModalDialog open onClose={onCancel} role="alertdialog" title={title}>
      <div className="flex flex-col gap-2 text-sm text-ink">
        {retry ? (
          <p>
            The earlier try failed: {(pending.payout.failureReason ?? 'no reason was given').replace(/\.$/, '')}. It is
            sent under the same key, so the participant can never be paid twice.
          </p>
        ) : (
          <p>
            {plural(pending.now.payouts, 'payout', 'payouts')} to{' '}
            {pending.now.participants === 1
              ? '1 participant who has'
              : `${pending.now.participants} participants who have`}{' '}
            set up how they get paid. Sending starts as soon as you confirm.
          </p>
        )}
        {pending.kind === 'all' && pending.waiting.payouts > 0 && (
          <p className="text-ink-muted">
            Not included: {plural(pending.waiting.payouts, 'payout', 'payouts')} ({money(pending.waiting.amountMinor)})
            to {plural(pending.waiting.participants, 'participant', 'participants')} who have not finished setting up
            how they get paid. They stay under “Waiting for the participant’s set-up”.
          </p>
        )}
        <p className="text-ink-muted">
          The study's funded balance must cover it; if it does not, nothing is sent and you are told how much is
          missing.
        </p>
      </div>
      <DialogActions>
        <Button onClick={onCancel}>Cancel</Button>
        <Button variant="primary" onClick={() => onConfirm(pending)}>
          {retry ? 'Send again' : `Send ${amount}`}
        </Button>
      </DialogActions>
    </ModalDialog>
  );
}
