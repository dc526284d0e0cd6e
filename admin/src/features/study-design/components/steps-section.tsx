import { useState } from 'react';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { ModalDialog } from '@/components/ui/modal-dialog';
import { Panel } from '@/components/ui/panel';
import { tableRecipe } from '@/components/ui/recipes';
import { EmptyState, ErrorState, LoadingState, Notice } from '@/components/ui/states';
import { ApiError } from '@/lib/api-error';
import { formatMinor } from '@/lib/money';
import { useConditions } from '../api/get-conditions';
import { useSteps, type Step } from '../api/get-steps';
import { useRemovePayOverride } from '../api/remove-pay-override';
import type { SetupPermissions } from './design-lock';
import { LockNotice } from './lock-notice';
import { conditionDisplayName } from '../utils/condition-name';
import { PayOverrideForm } from './pay-override-form';
import { StepForm } from './step-form';
import { StepSettingsForm } from './step-settings-form';
import { verificationWording, windowSentence } from '../utils/step-settings-wording';

type Editing =
  | { kind: 'add' }
  | { kind: 'edit'; step: Step }
  | { kind: 'settings'; step: Step }
  | { kind: 'override'; step: Step }
  | null;

export interface StepsSectionProps {
  studyId: string;
  /** Everyone in a within-subjects study does every condition, so pay cannot differ by condition. */
  design: 'between' | 'within';
  permissions: SetupPermissions;
}

