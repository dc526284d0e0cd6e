import { lazy, type ReactNode, Suspense, useEffect, useRef, useState } from 'react';
import { useParams } from 'react-router-dom';
import { PageLayout } from '@/components/layout/page-layout';
import { ButtonLink } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { Spinner } from '@/components/ui/spinner';
import { StageList } from '@/components/ui/stage-list';
import { type Me, useMe } from '@/features/auth/api/get-me';
import type { Signature } from '@/features/consent/api/sign-consent';
import { SignedFormDownload } from '@/features/consent/components/signed-form-download';
import { type MyEnrollment, useMyEnrollment } from '@/features/enrollment/api/get-my-enrollment';
import type { Withdrawal } from '@/features/enrollment/api/withdraw';
import { JoinStudyButton } from '@/features/enrollment/components/join-study-button';
import { NotEligible } from '@/features/enrollment/components/not-eligible';
import { WithdrawnConfirmation } from '@/features/enrollment/components/withdrawn-confirmation';
import { YourCondition } from '@/features/enrollment/components/your-condition';
import { YourSteps } from '@/features/enrollment/components/your-steps';
import { type PublicStudy, usePublicStudy } from '@/features/public-study/api/get-public-study';
import { StudyClosedNotice } from '@/features/public-study/components/study-closed-notice';
import { StudyOverview } from '@/features/public-study/components/study-overview';
import { isApiError } from '@/lib/api-problem';
import { formatDateTime } from '@/lib/date-format';
import { LoadFailed } from '@/components/ui/load-failed';

// What only someone taking part sees (the forms, the signature pad, the dialogs) loads when they reach it, so a
// visitor's first load of a study's link stays small (portal/bench/first-load.mjs measures it).
const ScreeningForm = lazy(() =>
  import('@/features/enrollment/components/screening-form').then((module) => ({ default: module.ScreeningForm })),
);
const ConsentJourney = lazy(() =>
  import('@/features/consent/components/consent-journey').then((module) => ({ default: module.ConsentJourney })),
);
const StopTakingPart = lazy(() =>
  import('@/features/enrollment/components/stop-taking-part').then((module) => ({ default: module.StopTakingPart })),
);

/** `/s/:slug`: the study page for anyone, and for someone taking part the place where their journey continues. */
export function StudyRoute() {
  const { slug = '' } = useParams();
  const study = usePublicStudy(slug);
  const me = useMe();

  const actions = me.data ? (
    <ButtonLink to="/studies" variant="quiet">
      Your studies
    </ButtonLink>
  ) : null;

  return (
    <PageLayout actions={actions}>
      {study.isPending ? (
        <Spinner label="Loading the study…" />
      ) : study.isError ? (
        isApiError(study.error, 'NOT_FOUND') ? (
          <StudyNotFound />
        ) : (
          <>
            <title>Study · Evenhand</title>
            <LoadFailed title="We could not load this study" read={study} />
          </>
        )
      ) : (
        <>
          <title>{`${study.data.title} · Evenhand`}</title>
          {me.data ? (
            <SignedInStudy study={study.data} me={me.data} />
          ) : (
            <StudyOverview study={study.data} action={<SignedOutAction study={study.data} checking={me.isPending} />} />
          )}
        </>
      )}
    </PageLayout>
  );
}

function SignedOutAction({ study, checking }: { study: PublicStudy; checking: boolean }) {
  if (study.status !== 'recruiting') return <StudyClosedNotice status={study.status} />;
  if (checking) return <Spinner label="Checking whether you are signed in…" />;
  return (
    <>
      <ButtonLink to={`/sign-in?study=${encodeURIComponent(study.slug)}`} wide>
        Take part
      </ButtonLink>
      <p className="text-fine text-ink-soft">
        First we e-mail you a sign-in link, so no password is needed. Then you answer a few questions and read the
        consent form. Nothing is agreed until you sign it.
      </p>
    </>
  );
}

