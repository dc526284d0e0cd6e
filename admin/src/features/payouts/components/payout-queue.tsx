import { Checkbox } from '@headlessui/react';
import { useEffect, useRef, useState } from 'react';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { cx } from '@/components/ui/cx';
import { Panel } from '@/components/ui/panel';
import { checkboxRecipe, tableRecipe } from '@/components/ui/recipes';
import { EmptyState, ErrorState, LoadingState, Notice } from '@/components/ui/states';
import { useDebouncedValue } from '@/hooks/use-debounced-value';
import { ApiError } from '@/lib/api-error';
import { formatMinor } from '@/lib/money';
import {
  BudgetShortfallError,
  approvedBeforeRefusal,
  useApprovePayouts,
  type ApprovalProgress,
} from '../api/approve-payouts';
import {
  getPayoutIdsInStage,
  usePayouts,
  type Payout,
  type PayoutSort,
  type PayoutStage,
  type StageTotals,
} from '../api/get-payouts';
import { useRetryPayout } from '../api/retry-payout';
import { batchProgress, type StatusCounts } from '../utils/batch-progress';
import { formatDay, payoutStages, plural, summarizeSelection, type SelectionSummary } from '../utils/payout-stages';
import { ConfirmSendDialog, type PendingSend } from './confirm-send-dialog';
import { PaymentHistoryDialog } from './payment-history-dialog';
import { PayoutStatusBadge } from './payout-status-badge';
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

const sortChoices: ReadonlyArray<{ value: PayoutSort; label: string }> = [
  { value: 'newest', label: 'Newest earned first' },
  { value: 'oldest', label: 'Oldest earned first' },
  { value: 'amount-desc', label: 'Largest amount first' },
  { value: 'amount-asc', label: 'Smallest amount first' },
  { value: 'participant', label: 'By participant' },
];

const controlClass =
  'h-8 rounded-md border border-line-strong bg-surface px-2 text-sm text-ink focus:outline-2 focus:outline-spruce';

interface RunningBatch {
  size: number;
  before: StatusCounts;
  startedAt: number;
}

type Outcome = { tone: 'danger' | 'info'; text: string } | null;

const emptyStage = { count: 0, amountMinor: 0, participants: 0 };

/**
 * The payout queue, in groups by what staff must do next (see payout-stages.ts). One group is open at a time; its
 * counts and sums come from the api's stage totals, the same sums the budget figures use.
 */