export function StepsSection({ studyId, design, permissions }: StepsSectionProps) {
  const steps = useSteps(studyId);
  const conditions = useConditions(studyId);
  const removeOverride = useRemovePayOverride(studyId);
  const [editing, setEditing] = useState<Editing>(null);
  const [shown, setShown] = useState<Editing>(null);
  const [announcement, setAnnouncement] = useState<string | null>(null);
  if (editing !== null && editing !== shown) setShown(editing);
  const canEdit = permissions.content === null;
  const canOverride = design === 'between' && permissions.payOverrides === null && (conditions.data?.length ?? 0) > 0;

  const conditionName = (conditionId: string) => {
    const condition = conditions.data?.find((c) => c.id === conditionId);
    return condition ? conditionDisplayName(condition) : 'A removed condition';
  };

  const done = (message: string) => {
    setEditing(null);
    setAnnouncement(message);
  };

  const dialogTitle =
    shown?.kind === 'add'
      ? 'Add a step'
      : shown?.kind === 'edit'
        ? `Edit step ${shown.step.position}`
        : shown?.kind === 'settings'
          ? `How step ${shown.step.position} is checked`
          : shown
            ? `Pay differently in step ${shown.step.position}`
            : '';

  return (
    <Panel
      id="steps"
      title="Steps and pay"
      description="What participants do, in order, what each step pays, how its completion is checked and when it can be done. Pay is the same in every condition unless you record an exception."
      actions={
        canEdit && (
          <Button variant="primary" onClick={() => setEditing({ kind: 'add' })}>
            Add step
          </Button>
        )
      }
    >
      <LockNotice lock={permissions.content} />
      <div aria-live="polite" className="empty:hidden">
        {announcement && (
          <Notice tone="info" className="mb-3">
            {announcement}
          </Notice>
        )}
      </div>
      {removeOverride.isError && (
        <Notice className="mb-3">
          {removeOverride.error instanceof ApiError
            ? removeOverride.error.message
            : 'The exception could not be removed. Try again.'}
        </Notice>
      )}
      {steps.isPending ? (
        <LoadingState label="Loading steps…" />
      ) : steps.isError ? (
        <ErrorState
          message={steps.error instanceof ApiError ? steps.error.message : 'The steps could not be loaded.'}
          onRetry={() => void steps.refetch()}
        />
      ) : steps.data.items.length === 0 ? (
        <EmptyState title="No steps yet">
          Add each session or task participants complete, with what it pays. Participants see the steps and their pay
          before they join.
        </EmptyState>
      ) : (
        <>
          {steps.data.hasPayOverrides && (
            <Notice tone="caution" className="mb-3">
              Some steps pay differently by condition. Unequal pay can bias who stays and who drops out; each exception
              below is recorded with its reason and flagged in the dropout watch.
            </Notice>
          )}
          <div className={tableRecipe.frame}>
            <table className={tableRecipe.table}>
              <caption className="sr-only">Steps and pay, in order</caption>
              <thead>
                <tr>
                  <th scope="col" className={`${tableRecipe.headCell} w-10`}>
                    #
                  </th>
                  <th scope="col" className={tableRecipe.headCell}>
                    Step
                  </th>
                  <th scope="col" className={`${tableRecipe.headCell} text-right`}>
                    Pay
                  </th>
                  {(canEdit || canOverride) && (
                    <th scope="col" className={tableRecipe.headCell}>
                      <span className="sr-only">Actions</span>
                    </th>
                  )}
                </tr>
              </thead>
              <tbody>
                {steps.data.items.map((step) => (
                  <tr key={step.id} className={`${tableRecipe.row} align-top`}>
                    <td className={`${tableRecipe.cell} tabular-nums text-ink-muted`}>{step.position}</td>
                    <td className={tableRecipe.cell}>
                      <span className="block font-medium">{step.title}</span>
                      {step.description && <span className="block text-xs text-ink-muted">{step.description}</span>}
                      <dl
                        className="mt-1.5 grid grid-cols-[max-content_1fr] gap-x-2 gap-y-0.5 text-xs"
                        aria-label={`How step ${step.position} is checked and when`}
                      >
                        <dt className="text-ink-muted">Checked by</dt>
                        <dd>
                          {verificationWording[step.verification].label}
                          {step.verification === 'return-link' && (
                            <span className="block font-mono text-2xs break-all text-ink-muted">
                              {step.taskUrl ?? 'No task address yet'}
                            </span>
                          )}
                          {step.verification === 'shared-code' && (
                            <span
                              className={`block ${step.hasCompletionCode ? 'text-ink-muted' : 'font-medium text-danger'}`}
                            >
                              {step.hasCompletionCode ? 'Code set' : 'No code set yet'}
                            </span>
                          )}
                        </dd>
                        <dt className="text-ink-muted">Window</dt>
                        <dd>{windowSentence(step)}</dd>
                      </dl>
                      {step.payOverrides.length > 0 && (
                        <ul
                          className="mt-1.5 flex flex-col gap-1"
                          aria-label={`Pay exceptions for step ${step.position}`}
                        >
                          {step.payOverrides.map((override) => (
                            <li key={override.conditionId} className="flex flex-wrap items-center gap-2 text-xs">
                              <Badge tone="caution">Pays differently</Badge>
                              <span className="font-medium">
                                {conditionName(override.conditionId)}:{' '}
                                {formatMinor(override.payMinor, steps.data.currency)}
                              </span>
                              <span className="text-ink-muted">— {override.reason}</span>
                              {canOverride && (
                                <Button
                                  variant="quiet"
                                  size="compact"
                                  pending={
                                    removeOverride.isPending &&
                                    removeOverride.variables?.conditionId === override.conditionId
                                  }
                                  onClick={() =>
                                    removeOverride.mutate(
                                      { stepId: step.id, conditionId: override.conditionId },
                                      {
                                        onSuccess: () =>
                                          setAnnouncement(
                                            `The exception for ${conditionName(override.conditionId)} was removed.`,
                                          ),
                                      },
                                    )
                                  }
                                  aria-label={`Remove the pay exception for ${conditionName(override.conditionId)} in step ${step.position}`}
                                >
                                  Remove
                                </Button>
                              )}
                            </li>
                          ))}
                        </ul>
                      )}
                    </td>
                    <td className={`${tableRecipe.cell} text-right font-medium tabular-nums whitespace-nowrap`}>
                      {formatMinor(step.payMinor, steps.data.currency)}
                    </td>
                    {(canEdit || canOverride) && (
                      <td className={`${tableRecipe.cell} whitespace-nowrap`}>
                        <div className="flex flex-col items-end gap-0.5">
                          {canEdit && (
                            <>
                              <Button
                                variant="quiet"
                                size="compact"
                                onClick={() => setEditing({ kind: 'edit', step })}
                                aria-label={`Edit step ${step.position}`}
                              >
                                Edit
                              </Button>
                              <Button
                                variant="quiet"
                                size="compact"
                                onClick={() => setEditing({ kind: 'settings', step })}
                                aria-label={`Choose how step ${step.position} is checked and when it opens`}
                              >
                                Checking and window…
                              </Button>
                            </>
                          )}
                          {canOverride && (
                            <Button
                              variant="quiet"
                              size="compact"
                              onClick={() => setEditing({ kind: 'override', step })}
                              aria-label={`Pay one condition differently in step ${step.position}`}
                            >
                              Pay differently…
                            </Button>
                          )}
                        </div>
                      </td>
                    )}
                  </tr>
                ))}
              </tbody>
              <tfoot>
                <tr className="bg-canvas">
                  <th scope="row" colSpan={2} className={`${tableRecipe.cell} text-left font-semibold`}>
                    Total for completing every step
                  </th>
                  <td className={`${tableRecipe.cell} text-right font-semibold tabular-nums`}>
                    {formatMinor(steps.data.totalPayMinor, steps.data.currency)}
                  </td>
                  {(canEdit || canOverride) && <td />}
                </tr>
              </tfoot>
            </table>
          </div>
          {design === 'between' && permissions.payOverrides === 'role' && permissions.content === null && (
            <p className="mt-2 text-xs text-ink-muted">
              Paying one condition differently is a researcher’s decision; ask the study’s researcher.
            </p>
          )}
        </>
      )}

      <ModalDialog
        open={editing !== null}
        onClose={() => setEditing(null)}
        title={dialogTitle}
        size={shown?.kind === 'settings' ? 'wide' : 'narrow'}
      >
        {shown &&
          steps.data &&
          (shown.kind === 'settings' ? (
            <StepSettingsForm
              key={`settings-${shown.step.id}`}
              studyId={studyId}
              step={shown.step}
              onCancel={() => setEditing(null)}
              onSaved={() => done(`How step ${shown.step.position} is checked was saved.`)}
            />
          ) : shown.kind === 'override' ? (
            <PayOverrideForm
              key={`override-${shown.step.id}`}
              studyId={studyId}
              currency={steps.data.currency}
              step={shown.step}
              conditions={conditions.data ?? []}
              onCancel={() => setEditing(null)}
              onSaved={() => done(`The pay exception for step ${shown.step.position} was recorded.`)}
            />
          ) : (
            <StepForm
              key={shown.kind === 'edit' ? shown.step.id : 'new'}
              studyId={studyId}
              currency={steps.data.currency}
              step={shown.kind === 'edit' ? shown.step : undefined}
              stepCount={steps.data.items.length}
              onCancel={() => setEditing(null)}
              onSaved={() =>
                done(shown.kind === 'edit' ? `Step ${shown.step.position} was saved.` : 'The step was added.')
              }
            />
          ))}
      </ModalDialog>
    </Panel>
  );
}
