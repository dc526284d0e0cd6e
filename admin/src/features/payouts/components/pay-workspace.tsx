import { useState } from 'react';
import { Notice } from '@/components/ui/states';
import { formatMinor } from '@/lib/money';
import { AddFundsDialog } from './add-funds-dialog';
import { BudgetSummary } from './budget-summary';
import { FinanceExportPanel } from './finance-export-panel';
import { PayoutQueue, type ConditionChoice } from './payout-queue';
import { ReconciliationPanel } from './reconciliation-panel';
import { TaxThresholdPanel } from './tax-threshold-panel';

export interface PayWorkspaceProps {
  studyId: string;
  currency: string;
  blinded: boolean;
  /** Coordinators and admins: fund, approve, retry. */
  canManage: boolean;
  /** Coordinators, auditors and admins: the provider check and the tax threshold. */
  canReview: boolean;
  conditions: ConditionChoice[];
}

/** A study's money: budget and funding, the payout queue, the provider check, the tax threshold and the finance export. */
export function PayWorkspace({ studyId, currency, blinded, canManage, canReview, conditions }: PayWorkspaceProps) {
  const [funding, setFunding] = useState(false);
  const [funded, setFunded] = useState<number | null>(null);
  const [batchRunning, setBatchRunning] = useState(false);

  return (
    <div className="flex flex-col gap-5">
      {funded !== null && (
        <Notice tone="info">{formatMinor(funded, currency, 'en-US')} was added to the study's balance.</Notice>
      )}
      <BudgetSummary
        studyId={studyId}
        canFund={canManage}
        onAddFunds={() => setFunding(true)}
        pollEveryMs={batchRunning ? 1000 : false}
      />
      <PayoutQueue
        studyId={studyId}
        blinded={blinded}
        canApprove={canManage}
        conditions={conditions}
        onBatchRunning={setBatchRunning}
      />
      {canReview && (
        <div className="grid gap-5 lg:grid-cols-2">
          <ReconciliationPanel studyId={studyId} currency={currency} />
          <TaxThresholdPanel studyId={studyId} />
        </div>
      )}
      {canReview && <FinanceExportPanel studyId={studyId} />}
      {canManage && (
        <AddFundsDialog
          studyId={studyId}
          currency={currency}
          open={funding}
          onClose={() => setFunding(false)}
          onFunded={setFunded}
        />
      )}
    </div>
  );
}
