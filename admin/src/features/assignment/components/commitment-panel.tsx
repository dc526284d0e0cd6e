import { Disclosure, DisclosureButton, DisclosurePanel } from '@headlessui/react';
import { CopyButton } from '@/components/ui/copy-button';
import { Panel } from '@/components/ui/panel';
import { disclosureRecipe } from '@/components/ui/recipes';
import type { Assignment } from '../api/get-assignment';
import { SchemeSummary } from './scheme-summary';
import { formatMoment } from '@/lib/dates';

function Chevron() {
  return (
    <svg className={disclosureRecipe.chevron} viewBox="0 0 16 16" fill="none" aria-hidden="true">
      <path d="m6 4 4 4-4 4" stroke="currentColor" strokeWidth="1.6" strokeLinecap="round" strokeLinejoin="round" />
    </svg>
  );
}

/** The published fingerprint, what it proves, and the sealed parameters it covers. */
export function CommitmentPanel({ assignment }: { assignment: Assignment }) {
  return (
    <Panel
      id="commitment"
      title="Sealed sequence"
      description={
        assignment.commitment
          ? 'Who gets which condition was fixed in advance by a secret seed. The fingerprint below was published before anyone was assigned.'
          : 'When the study opens, who gets which condition is fixed in advance by a secret seed, and its fingerprint is published.'
      }
    >
      <div className="flex flex-col gap-4">
        {assignment.commitment ? (
          <div className="flex flex-col gap-2">
            <p className="text-xs font-semibold text-ink">Fingerprint (SHA-256 commitment)</p>
            <p
              className="rounded-md border border-line bg-canvas px-3 py-2 font-mono text-sm break-all"
              data-testid="commitment"
            >
              {assignment.commitment}
            </p>
            <div className="flex flex-wrap items-center gap-3">
              <CopyButton value={assignment.commitment} label="Copy fingerprint" />
              {assignment.committedAt && (
                <span className="text-xs text-ink-muted">Published {formatMoment(assignment.committedAt)}</span>
              )}
            </div>
            <p className="max-w-prose text-sm text-ink-muted">
              The fingerprint is SHA-256 over the secret seed and the scheme’s parameters. Anyone holding it can later
              check that the sequence was not changed: once the seed is revealed (at closing or an audited unblinding),
              hashing it with the parameters must give this exact value, and re-deriving the sequence from it must
              reproduce every assignment.
            </p>
          </div>
        ) : (
          <p className="text-sm text-ink-muted">
            Not sealed yet. Opening the study draws the seed, seals the sequence and publishes its fingerprint here and
            in the audit trail.
          </p>
        )}

        <div className="flex flex-col gap-2 border-t border-line pt-3">
          <p className="text-xs font-semibold text-ink">Scheme</p>
          <SchemeSummary method={assignment.method} settings={assignment.settings} />
          {assignment.sealedParameters && (
            <Disclosure>
              <DisclosureButton className={disclosureRecipe.button}>
                <Chevron />
                Sealed parameters (JSON)
              </DisclosureButton>
              <DisclosurePanel className={disclosureRecipe.panel}>
                <pre className="max-h-80 overflow-auto rounded-md border border-line bg-canvas p-3 font-mono text-xs">
                  {JSON.stringify(assignment.sealedParameters, null, 2)}
                </pre>
                <p className="mt-1 text-xs text-ink-muted">
                  Exactly what the fingerprint covers, with conditions and factors by id.
                </p>
              </DisclosurePanel>
            </Disclosure>
          )}
        </div>

        {assignment.seed && (
          <div className="flex flex-col gap-2 border-t border-line pt-3">
            <p className="text-xs font-semibold text-ink">Revealed seed</p>
            <p
              className="rounded-md border border-line bg-canvas px-3 py-2 font-mono text-sm break-all"
              data-testid="seed"
            >
              {assignment.seed}
            </p>
            <div className="flex flex-wrap items-center gap-3">
              <CopyButton value={assignment.seed} label="Copy seed" />
              {assignment.seedRevealedAt && (
                <span className="text-xs text-ink-muted">Revealed {formatMoment(assignment.seedRevealedAt)}</span>
              )}
            </div>
            {assignment.unblindedAt && (
              <p className="text-sm text-ink-muted">
                Unblinded {formatMoment(assignment.unblindedAt)}
                {assignment.unblindReason && (
                  <>
                    {' '}
                    — reason recorded: <q className="text-ink">{assignment.unblindReason}</q>
                  </>
                )}
              </p>
            )}
          </div>
        )}
      </div>
    </Panel>
  );
}
