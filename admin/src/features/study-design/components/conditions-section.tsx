import { useState } from 'react';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { ModalDialog } from '@/components/ui/modal-dialog';
import { Panel } from '@/components/ui/panel';
import { tableRecipe } from '@/components/ui/recipes';
import { EmptyState, ErrorState, LoadingState, Notice } from '@/components/ui/states';
import { ApiError } from '@/lib/api-error';
import { useConditions, type Condition } from '../api/get-conditions';
import { ConditionForm } from './condition-form';
import type { SetupPermissions } from './design-lock';
import { LockNotice } from './lock-notice';

export interface ConditionsSectionProps {
  studyId: string;
  design: 'between' | 'within';
  blinded: boolean;
  isDraft: boolean;
  permissions: SetupPermissions;
}

type Editing = { kind: 'add' } | { kind: 'edit'; condition: Condition } | null;

export function ConditionsSection({ studyId, design, blinded, isDraft, permissions }: ConditionsSectionProps) {
  const conditions = useConditions(studyId);
  const [editing, setEditing] = useState<Editing>(null);
  const [shown, setShown] = useState<Editing>(null);
  const [announcement, setAnnouncement] = useState<string | null>(null);
  if (editing !== null && editing !== shown) setShown(editing);
  const showWeight = design === 'between';
  const canAdd = permissions.design === null;
  const canEdit = permissions.content === null;

  const items = conditions.data ?? [];
  const totalWeight = items.reduce((sum, c) => sum + c.allocationWeight, 0);
  const namesHidden = items.some((c) => c.internalName === null);

  return (
    <Panel
      id="conditions"
      title="Conditions"
      description={
        design === 'between'
          ? 'Each participant is assigned to one of these. Participants only ever see the label and instructions, never the internal name.'
          : 'Each participant goes through all of these, in an assigned order. The order listed here is the first row of the design.'
      }
      actions={
        canAdd && (
          <Button variant="primary" onClick={() => setEditing({ kind: 'add' })}>
            Add condition
          </Button>
        )
      }
    >
      <LockNotice lock={permissions.design}>
        {permissions.design === 'assigned' && canEdit && 'Labels and instructions can still be corrected.'}
      </LockNotice>
      <div aria-live="polite" className="empty:hidden">
        {announcement && (
          <Notice tone="info" className="mb-3">
            {announcement}
          </Notice>
        )}
      </div>
      {blinded && (namesHidden || isDraft) && (
        <p className="mb-3 text-sm text-ink-muted">
          {namesHidden
            ? 'The study is blinded: internal names are hidden behind codes until it closes or is unblinded.'
            : 'The study is blinded: once it opens, internal names are hidden behind the codes A, B, C… until it closes or is unblinded.'}
        </p>
      )}
      {conditions.isPending ? (
        <LoadingState label="Loading conditions…" />
      ) : conditions.isError ? (
        <ErrorState
          message={
            conditions.error instanceof ApiError ? conditions.error.message : 'The conditions could not be loaded.'
          }
          onRetry={() => void conditions.refetch()}
        />
      ) : items.length === 0 ? (
        <EmptyState title="No conditions yet">
          Add at least two conditions
          {design === 'within' ? '' : ', for example the new version and the one you compare it with'}. A study cannot
          open with fewer.
        </EmptyState>
      ) : (
        <>
          <div className={tableRecipe.frame}>
            <table className={tableRecipe.table}>
              <caption className="sr-only">Conditions</caption>
              <thead>
                <tr>
                  <th scope="col" className={tableRecipe.headCell}>
                    Code
                  </th>
                  <th scope="col" className={tableRecipe.headCell}>
                    Internal name
                  </th>
                  <th scope="col" className={tableRecipe.headCell}>
                    Participants see
                  </th>
                  {showWeight && (
                    <th scope="col" className={`${tableRecipe.headCell} text-right`}>
                      Weight
                    </th>
                  )}
                  {canEdit && (
                    <th scope="col" className={tableRecipe.headCell}>
                      <span className="sr-only">Actions</span>
                    </th>
                  )}
                </tr>
              </thead>
              <tbody>
                {items.map((condition) => (
                  <tr key={condition.id} className={tableRecipe.row}>
                    <td className={tableRecipe.cell}>
                      <Badge tone="spruce">{condition.code}</Badge>
                    </td>
                    <td className={`${tableRecipe.cell} font-medium`}>
                      {condition.internalName ?? (
                        <span className="font-normal text-ink-faint">Hidden while blinded</span>
                      )}
                    </td>
                    <td className={tableRecipe.cell}>
                      <span className="block">{condition.participantLabel}</span>
                      {condition.participantInstructions && (
                        <span className="line-clamp-2 block max-w-md text-xs text-ink-muted">
                          {condition.participantInstructions}
                        </span>
                      )}
                    </td>
                    {showWeight && (
                      <td className={`${tableRecipe.cell} text-right tabular-nums`}>{condition.allocationWeight}</td>
                    )}
                    {canEdit && (
                      <td className={`${tableRecipe.cell} text-right`}>
                        <Button
                          variant="quiet"
                          size="compact"
                          onClick={() => setEditing({ kind: 'edit', condition })}
                          aria-label={`Edit condition ${condition.code}`}
                        >
                          Edit
                        </Button>
                      </td>
                    )}
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          {showWeight && items.length > 0 && (
            <p className="mt-2 text-sm text-ink-muted">
              Allocation ratio{' '}
              <span className="font-medium text-ink tabular-nums">
                {items.map((c) => c.allocationWeight).join(' : ')}
              </span>{' '}
              (total weight {totalWeight}). Block sizes must be multiples of {totalWeight}.
            </p>
          )}
          {items.length === 1 && (
            <p className="mt-2 text-sm text-caution">Add one more condition: a study needs at least two.</p>
          )}
        </>
      )}

      <ModalDialog
        open={editing !== null}
        onClose={() => setEditing(null)}
        title={shown?.kind === 'edit' ? `Edit condition ${shown.condition.code}` : 'Add a condition'}
        description={
          permissions.resealsOnChange && shown?.kind === 'add'
            ? 'The study is open: adding a condition seals a fresh sequence under a new fingerprint.'
            : undefined
        }
      >
        {shown && (
          <ConditionForm
            key={shown.kind === 'edit' ? shown.condition.id : 'new'}
            studyId={studyId}
            condition={shown.kind === 'edit' ? shown.condition : undefined}
            showWeight={showWeight}
            weightLocked={permissions.design !== null}
            onCancel={() => setEditing(null)}
            onSaved={(condition) => {
              setEditing(null);
              setAnnouncement(
                shown.kind === 'add'
                  ? `Condition ${condition.code} was added.`
                  : `Condition ${condition.code} was saved.`,
              );
            }}
          />
        )}
      </ModalDialog>
    </Panel>
  );
}
