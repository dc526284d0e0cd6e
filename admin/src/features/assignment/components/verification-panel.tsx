import { useState } from 'react';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Panel } from '@/components/ui/panel';
import { tableRecipe } from '@/components/ui/recipes';
import { ErrorState, LoadingState, Notice } from '@/components/ui/states';
import { ApiError } from '@/lib/api-error';
import { useVerifyAssignment, type AllocationCheck } from '../api/verify-assignment';
import { armLabel, stratumLabel, type ArmCondition } from '../utils/arm-labels';

const MISMATCH_REASONS: Record<string, string> = {
  'differs-from-allocation': 'Recorded condition differs from its allocation',
  'no-allocation': 'Has a condition but no allocation',
  'allocation-of-another-study': 'Points at another study’s allocation',
};

function allocationText(conditions: readonly ArmCondition[], value: Record<string, unknown> | null): string {
  if (!value) return 'none';
  if (Array.isArray(value.order)) return armLabel(conditions, JSON.stringify(value.order)).code;
  if (typeof value.conditionId === 'string') return armLabel(conditions, value.conditionId).code;
  return 'none';
}

/** Re-derives the sequence from the revealed seed and compares it, allocation by allocation. */
export function VerificationPanel({ studyId, conditions }: { studyId: string; conditions: readonly ArmCondition[] }) {
  const [requested, setRequested] = useState(false);
  const verification = useVerifyAssignment(studyId, requested);
  const mismatches: AllocationCheck[] = verification.data?.checks.filter((check) => !check.matches) ?? [];
  const enrollmentMismatches = verification.data?.enrollmentMismatches ?? [];

  return (
    <Panel
      id="verify"
      title="Verify the sequence"
      description="With the seed revealed, Evenhand hashes it with the sealed parameters, compares the result with the published fingerprint, and replays every assignment."
      actions={
        <Button
          variant="primary"
          onClick={() => (requested ? void verification.refetch() : setRequested(true))}
          pending={verification.isFetching}
        >
          {verification.data ? 'Verify again' : 'Verify sequence'}
        </Button>
      }
    >
      {!requested ? (
        <p className="text-sm text-ink-muted">
          Nothing is checked until you ask; it reads every allocation of the study.
        </p>
      ) : verification.isPending ? (
        <LoadingState label="Replaying the sequence…" />
      ) : verification.isError ? (
        <ErrorState
          title="Verification could not run"
          message={
            verification.error instanceof ApiError ? verification.error.message : 'The check could not be completed.'
          }
          onRetry={() => void verification.refetch()}
        />
      ) : (
        <div className="flex flex-col gap-3" aria-live="polite">
          {verification.data.allMatch && verification.data.commitmentMatches ? (
            <Notice tone="info">
              <span className="font-semibold">Matched.</span> The seed reproduces the published fingerprint, and all{' '}
              {verification.data.matched.toLocaleString()} recorded assignments match the sequence it derives.
            </Notice>
          ) : (
            <Notice tone="danger">
              <span className="font-semibold">Mismatch.</span>{' '}
              {!verification.data.commitmentMatches &&
                'The seed and parameters do not reproduce the published fingerprint. '}
              {verification.data.mismatched > 0 &&
                `${verification.data.mismatched.toLocaleString()} of ${(verification.data.matched + verification.data.mismatched).toLocaleString()} recorded assignments differ from the derived sequence. `}
              {enrollmentMismatches.length > 0 &&
                `${enrollmentMismatches.length.toLocaleString()} ${enrollmentMismatches.length === 1 ? 'enrollment records' : 'enrollments record'} a condition that is not ${enrollmentMismatches.length === 1 ? 'its' : 'their'} allocation: the dropout watch and the export read that copy.`}
            </Notice>
          )}
          <dl className="flex flex-wrap gap-x-6 gap-y-1 text-sm">
            <div className="flex gap-1.5">
              <dt className="text-ink-muted">Fingerprint</dt>
              <dd>
                {verification.data.commitmentMatches ? (
                  <Badge tone="success">matches</Badge>
                ) : (
                  <Badge tone="danger">does not match</Badge>
                )}
              </dd>
            </div>
            <div className="flex gap-1.5">
              <dt className="text-ink-muted">Matched</dt>
              <dd className="font-medium tabular-nums">{verification.data.matched.toLocaleString()}</dd>
            </div>
            <div className="flex gap-1.5">
              <dt className="text-ink-muted">Mismatched</dt>
              <dd className="font-medium tabular-nums">{verification.data.mismatched.toLocaleString()}</dd>
            </div>
            <div className="flex gap-1.5">
              <dt className="text-ink-muted">Enrollments off their allocation</dt>
              <dd className="font-medium tabular-nums">{enrollmentMismatches.length.toLocaleString()}</dd>
            </div>
          </dl>
          {enrollmentMismatches.length > 0 && (
            <section aria-label="Enrollments that differ from their allocation" className="flex flex-col gap-2">
              <h3 className="text-sm font-semibold">Enrollments that differ from their allocation</h3>
              <ul className="divide-y divide-line rounded-md border border-line">
                {enrollmentMismatches.map((mismatch) => (
                  <li
                    key={mismatch.enrollmentId}
                    className="flex flex-col gap-0.5 px-3 py-2 text-sm sm:flex-row sm:flex-wrap sm:items-baseline sm:gap-x-4"
                  >
                    <span className="font-medium text-danger">
                      {MISMATCH_REASONS[mismatch.reason] ?? mismatch.reason}
                    </span>
                    <span className="font-mono text-xs break-all text-ink-muted">{mismatch.enrollmentId}</span>
                    <span>
                      Recorded{' '}
                      <span className="font-mono text-danger">{allocationText(conditions, mismatch.enrollment)}</span>,
                      allocation <span className="font-mono">{allocationText(conditions, mismatch.allocation)}</span>
                      {mismatch.expected && (
                        <>
                          , sequence <span className="font-mono">{allocationText(conditions, mismatch.expected)}</span>
                        </>
                      )}
                    </span>
                  </li>
                ))}
              </ul>
            </section>
          )}
          {mismatches.length > 0 && (
            <div className={tableRecipe.frame}>
              <table className={tableRecipe.table}>
                <caption className="sr-only">Assignments that differ from the derived sequence</caption>
                <thead>
                  <tr>
                    <th scope="col" className={tableRecipe.headCell}>
                      Arrival
                    </th>
                    <th scope="col" className={tableRecipe.headCell}>
                      Enrollment
                    </th>
                    <th scope="col" className={tableRecipe.headCell}>
                      Stratum
                    </th>
                    <th scope="col" className={tableRecipe.headCell}>
                      Sequence says
                    </th>
                    <th scope="col" className={tableRecipe.headCell}>
                      Recorded
                    </th>
                  </tr>
                </thead>
                <tbody>
                  {mismatches.map((check) => (
                    <tr key={check.arrivalPosition} className={tableRecipe.row}>
                      <td className={`${tableRecipe.cell} tabular-nums`}>{check.arrivalPosition}</td>
                      <td className={`${tableRecipe.cell} font-mono text-xs`}>{check.enrollmentId}</td>
                      <td className={tableRecipe.cell}>{stratumLabel(check.stratumKey)}</td>
                      <td className={`${tableRecipe.cell} font-mono`}>{allocationText(conditions, check.expected)}</td>
                      <td className={`${tableRecipe.cell} font-mono text-danger`}>
                        {allocationText(conditions, check.recorded)}
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          )}
        </div>
      )}
    </Panel>
  );
}
