import { Checkbox } from '@headlessui/react';
import { useEffect, useState } from 'react';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { cx } from '@/components/ui/cx';
import { DialogActions, ModalDialog } from '@/components/ui/modal-dialog';
import { Panel } from '@/components/ui/panel';
import { checkboxRecipe, tableRecipe } from '@/components/ui/recipes';
import { EmptyState, ErrorState, LoadingState, Notice } from '@/components/ui/states';
import { ApiError } from '@/lib/api-error';
import { formatMinor } from '@/lib/money';
import { BudgetShortfallError, approvedBeforeRefusal, useApprovePayouts, type ApprovalProgress } from '../api/approve-payouts';
import { getOwedPayoutIds, usePayouts, type Payout, type PayoutStatus } from '../api/get-payouts';
import { useRetryPayout } from '../api/retry-payout';
import { batchProgress, type StatusCounts } from '../utils/batch-progress';
import { PayoutStatusBadge, payoutStatusLabels, payoutStatusOrder } from './payout-status-badge';
import { ProgressMeter } from './progress-meter';

export interface ConditionChoice {
  id: string;
  label: string;
}

export interface PayoutQueueProps {
  studyId: string;
  blinded: boolean;
  canApprove: boolean;
  /** Offered as a filter only while the study is unblinded. */
  conditions: ConditionChoice[];
  /** Tells the page a batch is being paid, so the budget can follow along. */
  onBatchRunning?: (running: boolean) => void;
}

const pageSize = 50;

interface RunningBatch {
  size: number;
  before: StatusCounts;
  startedAt: number;
}

type Outcome = { tone: 'danger' | 'info'; text: string } | null;

