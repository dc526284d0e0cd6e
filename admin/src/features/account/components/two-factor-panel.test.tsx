import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { stubApi } from '@/test/api-stub';
import { renderWithProviders } from '@/test/render-with-providers';
import { TwoFactorPanel } from './two-factor-panel';

const codes = [
  'aaaaa-bbbbb',
  'ccccc-ddddd',
  'eeeee-fffff',
  'ggggg-hhhhh',
  'jjjjj-kkkkk',
  'mmmmm-nnnnn',
  'ppppp-qqqqq',
  'rrrrr-sssss',
  'ttttt-uuuuu',
  'vvvvv-wwwww',
];

describe('TwoFactorPanel', () => {
  it('sets up with a QR code, says a wrong code in words, and shows the recovery codes once even as the status turns to on', async () => {
    let enabled = false;
    stubApi({
      'GET /api/auth/two-factor': () => ({
        status: 200,
        body: {
          enabled,
          enabledAt: enabled ? '2026-12-05T08:00:00.000Z' : null,
          recoveryCodesLeft: enabled ? 10 : 0,
          required: false,
        },
      }),
      'GET /api/auth/me': { status: 200, body: {} },
      'POST /api/auth/two-factor/setup': {
        status: 200,
        body: {
          secret: 'JBSWY3DPEHPK3PXPJBSWY3DPEHPK3PXP',
          otpauthUrl: 'otpauth://totp/Evenhand:x',
          qrCodeDataUrl: 'data:image/svg+xml;base64,PHN2Zy8+',
        },
      },
      'POST /api/auth/two-factor/confirm': (request) => {
        if ((request.body as { code: string }).code !== '246810') {
          return {
            status: 400,
            body: {
              statusCode: 400,
              code: 'VALIDATION_FAILED',
              message: 'That code does not match.',
              errors: [{ field: 'code', message: 'does not match the authenticator app’s current code' }],
            },
          };
        }
        enabled = true;
        return { status: 200, body: { recoveryCodes: codes } };
      },
    });
    renderWithProviders(<TwoFactorPanel />);

    await userEvent.click(await screen.findByRole('button', { name: 'Set up two-factor sign-in' }));
    expect(await screen.findByRole('img', { name: 'QR code for your authenticator app' })).toHaveAttribute(
      'src',
      'data:image/svg+xml;base64,PHN2Zy8+',
    );
    expect(screen.getByTestId('two-factor-key')).toHaveTextContent('JBSW Y3DP EHPK 3PXP JBSW Y3DP EHPK 3PXP');

    const field = screen.getByLabelText('Code from your authenticator app');
    await userEvent.type(field, '12');
    await userEvent.click(screen.getByRole('button', { name: 'Turn on two-factor sign-in' }));
    expect(await screen.findByText('Enter the 6 digits your authenticator app shows.')).toBeInTheDocument();
    await userEvent.clear(field);
    await userEvent.type(field, '135790');
    await userEvent.click(screen.getByRole('button', { name: 'Turn on two-factor sign-in' }));
    expect(
      await screen.findByText('That code does not match. Enter the newest code your app shows.'),
    ).toBeInTheDocument();

    await userEvent.clear(field);
    await userEvent.type(field, '246 810');
    await userEvent.click(screen.getByRole('button', { name: 'Turn on two-factor sign-in' }));
    const list = await screen.findByRole('list', { name: 'Recovery codes' });
    expect(list.querySelectorAll('li')).toHaveLength(10);
    expect(screen.getByText(/shown only this once/)).toBeInTheDocument();

    await userEvent.click(screen.getByRole('button', { name: 'I have saved them' }));
    expect(await screen.findByText('10 recovery codes are left.')).toBeInTheDocument();
    await waitFor(() => expect(screen.queryByRole('list', { name: 'Recovery codes' })).not.toBeInTheDocument());
  });
});
