import { Link } from 'react-router-dom';
import { ErrorState, LoadingState, Notice } from '@/components/ui/states';
import { ApiError } from '@/lib/api-error';
import { useConsentVersion } from '../api/get-consent-version';
import { useConsentVersions, type ConsentVersion } from '../api/get-consent-versions';
import { ConsentStatusBadge } from './consent-status-badge';
import { DraftEditor } from './draft-editor';
import { VersionRecord } from './version-record';

export interface ConsentVersionViewProps {
  studyId: string;
  versionId: string;
  canEdit: boolean;
  backHref: string;
  onActivated: (version: ConsentVersion) => void;
}

export function ConsentVersionView({ studyId, versionId, canEdit, backHref, onActivated }: ConsentVersionViewProps) {
  const version = useConsentVersion(studyId, versionId);
  const versions = useConsentVersions(studyId);
  const activeVersionNumber =
    versions.data?.find((candidate) => candidate.status === 'active' && candidate.id !== versionId)?.version ?? null;

  return (
    <div className="flex flex-col gap-4">
      <Link to={backHref} className="self-start text-sm font-medium text-spruce-ink underline-offset-2 hover:underline">
        ← All consent versions
      </Link>
      {version.isPending ? (
        <LoadingState label="Loading the version…" />
      ) : version.isError ? (
        <ErrorState
          title={version.error instanceof ApiError && version.error.statusCode === 404 ? 'No such version' : undefined}
          message={version.error instanceof ApiError ? version.error.message : 'The version could not be loaded.'}
          onRetry={() => void version.refetch()}
        />
      ) : (
        <>
          <div className="flex flex-wrap items-center gap-2">
            <h2 className="text-lg font-semibold">Consent version {version.data.version}</h2>
            <ConsentStatusBadge status={version.data.status} />
          </div>
          {version.data.status === 'draft' && canEdit ? (
            <DraftEditor
              key={version.data.id}
              studyId={studyId}
              version={version.data}
              activeVersionNumber={activeVersionNumber}
              onActivated={onActivated}
            />
          ) : (
            <>
              {version.data.status === 'draft' && (
                <Notice tone="info">Drafts are edited by coordinators and researchers; you can read it here.</Notice>
              )}
              <VersionRecord studyId={studyId} version={version.data} />
            </>
          )}
        </>
      )}
    </div>
  );
}