export function PayoutQueue({ studyId, blinded, canApprove, conditions, onBatchRunning }: PayoutQueueProps) {
  const [status, setStatus] = useState<PayoutStatus | null>(null);
  const [conditionId, setConditionId] = useState<string | null>(null);
  const [page, setPage] = useState(1);
  const [selected, setSelected] = useState<Set<string>>(new Set());
  const [sending, setSending] = useState<ApprovalProgress | null>(null);
  const [batch, setBatch] = useState<RunningBatch | null>(null);
  const [outcome, setOutcome] = useState<Outcome>(null);
  const [confirmAll, setConfirmAll] = useState(false);

  const payouts = usePayouts(studyId, { status, conditionId: blinded ? null : conditionId, page, pageSize }, batch ? 1000 : false);
  const approve = useApprovePayouts(studyId, setSending);
  const retry = useRetryPayout(studyId);

  const counts = payouts.data?.countsByStatus ?? {};
  const progress = batch ? batchProgress(batch.size, batch.before, counts) : null;
  const fresh = batch !== null && payouts.dataUpdatedAt > batch.startedAt;

  useEffect(() => {
    if (batch && fresh && progress?.finished) {
      setOutcome({
        tone: 'info',
        text: `Batch finished: ${progress.paid} paid, ${progress.failed} failed.${progress.failed > 0 ? ' Failed payouts show the reason and can be retried.' : ''}`,
      });
      setBatch(null);
    }
  }, [batch, fresh, progress?.finished, progress?.paid, progress?.failed]);

  useEffect(() => onBatchRunning?.(batch !== null), [batch, onBatchRunning]);

  const startApproval = async (payoutIds: string[]) => {
    if (payoutIds.length === 0) return;
    setOutcome(null);
    const before = { ...counts };
    approve.mutate(payoutIds, {
      onSuccess: ({ approved, amountMinor }) => {
        setSelected(new Set());
        setBatch({ size: approved, before, startedAt: Date.now() });
        setOutcome({ tone: 'info', text: `Approved ${approved} payout${approved === 1 ? '' : 's'} (${money(amountMinor)}). Sending now…` });
      },
      onError: (error) => {
        const approvedFirst = approvedBeforeRefusal(error);
        if (approvedFirst > 0) setBatch({ size: approvedFirst, before, startedAt: Date.now() });
        setOutcome({ tone: 'danger', text: refusalMessage(error, approvedFirst) });
      },
      onSettled: () => setSending(null),
    });
  };

  const approveAllOwed = async () => {
    setConfirmAll(false);
    try {
      await startApproval(await getOwedPayoutIds(studyId));
    } catch (error) {
      setOutcome({ tone: 'danger', text: error instanceof ApiError ? error.message : 'The owed payouts could not be listed.' });
    }
  };

  const currency = payouts.data?.items[0]?.currency ?? 'USD';
  const money = (minor: number) => formatMinor(minor, currency, 'en-US');
  const owedCount = counts.owed ?? 0;
  const owedOnPage = (payouts.data?.items ?? []).filter((payout) => payout.status === 'owed');
  const allOnPageSelected = owedOnPage.length > 0 && owedOnPage.every((payout) => selected.has(payout.id));
  const busy = approve.isPending || batch !== null;

  const toggle = (id: string, on: boolean) =>
    setSelected((current) => {
      const next = new Set(current);
      if (on) next.add(id);
      else next.delete(id);
      return next;
    });

  const hasOverride = payouts.data?.items.some((payout) => payout.payOverride) ?? false;
  const total = Object.values(counts).reduce((sum, value) => sum + (value ?? 0), 0);

  return (
    <Panel
      id="payout-queue"
      title="Payout queue"
      description="What participants have earned, step by step. Approve to send it; each payout is sent once."
      actions={
        canApprove && (
          <>
            <Button onClick={() => void startApproval([...selected])} disabled={selected.size === 0 || busy}>
              Approve selected ({selected.size})
            </Button>
            <Button variant="primary" onClick={() => setConfirmAll(true)} disabled={owedCount === 0 || busy}>
              Approve all owed ({owedCount})
            </Button>
          </>
        )
      }
    >
      <div className="flex flex-col gap-3">
        <div className="flex flex-wrap items-center gap-3">
          <div role="group" aria-label="Show payouts by status" className="flex flex-wrap gap-1.5">
            <Chip pressed={status === null} onClick={() => (setStatus(null), setPage(1))} label="All" count={total} />
            {payoutStatusOrder
              .filter((candidate) => (counts[candidate] ?? 0) > 0 || candidate === status)
              .map((candidate) => (
                <Chip
                  key={candidate}
                  pressed={status === candidate}
                  onClick={() => (setStatus(status === candidate ? null : candidate), setPage(1))}
                  label={payoutStatusLabels[candidate].label}
                  count={counts[candidate] ?? 0}
                />
              ))}
          </div>
          {!blinded && conditions.length > 0 && (
            <label className="flex items-center gap-2 text-sm text-ink">
              <span className="text-xs font-semibold">Condition</span>
              <select
                className="h-7 rounded-md border border-line-strong bg-surface px-2 text-sm focus:outline-2 focus:outline-spruce"
                value={conditionId ?? ''}
                onChange={(event) => (setConditionId(event.target.value || null), setPage(1))}
              >
                <option value="">All conditions</option>
                {conditions.map((condition) => (
                  <option key={condition.id} value={condition.id}>
                    {condition.label}
                  </option>
                ))}
              </select>
            </label>
          )}
        </div>

        <div aria-live="polite" className="flex flex-col gap-2">
          {sending && (
            <div className="flex flex-col gap-1">
              <p className="text-sm text-ink">
                Approving {sending.sent} of {sending.total}…
              </p>
              <ProgressMeter label="Approving payouts" share={sending.total ? sending.sent / sending.total : 0} valueText={`${sending.sent} of ${sending.total} approved`} />
            </div>
          )}
          {batch && progress && (
            <div className="flex flex-col gap-1">
              <p className="text-sm text-ink" data-testid="batch-progress">
                Sending {batch.size}: {progress.paid} paid, {progress.failed} failed, {progress.inFlight} still on the way.
              </p>
              <ProgressMeter label="Payouts sent" share={progress.settledShare} valueText={`${progress.paid + progress.failed} of ${batch.size} settled`} />
            </div>
          )}
          {outcome && <Notice tone={outcome.tone}>{outcome.text}</Notice>}
        </div>

        {hasOverride && (
          <Notice tone="caution">
            Rows marked “Pay override” are paid differently from the study's standard amount. Unequal pay between conditions can change who stays in a study
            and bias the comparison.
          </Notice>
        )}

        {payouts.isPending ? (
          <LoadingState label="Loading payouts…" className="py-4" />
        ) : payouts.isError ? (
          <ErrorState message={payouts.error instanceof ApiError ? payouts.error.message : 'The payouts could not be loaded.'} onRetry={() => void payouts.refetch()} />
        ) : payouts.data.items.length === 0 ? (
          <EmptyState title={status || conditionId ? 'No payouts match this filter' : 'Nothing earned yet'}>
            {status || conditionId ? 'Choose another status or condition.' : 'Payouts appear here as participants complete steps.'}
          </EmptyState>
        ) : (
          <div className={tableRecipe.frame}>
            <table className={tableRecipe.table}>
              <caption className="sr-only">Payouts, page {page}</caption>
              <thead>
                <tr>
                  {canApprove && (
                    <th scope="col" className={cx(tableRecipe.headCell, 'w-8')}>
                      <Checkbox
                        aria-label="Select every owed payout on this page"
                        checked={allOnPageSelected}
                        disabled={owedOnPage.length === 0 || busy}
                        onChange={(on) => owedOnPage.forEach((payout) => toggle(payout.id, on))}
                        className={checkboxRecipe}
                      >
                        <Tick />
                      </Checkbox>
                    </th>
                  )}
                  <th scope="col" className={tableRecipe.headCell}>Participant</th>
                  <th scope="col" className={tableRecipe.headCell}>{blinded ? 'Condition (coded)' : 'Condition'}</th>
                  <th scope="col" className={tableRecipe.headCell}>Step</th>
                  <th scope="col" className={cx(tableRecipe.headCell, 'text-right')}>Amount</th>
                  <th scope="col" className={tableRecipe.headCell}>Status</th>
                  {canApprove && <th scope="col" className={tableRecipe.headCell}><span className="sr-only">Actions</span></th>}
                </tr>
              </thead>
              <tbody>
                {payouts.data.items.map((payout) => (
                  <PayoutRow
                    key={payout.id}
                    payout={payout}
                    canApprove={canApprove}
                    selected={selected.has(payout.id)}
                    onSelect={(on) => toggle(payout.id, on)}
                    disabled={busy}
                    retrying={retry.isPending && retry.variables === payout.id}
                    onRetry={() =>
                      retry.mutate(payout.id, {
                        onSuccess: () => setBatch({ size: 1, before: { ...counts, failed: (counts.failed ?? 1) - 1 }, startedAt: Date.now() }),
                        onError: (error) => setOutcome({ tone: 'danger', text: error instanceof ApiError ? error.message : 'The retry could not be queued.' }),
                      })
                    }
                  />
                ))}
              </tbody>
            </table>
          </div>
        )}

        {payouts.data && payouts.data.total > pageSize && (
          <div className="flex items-center justify-between text-sm text-ink-muted">
            <span>
              Page {page} of {Math.ceil(payouts.data.total / pageSize)}
            </span>
            <div className="flex gap-2">
              <Button size="compact" onClick={() => setPage(page - 1)} disabled={page === 1}>
                Previous
              </Button>
              <Button size="compact" onClick={() => setPage(page + 1)} disabled={page * pageSize >= payouts.data.total}>
                Next
              </Button>
            </div>
          </div>
        )}
      </div>

      <ModalDialog open={confirmAll} onClose={() => setConfirmAll(false)} role="alertdialog" title={`Approve all ${owedCount} owed payouts?`}>
        <p className="text-sm text-ink">
          {money(payouts.data?.amountByStatus.owed ?? 0)} will be sent to participants who finished setting up how they get paid. Anyone who has not will show as
          failed, with the reason, and can be retried later.
        </p>
        <DialogActions>
          <Button onClick={() => setConfirmAll(false)}>Cancel</Button>
          <Button variant="primary" onClick={() => void approveAllOwed()}>
            Approve and send
          </Button>
        </DialogActions>
      </ModalDialog>
    </Panel>
  );

  function refusalMessage(error: unknown, approvedFirst: number): string {
    const before = approvedFirst > 0 ? `Approved ${approvedFirst}; the rest were refused. ` : '';
    if (error instanceof BudgetShortfallError) {
      return `${before}Not enough funds: this needs ${money(error.neededMinor)} but only ${money(error.remainingMinor)} of the funded balance is left. Add funds by card, then approve again.`;
    }
    return before + (error instanceof ApiError ? error.message : 'The approval could not be sent. Try again.');
  }
}

