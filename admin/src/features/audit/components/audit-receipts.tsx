import { Button } from '@/components/ui/button';
import { buttonRecipe } from '@/components/ui/recipes';
import { cx } from '@/components/ui/cx';
import { ErrorState, LoadingState, Notice } from '@/components/ui/states';
import { ApiError } from '@/lib/api-error';
import { receiptHref, useAuditReceipts, useSealReceipt } from '../api/audit-receipts';
import { formatMoment } from '@/lib/dates';

/** Receipts seal every chain's newest event; each one is e-mailed to the auditors and can be downloaded here. */
export function AuditReceipts({ canSeal }: { canSeal: boolean }) {
  const receipts = useAuditReceipts();
  const seal = useSealReceipt();
  return (
    <div className="flex flex-col gap-3">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <p className="max-w-prose text-sm text-ink-muted">
          Keep the e-mailed copies: checking the trail against a receipt held outside Evenhand shows whether anything it
          sealed was later removed.
        </p>
        {canSeal && (
          <Button variant="primary" pending={seal.isPending} onClick={() => seal.mutate()}>
            Seal a receipt now
          </Button>
        )}
      </div>
      <div aria-live="polite" className="empty:hidden">
        {seal.isSuccess && (
          <Notice tone="info">
            Receipt no. {seal.data.number} sealed {seal.data.chains.length}{' '}
            {seal.data.chains.length === 1 ? 'chain' : 'chains'}; it is on its way to the auditors.
          </Notice>
        )}
        {seal.isError && (
          <Notice>
            {seal.error instanceof ApiError ? seal.error.message : 'The receipt could not be sealed. Try again.'}
          </Notice>
        )}
      </div>
      {receipts.isPending ? (
        <LoadingState label="Loading receipts…" />
      ) : receipts.isError ? (
        <ErrorState
          message={receipts.error instanceof ApiError ? receipts.error.message : 'The receipts could not be loaded.'}
          onRetry={() => void receipts.refetch()}
        />
      ) : receipts.data.length === 0 ? (
        <p className="text-sm text-ink-muted">
          No receipt yet. One is sealed every hour when the trail has moved, or now with the button above.
        </p>
      ) : (
        <ul aria-label="Audit receipts" className="divide-y divide-line rounded-md border border-line">
          {receipts.data.slice(0, 8).map((receipt) => (
            <li key={receipt.id} className="flex flex-wrap items-center gap-x-3 gap-y-1 px-3 py-2 text-sm">
              <span className="font-semibold tabular-nums">No. {receipt.number}</span>
              <time dateTime={receipt.issuedAt} className="text-ink-muted">
                {formatMoment(receipt.issuedAt)}
              </time>
              <span className="text-ink-muted">
                {receipt.reason === 'on-demand' ? 'sealed on request' : 'sealed on schedule'} · {receipt.chains}{' '}
                {receipt.chains === 1 ? 'chain' : 'chains'}
              </span>
              <a
                href={receiptHref(receipt.id)}
                download
                aria-label={`Download receipt no. ${receipt.number}`}
                className={cx(buttonRecipe.base, buttonRecipe.sizes.compact, buttonRecipe.variants.quiet, 'ml-auto')}
              >
                Download
              </a>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
