import { Link } from 'react-router-dom';
import { Badge } from '@/components/ui/badge';
import type { Study } from '../api/get-study';
import { studyDesignLabels, studyStatusLabels } from './study-labels';

export interface StudyHeaderProps {
  study: Study;
  /** The published SHA-256 commitment, once the study has opened. */
  commitment: string | null;
  actions?: React.ReactNode;
}

/** "cfd28da4…6480b": enough to recognise the fingerprint; the Assignment page shows it whole. */
export function shortFingerprint(hex: string): string {
  return hex.length <= 14 ? hex : `${hex.slice(0, 8)}…${hex.slice(-5)}`;
}

export function StudyHeader({ study, commitment, actions }: StudyHeaderProps) {
  const status = studyStatusLabels[study.status];
  return (
    <header className="flex flex-col gap-2">
      <Link to="/studies" className="w-fit text-sm text-spruce-ink underline-offset-2 hover:underline">
        ← All studies
      </Link>
      <div className="flex flex-wrap items-start justify-between gap-3">
        <div className="flex min-w-0 flex-col gap-1">
          <div className="flex flex-wrap items-center gap-2">
            <h1 className="text-2xl font-semibold">{study.title}</h1>
            <Badge tone={status.tone}>{status.label}</Badge>
            {study.blinded && <Badge tone="neutral">Blinded</Badge>}
            {study.archivedAt && <Badge tone="caution">Archived</Badge>}
          </div>
          <dl className="flex flex-wrap gap-x-5 gap-y-1 text-sm text-ink-muted">
            <div className="flex gap-1.5">
              <dt className="sr-only">Design</dt>
              <dd>{studyDesignLabels[study.design]}</dd>
            </div>
            <div className="flex gap-1.5">
              <dt>Protocol reference</dt>
              <dd className="font-medium text-ink">{study.protocolNumber || 'not given'}</dd>
            </div>
            <div className="flex gap-1.5">
              <dt>Ethics approval</dt>
              <dd className="font-medium text-ink">{study.ethicsApprovalReference || 'not given'}</dd>
            </div>
            {commitment && (
              <div className="flex gap-1.5">
                <dt>Sequence fingerprint</dt>
                <dd>
                  <Link
                    to={`/studies/${study.id}/assignment`}
                    className="font-mono text-xs text-spruce-ink underline-offset-2 hover:underline"
                    title={commitment}
                    aria-label={`Sequence fingerprint ${shortFingerprint(commitment)}, see the Assignment page`}
                  >
                    {shortFingerprint(commitment)}
                  </Link>
                </dd>
              </div>
            )}
          </dl>
        </div>
        {actions}
      </div>
    </header>
  );
}
