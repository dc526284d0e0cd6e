import { useId, useRef, useState } from 'react';
import { Button } from '@/components/ui/button';
import { ApiError } from '@/lib/api-error';
import { useDownloadApprovalLetter } from '../api/download-approval-letter';
import type { ConsentVersion } from '../api/get-consent-versions';
import { useUploadApprovalLetter } from '../api/upload-approval-letter';
import { approvalLetterProblem, formatFileSize, pdfHeaderLength } from '../utils/approval-letter-checks';

const fileInputClass =
  'block w-full text-sm text-ink-muted file:mr-3 file:h-8 file:cursor-pointer file:rounded-md file:border file:border-line-strong file:bg-surface file:px-3 file:text-sm file:font-medium file:text-ink hover:file:bg-sunken';

export function ApprovalLetterUpload({ studyId, version }: { studyId: string; version: ConsentVersion }) {
  const upload = useUploadApprovalLetter(studyId, version.id);
  const inputId = useId();
  const messageId = useId();
  const input = useRef<HTMLInputElement>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const [uploaded, setUploaded] = useState<string | null>(null);

  const onFile = async (file: File | undefined) => {
    setProblem(null);
    setUploaded(null);
    upload.reset();
    if (!file) return;
    const firstBytes = new Uint8Array(await file.slice(0, pdfHeaderLength).arrayBuffer());
    const refusal = approvalLetterProblem(file, firstBytes);
    if (refusal) {
      setProblem(refusal);
      return;
    }
    upload.mutate(file, {
      onSuccess: () => {
        setUploaded(`${file.name} was uploaded.`);
        if (input.current) input.current.value = '';
      },
      onError: (error) => {
        const detail =
          error instanceof ApiError ? error.fieldErrors.find((item) => item.field === 'letter')?.message : undefined;
        setProblem(
          error instanceof ApiError
            ? `${error.message}${detail ? ` (The file ${detail}.)` : ''}`
            : 'The letter could not be uploaded. Check your connection and try again.',
        );
      },
    });
  };

  return (
    <div className="flex flex-col gap-2">
      {version.approvalLetter ? (
        <LetterOnRecord studyId={studyId} version={version} />
      ) : (
        <p className="text-sm text-ink-muted">No letter uploaded yet.</p>
      )}
      <div className="flex flex-col gap-1">
        <label htmlFor={inputId} className="text-xs font-semibold text-ink">
          {version.approvalLetter ? 'Replace the approval letter' : 'Approval letter'} (PDF, up to 10 MB)
        </label>
        <input
          ref={input}
          id={inputId}
          type="file"
          accept="application/pdf,.pdf"
          aria-describedby={messageId}
          aria-invalid={problem ? true : undefined}
          disabled={upload.isPending}
          className={fileInputClass}
          onChange={(event) => void onFile(event.target.files?.[0])}
        />
        <p
          id={messageId}
          aria-live="polite"
          className={problem ? 'text-xs font-medium text-danger' : 'text-xs text-success'}
        >
          {upload.isPending ? 'Uploading…' : (problem ?? uploaded ?? '')}
        </p>
      </div>
    </div>
  );
}

/** The stored letter with its SHA-256, and a download through the session-aware client. */
export function LetterOnRecord({ studyId, version }: { studyId: string; version: ConsentVersion }) {
  const download = useDownloadApprovalLetter(studyId, version.id);
  const letter = version.approvalLetter;
  if (!letter) return null;
  const fileName = letter.name ?? `approval-letter-v${version.version}.pdf`;
  return (
    <div className="flex flex-wrap items-start justify-between gap-3 rounded-md border border-line bg-canvas px-3 py-2">
      <div className="min-w-0 text-sm">
        <p className="font-medium">
          {fileName} <span className="font-normal text-ink-muted">· {formatFileSize(letter.size)}</span>
        </p>
        <p className="text-xs text-ink-muted">
          SHA-256 <span className="font-mono break-all text-ink">{letter.sha256}</span>
        </p>
        {download.isError && (
          <p role="alert" className="text-xs font-medium text-danger">
            {download.error instanceof ApiError ? download.error.message : 'The letter could not be downloaded.'}
          </p>
        )}
      </div>
      <Button
        size="compact"
        pending={download.isPending}
        onClick={() => download.mutate(fileName)}
        aria-label={`Download the approval letter ${fileName}`}
      >
        Download letter
      </Button>
    </div>
  );
}