function SignedInStudy({ study, me }: { study: PublicStudy; me: Me }) {
  const enrollment = useMyEnrollment(study.id);

  if (enrollment.isPending) return <Spinner label="Finding where you are in this study…" />;
  if (enrollment.isError) {
    return <LoadFailed title="We could not load your place in this study" read={enrollment} />;
  }
  if (enrollment.data === null) {
    const action =
      study.status === 'recruiting' ? (
        <>
          <p className="text-fine text-ink-soft">
            Signed in as <strong className="wrap-anywhere text-ink">{me.email}</strong>.
          </p>
          <JoinStudyButton studyId={study.id} />
        </>
      ) : (
        <StudyClosedNotice status={study.status} />
      );
    return <StudyOverview study={study} action={action} />;
  }
  return <EnrollmentStage study={study} enrollment={enrollment.data} />;
}

const stages = ['Questions', 'Consent', 'Your steps'];
const stageOf: Record<MyEnrollment['next'], number> = {
  screening: 0,
  excluded: 0,
  consent: 1,
  're-consent': 1,
  steps: 2,
  done: 2,
  withdrawn: 2,
};

function EnrollmentStage({ study, enrollment }: { study: PublicStudy; enrollment: MyEnrollment }) {
  const [screeningReasons, setScreeningReasons] = useState<string[] | null>(null);
  const [signature, setSignature] = useState<Signature | null>(null);
  const [withdrawal, setWithdrawal] = useState<Withdrawal | null>(null);
  const [reconsentAsked, setReconsentAsked] = useState(false);
  const headingRef = useRef<HTMLHeadingElement>(null);
  const { next } = enrollment;

  // A step was refused because the consent form changed: once the new form is here, start at the top of the page.
  useEffect(() => {
    if (!reconsentAsked || next !== 're-consent') return;
    window.scrollTo?.({ top: 0 });
    headingRef.current?.focus();
  }, [reconsentAsked, next]);

  // Each stage (questions, form, steps) replaces the one before in place, and a phone would stay scrolled down to
  // where the last button was, past the new heading. Start the new stage at the top, with focus on the study title.
  // Two stages put focus somewhere better of their own: the signing confirmation and the withdrawal confirmation.
  const shownStage = useRef<MyEnrollment['next'] | null>(null);
  useEffect(() => {
    const previous = shownStage.current;
    shownStage.current = next;
    if (previous === next || next === 'withdrawn' || (next === 'steps' && signature)) return;
    const heading = headingRef.current;
    // On first arrival leave a page that already opens at its heading alone (a reload keeps its place).
    if (previous === null && heading && heading.getBoundingClientRect().top >= 0) return;
    window.scrollTo?.({ top: 0 });
    heading?.focus({ preventScroll: true });
  }, [next, signature]);
  const assignment = enrollment.assignment ?? signature?.assignment ?? null;

  const stopTakingPart =
    next === 'excluded' || next === 'withdrawn' ? null : (
      <Suspense fallback={null}>
        <StopTakingPart enrollment={enrollment} onWithdrawn={setWithdrawal} />
      </Suspense>
    );

  return (
    <div className="flex flex-col gap-8">
      <header className="flex flex-col gap-3">
        <p className="text-fine font-semibold tracking-wide text-clay-ink uppercase">{study.labName}</p>
        <h1 ref={headingRef} tabIndex={-1} className="text-title font-bold focus:outline-none">
          {enrollment.studyTitle}
        </h1>
        {next !== 'excluded' && next !== 'withdrawn' ? (
          <StageList label="Your progress" stages={stages} current={stageOf[next]} />
        ) : null}
      </header>

      {next === 'screening' ? (
        <Suspense fallback={<Spinner label="Loading the questions…" />}>
          <ScreeningForm
            studyId={enrollment.studyId}
            questions={enrollment.screening.questions}
            answers={enrollment.screening.answers}
            onScreened={(result) => setScreeningReasons(result.reasons)}
          />
        </Suspense>
      ) : null}

      {next === 'excluded' ? (
        <NotEligible
          studyTitle={enrollment.studyTitle}
          reasons={
            screeningReasons ?? (enrollment.screening.exclusionReason ? [enrollment.screening.exclusionReason] : [])
          }
          contactEmail={study.contactEmail}
        />
      ) : null}

      {next === 'consent' || next === 're-consent' ? (
        <Suspense fallback={<Spinner label="Loading the consent form…" />}>
          <ConsentJourney studyId={enrollment.studyId} reconsent={next === 're-consent'} onSigned={setSignature} />
        </Suspense>
      ) : null}

      {next === 'steps' || next === 'done' ? (
        <>
          {signature ? (
            <SignedConfirmation signedAt={signature.signedAt}>
              {assignment ? <YourCondition assignment={assignment} /> : null}
            </SignedConfirmation>
          ) : (
            <>
              {next === 'done' ? (
                <Notice tone="success" title="You have completed every step">
                  Thank you for taking part. Anything still owed to you will be paid as usual.
                </Notice>
              ) : null}
              {assignment ? <YourCondition assignment={assignment} /> : null}
            </>
          )}
          {enrollment.consent.signedVersionId ? (
            <SignedFormDownload
              studyId={enrollment.studyId}
              signedVersionId={enrollment.consent.signedVersionId}
              enrollmentReference={enrollment.reference}
            />
          ) : null}
          <YourSteps
            studyId={enrollment.studyId}
            steps={enrollment.steps}
            currency={enrollment.currency}
            earned={enrollment.earned}
            contactEmail={study.contactEmail}
            onNeedsReconsent={() => setReconsentAsked(true)}
          />
        </>
      ) : null}

      {next === 'withdrawn' ? (
        <WithdrawnConfirmation
          studyTitle={enrollment.studyTitle}
          withdrewAt={withdrawal?.withdrewAt ?? enrollment.withdrewAt}
          currency={enrollment.currency}
          earnedMinor={withdrawal?.earnedMinor ?? enrollment.earned.earnedMinor}
          stillToBePaidMinor={withdrawal?.stillToBePaidMinor ?? enrollment.earned.stillToBePaidMinor}
        >
          {/* The form promises the signed copy stays downloadable at any time, stopping included. */}
          {enrollment.consent.signedVersionId ? (
            <SignedFormDownload
              studyId={enrollment.studyId}
              signedVersionId={enrollment.consent.signedVersionId}
              enrollmentReference={enrollment.reference}
            />
          ) : null}
        </WithdrawnConfirmation>
      ) : null}

      {stopTakingPart}
    </div>
  );
}

