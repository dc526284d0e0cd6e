import { useState } from 'react';
import { Link } from 'react-router-dom';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Panel } from '@/components/ui/panel';
import { ErrorState, LoadingState, Notice } from '@/components/ui/states';
import { ApiError } from '@/lib/api-error';
import { useDownloadSignedCopy } from '../api/download-signed-copy';
import {
  useParticipantRecord,
  type ParticipantRecord as Record,
  type SignatureSummary,
  type TimelineEvent,
} from '../api/get-participant-record';
import { ContactLog } from './contact-log';
import {
  changeAnnouncement,
  ParticipationChangeDialog,
  type ParticipationChangeTarget,
} from './participation-change-dialog';
import { mayUndoLost } from '../utils/roster-actions';
import { RecordSteps } from './record-steps';
import { EnrollmentStatusBadge } from './enrollment-status-badge';
import { formatExactMoment } from '@/lib/dates';

const moment = (iso: string) => formatExactMoment(iso);

export interface ParticipantRecordProps {
  studyId: string;
  enrollmentId: string;
  blinded: boolean;
  backHref: string;
  /** The study's currency, for each step's pay. */
  currency: string;
  /** Coordinators and admins mark steps done, undo them, send messages and mark people lost (the api's rule). */
  canManage?: boolean;
  /** Auditors may not see participants' completion codes. */
  canSeeCodes?: boolean;
}

export function ParticipantRecord({
  studyId,
  enrollmentId,
  blinded,
  backHref,
  currency,
  canManage = false,
  canSeeCodes = false,
}: ParticipantRecordProps) {
  const record = useParticipantRecord(studyId, enrollmentId);
  return (
    <div className="flex flex-col gap-4">
      <Link to={backHref} className="self-start text-sm font-medium text-spruce-ink underline-offset-2 hover:underline">
        ← Roster
      </Link>
      {record.isPending ? (
        <LoadingState label="Loading the participant’s record…" />
      ) : record.isError ? (
        <ErrorState
          title={
            record.error instanceof ApiError && record.error.statusCode === 404 ? 'No such participant' : undefined
          }
          message={record.error instanceof ApiError ? record.error.message : 'The record could not be loaded.'}
          onRetry={() => void record.refetch()}
        />
      ) : (
        <RecordDetails
          studyId={studyId}
          record={record.data}
          blinded={blinded}
          currency={currency}
          canManage={canManage}
          canSeeCodes={canSeeCodes}
        />
      )}
    </div>
  );
}

interface RecordDetailsProps {
  studyId: string;
  record: Record;
  blinded: boolean;
  currency: string;
  canManage: boolean;
  canSeeCodes: boolean;
}

