import { useEffect, useMemo, useRef, useState } from 'react';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { ProgressBar } from '@/components/ui/progress-bar';
import { Spinner } from '@/components/ui/spinner';
import { type ConsentToSign, useConsentToSign } from '../api/get-consent';
import type { CurrentConsentVersion, Signature } from '../api/sign-consent';
import { useReadingPosition } from '../hooks/use-reading-position';
import { type ReadingPage, readingPages } from '../utils/reading-pages';
import { ConsentCaution } from './consent-caution';
import { SignatureStep } from './signature-step';
import { LoadFailed } from '@/components/ui/load-failed';

type ConsentJourneyProps = {
  studyId: string;
  /** Someone who signed an earlier version and is asked to sign the new one. */
  reconsent: boolean;
  onSigned: (signature: Signature) => void;
};

/** Reading the consent form, key information first, then section by section, then signing. */
export function ConsentJourney({ studyId, reconsent, onSigned }: ConsentJourneyProps) {
  const consent = useConsentToSign(studyId);
  const [changedTo, setChangedTo] = useState<CurrentConsentVersion | null>(null);

  if (consent.isPending) return <Spinner label="Opening the consent form…" />;
  if (consent.isError) {
    return <LoadFailed title="We could not open the consent form" read={consent} />;
  }
  // After a 409 the new version is on its way; do not show the old one meanwhile.
  if (changedTo && consent.data.versionId !== changedTo.versionId && consent.isFetching) {
    return <Spinner label="Opening the new version of the form…" />;
  }

  return (
    <ConsentReading
      key={consent.data.versionId}
      studyId={studyId}
      consent={consent.data}
      reconsent={reconsent}
      changedTo={changedTo?.versionId === consent.data.versionId ? changedTo : null}
      onVersionChanged={setChangedTo}
      onSigned={onSigned}
    />
  );
}

type ConsentReadingProps = {
  studyId: string;
  consent: ConsentToSign;
  reconsent: boolean;
  changedTo: CurrentConsentVersion | null;
  onVersionChanged: (current: CurrentConsentVersion) => void;
  onSigned: (signature: Signature) => void;
};

function ConsentReading({ studyId, consent, reconsent, changedTo, onVersionChanged, onSigned }: ConsentReadingProps) {
  const pages = useMemo(() => readingPages(consent), [consent]);
  const screens = pages.length + 1;
  const [position, setPosition] = useReadingPosition(studyId, consent.versionId, screens);
  const page = pages[position];

  const go = (next: number) => {
    setPosition(next);
    window.scrollTo?.({ top: 0 });
  };

  return (
    <div className="flex flex-col gap-6">
      {changedTo ? (
        <Notice title={`The form was updated while you were reading: this is version ${changedTo.version}`}>
          The research team changed the consent form and the ethics board approved it. Your signature was not saved.
          Please read the new version; it starts below.
        </Notice>
      ) : reconsent ? (
        <Notice title="The consent form has changed">
          The research team updated the form, and the ethics board approved the new version. Please read it and sign it
          again before your next step. If you would rather not go on, you can stop taking part.
          {consent.changesSinceSigned.length > 0 && (
            <>
              <span className="mt-2 block font-medium">What changed since you signed:</span>
              <ul className="mt-1 list-disc pl-5">
                {consent.changesSinceSigned.map((change) => (
                  <li key={change}>{change}</li>
                ))}
              </ul>
            </>
          )}
        </Notice>
      ) : null}

      <div className="flex flex-col gap-2">
        <p className="flex flex-wrap justify-between gap-x-3 text-fine text-ink-soft">
          <span>{page ? `Part ${position + 1} of ${pages.length}` : 'Signing'}</span>
          <span>
            About {consent.readingMinutes === 1 ? '1 minute' : `${consent.readingMinutes} minutes`} to read in all
          </span>
        </p>
        <ProgressBar
          label="How far you have read"
          value={position + 1}
          max={screens}
          valueText={page ? `Part ${position + 1} of ${pages.length}` : 'All read, now signing'}
        />
      </div>

      {page ? (
        <ReadingScreen
          page={page}
          isFirst={position === 0}
          nextHeading={pages[position + 1]?.heading ?? null}
          onBack={() => go(position - 1)}
          onNext={() => go(position + 1)}
        />
      ) : (
        <SignatureStep
          studyId={studyId}
          consent={consent}
          onSigned={onSigned}
          onVersionChanged={onVersionChanged}
          onBack={() => go(position - 1)}
        />
      )}
    </div>
  );
}

type ReadingScreenProps = {
  page: ReadingPage;
  isFirst: boolean;
  nextHeading: string | null;
  onBack: () => void;
  onNext: () => void;
};

function ReadingScreen({ page, isFirst, nextHeading, onBack, onNext }: ReadingScreenProps) {
  const headingRef = useRef<HTMLHeadingElement>(null);
  const mounted = useRef(false);
  // On the first screen focus stays where the page put it; after Back or Next it moves to the new heading.
  useEffect(() => {
    if (mounted.current) headingRef.current?.focus();
    mounted.current = true;
  }, [page.id]);

  const nextLabel = page.isKeyInformation
    ? 'Read the full form'
    : nextHeading
      ? `Next: ${nextHeading}`
      : 'Continue to signing';

  return (
    <section aria-labelledby="reading-heading" className="flex flex-col gap-5">
      <div className="flex flex-col gap-1">
        <p className="text-fine font-semibold tracking-wide text-clay-ink uppercase">
          {page.isKeyInformation ? 'Start here: the key points' : 'The full consent form'}
        </p>
        <h2 id="reading-heading" ref={headingRef} tabIndex={-1} className="text-heading font-bold focus:outline-none">
          {page.heading}
        </h2>
        {page.isKeyInformation ? (
          <p className="text-ink-soft">After these key points you can read the whole form, one section at a time.</p>
        ) : null}
      </div>

      {/* Sanitised by the api, which renders the approved Markdown; this is the text being signed. */}
      <div className="consent-text" dangerouslySetInnerHTML={{ __html: page.html }} />

      <nav aria-label="Consent form pages" className="flex flex-col gap-3">
        <Button wide onClick={onNext}>
          {nextLabel}
        </Button>
        {!isFirst ? (
          <Button variant="secondary" wide onClick={onBack}>
            Back
          </Button>
        ) : null}
      </nav>
      <p className="text-fine text-ink-soft">
        You can stop and come back later: we remember where you were, on this device.
      </p>
      <ConsentCaution />
    </section>
  );
}