/**
 * Right after signing: the confirmation with what the person was assigned to do, brought into view and focused, so on
 * a phone (or by keyboard, where focus would otherwise fall back to the page) it is the first thing they meet.
 */
function SignedConfirmation({ signedAt, children }: { signedAt: string; children: ReactNode }) {
  const headingRef = useRef<HTMLHeadingElement>(null);
  useEffect(() => {
    const heading = headingRef.current;
    if (!heading) return;
    heading.focus({ preventScroll: true });
    heading.scrollIntoView?.({ block: 'start' });
  }, []);

  return (
    <section aria-labelledby="signed-heading" className="flex scroll-mt-4 flex-col gap-5">
      <div
        role="status"
        className="flex flex-col gap-1 rounded-soft border-l-4 border-moss bg-moss-tint px-4 py-3 text-moss-ink"
      >
        <h2
          id="signed-heading"
          ref={headingRef}
          tabIndex={-1}
          className="scroll-mt-4 text-lead font-bold focus:outline-none"
        >
          You have signed the consent form
        </h2>
        <p className="text-fine text-ink">Signed on {formatDateTime(signedAt)}. Thank you for taking part.</p>
      </div>
      {children}
    </section>
  );
}

function StudyNotFound() {
  return (
    <section className="flex flex-col gap-5">
      <title>Study not found · Evenhand</title>
      <h1 className="text-title font-bold">We could not find this study</h1>
      <p className="text-lead">
        The link may be mistyped, or the study may have been taken down. If a research team sent you this link, please
        ask them for it again.
      </p>
      <ButtonLink to="/studies" variant="secondary" wide>
        Go to your studies
      </ButtonLink>
    </section>
  );
}
