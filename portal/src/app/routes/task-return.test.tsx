import { screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { installFakeApi, participant, problem, signedOutHandlers } from '@/test/fake-api';
import { publicStudy, signedEnrollment, studyId } from '@/test/participant-fixtures';
import { renderApp } from '@/test/render-app';

const studyPage = 'GET /api/public/studies/wayfinding-cues';
const enrollmentPath = `GET /api/studies/${studyId}/enrollments/me`;
const firstDone = signedEnrollment({
  status: 'active',
  steps: signedEnrollment().steps.map((step, index) =>
    index === 0
      ? {
          ...step,
          verification: 'return-link',
          hasTask: true,
          hasCompletionCode: false,
          status: 'done',
          completedAt: '2026-02-05T10:00:00.000Z',
        }
      : index === 1
        ? { ...step, status: 'upcoming', opensAt: '2026-02-06T10:00:00.000Z' }
        : step,
  ),
  earned: { earnedMinor: 1250, paidMinor: 0, stillToBePaidMinor: 1250 },
});

const signedIn = { 'GET /api/auth/me': { status: 200, body: participant } };

describe('coming back from the lab’s task', () => {
  it('says the step is done and its pay owed, with the step, the amount and a way back to the study', async () => {
    const fakeApi = installFakeApi({
      ...signedIn,
      [studyPage]: { status: 200, body: publicStudy },
      [enrollmentPath]: { status: 200, body: firstDone },
    });
    renderApp('/return?result=done&study=wayfinding-cues&step=s1');

    expect(await screen.findByRole('heading', { level: 1, name: 'Thank you: your step is done' })).toBeInTheDocument();
    const step = within(await screen.findByRole('region', { name: 'Step 1 · First session' }));
    expect(step.getByText('Done on February 5, 2026')).toBeInTheDocument();
    expect(step.getByText('Owed to you').nextElementSibling).toHaveTextContent('$12.50');
    expect(step.getByText(/The research team approves this pay, then it is sent to you\./)).toBeInTheDocument();
    expect(step.getByText('Still to be paid').nextElementSibling).toHaveTextContent('$12.50');
    expect(step.getByRole('link', { name: 'Getting paid' })).toHaveAttribute('href', '/payouts');
    expect(screen.getByText('Wayfinding cues', { selector: 'p' })).toBeInTheDocument();
    expect(screen.getByRole('link', { name: 'Back to the study' })).toHaveAttribute('href', '/s/wayfinding-cues');
    expect(fakeApi.callsTo('GET', `/api/studies/${studyId}/enrollments/me`)).toHaveLength(1);
    expect(fakeApi.unexpected).toEqual([]);
  });

  it('says calmly when the step had already been done, counting its pay once', async () => {
    installFakeApi({
      ...signedIn,
      [studyPage]: { status: 200, body: publicStudy },
      [enrollmentPath]: { status: 200, body: firstDone },
    });
    renderApp('/return?result=already-done&study=wayfinding-cues&step=s1');

    expect(await screen.findByRole('heading', { level: 1, name: 'This step was already done' })).toBeInTheDocument();
    const step = within(await screen.findByRole('region', { name: 'Step 1 · First session' }));
    expect(step.getByText('Earned').nextElementSibling).toHaveTextContent('$12.50');
    expect(step.queryByText('Owed to you')).not.toBeInTheDocument();
    expect(step.getByText(/It counts once: its \$12\.50 is in what you have earned below\./)).toBeInTheDocument();
  });

  it('shows the outcome signed out too, and offers to sign in for the details without asking for the enrollment', async () => {
    const fakeApi = installFakeApi({ ...signedOutHandlers, [studyPage]: { status: 200, body: publicStudy } });
    renderApp('/return?result=done&study=wayfinding-cues&step=s1');

    expect(await screen.findByRole('heading', { level: 1, name: 'Thank you: your step is done' })).toBeInTheDocument();
    const signIn = await screen.findByRole('link', { name: 'Sign in to see your steps' });
    expect(signIn).toHaveAttribute('href', '/sign-in?study=wayfinding-cues');
    expect(screen.getByText(/You are not signed in on this device/)).toBeInTheDocument();
    expect(screen.getByRole('link', { name: 'About the study' })).toHaveAttribute('href', '/s/wayfinding-cues');
    expect(fakeApi.callsTo('GET', `/api/studies/${studyId}/enrollments/me`)).toHaveLength(0);
  });

  it('still says the step is done when its details cannot be loaded, with a way to try again', async () => {
    const user = userEvent.setup();
    const fakeApi = installFakeApi({
      ...signedIn,
      [studyPage]: { status: 200, body: publicStudy },
      [enrollmentPath]: (_request, callNumber) =>
        callNumber === 1 ? problem(503, 'INTERNAL', 'Database unavailable') : { status: 200, body: firstDone },
    });
    renderApp('/return?result=done&study=wayfinding-cues&step=s1');

    const alert = await screen.findByRole('alert');
    expect(alert).toHaveTextContent('We could not load the step’s details');
    expect(alert).toHaveTextContent('Your step is done all the same.');
    expect(screen.getByRole('heading', { level: 1, name: 'Thank you: your step is done' })).toBeInTheDocument();

    await user.click(screen.getByRole('button', { name: 'Try again' }));
    expect(await screen.findByRole('region', { name: 'Step 1 · First session' })).toBeInTheDocument();
    expect(fakeApi.callsTo('GET', `/api/studies/${studyId}/enrollments/me`)).toHaveLength(2);
  });

  it('says so when the step is not among theirs, rather than showing another', async () => {
    installFakeApi({
      ...signedIn,
      [studyPage]: { status: 200, body: publicStudy },
      [enrollmentPath]: { status: 200, body: firstDone },
    });
    renderApp('/return?result=done&study=wayfinding-cues&step=not-a-step');

    expect(await screen.findByText('We could not find this step among yours')).toBeInTheDocument();
    expect(screen.queryByRole('region', { name: /First session/ })).not.toBeInTheDocument();
  });

  it.each([
    [
      'expired',
      'This link back from the task has expired',
      /Start the task again from the study page: it gives you a fresh link\./,
    ],
    ['other-person', 'This link belongs to someone else', /sign in as yourself, then start the task again/],
    ['not-open', 'This step is not open yet', /Your study page says when the step opens\./],
    ['consent', 'Please sign the new consent form first', /Read and sign the new form on the study page/],
    ['not-taking-part', 'You are not taking part in this study just now', /Steps count only while you take part\./],
    ['forged', 'This link was changed', /does not match the one we made/],
    ['malformed', 'This link is incomplete', /Part of the link back from the task is missing/],
  ])('explains a refusal (%s) in plain words, never the code', async (reason, heading, explanation) => {
    installFakeApi({ ...signedIn, [studyPage]: { status: 200, body: publicStudy } });
    renderApp(`/return?result=refused&study=wayfinding-cues&reason=${reason}`);

    expect(await screen.findByRole('heading', { level: 1, name: heading })).toBeInTheDocument();
    expect(screen.getByText(explanation)).toBeInTheDocument();
    expect(screen.getByText('Nothing was marked done.')).toBeInTheDocument();
    expect(await screen.findByText('Wayfinding cues', { selector: 'p' })).toBeInTheDocument();
    // The code may be an everyday word inside a sentence ("has expired"), but never shown on its own.
    expect(screen.queryByText(reason)).toBeNull();
  });

  it('offers the study page after a refusal, and the research team’s address for a changed link', async () => {
    installFakeApi({ ...signedIn, [studyPage]: { status: 200, body: publicStudy } });
    renderApp('/return?result=refused&study=wayfinding-cues&reason=forged');

    expect(await screen.findByRole('link', { name: 'Go to the study page' })).toHaveAttribute(
      'href',
      '/s/wayfinding-cues',
    );
    expect(await screen.findByRole('link', { name: 'wayfinding@harborlane.test' })).toHaveAttribute(
      'href',
      'mailto:wayfinding@harborlane.test',
    );
  });

  it('takes them to sign the new consent form', async () => {
    installFakeApi({ ...signedIn, [studyPage]: { status: 200, body: publicStudy } });
    renderApp('/return?result=refused&study=wayfinding-cues&reason=consent');

    expect(await screen.findByRole('link', { name: 'Read and sign the new form' })).toHaveAttribute(
      'href',
      '/s/wayfinding-cues',
    );
  });

  it('lets someone holding another person’s link sign out, then sign in as themselves', async () => {
    const user = userEvent.setup();
    const fakeApi = installFakeApi({
      ...signedIn,
      [studyPage]: { status: 200, body: publicStudy },
      'POST /api/auth/sign-out': { status: 204 },
    });
    renderApp('/return?result=refused&study=wayfinding-cues&reason=other-person');

    expect(await screen.findByText(participant.email)).toBeInTheDocument();
    await user.click(screen.getByRole('button', { name: 'Sign out' }));

    expect(await screen.findByText('You have signed out.')).toBeInTheDocument();
    expect(screen.getByRole('link', { name: 'Sign in as yourself' })).toHaveAttribute(
      'href',
      '/sign-in?study=wayfinding-cues',
    );
    expect(screen.getByRole('heading', { level: 1, name: 'This link belongs to someone else' })).toBeInTheDocument();
    expect(fakeApi.callsTo('POST', '/api/auth/sign-out')).toHaveLength(1);
  });

  it('offers sign-in after a refusal when signed out', async () => {
    installFakeApi({ ...signedOutHandlers, [studyPage]: { status: 200, body: publicStudy } });
    renderApp('/return?result=refused&study=wayfinding-cues&reason=expired');

    expect(await screen.findByRole('link', { name: 'Sign in' })).toHaveAttribute(
      'href',
      '/sign-in?study=wayfinding-cues',
    );
    expect(screen.queryByRole('link', { name: 'Go to the study page' })).not.toBeInTheDocument();
  });

  it('explains a refusal without a known study or reason in general words, pointing to their studies', async () => {
    const fakeApi = installFakeApi(signedIn);
    renderApp('/return?result=refused&reason=something-new');

    expect(await screen.findByRole('heading', { level: 1, name: 'We could not count this step' })).toBeInTheDocument();
    expect(screen.getByText('Back from the task')).toBeInTheDocument();
    expect(await screen.findByRole('link', { name: 'Go to your studies' })).toHaveAttribute('href', '/studies');
    expect(document.body.textContent).not.toContain('something-new');
    expect(fakeApi.unexpected).toEqual([]);
  });

  it('says it cannot tell how the task ended when the address has no result', async () => {
    installFakeApi({ ...signedIn, [studyPage]: { status: 200, body: publicStudy } });
    renderApp('/return?study=wayfinding-cues');

    expect(
      await screen.findByRole('heading', { level: 1, name: 'We could not tell how the task ended' }),
    ).toBeInTheDocument();
    expect(screen.getByRole('link', { name: 'Go to the study page' })).toHaveAttribute('href', '/s/wayfinding-cues');
  });
});
