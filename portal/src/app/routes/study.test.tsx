import { screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { installFakeApi, participant, problem, signedOutHandlers } from '@/test/fake-api';
import { enrollment, pdfBytes, publicStudy, signedEnrollment, studyId } from '@/test/participant-fixtures';
import { renderApp } from '@/test/render-app';

const studyPage = 'GET /api/public/studies/wayfinding-cues';

describe('public study page', () => {
  it('tells a visitor what the study involves, what each step pays and who can take part', async () => {
    installFakeApi({ ...signedOutHandlers, [studyPage]: { status: 200, body: publicStudy } });
    renderApp('/s/wayfinding-cues');

    expect(
      await screen.findByRole('heading', { level: 1, name: 'Wayfinding cues' }, { timeout: 3_000 }),
    ).toBeInTheDocument();
    expect(screen.getByText('Harbor Lane Cognition Lab', { selector: 'p' })).toBeInTheDocument();
    expect(screen.getByText('About 1 hour 15 minutes in all')).toBeInTheDocument();
    expect(screen.getByText('$37.50 in all')).toBeInTheDocument();
    expect(
      screen.getByText('You will walk three short routes on a screen and tell us how sure you felt.'),
    ).toBeInTheDocument();

    // Steps in their order, whatever order the api listed them in, each with its pay.
    const steps = within(screen.getByRole('region', { name: 'What taking part involves' })).getAllByRole('listitem');
    expect(steps.map((step) => step.textContent)).toEqual([
      expect.stringMatching(/^1First session\$12\.50/),
      expect.stringMatching(/^2Second session\$15\.00/),
      expect.stringMatching(/^3Follow-up questions\$10\.00/),
    ]);
    expect(screen.getByText('Total if you complete every step').nextElementSibling).toHaveTextContent('$37.50');
    expect(screen.getByText('18 or older')).toBeInTheDocument();
    expect(screen.getByText('HL-2026-031')).toBeInTheDocument();

    expect(screen.getByRole('link', { name: 'Take part' })).toHaveAttribute('href', '/sign-in?study=wayfinding-cues');
  });

  it('sends a visitor who taps "Take part" to the e-mail step, which carries the study along', async () => {
    const user = userEvent.setup();
    installFakeApi({ ...signedOutHandlers, [studyPage]: { status: 200, body: publicStudy } });
    const { router } = renderApp('/s/wayfinding-cues');

    await user.click(await screen.findByRole('link', { name: 'Take part' }, { timeout: 3_000 }));

    expect(await screen.findByText('You came here from a study link. Sign in to continue.')).toBeInTheDocument();
    expect(router.state.location.search).toBe('?study=wayfinding-cues');
  });

  it.each([
    ['paused', 'This study is not taking new people just now'],
    ['closed', 'This study has finished'],
  ] as const)('shows a calm notice instead of the button when the study is %s', async (status, notice) => {
    installFakeApi({ ...signedOutHandlers, [studyPage]: { status: 200, body: { ...publicStudy, status } } });
    renderApp('/s/wayfinding-cues');

    expect(await screen.findByText(notice, {}, { timeout: 3_000 })).toBeInTheDocument();
    expect(screen.queryByRole('link', { name: 'Take part' })).not.toBeInTheDocument();
    expect(screen.queryByRole('button', { name: 'Take part' })).not.toBeInTheDocument();
  });

  it('says plainly when there is no such study', async () => {
    installFakeApi({
      ...signedOutHandlers,
      'GET /api/public/studies/no-such-study': problem(404, 'NOT_FOUND', 'Study not found'),
    });
    renderApp('/s/no-such-study');

    expect(
      await screen.findByRole('heading', { name: 'We could not find this study' }, { timeout: 3_000 }),
    ).toBeInTheDocument();
  });

  it('lets someone signed in join, and then asks the screening questions', async () => {
    const user = userEvent.setup();
    const fakeApi = installFakeApi({
      'GET /api/auth/me': { status: 200, body: participant },
      [studyPage]: { status: 200, body: publicStudy },
      [`GET /api/studies/${studyId}/enrollments/me`]: problem(404, 'NOT_FOUND', 'Not joined'),
      [`POST /api/studies/${studyId}/enrollments/me`]: { status: 201, body: enrollment() },
      'GET /api/studies': { status: 200, body: { items: [] } },
    });
    renderApp('/s/wayfinding-cues');

    expect(await screen.findByText(participant.email, {}, { timeout: 3_000 })).toBeInTheDocument();
    await user.click(screen.getByRole('button', { name: 'Take part' }));

    expect(await screen.findByRole('heading', { name: 'A few questions first' })).toBeInTheDocument();
    expect(fakeApi.callsTo('POST', `/api/studies/${studyId}/enrollments/me`)).toHaveLength(1);
  });

  it('explains when the study stopped taking people just as they tried to join', async () => {
    const user = userEvent.setup();
    installFakeApi({
      'GET /api/auth/me': { status: 200, body: participant },
      [studyPage]: { status: 200, body: publicStudy },
      [`GET /api/studies/${studyId}/enrollments/me`]: problem(404, 'NOT_FOUND', 'Not joined'),
      [`POST /api/studies/${studyId}/enrollments/me`]: problem(409, 'STUDY_NOT_RECRUITING', 'Study is not recruiting'),
    });
    renderApp('/s/wayfinding-cues');

    await user.click(await screen.findByRole('button', { name: 'Take part' }, { timeout: 3_000 }));

    expect(await screen.findByText('We could not add you to the study')).toBeInTheDocument();
    expect(screen.getByText(/not taking new people just now/)).toBeInTheDocument();
  });

  it('shows someone who already withdrew the confirmation, not the steps', async () => {
    installFakeApi({
      'GET /api/auth/me': { status: 200, body: participant },
      [studyPage]: { status: 200, body: publicStudy },
      [`GET /api/studies/${studyId}/enrollments/me`]: {
        status: 200,
        body: enrollment({
          status: 'withdrew',
          next: 'withdrawn',
          withdrewAt: '2026-02-09T16:30:00.000Z',
          earned: { earnedMinor: 1250, paidMinor: 1250, stillToBePaidMinor: 0 },
        }),
      },
    });
    renderApp('/s/wayfinding-cues');

    expect(
      await screen.findByRole('heading', { name: 'You have stopped taking part' }, { timeout: 3_000 }),
    ).toBeInTheDocument();
    expect(screen.getByText('You earned').nextElementSibling).toHaveTextContent('$12.50');
    expect(screen.queryByRole('heading', { name: 'Your steps' })).not.toBeInTheDocument();
  });
});

describe('coming back from the e-mailed link', () => {
  it('goes to the study page the link was asked for from', async () => {
    installFakeApi({
      ...signedOutHandlers,
      'POST /api/auth/sign-in-link/consume': { status: 200, body: { user: participant, studySlug: 'wayfinding-cues' } },
      [studyPage]: { status: 200, body: publicStudy },
      [`GET /api/studies/${studyId}/enrollments/me`]: problem(404, 'NOT_FOUND', 'Not joined'),
    });
    const { router } = renderApp('/sign-in/link?token=tok-study');

    expect(await screen.findByRole('button', { name: 'Take part' }, { timeout: 3_000 })).toBeInTheDocument();
    expect(router.state.location.pathname).toBe('/s/wayfinding-cues');
  });

  it('sends someone already signed in straight from the e-mail step to the study', async () => {
    installFakeApi({
      'GET /api/auth/me': { status: 200, body: participant },
      [studyPage]: { status: 200, body: publicStudy },
      [`GET /api/studies/${studyId}/enrollments/me`]: problem(404, 'NOT_FOUND', 'Not joined'),
    });
    const { router } = renderApp('/sign-in?study=wayfinding-cues');

    expect(await screen.findByRole('button', { name: 'Take part' }, { timeout: 3_000 })).toBeInTheDocument();
    expect(router.state.location.pathname).toBe('/s/wayfinding-cues');
  });

  it('lists joined studies with a link to each study page', async () => {
    installFakeApi({
      'GET /api/auth/me': { status: 200, body: participant },
      'GET /api/studies': {
        status: 200,
        body: {
          items: [
            { id: studyId, slug: 'wayfinding-cues', title: 'Wayfinding cues', status: 'recruiting', design: 'between' },
          ],
        },
      },
    });
    renderApp('/studies');

    expect(await screen.findByRole('link', { name: 'Wayfinding cues' }, { timeout: 3_000 })).toHaveAttribute(
      'href',
      '/s/wayfinding-cues',
    );
  });

  it('keeps the signed form downloadable for someone who stopped taking part', async () => {
    installFakeApi({
      'GET /api/auth/me': { status: 200, body: participant },
      [studyPage]: { status: 200, body: publicStudy },
      [`GET /api/studies/${studyId}/enrollments/me`]: {
        status: 200,
        body: signedEnrollment({ status: 'withdrew', next: 'withdrawn', withdrewAt: '2026-02-09T16:30:00.000Z' }),
      },
      [`GET /api/studies/${studyId}/enrollments/me/consent.pdf`]: {
        status: 200,
        raw: { bytes: pdfBytes, contentType: 'application/pdf' },
      },
    });
    renderApp('/s/wayfinding-cues');

    expect(
      await screen.findByRole('heading', { name: 'You have stopped taking part' }, { timeout: 3_000 }),
    ).toBeInTheDocument();
    const download = await screen.findByRole('link', { name: 'Download your signed form (PDF)' });
    expect(download).toHaveAttribute('download', 'signed-consent-WC-0042.pdf');
    expect(screen.queryByRole('heading', { name: 'Your steps' })).not.toBeInTheDocument();
  });

  it('shows in "Your studies" each study\'s true state: stopped, completed, taking part', async () => {
    const ids = { stopped: 'a1', completed: 'b2', running: 'c3' };
    installFakeApi({
      'GET /api/auth/me': { status: 200, body: participant },
      'GET /api/studies': {
        status: 200,
        body: {
          items: [
            {
              id: ids.stopped,
              slug: 'stopped',
              title: 'Stopped study',
              status: 'recruiting',
              design: 'between',
              archivedAt: null,
            },
            {
              id: ids.completed,
              slug: 'completed',
              title: 'Completed study',
              status: 'closed',
              design: 'between',
              archivedAt: null,
            },
            {
              id: ids.running,
              slug: 'running',
              title: 'Running study',
              status: 'recruiting',
              design: 'between',
              archivedAt: null,
            },
          ],
        },
      },
      [`GET /api/studies/${ids.stopped}/enrollments/me`]: {
        status: 200,
        body: signedEnrollment({ studyId: ids.stopped, status: 'withdrew', next: 'withdrawn' }),
      },
      [`GET /api/studies/${ids.completed}/enrollments/me`]: {
        status: 200,
        body: signedEnrollment({ studyId: ids.completed, status: 'completed', next: 'done' }),
      },
      [`GET /api/studies/${ids.running}/enrollments/me`]: {
        status: 200,
        body: signedEnrollment({ studyId: ids.running }),
      },
    });
    renderApp('/studies');

    const card = async (title: string) =>
      within((await screen.findByRole('link', { name: title }, { timeout: 3_000 })).closest('li')!);
    const stopped = await card('Stopped study');
    expect(await stopped.findByText('You stopped taking part')).toBeInTheDocument();
    expect(stopped.getByText('Running')).toBeInTheDocument();
    const completed = await card('Completed study');
    expect(await completed.findByText('You completed it')).toBeInTheDocument();
    expect(completed.getByText('Finished')).toBeInTheDocument();
    const running = await card('Running study');
    expect(await running.findByText('Taking part')).toBeInTheDocument();
  });
});
