import { useState } from 'react';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Panel } from '@/components/ui/panel';
import { EmptyState, ErrorState, LoadingState, Notice } from '@/components/ui/states';
import { ApiError } from '@/lib/api-error';
import { useStratificationFactors } from '../api/get-stratification-factors';
import { stratumCount } from '../utils/factor-levels';
import type { SetupPermissions } from './design-lock';
import { FactorsForm } from './factors-form';
import { LockNotice } from './lock-notice';
import { PretestNote } from './pretest-note';

export interface FactorsSectionProps {
  studyId: string;
  permissions: SetupPermissions;
}

export function FactorsSection({ studyId, permissions }: FactorsSectionProps) {
  const factors = useStratificationFactors(studyId);
  const [editing, setEditing] = useState(false);
  const [announcement, setAnnouncement] = useState<string | null>(null);
  const canEdit = permissions.design === null;

  const items = factors.data?.items ?? [];
  return (
    <Panel
      id="factors"
      title="Stratification factors"
      description="Answers participants give during screening (such as a pretest score) that the assignment keeps balanced. They never exclude anyone."
      actions={
        canEdit &&
        !editing &&
        factors.isSuccess && (
          <Button variant="primary" onClick={() => setEditing(true)}>
            {items.length === 0 ? 'Add factors' : 'Edit factors'}
          </Button>
        )
      }
    >
      <LockNotice lock={permissions.design} />
      <div aria-live="polite" className="empty:hidden">
        {announcement && (
          <Notice tone="info" className="mb-3">
            {announcement}
          </Notice>
        )}
      </div>
      {factors.isPending ? (
        <LoadingState label="Loading factors…" />
      ) : factors.isError ? (
        <ErrorState
          message={
            factors.error instanceof ApiError
              ? factors.error.message
              : 'The stratification factors could not be loaded.'
          }
          onRetry={() => void factors.refetch()}
        />
      ) : editing ? (
        <>
          {permissions.resealsOnChange && (
            <Notice tone="caution" className="mb-3">
              The study is open: saving new factors seals a fresh sequence under a new fingerprint.
            </Notice>
          )}
          <FactorsForm
            studyId={studyId}
            factors={items}
            pretestNote={factors.data.pretestNote}
            onCancel={() => setEditing(false)}
            onSaved={() => {
              setEditing(false);
              setAnnouncement('The stratification factors were saved.');
            }}
          />
        </>
      ) : items.length === 0 ? (
        <EmptyState title="No stratification factors">
          {canEdit
            ? 'Without factors, every participant is in one stratum. Add a pretest or a grouping when conditions must stay balanced within its levels.'
            : 'This study has none: every participant is in one stratum.'}
        </EmptyState>
      ) : (
        <div className="flex flex-col gap-3">
          <ul className="flex flex-col divide-y divide-line rounded-md border border-line">
            {items.map((factor) => (
              <li key={factor.id} className="flex flex-wrap items-start justify-between gap-3 px-3 py-2.5">
                <div className="min-w-0">
                  <p className="font-medium">{factor.label}</p>
                  <p className="text-xs text-ink-muted">
                    <span className="font-mono">{factor.key}</span> ·{' '}
                    {factor.kind === 'numeric'
                      ? `numeric, cut at ${(factor.cutPoints ?? []).join(', ')}`
                      : 'categorical'}
                    {factor.minimizationWeight !== 1 && ` · weight ${factor.minimizationWeight} in minimization`}
                  </p>
                </div>
                <ul className="flex flex-wrap gap-1" aria-label={`Levels of ${factor.key}`}>
                  {factor.levels.map((level) => (
                    <li key={level}>
                      <Badge tone="spruce">{level}</Badge>
                    </li>
                  ))}
                </ul>
              </li>
            ))}
          </ul>
          <p className="text-sm text-ink-muted">
            Together these make {stratumCount(items.map((f) => f.levels.length))} strata, each with its own balanced
            sequence under a stratified scheme.
          </p>
          {items.some((factor) => factor.kind === 'numeric') && <PretestNote note={factors.data.pretestNote} />}
        </div>
      )}
    </Panel>
  );
}
