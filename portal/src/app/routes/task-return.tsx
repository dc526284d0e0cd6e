import type { UseQueryResult } from '@tanstack/react-query';
import { useState } from 'react';
import { useSearchParams } from 'react-router-dom';
import { PageLayout } from '@/components/layout/page-layout';
import { Button, ButtonLink } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { Spinner } from '@/components/ui/spinner';
import { type Me, useMe } from '@/features/auth/api/get-me';
import { useSignOut } from '@/features/auth/api/sign-out';
import { useMyEnrollment } from '@/features/enrollment/api/get-my-enrollment';
import { ReturnRefusalExplained } from '@/features/enrollment/components/return-refusal';
import { ReturnedStep } from '@/features/enrollment/components/returned-step';
import { readTaskReturn, type TaskReturn } from '@/features/enrollment/utils/task-return';
import { type PublicStudy, usePublicStudy } from '@/features/public-study/api/get-public-study';
import { describeProblem } from '@/lib/problem-message';
import { LoadFailed } from '@/components/ui/load-failed';

type StudyQuery = UseQueryResult<PublicStudy>;
type MeQuery = UseQueryResult<Me | null>;

/**
 * `/return`: where the api's signed return address sends someone back from the lab's task, saying whether the step
 * was marked done or why not. It works signed out too: the task may be finished on a device without a session.
 */
export function TaskReturnRoute() {
  const [searchParams] = useSearchParams();
  const taskReturn = readTaskReturn(searchParams);
  const slug = taskReturn.studySlug;
  const me = useMe();
  const study = usePublicStudy(slug ?? '', { enabled: slug !== null });
  // Signing out drops every cached answer, the study's too; the page stays as it is while that is asked again.
  const [studySettled, setStudySettled] = useState(false);
  if (!studySettled && !study.isPending) setStudySettled(true);

  const actions = me.data ? (
    <ButtonLink to="/studies" variant="quiet">
      Your studies
    </ButtonLink>
  ) : null;

  return (
    <PageLayout actions={actions}>
      {/* The study's name and contact come with the page, rather than shifting it a moment later. */}
      {slug !== null && !studySettled ? (
        <Spinner label="Welcome back. One moment…" />
      ) : taskReturn.result === 'refused' ? (
        <ReturnRefusalExplained
          reason={taskReturn.reason}
          studyTitle={study.data?.title}
          contactEmail={study.data?.contactEmail}
          actions={<RefusalActions taskReturn={taskReturn} me={me} />}
        />
      ) : taskReturn.result === 'unknown' ? (
        <UnknownReturn slug={slug} />
      ) : (
        <ReturnDone taskReturn={taskReturn} me={me} study={study} />
      )}
    </PageLayout>
  );
}

const studyPathOf = (slug: string | null) => (slug ? `/s/${encodeURIComponent(slug)}` : null);
const signInPathOf = (slug: string | null) => (slug ? `/sign-in?study=${encodeURIComponent(slug)}` : '/sign-in');

function ReturnDone({
  taskReturn,
  me,
  study,
}: {
  taskReturn: Extract<TaskReturn, { result: 'done' | 'already-done' }>;
  me: MeQuery;
  study: StudyQuery;
}) {
  const justNow = taskReturn.result === 'done';
  const studyPath = studyPathOf(taskReturn.studySlug);
  const signedIn = Boolean(me.data);

  return (
    <section aria-labelledby="return-done-heading" className="flex flex-col gap-6">
      <title>{justNow ? 'Step done · Evenhand' : 'Step already done · Evenhand'}</title>
      <div className="flex flex-col gap-3">
        <p className="text-fine font-semibold tracking-wide text-clay-ink uppercase">
          {study.data?.title ?? 'Back from the task'}
        </p>
        <h1 id="return-done-heading" className="text-title font-bold">
          {justNow ? 'Thank you: your step is done' : 'This step was already done'}
        </h1>
        <p className="text-lead">
          {justNow
            ? 'You finished the task and we have marked the step done. The pay it earned is owed to you.'
            : 'You had finished it before, so nothing has changed. Its pay counts once.'}
        </p>
      </div>

      {me.isPending ? (
        <Spinner label="Checking that you are signed in…" />
      ) : me.isError ? (
        <LoadFailed title="We could not check whether you are signed in" read={me} />
      ) : signedIn ? (
        <StepDetails taskReturn={taskReturn} study={study} />
      ) : (
        <div className="flex flex-col gap-3 rounded-soft bg-sand p-4">
          <p>
            You are not signed in on this device, so we cannot show the step here. Sign in to see it, what it pays and
            everything you have earned.
          </p>
          <ButtonLink to={signInPathOf(taskReturn.studySlug)} wide>
            Sign in to see your steps
          </ButtonLink>
        </div>
      )}

      {studyPath ? (
        <ButtonLink to={studyPath} variant={signedIn ? 'primary' : 'secondary'} wide>
          {signedIn ? 'Back to the study' : 'About the study'}
        </ButtonLink>
      ) : signedIn ? (
        <ButtonLink to="/studies" wide>
          Go to your studies
        </ButtonLink>
      ) : null}
    </section>
  );
}

