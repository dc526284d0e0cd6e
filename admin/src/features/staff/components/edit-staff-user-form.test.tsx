import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it, vi } from 'vitest';
import { stubApi } from '@/test/api-stub';
import { renderWithProviders } from '@/test/render-with-providers';
import { EditStaffUserForm } from './edit-staff-user-form';

const member = {
  id: '3e9b7a10-54c2-4f7e-9d61-0c8a2b4f6e33',
  email: 'wren.halloway@evenhand.test',
  name: 'Wren Halloway',
  role: 'researcher' as const,
  active: true,
  createdAt: '2025-01-06T09:30:00.000Z',
  lastSignInAt: '2025-01-07T14:05:00.000Z',
};
const path = `/api/users/${member.id}`;

describe('EditStaffUserForm', () => {
  it('starts from the saved values and sends only name and role', async () => {
    const { requests } = stubApi({
      [`PATCH ${path}`]: { status: 200, body: { ...member, name: 'Wren Halloway-Ives', role: 'coordinator' } },
    });
    const onSaved = vi.fn();
    renderWithProviders(<EditStaffUserForm user={member} onSaved={onSaved} onCancel={vi.fn()} />);

    expect(screen.getByLabelText('E-mail')).toHaveValue('wren.halloway@evenhand.test');
    expect(screen.getByLabelText('E-mail')).toBeDisabled();
    expect(screen.getByRole('button', { name: 'Save changes' })).toBeDisabled();

    await userEvent.type(screen.getByLabelText('Name'), '-Ives');
    await userEvent.click(screen.getByRole('button', { name: /Role/ }));
    await userEvent.click(await screen.findByRole('option', { name: /Coordinator/ }));
    await userEvent.click(screen.getByRole('button', { name: 'Save changes' }));

    await waitFor(() => expect(onSaved).toHaveBeenCalled());
    expect(requests).toEqual([
      expect.objectContaining({ method: 'PATCH', path, body: { name: 'Wren Halloway-Ives', role: 'coordinator' } }),
    ]);
  });

  it('refuses an empty name and puts a server error on its field', async () => {
    stubApi({
      [`PATCH ${path}`]: {
        status: 400,
        body: {
          statusCode: 400,
          code: 'VALIDATION_FAILED',
          message: 'Some fields are missing or invalid.',
          errors: [{ field: 'name', message: 'name is too long' }],
        },
      },
    });
    renderWithProviders(<EditStaffUserForm user={member} onSaved={vi.fn()} onCancel={vi.fn()} />);

    await userEvent.clear(screen.getByLabelText('Name'));
    await userEvent.click(screen.getByRole('button', { name: 'Save changes' }));
    expect(await screen.findByText('Enter the person’s name.')).toBeInTheDocument();

    await userEvent.type(screen.getByLabelText('Name'), 'W');
    await userEvent.click(screen.getByRole('button', { name: 'Save changes' }));
    await waitFor(() => expect(screen.getByLabelText('Name')).toHaveAccessibleDescription('name is too long'));
  });
});
