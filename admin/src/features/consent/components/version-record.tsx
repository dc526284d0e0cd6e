import type { ConsentVersion } from '../api/get-consent-versions';
import { formatLetterDate, formatMoment } from '../utils/consent-dates';
import { LetterOnRecord } from './approval-letter-upload';
import { ConsentPreview } from './consent-preview';

/** An active or retired version: fixed text, full fingerprint, approval and its letter. Nothing here can change. */
export function VersionRecord({ studyId, version }: { studyId: string; version: ConsentVersion }) {
  return (
    <div className="flex flex-col gap-5">
      <section aria-labelledby="record-heading" className="rounded-lg border border-line bg-surface p-4 shadow-raised">
        <h3 id="record-heading" className="font-semibold">
          {version.status === 'active'
            ? 'The version participants sign now'
            : version.status === 'retired'
              ? 'A retired version, kept on record'
              : 'Draft'}
        </h3>
        <dl className="mt-3 grid gap-x-6 gap-y-2 text-sm sm:grid-cols-[max-content_1fr]">
          <dt className="text-ink-muted">Fingerprint (SHA-256 of the text)</dt>
          <dd className="font-mono text-xs leading-5 break-all">{version.fingerprint ?? 'Fixed at activation'}</dd>
          <dt className="text-ink-muted">Ethics approval</dt>
          <dd>
            {version.approvalReference ? (
              <span className="font-mono text-xs">{version.approvalReference}</span>
            ) : (
              'Not entered'
            )}
            {version.approvedAt && <> of {formatLetterDate(version.approvedAt)}</>}
          </dd>
          <dt className="text-ink-muted">Active</dt>
          <dd>
            {version.activeFrom ? `from ${formatMoment(version.activeFrom)}` : 'Never activated'}
            {version.activeTo && ` to ${formatMoment(version.activeTo)}`}
          </dd>
          <dt className="text-ink-muted">Signatures</dt>
          <dd className="tabular-nums">{version.signatures}</dd>
          <dt className="text-ink-muted">Reading time</dt>
          <dd>About {version.readingMinutes} minutes</dd>
        </dl>
        <div className="mt-3">
          {version.approvalLetter ? (
            <LetterOnRecord studyId={studyId} version={version} />
          ) : (
            <p className="text-sm text-ink-muted">No approval letter on record.</p>
          )}
        </div>
      </section>
      <section aria-labelledby="text-heading" className="flex flex-col gap-2">
        <h3 id="text-heading" className="font-semibold">
          The text {version.status === 'draft' ? 'as saved' : 'as approved'}
        </h3>
        <ConsentPreview
          html={version.previewHtml}
          label={`Text of version ${version.version}`}
          className="max-h-[40rem]"
        />
      </section>
    </div>
  );
}
