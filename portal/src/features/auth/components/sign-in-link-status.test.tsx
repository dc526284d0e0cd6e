import { screen } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { installFakeApi, participant, problem, signedOutHandlers } from '@/test/fake-api';
import { renderApp } from '@/test/render-app';

describe('opening the e-mailed sign-in link', () => {
  it('spends the token exactly once and lands on "Your studies", signed in', async () => {
    const fakeApi = installFakeApi({
      ...signedOutHandlers,
      'POST /api/auth/sign-in-link/consume': { status: 200, body: { user: participant } },
      'GET /api/studies': { status: 200, body: { items: [] } },
    });
    const { router } = renderApp('/sign-in/link?token=tok-6b1d9e');

    expect(await screen.findByRole('heading', { name: 'Your studies' })).toBeInTheDocument();
    expect(router.state.location.pathname).toBe('/studies');
    expect(screen.getByText(participant.email)).toBeInTheDocument();
    expect(await screen.findByRole('heading', { name: 'No studies yet' })).toBeInTheDocument();
    // Rendered in StrictMode: effects run twice, the single-use token must still be sent once.
    expect(fakeApi.callsTo('POST', '/api/auth/sign-in-link/consume').map((r) => r.body)).toEqual([
      { token: 'tok-6b1d9e' },
    ]);
    expect(fakeApi.unexpected).toEqual([]);
  });

  it('explains an expired or used link and offers a new one', async () => {
    const user = userEvent.setup();
    installFakeApi({
      ...signedOutHandlers,
      'POST /api/auth/sign-in-link/consume': problem(400, 'LINK_INVALID', 'This sign-in link is not valid'),
    });
    const { router } = renderApp('/sign-in/link?token=tok-spent');

    expect(await screen.findByRole('heading', { name: 'This sign-in link can no longer be used' })).toBeInTheDocument();
    expect(screen.getByText(/Each link works once, for 15 minutes/)).toBeInTheDocument();

    await user.click(screen.getByRole('link', { name: 'Send me a new sign-in link' }));
    expect(await screen.findByRole('heading', { name: 'Sign in with your e-mail' })).toBeInTheDocument();
    expect(router.state.location.pathname).toBe('/sign-in');
  });

  it('says the link is incomplete when it has no token, without asking the api', async () => {
    const fakeApi = installFakeApi({ ...signedOutHandlers });
    renderApp('/sign-in/link');

    expect(await screen.findByRole('heading', { name: 'This link is incomplete' })).toBeInTheDocument();
    expect(fakeApi.callsTo('POST', '/api/auth/sign-in-link/consume')).toHaveLength(0);
  });

  it('offers to try again when the server failed, and signs in on the second try', async () => {
    const user = userEvent.setup();
    const fakeApi = installFakeApi({
      ...signedOutHandlers,
      'POST /api/auth/sign-in-link/consume': (_request, callNumber) =>
        callNumber === 1 ? problem(500, 'INTERNAL', 'Internal error') : { status: 200, body: { user: participant } },
      'GET /api/studies': { status: 200, body: { items: [] } },
    });
    renderApp('/sign-in/link?token=tok-retry');

    expect(
      await screen.findByText('Something went wrong on our side. Please try again in a moment.'),
    ).toBeInTheDocument();
    await user.click(screen.getByRole('button', { name: 'Try again' }));

    expect(await screen.findByRole('heading', { name: 'Your studies' })).toBeInTheDocument();
    expect(fakeApi.callsTo('POST', '/api/auth/sign-in-link/consume')).toHaveLength(2);
  });

  it("says in plain words that a malformed link is not complete, never the api's field message", async () => {
    installFakeApi({
      ...signedOutHandlers,
      'POST /api/auth/sign-in-link/consume': {
        status: 400,
        body: {
          statusCode: 400,
          code: 'VALIDATION_FAILED',
          message: 'Some fields are not right',
          errors: [{ field: 'token', message: 'token is not a sign-in token' }],
        },
      },
    });
    renderApp('/sign-in/link?token=abc');

    expect(await screen.findByRole('heading', { name: 'This sign-in link is not complete' })).toBeInTheDocument();
    expect(screen.getByText(/Ask for a new link and tap it straight from the e-mail/)).toBeInTheDocument();
    expect(screen.queryByText(/token/i)).not.toBeInTheDocument();
    expect(screen.getByRole('link', { name: 'Send me a new sign-in link' })).toHaveAttribute('href', '/sign-in');
  });
});
