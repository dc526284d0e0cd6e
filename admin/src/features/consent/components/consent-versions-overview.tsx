import { useState } from 'react';
import { Link } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { EmptyState, ErrorState, LoadingState, Notice } from '@/components/ui/states';
import { ApiError } from '@/lib/api-error';
import { useConsentVersions, type ConsentVersion } from '../api/get-consent-versions';
import { formatLetterDate, formatMoment } from '../utils/consent-dates';
import { ConsentVersionsTable } from './consent-versions-table';
import { NewDraftDialog } from './new-draft-dialog';
import { TemplateCaution } from './template-caution';

export interface ConsentVersionsOverviewProps {
  studyId: string;
  canEdit: boolean;
  versionHref: (versionId: string) => string;
  onDraftCreated: (version: ConsentVersion) => void;
}

export function ConsentVersionsOverview({
  studyId,
  canEdit,
  versionHref,
  onDraftCreated,
}: ConsentVersionsOverviewProps) {
  const versions = useConsentVersions(studyId);
  const [creating, setCreating] = useState(false);
  const [draftFormKey, setDraftFormKey] = useState(0);
  const startDraft = () => {
    setDraftFormKey((key) => key + 1);
    setCreating(true);
  };

  const newDraftButton = canEdit && (
    <Button variant="primary" onClick={startDraft}>
      New draft from template
    </Button>
  );

  return (
    <div className="flex flex-col gap-4">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h2 className="text-lg font-semibold">Consent versions</h2>
          <p className="text-sm text-ink-muted">
            The form participants read and sign. Each approved version stays on record with the signatures made on it.
          </p>
        </div>
        {newDraftButton}
      </div>
      <TemplateCaution />

      {versions.isPending ? (
        <LoadingState label="Loading consent versions…" />
      ) : versions.isError ? (
        <ErrorState
          message={
            versions.error instanceof ApiError ? versions.error.message : 'The consent versions could not be loaded.'
          }
          onRetry={() => void versions.refetch()}
        />
      ) : versions.data.length === 0 ? (
        <EmptyState title="No consent form yet" action={newDraftButton || undefined}>
          Start a draft from a template, adapt it with your ethics board, upload their approval letter and activate it.
          Participants can sign once a version is active.
        </EmptyState>
      ) : (
        <>
          <ActiveVersionSummary
            version={versions.data.find((version) => version.status === 'active') ?? null}
            versionHref={versionHref}
          />
          <ConsentVersionsTable versions={versions.data} versionHref={versionHref} />
        </>
      )}

      {canEdit && (
        <NewDraftDialog
          key={draftFormKey}
          studyId={studyId}
          open={creating}
          onClose={() => setCreating(false)}
          onCreated={(version) => {
            setCreating(false);
            onDraftCreated(version);
          }}
        />
      )}
    </div>
  );
}

function ActiveVersionSummary({
  version,
  versionHref,
}: {
  version: ConsentVersion | null;
  versionHref: (id: string) => string;
}) {
  if (!version) {
    return (
      <Notice tone="info">
        No version is active, so nobody can sign yet. Activate an approved draft to open consent to participants.
      </Notice>
    );
  }
  return (
    <section
      aria-labelledby="active-version-heading"
      className="rounded-lg border border-success/30 bg-surface p-4 shadow-raised"
    >
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h3 id="active-version-heading" className="font-semibold">
          Participants now sign version {version.version}
        </h3>
        <Link
          to={versionHref(version.id)}
          className="text-sm font-medium text-spruce-ink underline-offset-2 hover:underline"
        >
          Open version {version.version}
        </Link>
      </div>
      <dl className="mt-2 grid gap-x-6 gap-y-2 text-sm sm:grid-cols-[max-content_1fr]">
        <dt className="text-ink-muted">Fingerprint (SHA-256)</dt>
        <dd className="font-mono text-xs break-all">{version.fingerprint}</dd>
        <dt className="text-ink-muted">Ethics approval</dt>
        <dd>
          <span className="font-mono text-xs">{version.approvalReference}</span>
          {version.approvedAt && <> of {formatLetterDate(version.approvedAt)}</>}
        </dd>
        <dt className="text-ink-muted">Active since</dt>
        <dd>{version.activeFrom ? formatMoment(version.activeFrom) : '—'}</dd>
        <dt className="text-ink-muted">Signatures</dt>
        <dd className="tabular-nums">{version.signatures}</dd>
      </dl>
    </section>
  );
}
