import { useEffect, useState } from 'react';
import { useLocation } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { Panel } from '@/components/ui/panel';
import { EmptyState, ErrorState, LoadingState, Notice } from '@/components/ui/states';
import { useAssignment } from '@/features/assignment/api/get-assignment';
import { useStartingMix } from '@/features/assignment/api/get-starting-mix';
import { BalanceTable } from '@/features/assignment/components/balance-table';
import { CommitmentPanel } from '@/features/assignment/components/commitment-panel';
import { DryRunPanel } from '@/features/assignment/components/dry-run-panel';
import { UnblindDialog } from '@/features/assignment/components/unblind-dialog';
import { VerificationPanel } from '@/features/assignment/components/verification-panel';
import { armLabel, type ArmCondition } from '@/features/assignment/utils/arm-labels';
import type { SchemeContext } from '@/features/assignment/utils/scheme-settings';
import { useConditions } from '@/features/study-design/api/get-conditions';
import { useStratificationFactors } from '@/features/study-design/api/get-stratification-factors';
import { ApiError } from '@/lib/api-error';
import { mayDesignStudy, mayUnblind } from '@/lib/study-permissions';
import { useStudySession } from '../../study-context';

export function Component() {
  const { study, me } = useStudySession();
  const assignment = useAssignment(study.id, { live: study.status === 'recruiting' });
  const conditions = useConditions(study.id);
  const factors = useStratificationFactors(study.id);
  const mayDryRun = mayDesignStudy(me.role) && study.status !== 'closed';
  const startingMix = useStartingMix(study.id, { enabled: mayDryRun });
  const [unblinding, setUnblinding] = useState(false);
  const [announcement, setAnnouncement] = useState<string | null>(null);
  const { hash } = useLocation();
  const loaded = Boolean(assignment.data && conditions.data && factors.data);

  // Links such as "Try it in a dry run" point at a section; it exists only once the data has loaded.
  useEffect(() => {
    if (!loaded || !hash) return;
    document.getElementById(hash.slice(1))?.scrollIntoView({ block: 'start' });
  }, [loaded, hash]);

  const failed = [assignment, conditions, factors].find((query) => query.isError);
  if (failed) {
    return (
      <ErrorState
        message={failed.error instanceof ApiError ? failed.error.message : 'The assignment could not be loaded.'}
        onRetry={() => [assignment, conditions, factors].forEach((query) => void query.refetch())}
      />
    );
  }
  if (!assignment.data || !conditions.data || !factors.data) return <LoadingState label="Loading the assignment…" />;

  const armConditions: ArmCondition[] = conditions.data;
  const context: SchemeContext = {
    design: study.design,
    conditionWeights: conditions.data.map((condition) => condition.allocationWeight),
    factors: factors.data.items.map((factor) => ({ key: factor.key, kind: factor.kind })),
  };
  const balance = assignment.data.balance;
  // Between designs show every condition, even one nobody is in yet; within designs show the orders handed out.
  const armIds =
    study.design === 'between'
      ? conditions.data.map((condition) => condition.id)
      : [...new Set(balance.flatMap((stratum) => stratum.counts.map((count) => count.armId)))].sort((a, b) =>
          armLabel(conditions.data, a).code.localeCompare(armLabel(conditions.data, b).code),
        );
  const canUnblind =
    mayUnblind(me.role) &&
    assignment.data.commitment !== null &&
    assignment.data.unblindedAt === null &&
    study.status !== 'closed';

  return (
    <div className="flex flex-col gap-5">
      <title>{`Assignment · ${study.title} · Evenhand`}</title>
      <div aria-live="polite" className="empty:hidden">
        {announcement && <Notice tone="info">{announcement}</Notice>}
      </div>
      <CommitmentPanel assignment={assignment.data} />

      <Panel
        id="balance"
        title="Balance per stratum"
        description={
          study.design === 'between'
            ? 'How many participants each condition has received in each stratum so far.'
            : 'How often each order of conditions has been handed out in each stratum so far.'
        }
        actions={
          canUnblind && (
            <Button variant="danger" onClick={() => setUnblinding(true)}>
              Unblind…
            </Button>
          )
        }
      >
        {balance.length === 0 ? (
          <EmptyState title="Nobody assigned yet">
            {assignment.data.commitment
              ? 'Participants are assigned the moment they sign the consent form; the counts appear here as they do.'
              : 'The study has not opened. Use the dry run below to see how the scheme would balance.'}
          </EmptyState>
        ) : (
          <div className="flex flex-col gap-2">
            <BalanceTable
              caption="Assignments per stratum and condition"
              rows={balance}
              conditions={armConditions}
              armIds={armIds}
            />
            <p className="text-sm text-ink-muted">
              {assignment.data.allocated.toLocaleString()} assigned in all
              {study.status === 'recruiting' && ' · refreshes every 15 seconds'}
              {study.blinded &&
                conditions.data.some((condition) => condition.internalName === null) &&
                ' · condition names hidden while blinded'}
              .
            </p>
          </div>
        )}
        {mayUnblind(me.role) && assignment.data.commitment === null && (
          <p className="mt-3 text-xs text-ink-muted">Unblinding becomes possible once the study has opened.</p>
        )}
      </Panel>

      {assignment.data.seed && <VerificationPanel studyId={study.id} conditions={armConditions} />}

      {mayDryRun && startingMix.isPending ? (
        <LoadingState label="Loading the dry run…" />
      ) : mayDryRun ? (
        <DryRunPanel
          studyId={study.id}
          context={context}
          conditions={armConditions}
          factors={factors.data.items}
          savedMethod={assignment.data.method}
          savedSettings={assignment.data.settings}
          // When the screened people's mix cannot be read, the panel starts from an even mix instead.
          startingMix={startingMix.data ?? null}
        />
      ) : null}

      <UnblindDialog
        studyId={study.id}
        open={unblinding}
        onClose={() => setUnblinding(false)}
        onUnblinded={() => {
          setUnblinding(false);
          setAnnouncement(
            'The study was unblinded. The seed is shown below the fingerprint, and the sequence can now be verified.',
          );
        }}
      />
    </div>
  );
}
