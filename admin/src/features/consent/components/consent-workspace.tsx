import { useState } from 'react';
import { useSearchParams } from 'react-router-dom';
import { Notice } from '@/components/ui/states';
import type { ConsentVersion } from '../api/get-consent-versions';
import { ConsentVersionView } from './consent-version-view';
import { ConsentVersionsOverview } from './consent-versions-overview';

export interface ConsentWorkspaceProps {
  studyId: string;
  /** Coordinators, researchers and admins may draft and activate (the api's rule). */
  canEdit: boolean;
  /** Told after an activation, e.g. to refresh the roster's re-consent flags. */
  onActivated?: (version: ConsentVersion) => void;
}

/** The consent page: the list of versions, or one version when `?version=` names it. */
export function ConsentWorkspace({ studyId, canEdit, onActivated }: ConsentWorkspaceProps) {
  const [searchParams, setSearchParams] = useSearchParams();
  const versionId = searchParams.get('version');
  const [announcement, setAnnouncement] = useState<string | null>(null);

  const hrefFor = (id: string | null) => {
    const next = new URLSearchParams(searchParams);
    if (id) next.set('version', id);
    else next.delete('version');
    const query = next.toString();
    return query ? `?${query}` : '.';
  };
  const open = (id: string | null) =>
    setSearchParams((params) => {
      const next = new URLSearchParams(params);
      if (id) next.set('version', id);
      else next.delete('version');
      return next;
    });

  return (
    <div className="flex flex-col gap-4">
      <div aria-live="polite" className="empty:hidden">
        {announcement && <Notice tone="info">{announcement}</Notice>}
      </div>
      {versionId ? (
        <ConsentVersionView
          studyId={studyId}
          versionId={versionId}
          canEdit={canEdit}
          backHref={hrefFor(null)}
          onActivated={(version) => {
            setAnnouncement(
              `Version ${version.version} is active. Its fingerprint is fixed, and everyone enrolled is asked to sign it.`,
            );
            onActivated?.(version);
          }}
        />
      ) : (
        <ConsentVersionsOverview
          studyId={studyId}
          canEdit={canEdit}
          versionHref={(id) => hrefFor(id)}
          onDraftCreated={(version) => {
            setAnnouncement(`Draft version ${version.version} was created from the template. Edit it below.`);
            open(version.id);
          }}
        />
      )}
    </div>
  );
}