function RecordDetails({ studyId, record, blinded, currency, canManage, canSeeCodes }: RecordDetailsProps) {
  const { enrollment } = record;
  const [change, setChange] = useState<ParticipationChangeTarget | null>(null);
  const [announcement, setAnnouncement] = useState<string | null>(null);
  const covariates = Object.entries(enrollment.covariates);
  // Oldest first, so the record reads as the story of this person's participation.
  const timeline = [...record.timeline].sort((a, b) => Date.parse(a.at) - Date.parse(b.at));
  return (
    <>
      <div className="flex flex-wrap items-center gap-2">
        <h2 className="font-mono text-lg font-semibold">{enrollment.reference}</h2>
        <EnrollmentStatusBadge status={enrollment.status} />
        {enrollment.needsReconsent && <Badge tone="caution">Re-consent needed</Badge>}
        {enrollment.suggestLost && <Badge tone="caution">Suggested: lost to follow-up</Badge>}
      </div>
      <div aria-live="polite" className="empty:hidden">
        {announcement && <Notice tone="info">{announcement}</Notice>}
      </div>

      <Panel id="participation" title="Participation">
        <dl className="grid gap-x-6 gap-y-2 text-sm sm:grid-cols-[max-content_1fr]">
          <dt className="text-ink-muted">E-mail</dt>
          <dd>{enrollment.email}</dd>
          <dt className="text-ink-muted">Name</dt>
          <dd>{enrollment.name ?? '—'}</dd>
          <dt className="text-ink-muted">{blinded ? 'Condition (coded while blinded)' : 'Condition'}</dt>
          <dd>{enrollment.condition ?? 'Not assigned'}</dd>
          <dt className="text-ink-muted">Stratum</dt>
          <dd className="font-mono text-xs leading-5">{enrollment.stratumKey ?? '—'}</dd>
          <dt className="text-ink-muted">Pretest answers</dt>
          <dd>
            {covariates.length === 0 ? (
              '—'
            ) : (
              <ul>
                {covariates.map(([key, value]) => (
                  <li key={key}>
                    <span className="font-mono text-xs">{key}</span>:{' '}
                    {value === null || value === undefined ? '—' : String(value)}
                  </li>
                ))}
              </ul>
            )}
          </dd>
          <dt className="text-ink-muted">Consent</dt>
          <dd>
            {enrollment.signedVersion !== null ? `Signed version ${enrollment.signedVersion}` : 'Not signed'}
            {enrollment.needsReconsent && ', must sign the newest version'}
          </dd>
          <dt className="text-ink-muted">Added</dt>
          <dd>{moment(enrollment.createdAt)}</dd>
          <dt className="text-ink-muted">Invitation sent</dt>
          <dd>{enrollment.invitationSentAt ? moment(enrollment.invitationSentAt) : 'Not sent'}</dd>
          <dt className="text-ink-muted">Assigned</dt>
          <dd>{enrollment.assignedAt ? moment(enrollment.assignedAt) : '—'}</dd>
          {record.exclusionReason && (
            <>
              <dt className="text-ink-muted">Reason for exclusion</dt>
              <dd>{record.exclusionReason}</dd>
            </>
          )}
          {(record.withdrawalReason || enrollment.status === 'withdrew') && (
            <>
              <dt className="text-ink-muted">Reason for withdrawal</dt>
              <dd>{record.withdrawalReason ?? 'None given'}</dd>
            </>
          )}
          {(record.lostReason || enrollment.status === 'lost') && (
            <>
              <dt className="text-ink-muted">Why lost to follow-up</dt>
              <dd className="flex flex-wrap items-center gap-2">
                {record.lostReason ?? 'Nothing noted'}
                {canManage && mayUndoLost(enrollment.status) && (
                  <Button size="compact" onClick={() => setChange({ change: 'undo-lost', entry: enrollment })}>
                    Undo lost to follow-up
                  </Button>
                )}
              </dd>
            </>
          )}
        </dl>
      </Panel>

      <RecordSteps
        studyId={studyId}
        record={record}
        currency={currency}
        canManage={canManage}
        canSeeCodes={canSeeCodes}
      />

      <ContactLog
        studyId={studyId}
        enrollment={enrollment}
        canManage={canManage}
        onMarkLost={() => setChange({ change: 'lost', entry: enrollment })}
      />
      {canManage && (
        <ParticipationChangeDialog
          studyId={studyId}
          target={change}
          onClose={() => setChange(null)}
          onChanged={(entry, kind) => {
            setChange(null);
            setAnnouncement(changeAnnouncement(entry, kind));
          }}
        />
      )}

      <Panel
        id="signatures"
        title="Signatures"
        description="Each consent version this person signed, with what the signature meant and where it came from."
      >
        {record.signatures.length === 0 ? (
          <p className="text-sm text-ink-muted">No signature yet.</p>
        ) : (
          <ul className="flex flex-col gap-3">
            {record.signatures.map((signature) => (
              <li key={signature.id}>
                <SignatureCard
                  studyId={studyId}
                  enrollmentId={enrollment.id}
                  reference={enrollment.reference}
                  signature={signature}
                />
              </li>
            ))}
          </ul>
        )}
      </Panel>

      <Panel id="timeline" title="Timeline" description="Events from the audit trail, oldest first.">
        {timeline.length === 0 ? (
          <p className="text-sm text-ink-muted">No events recorded.</p>
        ) : (
          <ol className="relative flex flex-col gap-3 border-l border-line pl-4">
            {timeline.map((event, index) => (
              <TimelineItem key={`${event.at}-${event.action}-${index}`} event={event} />
            ))}
          </ol>
        )}
      </Panel>
    </>
  );
}