export function PayoutQueue({ studyId, blinded, canApprove, conditions, onBatchRunning }: PayoutQueueProps) {
  const [stage, setStage] = useState<PayoutStage>('to-approve');
  const [conditionId, setConditionId] = useState<string | null>(null);
  const [searchText, setSearchText] = useState('');
  const [sort, setSort] = useState<PayoutSort>('newest');
  const [page, setPage] = useState(1);
  const [selected, setSelected] = useState<Map<string, Payout>>(new Map());
  const [sending, setSending] = useState<ApprovalProgress | null>(null);
  const [batch, setBatch] = useState<RunningBatch | null>(null);
  const [outcome, setOutcome] = useState<Outcome>(null);
  const [pendingSend, setPendingSend] = useState<PendingSend | null>(null);
  const [historyOf, setHistoryOf] = useState<{ enrollmentId: string; reference: string } | null>(null);
  const search = useDebouncedValue(searchText, 300);

  const payouts = usePayouts(
    studyId,
    { stage, conditionId: blinded ? null : conditionId, search, sort, page, pageSize },
    batch ? 1000 : false,
  );
  const approve = useApprovePayouts(studyId, setSending);
  const retry = useRetryPayout(studyId);

  // While another group's rows load, the previous group's rows are kept as placeholder data; never show them under
  // this group's heading.
  const settledStage = useRef(stage);
  if (payouts.data && !payouts.isPlaceholderData) settledStage.current = stage;
  const loadingGroup = settledStage.current !== stage;

  const counts = payouts.data?.countsByStatus ?? {};
  const stages: StageTotals | undefined = payouts.data?.stages;
  const progress = batch ? batchProgress(batch.size, batch.before, counts) : null;
  const fresh = batch !== null && payouts.dataUpdatedAt > batch.startedAt;

  useEffect(() => {
    if (batch && fresh && progress?.finished) {
      setOutcome({
        tone: 'info',
        text: `Batch finished: ${progress.paid} paid, ${progress.failed} failed.${progress.failed > 0 ? ' Failed payouts are under “Needs attention” with the reason, and can be sent again.' : ''}`,
      });
      setBatch(null);
    }
  }, [batch, fresh, progress?.finished, progress?.paid, progress?.failed]);

  useEffect(() => onBatchRunning?.(batch !== null), [batch, onBatchRunning]);

  const currency = payouts.data?.items[0]?.currency ?? 'USD';
  const money = (minor: number) => formatMinor(minor, currency, 'en-US');
  const waitingCount = stages?.['to-approve'].count ?? 0;
  const rows = loadingGroup ? [] : (payouts.data?.items ?? []);
  const selectable = rows.filter((payout) => payout.stage === 'to-approve');
  const allOnPageSelected = selectable.length > 0 && selectable.every((payout) => selected.has(payout.id));
  const busy = approve.isPending || batch !== null;

  const toggle = (payout: Payout, on: boolean) =>
    setSelected((current) => {
      const next = new Map(current);
      if (on) next.set(payout.id, payout);
      else next.delete(payout.id);
      return next;
    });

  const openStage = (next: PayoutStage) => {
    setStage(next);
    setPage(1);
  };

  const startApproval = (payoutIds: string[]) => {
    if (payoutIds.length === 0) return;
    setOutcome(null);
    const before = { ...counts };
    approve.mutate(payoutIds, {
      onSuccess: ({ approved, amountMinor }) => {
        setSelected(new Map());
        setBatch({ size: approved, before, startedAt: Date.now() });
        setOutcome({
          tone: 'info',
          text: `Approved ${approved} payout${approved === 1 ? '' : 's'} (${money(amountMinor)}). Sending now…`,
        });
      },
      onError: (error) => {
        const approvedFirst = approvedBeforeRefusal(error);
        if (approvedFirst > 0) setBatch({ size: approvedFirst, before, startedAt: Date.now() });
        setOutcome({ tone: 'danger', text: refusalMessage(error, approvedFirst) });
      },
      onSettled: () => setSending(null),
    });
  };

  const confirmSend = async (send: PendingSend) => {
    setPendingSend(null);
    if (send.kind === 'retry') {
      const { payout } = send;
      retry.mutate(payout.id, {
        onSuccess: () =>
          setBatch({ size: 1, before: { ...counts, failed: (counts.failed ?? 1) - 1 }, startedAt: Date.now() }),
        onError: (error) =>
          setOutcome({
            tone: 'danger',
            text: error instanceof ApiError ? error.message : 'The payout could not be sent again.',
          }),
      });
      return;
    }
    if (send.kind === 'selected') {
      startApproval([...selected.keys()]);
      return;
    }
    try {
      startApproval(await getPayoutIdsInStage(studyId, 'to-approve'));
    } catch (error) {
      setOutcome({
        tone: 'danger',
        text: error instanceof ApiError ? error.message : 'The payouts waiting for approval could not be listed.',
      });
    }
  };

  const hasOverride = rows.some((payout) => payout.payOverride);
  const filtered = Boolean(search.trim()) || conditionId !== null;

  return (
    <Panel
      id="payout-queue"
      title="Payout queue"
      description="What participants have earned, grouped by what happens next. Each payout is sent once, and only after you confirm."
    >
      <div className="flex flex-col gap-3">
        <div aria-live="polite" className="flex flex-col gap-2">
          {sending && (
            <div className="flex flex-col gap-1">
              <p className="text-sm text-ink">
                Approving {sending.sent} of {sending.total}…
              </p>
              <ProgressMeter
                label="Approving payouts"
                share={sending.total ? sending.sent / sending.total : 0}
                valueText={`${sending.sent} of ${sending.total} approved`}
              />
            </div>
          )}
          {batch && progress && (
            <div className="flex flex-col gap-1">
              <p className="text-sm text-ink" data-testid="batch-progress">
                Sending {batch.size}: {progress.paid} paid, {progress.failed} failed, {progress.inFlight} still on the
                way.
              </p>
              <ProgressMeter
                label="Payouts sent"
                share={progress.settledShare}
                valueText={`${progress.paid + progress.failed} of ${batch.size} settled`}
              />
            </div>
          )}
          {outcome && <Notice tone={outcome.tone}>{outcome.text}</Notice>}
        </div>

        {payouts.isPending ? (
          <LoadingState label="Loading payouts…" className="py-4" />
        ) : payouts.isError ? (
          <ErrorState
            message={payouts.error instanceof ApiError ? payouts.error.message : 'The payouts could not be loaded.'}
            onRetry={() => void payouts.refetch()}
          />
        ) : (
          <ol className="flex flex-col gap-2" aria-label="Payouts by what happens next">
            {payoutStages.map(({ stage: candidate, title, next }) => {
              const totals = stages?.[candidate] ?? emptyStage;
              const open = candidate === stage;
              return (
                <li
                  key={candidate}
                  className={cx('rounded-lg border', open ? 'border-spruce/60 bg-surface' : 'border-line bg-canvas')}
                >
                  <h3>
                    <button
                      type="button"
                      aria-expanded={open}
                      aria-controls={`stage-${candidate}`}
                      onClick={() => openStage(candidate)}
                      className="flex w-full flex-wrap items-baseline justify-between gap-x-4 gap-y-0.5 rounded-lg px-3 py-2 text-left focus:outline-none focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-spruce"
                    >
                      <span className="flex items-baseline gap-2">
                        <span
                          aria-hidden="true"
                          className={cx(
                            'text-xs text-ink-muted transition-transform',
                            open && 'inline-block rotate-90',
                          )}
                        >
                          ▸
                        </span>
                        <span
                          className={cx('text-sm font-semibold', totals.count === 0 ? 'text-ink-muted' : 'text-ink')}
                        >
                          {title}
                        </span>
                      </span>
                      <span className="text-xs tabular-nums text-ink-muted">
                        {totals.count === 0
                          ? 'none'
                          : `${plural(totals.count, 'payout', 'payouts')} · ${plural(totals.participants, 'participant', 'participants')} · ${money(totals.amountMinor)}`}
                      </span>
                    </button>
                  </h3>
                  {open && (
                    <div id={`stage-${candidate}`} className="flex flex-col gap-3 border-t border-line px-3 pt-2 pb-3">
                      <p className="text-sm text-ink-muted">{next}</p>
                      <div className="flex flex-wrap items-end gap-3">
                        <label className="flex flex-col gap-1 text-xs font-semibold text-ink">
                          Search
                          <input
                            type="search"
                            className={cx(controlClass, 'w-56 font-normal')}
                            placeholder="Participant, step or receipt"
                            value={searchText}
                            onChange={(event) => (setSearchText(event.target.value), setPage(1))}
                          />
                        </label>
                        <label className="flex flex-col gap-1 text-xs font-semibold text-ink">
                          Order
                          <select
                            className={cx(controlClass, 'font-normal')}
                            value={sort}
                            onChange={(event) => (setSort(event.target.value as PayoutSort), setPage(1))}
                          >
                            {sortChoices.map((choice) => (
                              <option key={choice.value} value={choice.value}>
                                {choice.label}
                              </option>
                            ))}
                          </select>
                        </label>
                        {!blinded && conditions.length > 0 && (
                          <label className="flex flex-col gap-1 text-xs font-semibold text-ink">
                            Condition
                            <select
                              className={cx(controlClass, 'font-normal')}
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
                        {canApprove && candidate === 'to-approve' && (
                          <div className="ml-auto flex flex-wrap gap-2">
                            <Button
                              onClick={() =>
                                setPendingSend({ kind: 'selected', now: summarizeSelection([...selected.values()]) })
                              }
                              disabled={selected.size === 0 || busy}
                            >
                              Approve selected ({selected.size})
                            </Button>
                            <Button
                              variant="primary"
                              onClick={() =>
                                setPendingSend({
                                  kind: 'all',
                                  now: stageSummary(stages, 'to-approve'),
                                  waiting: stageSummary(stages, 'awaiting-setup'),
                                })
                              }
                              disabled={waitingCount === 0 || busy}
                            >
                              Approve all waiting ({waitingCount})
                            </Button>
                          </div>
                        )}
                      </div>

                      {hasOverride && (
                        <Notice tone="caution">
                          Rows marked “Pay override” are paid differently from the study's standard amount. Unequal pay
                          between conditions can change who stays in a study and bias the comparison.
                        </Notice>
                      )}

                      {loadingGroup ? (
                        <LoadingState label={`Loading ${title.toLowerCase()}…`} className="py-4" />
                      ) : rows.length === 0 ? (
                        <EmptyState title={filtered ? 'No payouts match' : 'Nothing here'}>
                          {filtered
                            ? 'Clear the search or choose another condition.'
                            : 'No payout is at this point right now.'}
                        </EmptyState>
                      ) : (
                        <div className={tableRecipe.frame} tabIndex={0} role="region" aria-label={`${title}: payouts`}>
                          <table className={tableRecipe.table}>
                            <caption className="sr-only">
                              {title}: payouts, page {page}
                            </caption>
                            <thead>
                              <tr>
                                {canApprove && candidate === 'to-approve' && (
                                  <th scope="col" className={cx(tableRecipe.headCell, 'w-8')}>
                                    <Checkbox
                                      aria-label="Select every payout on this page"
                                      checked={allOnPageSelected}
                                      disabled={selectable.length === 0 || busy}
                                      onChange={(on) => selectable.forEach((payout) => toggle(payout, on))}
                                      className={checkboxRecipe}
                                    >
                                      <Tick />
                                    </Checkbox>
                                  </th>
                                )}
                                <th scope="col" className={tableRecipe.headCell}>
                                  Participant
                                </th>
                                <th scope="col" className={tableRecipe.headCell}>
                                  {blinded ? 'Condition (coded)' : 'Condition'}
                                </th>
                                <th scope="col" className={tableRecipe.headCell}>
                                  Step
                                </th>
                                <th scope="col" className={tableRecipe.headCell}>
                                  Earned
                                </th>
                                <th scope="col" className={tableRecipe.headCell}>
                                  {candidate === 'paid' ? 'Paid' : 'Approved'}
                                </th>
                                <th scope="col" className={cx(tableRecipe.headCell, 'text-right')}>
                                  Amount
                                </th>
                                <th scope="col" className={tableRecipe.headCell}>
                                  State
                                </th>
                              </tr>
                            </thead>
                            <tbody>
                              {rows.map((payout) => (
                                <PayoutRow
                                  key={payout.id}
                                  payout={payout}
                                  selectable={canApprove && candidate === 'to-approve'}
                                  canApprove={canApprove}
                                  selected={selected.has(payout.id)}
                                  onSelect={(on) => toggle(payout, on)}
                                  disabled={busy}
                                  retrying={retry.isPending && retry.variables === payout.id}
                                  onRetry={() =>
                                    setPendingSend({ kind: 'retry', payout, now: summarizeSelection([payout]) })
                                  }
                                  onHistory={() =>
                                    setHistoryOf({ enrollmentId: payout.enrollmentId, reference: payout.reference })
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
                            <Button
                              size="compact"
                              onClick={() => setPage(page + 1)}
                              disabled={page * pageSize >= payouts.data.total}
                            >
                              Next
                            </Button>
                          </div>
                        </div>
                      )}
                    </div>
                  )}
                </li>
              );
            })}
          </ol>
        )}
      </div>

      <ConfirmSendDialog
        pending={pendingSend}
        currency={currency}
        onCancel={() => setPendingSend(null)}
        onConfirm={(send) => void confirmSend(send)}
      />
      <PaymentHistoryDialog studyId={studyId} participant={historyOf} onClose={() => setHistoryOf(null)} />
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

function stageSummary(stages: StageTotals | undefined, stage: PayoutStage): SelectionSummary {
  const totals = stages?.[stage] ?? emptyStage;
  return { payouts: totals.count, participants: totals.participants, amountMinor: totals.amountMinor };
}

interface PayoutRowProps {
  payout: Payout;
  selectable: boolean;
  canApprove: boolean;
  selected: boolean;
  onSelect: (on: boolean) => void;
  disabled: boolean;
  retrying: boolean;
  onRetry: () => void;
  onHistory: () => void;
}

function PayoutRow({
  payout,
  selectable,
  canApprove,
  selected,
  onSelect,
  disabled,
  retrying,
  onRetry,
  onHistory,
}: PayoutRowProps) {
  const what = payout.kind === 'bonus' ? 'Completion bonus' : payout.stepTitle;
  return (
    <tr className={tableRecipe.row}>
      {selectable && (
        <td className={tableRecipe.cell}>
          <Checkbox
            aria-label={`Select ${payout.reference}, ${payout.stepTitle ?? 'bonus'}`}
            checked={selected}
            onChange={onSelect}
            disabled={disabled}
            className={checkboxRecipe}
          >
            <Tick />
          </Checkbox>
        </td>
      )}
      <td className={tableRecipe.cell}>
        <button
          type="button"
          onClick={onHistory}
          aria-label={`Payment history of ${payout.reference}`}
          className="rounded-sm font-mono text-xs text-spruce-ink underline decoration-dotted underline-offset-2 hover:decoration-solid focus:outline-none focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-spruce"
        >
          {payout.reference}
        </button>
      </td>
      <td className={tableRecipe.cell}>{payout.condition ?? '—'}</td>
      <td className={tableRecipe.cell}>{what}</td>
      <td className={cx(tableRecipe.cell, 'whitespace-nowrap tabular-nums')}>{formatDay(payout.createdAt)}</td>
      <td className={cx(tableRecipe.cell, 'whitespace-nowrap tabular-nums')}>
        {formatDay(payout.status === 'paid' ? payout.paidAt : payout.approvedAt)}
      </td>
      <td className={cx(tableRecipe.cell, 'text-right tabular-nums')}>
        <span className="inline-flex items-center gap-1.5">
          {payout.payOverride && <Badge tone="caution">Pay override</Badge>}
          {formatMinor(payout.amountMinor, payout.currency, 'en-US')}
        </span>
      </td>
      <td className={tableRecipe.cell}>
        <div className="flex flex-col items-start gap-1">
          <PayoutStatusBadge status={payout.status} />
          {payout.status === 'failed' && payout.failureReason && (
            <span data-testid="failure-reason" className="text-xs text-danger">
              {payout.failureReason}
            </span>
          )}
          {payout.status === 'paid' && payout.receiptNumber && (
            <span className="font-mono text-2xs text-ink-muted">Receipt {payout.receiptNumber}</span>
          )}
          {canApprove && payout.status === 'failed' && (
            <Button
              size="compact"
              onClick={onRetry}
              pending={retrying}
              aria-label={`Retry ${payout.reference}, ${payout.stepTitle ?? 'bonus'}`}
            >
              Retry
            </Button>
          )}
        </div>
      </td>
    </tr>
  );
}

function Tick() {
  return (
    <svg
      className="invisible size-3 text-ink-inverse group-data-checked:visible"
      viewBox="0 0 16 16"
      fill="none"
      aria-hidden="true"
    >
      <path d="m3.5 8.5 3 3 6-7" stroke="currentColor" strokeWidth="2.2" strokeLinecap="round" strokeLinejoin="round" />
    </svg>
  );
}
