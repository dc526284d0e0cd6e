import type { PayoutStatus } from './entities/payout.entity';

export interface LedgerPayout {
  id: string;
  status: PayoutStatus;
  amountMinor: number;
  transferId: string | null;
}

export interface ProviderTransfer {
  id: string;
  amountMinor: number;
  reversed: boolean;
  payoutId: string | null;
}

export interface ReconciliationDifference {
  kind: 'missing-at-provider' | 'unknown-at-provider' | 'amount-differs' | 'reversal-differs';
  payoutId: string | null;
  transferId: string | null;
  ledgerAmountMinor: number | null;
  providerAmountMinor: number | null;
  message: string;
}

/** Compares our ledger with the provider's transfers, one line per difference; an empty list means every cent agrees. */
export function reconcile(ledger: LedgerPayout[], transfers: ProviderTransfer[], checkedAt = new Date()) {
  const differences: ReconciliationDifference[] = [];
  const byTransfer = new Map(transfers.map((t) => [t.id, t]));
  const sent = ledger.filter((p) => p.transferId && (p.status === 'paid' || p.status === 'reversed'));
  const known = new Set(sent.map((p) => p.transferId));
  for (const payout of sent) {
    const transfer = byTransfer.get(payout.transferId!);
    if (!transfer) {
      differences.push({
        kind: 'missing-at-provider',
        payoutId: payout.id,
        transferId: payout.transferId,
        ledgerAmountMinor: payout.amountMinor,
        providerAmountMinor: null,
        message: 'We recorded this payout as sent, but the provider has no such transfer.',
      });
      continue;
    }
    if (transfer.amountMinor !== payout.amountMinor) {
      differences.push({
        kind: 'amount-differs',
        payoutId: payout.id,
        transferId: transfer.id,
        ledgerAmountMinor: payout.amountMinor,
        providerAmountMinor: transfer.amountMinor,
        message: 'The amounts differ.',
      });
    }
    if (transfer.reversed !== (payout.status === 'reversed')) {
      differences.push({
        kind: 'reversal-differs',
        payoutId: payout.id,
        transferId: transfer.id,
        ledgerAmountMinor: payout.amountMinor,
        providerAmountMinor: transfer.amountMinor,
        message: transfer.reversed
          ? 'The provider reversed this transfer; our ledger still shows it paid.'
          : 'Our ledger shows a reversal the provider does not.',
      });
    }
  }
  for (const transfer of transfers) {
    if (!known.has(transfer.id)) {
      differences.push({
        kind: 'unknown-at-provider',
        payoutId: transfer.payoutId,
        transferId: transfer.id,
        ledgerAmountMinor: null,
        providerAmountMinor: transfer.amountMinor,
        message: 'The provider shows a transfer our ledger does not record as sent.',
      });
    }
  }
  const ledgerPaid = ledger.filter((p) => p.status === 'paid');
  const live = transfers.filter((t) => !t.reversed);
  return {
    checkedAt: checkedAt.toISOString(),
    ledgerPaidCount: ledgerPaid.length,
    ledgerPaidMinor: ledgerPaid.reduce((s, p) => s + p.amountMinor, 0),
    providerTransferCount: live.length,
    providerTransferMinor: live.reduce((s, t) => s + t.amountMinor, 0),
    differences,
  };
}