interface PayoutRowProps {
  payout: Payout;
  canApprove: boolean;
  selected: boolean;
  onSelect: (on: boolean) => void;
  disabled: boolean;
  retrying: boolean;
  onRetry: () => void;
}

function PayoutRow({ payout, canApprove, selected, onSelect, disabled, retrying, onRetry }: PayoutRowProps) {
  return (
    <tr className={tableRecipe.row}>
      {canApprove && (
        <td className={tableRecipe.cell}>
          {payout.status === 'owed' && (
            <Checkbox aria-label={`Select ${payout.reference}, ${payout.stepTitle ?? 'bonus'}`} checked={selected} onChange={onSelect} disabled={disabled} className={checkboxRecipe}>
              <Tick />
            </Checkbox>
          )}
        </td>
      )}
      <td className={cx(tableRecipe.cell, 'font-mono text-xs')}>
        {payout.reference}
        {!payout.payoutAccountReady && <span className="ml-1.5 font-sans text-2xs text-ink-faint">(no payout setup)</span>}
      </td>
      <td className={tableRecipe.cell}>{payout.condition ?? '—'}</td>
      <td className={tableRecipe.cell}>{payout.kind === 'bonus' ? 'Completion bonus' : payout.stepTitle}</td>
      <td className={cx(tableRecipe.cell, 'text-right tabular-nums')}>
        <span className="inline-flex items-center gap-1.5">
          {payout.payOverride && <Badge tone="caution">Pay override</Badge>}
          {formatMinor(payout.amountMinor, payout.currency, 'en-US')}
        </span>
      </td>
      <td className={tableRecipe.cell}>
        <div className="flex flex-col items-start gap-0.5">
          <PayoutStatusBadge status={payout.status} />
          {payout.status === 'failed' && payout.failureReason && <span data-testid="failure-reason" className="text-xs text-danger">{payout.failureReason}</span>}
        </div>
      </td>
      {canApprove && (
        <td className={cx(tableRecipe.cell, 'text-right')}>
          {payout.status === 'failed' && (
            <Button size="compact" onClick={onRetry} pending={retrying} aria-label={`Retry ${payout.reference}, ${payout.stepTitle ?? 'bonus'}`}>
              Retry
            </Button>
          )}
        </td>
      )}
    </tr>
  );
}

function Tick() {
  return (
    <svg className="invisible size-3 text-ink-inverse group-data-checked:visible" viewBox="0 0 16 16" fill="none" aria-hidden="true">
      <path d="m3.5 8.5 3 3 6-7" stroke="currentColor" strokeWidth="2.2" strokeLinecap="round" strokeLinejoin="round" />
    </svg>
  );
}

const chipClass =
  'inline-flex h-7 items-center gap-1.5 rounded-full border px-3 text-sm font-medium transition-colors focus:outline-none focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-spruce';

function Chip({ pressed, onClick, label, count }: { pressed: boolean; onClick: () => void; label: string; count: number }) {
  return (
    <button type="button" aria-pressed={pressed} onClick={onClick} className={cx(chipClass, pressed ? 'border-spruce bg-spruce text-ink-inverse' : 'border-line-strong bg-surface text-ink hover:bg-sunken')}>
      {label}
      <span className={cx('tabular-nums text-xs', pressed ? 'text-ink-inverse/85' : 'text-ink-muted')}>{count}</span>
    </button>
  );
}
