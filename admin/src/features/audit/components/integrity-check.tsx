import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/states';
import { ApiError } from '@/lib/api-error';
import { useVerifyAuditChains, type AuditVerification } from '../api/verify-audit-chains';
import { chainLabel } from '../utils/audit-selection';
import { formatMoment } from '@/lib/dates';

export interface IntegrityCheckProps {
  studyTitles: ReadonlyMap<string, string>;
  /** Shows one chain's events in the list below. */
  onShowChain: (chain: string) => void;
}

/** Re-computes every chain on the server and says, in words, whether the trail is as it was written. */
export function IntegrityCheck({ studyTitles, onShowChain }: IntegrityCheckProps) {
  const verify = useVerifyAuditChains();
  return (
    <div className="flex flex-col gap-3">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <p className="max-w-prose text-sm text-ink-muted">
          Every event is sealed with a key held outside the database and linked to the one before it; receipts anchor
          the newest ones.
        </p>
        <Button variant="primary" pending={verify.isPending} onClick={() => verify.mutate()}>
          Check the trail
        </Button>
      </div>
      <div aria-live="polite" className="empty:hidden">
        {verify.isError ? (
          <Notice>
            {verify.error instanceof ApiError ? verify.error.message : 'The check could not be run. Try again.'}
          </Notice>
        ) : verify.data ? (
          <Verdict result={verify.data} studyTitles={studyTitles} onShowChain={onShowChain} />
        ) : null}
      </div>
    </div>
  );
}

function receiptWords(receipt: AuditVerification['receipt']): string {
  if (!receipt) return 'No receipt has been sealed yet, so the newest events are not anchored outside the database.';
  const when = receipt.issuedAt ? ` of ${formatMoment(receipt.issuedAt)}` : '';
  return `Checked against audit receipt no. ${receipt.number ?? '?'}${when}${receipt.source === 'latest' ? ', the latest' : ''}.`;
}

function Verdict({ result, studyTitles, onShowChain }: { result: AuditVerification } & IntegrityCheckProps) {
  const count = result.chains.length;
  return (
    <div className="flex flex-col gap-2">
      {result.intact ? (
        <Notice tone="info">
          <span className="font-semibold">Intact.</span> Every event in{' '}
          {count === 1 ? 'the one chain' : `all ${count} chains`} is as it was written, and nothing sealed by a receipt
          is missing. {receiptWords(result.receipt)}
        </Notice>
      ) : (
        <Notice>
          <span className="font-semibold">Not intact.</span>{' '}
          {result.findings.length === 1 ? 'One problem was' : `${result.findings.length} problems were`} found.{' '}
          {receiptWords(result.receipt)}
        </Notice>
      )}
      {result.findings.length > 0 && (
        <ol aria-label="What failed" className="flex flex-col gap-2">
          {result.findings.map((finding) => (
            <li
              key={`${finding.chain}-${finding.sequence}-${finding.reason}`}
              className="rounded-md border border-danger/30 px-3 py-2 text-sm"
            >
              <p className="font-medium text-danger">
                {finding.chain
                  ? `${finding.studyTitle ?? chainLabel(finding.chain, studyTitles)}, event ${finding.sequence ?? '?'}`
                  : 'The receipt'}
              </p>
              {finding.event && <p className="text-ink">First failing event: “{finding.event.sentence}”</p>}
              <p className="text-ink-muted">{finding.message}</p>
            </li>
          ))}
        </ol>
      )}
      <ul aria-label="Chains checked" className="divide-y divide-line rounded-md border border-line">
        {result.chains.map((chain) => (
          <li key={chain.chain} className="flex flex-wrap items-center gap-x-3 gap-y-1 px-3 py-1.5 text-sm">
            {chain.intact ? <Badge tone="success">Intact</Badge> : <Badge tone="danger">Broken</Badge>}
            <span className="font-medium">{chainLabel(chain.chain, studyTitles)}</span>
            <span className="text-ink-muted tabular-nums">
              {chain.events} {chain.events === 1 ? 'event' : 'events'}
            </span>
            <Button variant="quiet" size="compact" className="ml-auto" onClick={() => onShowChain(chain.chain)}>
              Show its events
            </Button>
          </li>
        ))}
      </ul>
      <p className="text-xs text-ink-muted">Checked {formatMoment(result.checkedAt)}.</p>
    </div>
  );
}
