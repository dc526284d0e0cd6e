import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { stubApi } from '@/test/api-stub';
import { renderWithProviders } from '@/test/render-with-providers';
import { ChangePasswordForm } from './change-password-form';

describe('ChangePasswordForm', () => {
  it('says early when the new password is short or repeated differently, and sends nothing', async () => {
    const { requests } = stubApi({});
    renderWithProviders(<ChangePasswordForm />);
    await userEvent.type(screen.getByLabelText('Current password'), 'temporary-password-1');
    await userEvent.type(screen.getByLabelText('New password'), 'short');
    await userEvent.type(screen.getByLabelText('New password again'), 'shorter');
    await userEvent.click(screen.getByRole('button', { name: 'Change password' }));
    expect(await screen.findByText('Use at least 12 characters.')).toBeInTheDocument();
    expect(screen.getByText('The two new passwords differ.')).toBeInTheDocument();
    expect(requests).toEqual([]);
  });

  it('puts the api’s refusal of the current password on that field, in words', async () => {
    stubApi({
      'POST /api/auth/password': {
        status: 400,
        body: {
          statusCode: 400,
          code: 'VALIDATION_FAILED',
          message: 'The current password is not right.',
          errors: [{ field: 'currentPassword', message: 'is not your current password' }],
        },
      },
    });
    renderWithProviders(<ChangePasswordForm />);
    await userEvent.type(screen.getByLabelText('Current password'), 'wrong-password');
    await userEvent.type(screen.getByLabelText('New password'), 'a-brand-new-password');
    await userEvent.type(screen.getByLabelText('New password again'), 'a-brand-new-password');
    await userEvent.click(screen.getByRole('button', { name: 'Change password' }));
    await waitFor(() =>
      expect(screen.getByLabelText('Current password')).toHaveAccessibleDescription(
        'That is not your current password.',
      ),
    );
  });
});
