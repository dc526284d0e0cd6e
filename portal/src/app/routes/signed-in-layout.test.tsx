import { screen } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { installFakeApi, participant, problem, signedOutHandlers } from '@/test/fake-api';
import { renderApp } from '@/test/render-app';

describe('signed-in area', () => {
  it('sends someone without a session to the e-mail sign-in', async () => {
    const fakeApi = installFakeApi({ ...signedOutHandlers });
    const { router } = renderApp('/studies');

    expect(await screen.findByRole('heading', { name: 'Sign in with your e-mail' })).toBeInTheDocument();
    expect(router.state.location.pathname).toBe('/sign-in');
    expect(screen.queryByText('Please sign in again.')).not.toBeInTheDocument();
    expect(fakeApi.callsTo('GET', '/api/studies')).toHaveLength(0);
  });

  it('shows the studies with the signed-in address, for staff too', async () => {
    installFakeApi({
      'GET /api/auth/me': {
        status: 200,
        body: { ...participant, email: 'coordinator@evenhand.test', role: 'coordinator' },
      },
      'GET /api/studies': {
        status: 200,
        body: {
          items: [
            { id: 'a0c4', slug: 'wayfinding-cues', title: 'Wayfinding cues', status: 'recruiting', design: 'between' },
          ],
        },
      },
      // Staff have no part of their own in a study.
      'GET /api/studies/a0c4/enrollments/me': problem(404, 'NOT_FOUND', 'You have not joined this study.'),
    });
    renderApp('/');

    expect(await screen.findByRole('heading', { name: 'Wayfinding cues' })).toBeInTheDocument();
    expect(screen.getByText('coordinator@evenhand.test')).toBeInTheDocument();
    expect(screen.getByText('Running')).toBeInTheDocument();
    expect(screen.queryByText('No studies yet')).not.toBeInTheDocument();
  });

  it('shows an error with a way to try again when the studies cannot be loaded', async () => {
    const user = userEvent.setup();
    installFakeApi({
      'GET /api/auth/me': { status: 200, body: participant },
      'GET /api/studies': (_request, callNumber) =>
        callNumber === 1 ? problem(503, 'INTERNAL', 'Database unavailable') : { status: 200, body: { items: [] } },
    });
    renderApp('/studies');

    expect(await screen.findByText('We could not load your studies')).toBeInTheDocument();
    await user.click(screen.getByRole('button', { name: 'Try again' }));
    expect(await screen.findByRole('heading', { name: 'No studies yet' })).toBeInTheDocument();
  });

  it('signs out and says so on the sign-in page', async () => {
    const user = userEvent.setup();
    const fakeApi = installFakeApi({
      'GET /api/auth/me': { status: 200, body: participant },
      'GET /api/studies': { status: 200, body: { items: [] } },
      'POST /api/auth/sign-out': { status: 204 },
    });
    const { router } = renderApp('/studies');

    await user.click(await screen.findByRole('button', { name: 'Sign out' }));

    expect(await screen.findByText('You have signed out.')).toBeInTheDocument();
    expect(router.state.location.pathname).toBe('/sign-in');
    expect(fakeApi.callsTo('POST', '/api/auth/sign-out')).toHaveLength(1);
  });

  it('asks to sign in again when the session runs out and cannot be refreshed', async () => {
    installFakeApi({
      'GET /api/auth/me': { status: 200, body: participant },
      'GET /api/studies': (_request, callNumber) =>
        callNumber === 1 ? { status: 200, body: { items: [] } } : problem(401, 'UNAUTHENTICATED', 'Expired'),
      'POST /api/auth/refresh': problem(401, 'UNAUTHENTICATED', 'No valid refresh token'),
    });
    const { router, queryClient } = renderApp('/studies');
    await screen.findByRole('heading', { name: 'No studies yet' });

    await queryClient.refetchQueries({ queryKey: ['studies'] });

    expect(await screen.findByText('Please sign in again.')).toBeInTheDocument();
    expect(router.state.location.pathname).toBe('/sign-in');
  });
});

describe('pages that do not exist', () => {
  it('shows a page-not-found screen with a way back', async () => {
    installFakeApi({ ...signedOutHandlers });
    renderApp('/no-such-page');

    expect(await screen.findByRole('heading', { name: 'We could not find that page' })).toBeInTheDocument();
    expect(screen.getByRole('link', { name: 'Go to your studies' })).toHaveAttribute('href', '/studies');
  });
});