/** The step and its pay, from the person's own enrollment: public study page → study id → enrollment. */
function StepDetails({
  taskReturn,
  study,
}: {
  taskReturn: Extract<TaskReturn, { result: 'done' | 'already-done' }>;
  study: StudyQuery;
}) {
  const enrollment = useMyEnrollment(study.data?.id ?? '', { enabled: study.isSuccess });
  const notFound = (
    <Notice title="We could not find this step among yours">
      Your study page shows each of your steps and where it stands.
    </Notice>
  );

  if (taskReturn.studySlug === null) return notFound;
  if (study.isError || enrollment.isError) {
    const failed = study.isError ? study : enrollment;
    return (
      <LoadFailed
        title="We could not load the step’s details"
        read={failed}
        afterProblem="Your step is done all the same."
      />
    );
  }
  if (study.isPending || enrollment.isPending) return <Spinner label="Looking up your step…" />;

  const steps = [...(enrollment.data?.steps ?? [])].sort((a, b) => a.position - b.position);
  const index = steps.findIndex((step) => step.id === taskReturn.stepId);
  const step = steps[index];
  if (!enrollment.data || !step) return notFound;
  return (
    <ReturnedStep
      step={step}
      stepNumber={index + 1}
      currency={enrollment.data.currency}
      earned={enrollment.data.earned}
      justNow={taskReturn.result === 'done'}
    />
  );
}

/** Next moves after a refusal: to the study page when signed in, to sign in when not, or to sign out when the link was someone else's. */
function RefusalActions({ taskReturn, me }: { taskReturn: Extract<TaskReturn, { result: 'refused' }>; me: MeQuery }) {
  const signOut = useSignOut();
  const studyPath = studyPathOf(taskReturn.studySlug);

  if (me.isPending) return <Spinner label="Checking whether you are signed in…" />;

  if (!me.data) {
    return (
      <>
        {signOut.isSuccess ? <Notice tone="success" title="You have signed out." /> : null}
        <ButtonLink to={signInPathOf(taskReturn.studySlug)} wide>
          {taskReturn.reason === 'other-person' ? 'Sign in as yourself' : 'Sign in'}
        </ButtonLink>
        {studyPath ? (
          <ButtonLink to={studyPath} variant="secondary" wide>
            About the study
          </ButtonLink>
        ) : null}
      </>
    );
  }

  const toStudy = studyPath ? (
    <ButtonLink to={studyPath} variant={taskReturn.reason === 'other-person' ? 'secondary' : 'primary'} wide>
      {taskReturn.reason === 'consent' ? 'Read and sign the new form' : 'Go to the study page'}
    </ButtonLink>
  ) : (
    <ButtonLink to="/studies" variant={taskReturn.reason === 'other-person' ? 'secondary' : 'primary'} wide>
      Go to your studies
    </ButtonLink>
  );

  if (taskReturn.reason !== 'other-person') return toStudy;
  return (
    <>
      <p>
        You are signed in as <strong className="wrap-anywhere">{me.data.email}</strong>.
      </p>
      {signOut.isError ? (
        <Notice tone="error" title="We could not sign you out">
          {describeProblem(signOut.error)}
        </Notice>
      ) : null}
      <Button wide onClick={() => signOut.mutate()} disabled={signOut.isPending}>
        {signOut.isPending ? 'Signing out…' : 'Sign out'}
      </Button>
      {toStudy}
    </>
  );
}

function UnknownReturn({ slug }: { slug: string | null }) {
  const studyPath = studyPathOf(slug);
  return (
    <section aria-labelledby="return-unknown-heading" className="flex flex-col gap-5">
      <title>Back from the task · Evenhand</title>
      <h1 id="return-unknown-heading" className="text-title font-bold">
        We could not tell how the task ended
      </h1>
      <p className="text-lead">
        The address that brought you here is incomplete. If you were doing a task for a study, your study page shows
        whether the step is done.
      </p>
      <ButtonLink to={studyPath ?? '/studies'} wide>
        {studyPath ? 'Go to the study page' : 'Go to your studies'}
      </ButtonLink>
    </section>
  );
}
