import { useState } from 'react';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Panel } from '@/components/ui/panel';
import { EmptyState, ErrorState, LoadingState, Notice } from '@/components/ui/states';
import { ApiError } from '@/lib/api-error';
import { useScreeningQuestions } from '../api/get-screening-questions';
import type { SetupPermissions } from './design-lock';
import { LockNotice } from './lock-notice';
import { ScreeningForm } from './screening-form';

const kindLabels = { 'yes-no': 'Yes or no', number: 'Number', choice: 'Choice' } as const;

export interface ScreeningSectionProps {
  studyId: string;
  permissions: SetupPermissions;
}

export function ScreeningSection({ studyId, permissions }: ScreeningSectionProps) {
  const questions = useScreeningQuestions(studyId);
  const [editing, setEditing] = useState(false);
  const [announcement, setAnnouncement] = useState<string | null>(null);
  const canEdit = permissions.content === null;

  const eligibility = questions.data?.filter((q) => q.purpose === 'eligibility') ?? [];
  const stratification = questions.data?.filter((q) => q.purpose === 'stratification') ?? [];

  return (
    <Panel
      id="screening"
      title="Screening questions"
      description="What participants answer before the consent form. Eligibility questions decide who may take part; the stratification factors’ questions follow them."
      actions={
        canEdit &&
        !editing &&
        questions.isSuccess && (
          <Button variant="primary" onClick={() => setEditing(true)}>
            {eligibility.length === 0 ? 'Add questions' : 'Edit questions'}
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
      {questions.isPending ? (
        <LoadingState label="Loading screening questions…" />
      ) : questions.isError ? (
        <ErrorState
          message={
            questions.error instanceof ApiError
              ? questions.error.message
              : 'The screening questions could not be loaded.'
          }
          onRetry={() => void questions.refetch()}
        />
      ) : editing ? (
        <ScreeningForm
          studyId={studyId}
          questions={eligibility}
          factorKeys={stratification.map((q) => q.key)}
          onCancel={() => setEditing(false)}
          onSaved={() => {
            setEditing(false);
            setAnnouncement('The screening questions were saved.');
          }}
        />
      ) : questions.data.length === 0 ? (
        <EmptyState title="No screening questions">Everyone who signs in may go on to the consent form.</EmptyState>
      ) : (
        <ol className="flex flex-col divide-y divide-line rounded-md border border-line">
          {questions.data.map((question) => (
            <li key={question.key} className="flex flex-wrap items-start justify-between gap-2 px-3 py-2.5">
              <div className="min-w-0">
                <p className="font-medium">{question.label}</p>
                <p className="text-xs text-ink-muted">
                  <span className="font-mono">{question.key}</span> · {kindLabels[question.kind]}
                  {question.options && ` · ${question.options.join(', ')}`}
                </p>
              </div>
              {question.purpose === 'eligibility' ? (
                <Badge tone="neutral">Eligibility</Badge>
              ) : (
                <Badge tone="spruce">Stratification, never excludes</Badge>
              )}
            </li>
          ))}
        </ol>
      )}
    </Panel>
  );
}
