import { useState } from 'react';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { CopyButton } from '@/components/ui/copy-button';
import { Panel } from '@/components/ui/panel';
import { ErrorState, LoadingState, Notice } from '@/components/ui/states';
import { ApiError } from '@/lib/api-error';
import { formatMinor } from '@/lib/money';
import { useCompleteStep } from '../api/complete-step';
import type { ParticipantRecord } from '../api/get-participant-record';
import { useStepCodes } from '../api/get-step-codes';
import {
  payoutStatusWording,
  stepStatusWording,
  undoUnavailableReason,
  verificationWording,
  verifiedByWording,
} from '../utils/step-wording';
import { UndoCompletionDialog, type UndoTarget } from './undo-completion-dialog';
import { formatMoment } from '@/lib/dates';

type RecordStep = ParticipantRecord['steps'][number];

const moment = (iso: string) => formatMoment(iso);

export interface RecordStepsProps {
  studyId: string;
  record: ParticipantRecord;
  /** The study's currency, for each step's pay. */
  currency: string;
  /** Coordinators and admins mark steps done and undo them. */
  canManage: boolean;
  /** Everyone but auditors may see participants' codes. */
  canSeeCodes: boolean;
}

export function RecordSteps({ studyId, record, currency, canManage, canSeeCodes }: RecordStepsProps) {
  const enrollment = record.enrollment;
  const complete = useCompleteStep(studyId, enrollment.id);
  const [undoing, setUndoing] = useState<UndoTarget | null>(null);
  const [announcement, setAnnouncement] = useState<string | null>(null);
  const hasCodeSteps = record.steps.some((step) => step.verification === 'participant-code');

  const markDone = (step: RecordStep) => {
    setAnnouncement(null);
    complete.mutate(step.stepId, {
      onSuccess: () => setAnnouncement(`Step ${step.position} is marked done; its pay is owed.`),
    });
  };

  return (
    <Panel
      id="steps"
      title="Steps"
      description="Each step with its window, how it was checked and by whom, and where its pay stands."
    >
      <div aria-live="polite" className="empty:hidden">
        {announcement && (
          <Notice tone="info" className="mb-3">
            {announcement}
          </Notice>
        )}
      </div>
      {complete.isError && (
        <Notice className="mb-3">
          {complete.error instanceof ApiError
            ? complete.error.message
            : 'The step could not be marked done. Try again.'}
        </Notice>
      )}
      {record.steps.length === 0 ? (
        <p className="text-sm text-ink-muted">
          {enrollment.assignedAt
            ? 'The study has no steps.'
            : 'Steps start once this person has signed the consent form and been assigned.'}
        </p>
      ) : (
        <ol className="flex flex-col gap-3" aria-label="Steps of this participant">
          {record.steps.map((step) => (
            <li key={step.stepId}>
              <StepCard
                step={step}
                currency={currency}
                canManage={canManage}
                marking={complete.isPending && complete.variables === step.stepId}
                onMarkDone={() => markDone(step)}
                onUndo={() => {
                  setAnnouncement(null);
                  setUndoing({ stepId: step.stepId, position: step.position, title: step.title });
                }}
              />
            </li>
          ))}
        </ol>
      )}
      {canSeeCodes && hasCodeSteps && <ParticipantCodes studyId={studyId} enrollmentId={enrollment.id} />}
      {canManage && (
        <UndoCompletionDialog
          studyId={studyId}
          enrollmentId={enrollment.id}
          reference={enrollment.reference}
          target={undoing}
          onClose={() => setUndoing(null)}
          onUndone={(target) => {
            setUndoing(null);
            setAnnouncement(`Step ${target.position} is no longer done; its unapproved pay was cancelled.`);
          }}
        />
      )}
    </Panel>
  );
}

