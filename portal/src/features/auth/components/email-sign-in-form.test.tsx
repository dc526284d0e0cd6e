import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { installFakeApi, problem, signedOutHandlers } from '@/test/fake-api';
import { renderApp } from '@/test/render-app';

const sent = { status: 202, body: { sent: true } };

async function openSignIn(path = '/sign-in') {
  const user = userEvent.setup();
  renderApp(path);
  const field = await screen.findByLabelText('Your e-mail address');
  const submit = screen.getByRole('button', { name: 'Send me a sign-in link' });
  return { user, field, submit };
}

describe('e-mail sign-in form', () => {
  it('asks for an address when the field is left empty, and sends nothing', async () => {
    const fakeApi = installFakeApi({ ...signedOutHandlers, 'POST /api/auth/sign-in-link': sent });
    const { user, field, submit } = await openSignIn();

    await user.click(submit);

    expect(await screen.findByText('Enter your e-mail address.')).toBeInTheDocument();
    expect(field).toHaveAttribute('aria-invalid', 'true');
    expect(field).toHaveAccessibleDescription(expect.stringContaining('Enter your e-mail address.'));
    expect(field).toHaveFocus();
    expect(fakeApi.callsTo('POST', '/api/auth/sign-in-link')).toHaveLength(0);
  });

  it('explains a malformed address inline and clears the message once it is corrected', async () => {
    const fakeApi = installFakeApi({ ...signedOutHandlers, 'POST /api/auth/sign-in-link': sent });
    const { user, field, submit } = await openSignIn();

    await user.type(field, 'robin.ash.example.test');
    await user.click(submit);

    expect(await screen.findByText('Enter an e-mail address like name@example.com.')).toBeInTheDocument();
    expect(fakeApi.callsTo('POST', '/api/auth/sign-in-link')).toHaveLength(0);

    await user.clear(field);
    await user.type(field, 'robin.ash@example.test');
    await waitFor(() =>
      expect(screen.queryByText('Enter an e-mail address like name@example.com.')).not.toBeInTheDocument(),
    );
    expect(field).not.toHaveAttribute('aria-invalid', 'true');
  });

  it('sends the trimmed address alone when there is no study link, then says to check the inbox', async () => {
    const fakeApi = installFakeApi({ ...signedOutHandlers, 'POST /api/auth/sign-in-link': sent });
    const { user, field, submit } = await openSignIn();

    await user.type(field, '  robin.ash@example.test ');
    await user.click(submit);

    expect(await screen.findByRole('heading', { name: 'Check your inbox' })).toHaveFocus();
    expect(screen.getByText('robin.ash@example.test')).toBeInTheDocument();
    expect(screen.getByText('The link works for 15 minutes and only once.')).toBeInTheDocument();
    expect(fakeApi.callsTo('POST', '/api/auth/sign-in-link').map((r) => r.body)).toEqual([
      { email: 'robin.ash@example.test' },
    ]);
  });

  it('passes the study from a study link along with the address', async () => {
    const fakeApi = installFakeApi({ ...signedOutHandlers, 'POST /api/auth/sign-in-link': sent });
    const { user, field, submit } = await openSignIn('/sign-in?study=wayfinding-cues');

    expect(screen.getByText('You came here from a study link. Sign in to continue.')).toBeInTheDocument();
    await user.type(field, 'robin.ash@example.test');
    await user.click(submit);

    await screen.findByRole('heading', { name: 'Check your inbox' });
    expect(fakeApi.callsTo('POST', '/api/auth/sign-in-link').map((r) => r.body)).toEqual([
      { email: 'robin.ash@example.test', studySlug: 'wayfinding-cues' },
    ]);
  });

  it('sends the link again on request, and goes back with the address filled in for a wrong address', async () => {
    const fakeApi = installFakeApi({ ...signedOutHandlers, 'POST /api/auth/sign-in-link': sent });
    const { user, field, submit } = await openSignIn('/sign-in?study=wayfinding-cues');
    await user.type(field, 'robin.ahs@example.test');
    await user.click(submit);
    await screen.findByRole('heading', { name: 'Check your inbox' });

    await user.click(screen.getByRole('button', { name: 'Send the link again' }));
    expect(await screen.findByText('We sent you a new link.')).toBeInTheDocument();
    expect(fakeApi.callsTo('POST', '/api/auth/sign-in-link').map((r) => r.body)).toEqual([
      { email: 'robin.ahs@example.test', studySlug: 'wayfinding-cues' },
      { email: 'robin.ahs@example.test', studySlug: 'wayfinding-cues' },
    ]);

    await user.click(screen.getByRole('button', { name: 'Wrong address? Change it' }));
    expect(await screen.findByLabelText('Your e-mail address')).toHaveValue('robin.ahs@example.test');
  });

  it('says so plainly when too many links were asked for, and stays on the form', async () => {
    installFakeApi({
      ...signedOutHandlers,
      'POST /api/auth/sign-in-link': problem(429, 'RATE_LIMITED', 'Too many requests'),
    });
    const { user, field, submit } = await openSignIn();

    await user.type(field, 'robin.ash@example.test');
    await user.click(submit);

    const alert = await screen.findByText(/asked several times in a short while/);
    expect(alert.closest('[role="alert"]')).toHaveTextContent('We could not send your link');
    expect(screen.queryByRole('heading', { name: 'Check your inbox' })).not.toBeInTheDocument();
  });

  it('puts a field error from the api on the e-mail field', async () => {
    installFakeApi({
      ...signedOutHandlers,
      'POST /api/auth/sign-in-link': {
        status: 400,
        body: {
          statusCode: 400,
          code: 'VALIDATION_FAILED',
          message: 'Some fields are not right',
          errors: [{ field: 'email', message: 'email must be an email' }],
        },
      },
    });
    const { user, field, submit } = await openSignIn();

    await user.type(field, 'robin.ash@example.test');
    await user.click(submit);

    // The api's own words name its field ("email must be …"); the person reads the form's words instead.
    expect(
      await screen.findByText('Please enter your whole e-mail address, like name@example.com.'),
    ).toBeInTheDocument();
    expect(screen.queryByText(/must be an email/)).not.toBeInTheDocument();
    expect(field).toHaveAttribute('aria-invalid', 'true');
  });
});