function SignatureCard({
  studyId,
  enrollmentId,
  reference,
  signature,
}: {
  studyId: string;
  enrollmentId: string;
  reference: string;
  signature: SignatureSummary;
}) {
  const download = useDownloadSignedCopy(studyId);
  const fileName = `signed-consent-${reference}-v${signature.version}.pdf`;
  return (
    <article
      aria-label={`Signature on version ${signature.version}`}
      className="rounded-md border border-line bg-canvas px-4 py-3"
    >
      <div className="flex flex-wrap items-start justify-between gap-2">
        <h3 className="font-semibold">
          Version {signature.version}{' '}
          <span className="font-normal text-ink-muted">· signed {moment(signature.signedAt)}</span>
        </h3>
        {signature.pdfSha256 ? (
          <Button
            size="compact"
            pending={download.isPending}
            onClick={() => download.mutate({ enrollmentId, signatureId: signature.id, fileName })}
            aria-label={`Download the signed PDF of version ${signature.version}`}
          >
            Download PDF
          </Button>
        ) : (
          <span className="text-xs text-ink-muted">The signed PDF is still being made.</span>
        )}
      </div>
      {download.isError && (
        <p role="alert" className="mt-1 text-xs font-medium text-danger">
          {download.error instanceof ApiError ? download.error.message : 'The PDF could not be downloaded.'}
        </p>
      )}
      <dl className="mt-2 grid gap-x-6 gap-y-1.5 text-sm sm:grid-cols-[max-content_1fr]">
        <dt className="text-ink-muted">Typed name</dt>
        <dd className="font-medium">{signature.typedName}</dd>
        <dt className="text-ink-muted">Meaning of the signature</dt>
        <dd>“{signature.meaning}”</dd>
        <dt className="text-ink-muted">Drawn mark</dt>
        <dd>{signature.hasMark ? 'Yes' : 'None'}</dd>
        <dt className="text-ink-muted">Text fingerprint (SHA-256)</dt>
        <dd className="font-mono text-xs leading-5 break-all">{signature.textFingerprint}</dd>
        <dt className="text-ink-muted">PDF fingerprint (SHA-256)</dt>
        <dd className="font-mono text-xs leading-5 break-all">{signature.pdfSha256 ?? '—'}</dd>
        <dt className="text-ink-muted">IP address</dt>
        <dd className="font-mono text-xs leading-5">{signature.ip ?? '—'}</dd>
        <dt className="text-ink-muted">Browser (user agent)</dt>
        <dd className="text-xs leading-5 break-words text-ink-muted">{signature.userAgent ?? '—'}</dd>
      </dl>
    </article>
  );
}

function TimelineItem({ event }: { event: TimelineEvent }) {
  const details = Object.entries(event.data);
  return (
    <li className="relative">
      <span aria-hidden="true" className="absolute top-1.5 -left-[1.3rem] size-2 rounded-full bg-spruce" />
      <p className="text-sm">{event.sentence}</p>
      <p className="text-xs text-ink-muted">
        {event.name} · <time dateTime={event.at}>{moment(event.at)}</time>
      </p>
      {details.length > 0 && (
        <dl className="mt-1 grid grid-cols-[max-content_1fr] gap-x-3 text-xs text-ink-muted">
          {details.map(([key, value]) => (
            <div key={key} className="contents">
              <dt>{key}</dt>
              <dd className="font-mono break-all text-ink">
                {typeof value === 'string' ? value : JSON.stringify(value)}
              </dd>
            </div>
          ))}
        </dl>
      )}
    </li>
  );
}
