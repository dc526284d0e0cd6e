import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/states';
import { ApiError } from '@/lib/api-error';
import { useVerifyAuditChains, type AuditVerification } from '../api/verify-audit-chains';
import { chainLabel } from '../utils/audit-labels';

const momentFormat = new Intl.DateTimeFormat(undefined, { dateStyle: 'medium', timeStyle: 'medium' });

export interface IntegrityCheckProps {
  studyTitles: ReadonlyMap<string, string>;
  /** Shows one chain's events in the table below. */
  onShowChain: (chain: string) => void;
}

/** Re-computes every chain on the server and reports, per chain, whether each link still matches the one before. */
export function IntegrityCheck({ studyTitles, onShowChain }: IntegrityCheckProps) {
  const verify = useVerifyAuditChains();
  return (
    <div className="flex flex-col gap-3">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <p className="max-w-prose text-sm text-ink-muted">
          Each event stores the hash of the one before it in its chain. Changing or deleting any past event breaks every link after it.
        </p>
        <Button variant="primary" pending={verify.isPending} onClick={() => verify.mutate()}>
          Check integrity
        </Button>
      </div>
      <div aria-live="polite" className="empty:hidden">
        {verify.isError ? (
          <Notice>{verify.error instanceof ApiError ? verify.error.message : 'The check could not be run. Try again.'}</Notice>
        ) : verify.data ? (
          <VerificationResult result={verify.data} studyTitles={studyTitles} onShowChain={onShowChain} />
        ) : null}
      </div>
    </div>
  );
}

function VerificationResult({ result, studyTitles, onShowChain }: { result: AuditVerification } & IntegrityCheckProps) {
  const broken = result.chains.filter((chain) => !chain.intact).length;
  return (
    <div className="flex flex-col gap-2">
      <p className={result.intact ? 'text-sm font-medium text-success' : 'text-sm font-medium text-danger'}>
        {result.intact
          ? `All ${result.chains.length} ${result.chains.length === 1 ? 'chain is' : 'chains are'} intact.`
          : `${broken} of ${result.chains.length} ${result.chains.length === 1 ? 'chain is' : 'chains are'} broken.`}{' '}
        <span className="font-normal text-ink-muted">Checked {momentFormat.format(new Date(result.checkedAt))}.</span>
      </p>
      <ul aria-label="Chains checked" className="divide-y divide-line rounded-md border border-line">
        {result.chains.map((chain) => (
          <li key={chain.chain} className="flex flex-wrap items-center gap-x-3 gap-y-1 px-3 py-2 text-sm">
            {chain.intact ? <Badge tone="success">Intact</Badge> : <Badge tone="danger">Broken</Badge>}
            <span className="font-medium">{chainLabel(chain.chain, studyTitles)}</span>
            <span className="text-ink-muted tabular-nums">
              {chain.events} {chain.events === 1 ? 'event' : 'events'}
            </span>
            {chain.firstBreak && (
              <span className="text-danger">
                First broken link: event {chain.firstBreak.sequence} ({chain.firstBreak.reason})
              </span>
            )}
            <Button variant="quiet" size="compact" className="ml-auto" onClick={() => onShowChain(chain.chain)}>
              Show its events
            </Button>
          </li>
        ))}
      </ul>
    </div>
  );
}
