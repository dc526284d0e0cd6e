import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it, vi } from 'vitest';
import { stubApi } from '@/test/api-stub';
import { renderWithProviders } from '@/test/render-with-providers';
import { CreateStaffUserForm } from './create-staff-user-form';

const created = {
  id: '0f7c2a8e-2b8e-4d0a-8c55-1d6f1e2a9b40',
  email: 'tove.marsh@evenhand.test',
  name: 'Tove Marsh',
  role: 'researcher',
  active: true,
  createdAt: '2025-01-06T09:30:00.000Z',
  lastSignInAt: null,
};

async function fillForm({ password = 'long-enough-pass' }: { password?: string } = {}) {
  await userEvent.type(screen.getByLabelText('Name'), 'Tove Marsh');
  await userEvent.type(screen.getByLabelText('E-mail'), 'tove.marsh@evenhand.test');
  await userEvent.click(screen.getByRole('button', { name: /Role/ }));
  await userEvent.click(await screen.findByRole('option', { name: /Researcher/ }));
  await userEvent.type(screen.getByLabelText('Temporary password'), password);
}

const submit = () => userEvent.click(screen.getByRole('button', { name: 'Add staff member' }));

describe('CreateStaffUserForm', () => {
  it('names every missing field and sends nothing', async () => {
    const { requests } = stubApi({});
    renderWithProviders(<CreateStaffUserForm onCreated={vi.fn()} onCancel={vi.fn()} />);

    await submit();

    expect(await screen.findByText('Enter the person’s name.')).toBeInTheDocument();
    expect(screen.getByText('Enter an e-mail address.')).toBeInTheDocument();
    expect(screen.getByText('Choose a role.')).toBeInTheDocument();
    expect(screen.getByText('Use at least 12 characters.')).toBeInTheDocument();
    expect(requests).toHaveLength(0);
  });

  it('refuses an 11-character password and accepts 12', async () => {
    // DESIGN.md / API contract: staff passwords need at least 12 characters.
    const { requests } = stubApi({ 'POST /api/users': { status: 201, body: created } });
    const onCreated = vi.fn();
    renderWithProviders(<CreateStaffUserForm onCreated={onCreated} onCancel={vi.fn()} />);

    await fillForm({ password: '12345678901' });
    await submit();
    expect(await screen.findByText('Use at least 12 characters.')).toBeInTheDocument();
    expect(requests).toHaveLength(0);

    await userEvent.type(screen.getByLabelText('Temporary password'), '2');
    await submit();
    await waitFor(() => expect(onCreated).toHaveBeenCalledWith(created));
  });

  it('posts email, name, chosen role and password', async () => {
    const { requests } = stubApi({ 'POST /api/users': { status: 201, body: created } });
    renderWithProviders(<CreateStaffUserForm onCreated={vi.fn()} onCancel={vi.fn()} />);

    await fillForm();
    await submit();

    await waitFor(() => expect(requests).toHaveLength(1));
    expect(requests[0]).toMatchObject({
      method: 'POST',
      path: '/api/users',
      body: { email: 'tove.marsh@evenhand.test', name: 'Tove Marsh', role: 'researcher', password: 'long-enough-pass' },
    });
  });

  it('puts a 409 EMAIL_TAKEN on the e-mail field', async () => {
    stubApi({
      'POST /api/users': {
        status: 409,
        body: { statusCode: 409, code: 'EMAIL_TAKEN', message: 'An account with this e-mail already exists.' },
      },
    });
    const onCreated = vi.fn();
    renderWithProviders(<CreateStaffUserForm onCreated={onCreated} onCancel={vi.fn()} />);

    await fillForm();
    await submit();

    const email = screen.getByLabelText('E-mail');
    await waitFor(() => expect(email).toHaveAccessibleDescription('An account with this e-mail already exists.'));
    expect(email).toHaveAttribute('aria-invalid', 'true');
    expect(email).toHaveFocus();
    expect(onCreated).not.toHaveBeenCalled();
  });

  it('maps 400 errors[] onto their fields and keeps the rest above the form', async () => {
    stubApi({
      'POST /api/users': {
        status: 400,
        body: {
          statusCode: 400,
          code: 'VALIDATION_FAILED',
          message: 'Some fields are not valid.',
          errors: [
            { field: 'password', message: 'password is too common' },
            { field: 'name', message: 'name must not contain angle brackets' },
            { field: 'studyIds', message: 'studyIds is not allowed' },
          ],
        },
      },
    });
    renderWithProviders(<CreateStaffUserForm onCreated={vi.fn()} onCancel={vi.fn()} />);

    await fillForm();
    await submit();

    await waitFor(() =>
      expect(screen.getByLabelText('Temporary password')).toHaveAccessibleDescription('password is too common'),
    );
    expect(screen.getByLabelText('Name')).toHaveAccessibleDescription('name must not contain angle brackets');
    expect(screen.getByRole('alert')).toHaveTextContent('studyIds: studyIds is not allowed');
  });
});