function StepCard({
  step,
  currency,
  canManage,
  marking,
  onMarkDone,
  onUndo,
}: {
  step: RecordStep;
  currency: string;
  canManage: boolean;
  marking: boolean;
  onMarkDone: () => void;
  onUndo: () => void;
}) {
  const status = stepStatusWording[step.status];
  const completion = step.completion;
  const payout = completion?.payoutStatus
    ? (payoutStatusWording[completion.payoutStatus] ?? { label: completion.payoutStatus, tone: 'neutral' as const })
    : null;
  const undoBlocked = completion ? undoUnavailableReason(completion) : null;
  const evidence = completion ? Object.entries(completion.evidence) : [];

  return (
    <article
      aria-label={`Step ${step.position}: ${step.title}`}
      className="rounded-md border border-line bg-canvas px-4 py-3"
    >
      <div className="flex flex-wrap items-start justify-between gap-2">
        <div className="flex min-w-0 flex-col gap-0.5">
          <h3 className="font-semibold">
            <span className="text-ink-muted tabular-nums">{step.position}.</span> {step.title}
          </h3>
          <p className="flex flex-wrap items-center gap-2 text-sm">
            <Badge tone={status.tone}>{status.label}</Badge>
            {payout && <Badge tone={payout.tone}>{payout.label}</Badge>}
            <span className="text-ink-muted">
              {formatMinor(step.payMinor, currency)} · {verificationWording[step.verification]}
            </span>
          </p>
        </div>
        {canManage && (
          <div className="flex flex-wrap gap-2">
            {(step.status === 'open' || step.status === 'overdue') && (
              <Button
                size="compact"
                variant="primary"
                pending={marking}
                onClick={onMarkDone}
                aria-label={`Mark step ${step.position} done`}
              >
                Mark done
              </Button>
            )}
            {completion?.canUndo && (
              <Button size="compact" onClick={onUndo} aria-label={`Undo step ${step.position}`}>
                Undo…
              </Button>
            )}
          </div>
        )}
      </div>

      <dl className="mt-2 grid gap-x-6 gap-y-1 text-sm sm:grid-cols-[max-content_1fr]">
        {!completion && (
          <>
            <dt className="text-ink-muted">Where it stands</dt>
            <dd>{status.explanation}</dd>
          </>
        )}
        <dt className="text-ink-muted">Opens</dt>
        <dd>
          {step.opensAt ? (
            <time dateTime={step.opensAt}>{moment(step.opensAt)}</time>
          ) : (
            'Once the step before it is done'
          )}
        </dd>
        <dt className="text-ink-muted">Due</dt>
        <dd>{step.dueAt ? <time dateTime={step.dueAt}>{moment(step.dueAt)}</time> : 'No due date'}</dd>
        {completion && (
          <>
            <dt className="text-ink-muted">Done</dt>
            <dd>
              <time dateTime={completion.completedAt}>{moment(completion.completedAt)}</time>
            </dd>
            <dt className="text-ink-muted">Checked by</dt>
            <dd>
              {verifiedByWording[completion.verifiedBy]}
              {completion.recordedByEmail && (
                <span className="text-ink-muted"> · recorded by {completion.recordedByEmail}</span>
              )}
            </dd>
            {evidence.length > 0 && (
              <>
                <dt className="text-ink-muted">Evidence</dt>
                <dd className="font-mono text-xs leading-5 break-all">
                  {evidence
                    .map(([key, value]) => `${key}: ${typeof value === 'string' ? value : JSON.stringify(value)}`)
                    .join(' · ')}
                </dd>
              </>
            )}
          </>
        )}
        {step.code && (
          <>
            <dt className="text-ink-muted">Their code</dt>
            <dd className="font-mono text-sm font-medium">{step.code}</dd>
          </>
        )}
      </dl>

      {canManage && completion && undoBlocked && (
        <p className="mt-2 text-xs text-ink-muted">Undo is not available. {undoBlocked}</p>
      )}

      {step.undone.length > 0 && (
        <div className="mt-2 border-t border-line pt-2">
          <h4 className="text-xs font-semibold text-ink-muted">Undone before</h4>
          <ul className="mt-1 flex flex-col gap-1 text-xs">
            {step.undone.map((undone) => (
              <li key={`${undone.completedAt}-${undone.undoneAt}`}>
                Done <time dateTime={undone.completedAt}>{moment(undone.completedAt)}</time>, undone{' '}
                <time dateTime={undone.undoneAt}>{moment(undone.undoneAt)}</time>
                {undone.undoneByEmail && ` by ${undone.undoneByEmail}`}: “{undone.reason}”
              </li>
            ))}
          </ul>
        </div>
      )}
    </article>
  );
}

function ParticipantCodes({ studyId, enrollmentId }: { studyId: string; enrollmentId: string }) {
  const codes = useStepCodes(studyId, enrollmentId);
  return (
    <section aria-labelledby="participant-codes-heading" className="mt-4 border-t border-line pt-3">
      <h3 id="participant-codes-heading" className="font-semibold">
        Their codes
      </h3>
      <p className="text-sm text-ink-muted">
        For handing out in person or by message; each works only for this participant and step.
      </p>
      {codes.isPending ? (
        <LoadingState label="Loading the codes…" className="py-4" />
      ) : codes.isError ? (
        <ErrorState
          message={codes.error instanceof ApiError ? codes.error.message : 'The codes could not be loaded.'}
          onRetry={() => void codes.refetch()}
        />
      ) : codes.data.items.length === 0 ? (
        <p className="mt-1 text-sm text-ink-muted">No step uses codes of its own for this participant.</p>
      ) : (
        <ul className="mt-2 flex flex-col gap-1.5 text-sm" aria-label="Codes for each step">
          {codes.data.items.map((code) => (
            <li key={code.stepId} className="flex flex-wrap items-center gap-x-3 gap-y-1">
              <span className="min-w-0">
                Step {code.position}: {code.title}
              </span>
              <code className="rounded-sm bg-sunken px-1.5 py-0.5 font-mono text-sm font-semibold">{code.code}</code>
              <CopyButton value={code.code} label="Copy" aria-label={`Copy the code for step ${code.position}`} />
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}
