import { useState } from 'react';
import { Panel } from '@/components/ui/panel';
import { EmptyState, ErrorState, LoadingState, Notice } from '@/components/ui/states';
import { ApiError } from '@/lib/api-error';
import { useAttritionAlerts } from '../api/get-attrition-alerts';
import { useAttritionReport } from '../api/get-attrition-report';
import { AlertThresholdsForm } from './alert-thresholds-form';
import { ConditionTable, RateDefinitions } from './condition-table';
import { FlowDiagram } from './flow-diagram';
import { ContactsByCondition } from './contacts-by-condition';
import { CovariateBalanceTable } from './covariate-balance-table';
import { DropoutCurves } from './dropout-curves';
import { PayParityTable } from './pay-parity-table';
import { StratifiedTests } from './stratified-tests';
import { WwcVerdicts } from './wwc-verdicts';
import { plannedLengthExplanation } from '../utils/watch-format';
import { formatMoment } from '@/lib/dates';

export interface DropoutWatchProps {
  studyId: string;
  canEditAlerts: boolean;
  canExport: boolean;
}

export function DropoutWatch({ studyId, canEditAlerts, canExport }: DropoutWatchProps) {
  const [comparisonConditionId, setComparisonConditionId] = useState<string | null>(null);
  const report = useAttritionReport(studyId, comparisonConditionId);
  const alerts = useAttritionAlerts(studyId);

  if (report.isError) {
    return (
      <ErrorState
        message={report.error instanceof ApiError ? report.error.message : 'The dropout watch could not be loaded.'}
        onRetry={() => void report.refetch()}
      />
    );
  }
  if (!report.data) return <LoadingState label="Computing the dropout watch…" />;
  const data = report.data;
  const comparisonId = data.wwc.comparisonConditionId;
  const comparisonName = data.conditions.find((condition) => condition.conditionId === comparisonId)?.name ?? null;

  const header = (
    <div className="flex flex-wrap items-center justify-between gap-3">
      <p className="text-sm text-ink-muted">
        Computed <time dateTime={data.computedAt}>{formatMoment(data.computedAt)}</time>
        {report.isFetching && ' · refreshing…'}
        {data.blinded && ' · blinded: conditions are shown by code'}
      </p>
      {canExport && (
        <a
          href={`/api/studies/${studyId}/export.csv`}
          download
          className="inline-flex h-8 items-center rounded-md border border-line-strong bg-surface px-3 text-sm font-medium text-ink hover:bg-sunken focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-spruce"
        >
          Download data (CSV)
        </a>
      )}
    </div>
  );

  const cautions = (
    <Notice tone="caution">
      <p className="font-semibold">Statistical flags here are screening aids, not the study's analysis.</p>
      <ul className="mt-1 list-disc pl-5">
        {data.cautions.map((caution) => (
          <li key={caution}>{caution}</li>
        ))}
      </ul>
    </Notice>
  );

  if (data.overall.randomized === 0) {
    return (
      <div className="flex flex-col gap-5">
        {header}
        <EmptyState title="Nobody randomized yet">
          The dropout watch fills in once participants are assigned to conditions. {data.flow.assessedForEligibility}{' '}
          have joined so far.
        </EmptyState>
        {cautions}
      </div>
    );
  }

  return (
    <div className="flex flex-col gap-5">
      {header}
      {cautions}

      <Panel
        id="verdict"
        title="Attrition against the WWC boundaries"
        description="What Works Clearinghouse attrition standard, under both boundaries."
      >
        <WwcVerdicts
          report={data}
          comparisonConditionId={comparisonConditionId}
          onComparisonChange={setComparisonConditionId}
        />
      </Panel>

      <Panel
        id="flow"
        title="Participant flow"
        description="CONSORT 2010-style: enrollment, allocation, follow-up and analysis, with counts and reasons."
      >
        <FlowDiagram flow={data.flow} fileStem={`participant-flow-${studyId}`} />
      </Panel>

      <Panel id="conditions" title="By condition" description={data.windowRule}>
        <div className="flex flex-col gap-3">
          <ConditionTable
            conditions={data.conditions}
            studyClosed={data.studyStatus === 'closed'}
            plannedLength={data.survival.plannedLength}
          />
          <RateDefinitions countingRule={data.countingRule} />
          <p className="text-xs text-ink-muted" data-testid="planned-length">
            {plannedLengthExplanation(data.survival.plannedLength)}
          </p>
        </div>
      </Panel>

      <Panel id="curves" title="Dropout over time">
        <DropoutCurves report={data} />
      </Panel>

      <Panel
        id="strata"
        title="Within randomization strata"
        description="Dropout compared within each stratum the randomization balanced on, then combined."
      >
        <StratifiedTests report={data} />
      </Panel>

      <Panel id="pay" title="Pay by condition">
        <PayParityTable report={data} />
      </Panel>

      <Panel
        id="contacts"
        title="Contacts by condition"
        description="Reminders, re-consent requests and staff messages after randomization. Contacting one condition more than another can itself change who drops out."
      >
        <ContactsByCondition report={data} />
      </Panel>

      <Panel
        id="balance"
        title="Covariate balance"
        description={comparisonName ? `Each condition against condition ${comparisonName}.` : undefined}
      >
        <CovariateBalanceTable report={data} />
      </Panel>

      <Panel
        id="alerts"
        title="Alert thresholds"
        description="The study's researchers get one e-mail each time a threshold is crossed, with a link to this screen."
      >
        {alerts.isError ? (
          <ErrorState
            message={
              alerts.error instanceof ApiError ? alerts.error.message : 'The alert thresholds could not be loaded.'
            }
            onRetry={() => void alerts.refetch()}
          />
        ) : !alerts.data ? (
          <LoadingState label="Loading the alert thresholds…" />
        ) : (
          <AlertThresholdsForm
            key={comparisonId ?? 'default'}
            studyId={studyId}
            alerts={alerts.data}
            comparisonConditionId={comparisonId}
            comparisonName={comparisonName}
            canEdit={canEditAlerts}
            repeatedLooks={data.repeatedLooks}
          />
        )}
      </Panel>
    </div>
  );
}
