import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it, vi } from 'vitest';
import { stubApi } from '@/test/api-stub';
import { renderWithProviders } from '@/test/render-with-providers';
import { SignInForm } from './sign-in-form';

const coordinator = {
  id: '5b0c3c36-6d5e-4a43-9a57-3f2f8f3f1a11',
  email: 'coordinator@evenhand.test',
  name: 'Robin Okafor-Lind',
  role: 'coordinator',
  active: true,
  twoFactorEnabled: false,
  twoFactorSetupNeeded: false,
};

describe('SignInForm', () => {
  it('names each missing field and sends nothing', async () => {
    const { requests } = stubApi({});
    renderWithProviders(<SignInForm onSignedIn={vi.fn()} />);

    await userEvent.click(screen.getByRole('button', { name: 'Sign in' }));

    expect(await screen.findByText('Enter your e-mail address.')).toBeInTheDocument();
    expect(screen.getByText('Enter your password.')).toBeInTheDocument();
    expect(screen.getByLabelText('E-mail')).toHaveAttribute('aria-invalid', 'true');
    expect(requests).toHaveLength(0);
  });

  it('refuses an address without a domain', async () => {
    stubApi({});
    renderWithProviders(<SignInForm onSignedIn={vi.fn()} />);

    await userEvent.type(screen.getByLabelText('E-mail'), 'coordinator');
    await userEvent.type(screen.getByLabelText('Password'), 'evenhand-demo');
    await userEvent.click(screen.getByRole('button', { name: 'Sign in' }));

    expect(await screen.findByText('Enter a valid e-mail address, like name@lab.org.')).toBeInTheDocument();
  });

  it('posts the e-mail (trimmed) and password and hands back the signed-in user', async () => {
    const { requests } = stubApi({ 'POST /api/auth/sign-in': { status: 200, body: { user: coordinator } } });
    const onSignedIn = vi.fn();
    renderWithProviders(<SignInForm onSignedIn={onSignedIn} />);

    await userEvent.type(screen.getByLabelText('E-mail'), '  coordinator@evenhand.test ');
    await userEvent.type(screen.getByLabelText('Password'), 'evenhand-demo');
    await userEvent.click(screen.getByRole('button', { name: 'Sign in' }));

    await waitFor(() => expect(onSignedIn).toHaveBeenCalledWith(coordinator));
    expect(requests).toEqual([
      expect.objectContaining({
        method: 'POST',
        path: '/api/auth/sign-in',
        body: { email: 'coordinator@evenhand.test', password: 'evenhand-demo' },
      }),
    ]);
  });

  it('shows the api’s generic message on 401 without trying to refresh', async () => {
    const { requests } = stubApi({
      'POST /api/auth/sign-in': {
        status: 401,
        body: { statusCode: 401, code: 'INVALID_CREDENTIALS', message: 'E-mail or password is not right.' },
      },
    });
    const onSignedIn = vi.fn();
    renderWithProviders(<SignInForm onSignedIn={onSignedIn} />);

    await userEvent.type(screen.getByLabelText('E-mail'), 'nobody@evenhand.test');
    await userEvent.type(screen.getByLabelText('Password'), 'not-the-password');
    await userEvent.click(screen.getByRole('button', { name: 'Sign in' }));

    expect(await screen.findByRole('alert')).toHaveTextContent('E-mail or password is not right.');
    expect(onSignedIn).not.toHaveBeenCalled();
    expect(requests.map((request) => request.path)).toEqual(['/api/auth/sign-in']);
  });

  it('shows the rate-limit message on 429', async () => {
    stubApi({
      'POST /api/auth/sign-in': {
        status: 429,
        body: {
          statusCode: 429,
          code: 'RATE_LIMITED',
          message: 'Too many sign-in attempts. Wait a minute and try again.',
        },
      },
    });
    renderWithProviders(<SignInForm onSignedIn={vi.fn()} />);

    await userEvent.type(screen.getByLabelText('E-mail'), 'coordinator@evenhand.test');
    await userEvent.type(screen.getByLabelText('Password'), 'evenhand-demo');
    await userEvent.click(screen.getByRole('button', { name: 'Sign in' }));

    expect(await screen.findByRole('alert')).toHaveTextContent(
      'Too many sign-in attempts. Wait a minute and try again.',
    );
  });

  it('asks for the authenticator code after a right password, then for a recovery code when chosen', async () => {
    const { requests } = stubApi({
      'POST /api/auth/sign-in': (request) => {
        const body = request.body as { code?: string; recoveryCode?: string };
        if (body.recoveryCode === 'abcde-fghjk') return { status: 200, body: { user: coordinator } };
        if (body.code || body.recoveryCode) {
          return {
            status: 401,
            body: {
              statusCode: 401,
              code: 'TWO_FACTOR_INVALID',
              message: 'That code is not right, or it was used already.',
            },
          };
        }
        return {
          status: 401,
          body: { statusCode: 401, code: 'TWO_FACTOR_REQUIRED', message: 'Enter the 6-digit code.' },
        };
      },
    });
    const onSignedIn = vi.fn();
    renderWithProviders(<SignInForm onSignedIn={onSignedIn} />);

    await userEvent.type(screen.getByLabelText('E-mail'), 'coordinator@evenhand.test');
    await userEvent.type(screen.getByLabelText('Password'), 'evenhand-demo');
    await userEvent.click(screen.getByRole('button', { name: 'Sign in' }));

    const codeField = await screen.findByLabelText('Code from your authenticator app');
    expect(screen.queryByRole('alert')).not.toBeInTheDocument();
    await userEvent.type(codeField, '12 34');
    await userEvent.click(screen.getByRole('button', { name: 'Sign in' }));
    expect(await screen.findByText('Enter the 6 digits your authenticator app shows.')).toBeInTheDocument();

    await userEvent.clear(codeField);
    await userEvent.type(codeField, '123 456');
    await userEvent.click(screen.getByRole('button', { name: 'Sign in' }));
    expect(await screen.findByRole('alert')).toHaveTextContent('That code is not right, or it was used already.');

    await userEvent.click(screen.getByRole('button', { name: 'Use a recovery code instead' }));
    await userEvent.type(screen.getByLabelText('Recovery code'), 'abcde-fghjk');
    await userEvent.click(screen.getByRole('button', { name: 'Sign in' }));
    await waitFor(() => expect(onSignedIn).toHaveBeenCalledWith(coordinator));
    expect(requests.map((request) => request.body)).toEqual([
      { email: 'coordinator@evenhand.test', password: 'evenhand-demo' },
      { email: 'coordinator@evenhand.test', password: 'evenhand-demo', code: '123456' },
      { email: 'coordinator@evenhand.test', password: 'evenhand-demo', recoveryCode: 'abcde-fghjk' },
    ]);
  });
});
