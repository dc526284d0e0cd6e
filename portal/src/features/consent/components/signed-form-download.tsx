import { useEffect, useState } from 'react';
import { Button, buttonClasses } from '@/components/ui/button';
import { describeProblem } from '@/lib/problem-message';
import { isPdfNotReadyYet, useSignedConsentPdf } from '../api/get-signed-consent-pdf';

type SignedFormDownloadProps = {
  studyId: string;
  signedVersionId: string;
  /** Names the saved file, so it can be told apart from other studies' forms. */
  enrollmentReference: string;
};

/** The signed copy as a PDF, once the api has made it (it is made in the background just after signing). */
export function SignedFormDownload({ studyId, signedVersionId, enrollmentReference }: SignedFormDownloadProps) {
  const pdf = useSignedConsentPdf(studyId, signedVersionId);
  const fileUrl = useObjectUrl(pdf.data);

  return (
    <section aria-labelledby="signed-form-heading" className="flex flex-col gap-3">
      <h2 id="signed-form-heading" className="text-heading font-bold">
        Your signed form
      </h2>
      <div aria-live="polite" className="flex flex-col gap-3">
        {fileUrl ? (
          <>
            <a
              href={fileUrl}
              download={`signed-consent-${enrollmentReference}.pdf`}
              className={buttonClasses('secondary', 'w-full')}
            >
              Download your signed form (PDF)
            </a>
            <p className="text-fine text-ink-soft">We have also e-mailed you a copy. Keep it for your records.</p>
          </>
        ) : pdf.isError ? (
          <>
            <p>
              {isPdfNotReadyYet(pdf.error)
                ? 'Your signed copy is still being prepared. It usually takes less than a minute, and we will also e-mail it to you.'
                : `We could not get your signed copy. ${describeProblem(pdf.error)}`}
            </p>
            <Button variant="secondary" wide onClick={() => void pdf.refetch()} disabled={pdf.isFetching}>
              {pdf.isFetching ? 'Checking…' : 'Try again'}
            </Button>
          </>
        ) : (
          <p className="flex items-center gap-3">
            <span
              aria-hidden="true"
              className="size-5 animate-spin rounded-full border-3 border-sand-deep border-t-clay motion-reduce:animate-none"
            />
            Your signed copy is being prepared…
          </p>
        )}
      </div>
    </section>
  );
}

/** A short-lived address for a downloaded file, released when it is no longer shown. */
function useObjectUrl(blob: Blob | undefined): string | null {
  const [url, setUrl] = useState<string | null>(null);
  useEffect(() => {
    if (!blob) return;
    const objectUrl = URL.createObjectURL(blob);
    setUrl(objectUrl);
    return () => {
      URL.revokeObjectURL(objectUrl);
      setUrl(null);
    };
  }, [blob]);
  return url;
}
