import { Button } from '@/components/ui/button';
import { Panel } from '@/components/ui/panel';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { ApiError } from '@/lib/api-error';
import { formatMinor } from '@/lib/money';
import { useBudget } from '../api/get-budget';

const figures = [
  { key: 'plannedMinor', label: 'Planned', hint: 'Set on the study' },
  { key: 'fundedMinor', label: 'Funded', hint: 'Paid in by card' },
  { key: 'owedMinor', label: 'Owed', hint: 'Earned, not yet approved' },
  { key: 'needsAttentionMinor', label: 'Needs attention', hint: 'Failed, to send again' },
  { key: 'committedMinor', label: 'On its way', hint: 'Approved, being sent' },
  { key: 'paidMinor', label: 'Paid', hint: 'Received by participants' },
  { key: 'remainingMinor', label: 'Remaining', hint: 'Funded − on its way − paid' },
] as const;

export interface BudgetSummaryProps {
  studyId: string;
  canFund: boolean;
  onAddFunds: () => void;
  pollEveryMs?: number | false;
}

export function BudgetSummary({ studyId, canFund, onAddFunds, pollEveryMs = false }: BudgetSummaryProps) {
  const budget = useBudget(studyId, pollEveryMs);
  return (
    <Panel
      id="budget"
      title="Budget"
      description="What this study can pay out. Approvals stop at the funded balance. Owed, needs attention, on its way and paid are the sums of the queue’s groups."
      actions={
        canFund && (
          <Button variant="primary" onClick={onAddFunds}>
            Add funds by card
          </Button>
        )
      }
    >
      {budget.isPending ? (
        <LoadingState label="Loading the budget…" className="py-4" />
      ) : budget.isError ? (
        <ErrorState
          message={budget.error instanceof ApiError ? budget.error.message : 'The budget could not be loaded.'}
          onRetry={() => void budget.refetch()}
        />
      ) : (
        <>
          <dl className="grid grid-cols-2 gap-3 sm:grid-cols-4 xl:grid-cols-7">
            {figures.map((figure) => (
              <div key={figure.key} className="rounded-md border border-line bg-canvas px-3 py-2">
                <dt className="text-xs font-semibold text-ink-muted">{figure.label}</dt>
                <dd className="mt-0.5 text-lg font-semibold tabular-nums text-ink" data-testid={`budget-${figure.key}`}>
                  {formatMinor(budget.data[figure.key], budget.data.currency, 'en-US')}
                </dd>
                <dd className="text-2xs text-ink-faint">{figure.hint}</dd>
              </div>
            ))}
          </dl>
          {budget.data.owedMinor > budget.data.remainingMinor && (
            <p className="mt-3 text-sm text-ink-muted">
              Paying everything owed needs{' '}
              {formatMinor(budget.data.owedMinor - budget.data.remainingMinor, budget.data.currency, 'en-US')} more than
              is left.
            </p>
          )}
        </>
      )}
    </Panel>
  );
}
