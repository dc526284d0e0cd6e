import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it, vi } from 'vitest';
import { stubApi } from '@/test/api-stub';
import { renderWithProviders } from '@/test/render-with-providers';
import { StaffActivationDialog } from './staff-activation-dialog';

const member = {
  id: '7d1c3f52-9a4e-4c55-a1f0-5b2d8e6c4a19',
  email: 'quill.arbor@evenhand.test',
  name: 'Quill Arbor',
  role: 'coordinator' as const,
  active: true,
  createdAt: '2025-01-06T09:30:00.000Z',
  lastSignInAt: null,
};

describe('StaffActivationDialog', () => {
  it('asks first, then patches active:false for the chosen person', async () => {
    const { requests } = stubApi({
      'PATCH /api/users/7d1c3f52-9a4e-4c55-a1f0-5b2d8e6c4a19': { status: 200, body: { ...member, active: false } },
    });
    const onChanged = vi.fn();
    renderWithProviders(<StaffActivationDialog user={member} onClose={vi.fn()} onChanged={onChanged} />);

    expect(await screen.findByText('Deactivate Quill Arbor?')).toBeInTheDocument();
    expect(requests).toHaveLength(0);

    await userEvent.click(screen.getByRole('button', { name: 'Deactivate' }));

    await waitFor(() => expect(onChanged).toHaveBeenCalledWith({ ...member, active: false }));
    expect(requests).toEqual([expect.objectContaining({ method: 'PATCH', body: { active: false } })]);
  });

  it('reactivates a deactivated person with active:true', async () => {
    const { requests } = stubApi({
      'PATCH /api/users/7d1c3f52-9a4e-4c55-a1f0-5b2d8e6c4a19': { status: 200, body: member },
    });
    renderWithProviders(
      <StaffActivationDialog user={{ ...member, active: false }} onClose={vi.fn()} onChanged={vi.fn()} />,
    );

    await userEvent.click(await screen.findByRole('button', { name: 'Reactivate' }));

    await waitFor(() => expect(requests).toHaveLength(1));
    expect(requests[0]?.body).toEqual({ active: true });
  });

  it('shows the api’s refusal inside the dialog and stays open', async () => {
    stubApi({
      'PATCH /api/users/7d1c3f52-9a4e-4c55-a1f0-5b2d8e6c4a19': {
        status: 400,
        body: { statusCode: 400, code: 'VALIDATION_FAILED', message: 'An admin cannot deactivate their own account.' },
      },
    });
    const onChanged = vi.fn();
    renderWithProviders(<StaffActivationDialog user={member} onClose={vi.fn()} onChanged={onChanged} />);

    await userEvent.click(await screen.findByRole('button', { name: 'Deactivate' }));

    expect(await screen.findByRole('alert')).toHaveTextContent('An admin cannot deactivate their own account.');
    expect(screen.getByText('Deactivate Quill Arbor?')).toBeInTheDocument();
    expect(onChanged).not.toHaveBeenCalled();
  });

  it('sends nothing when cancelled', async () => {
    const { requests } = stubApi({});
    const onClose = vi.fn();
    renderWithProviders(<StaffActivationDialog user={member} onClose={onClose} onChanged={vi.fn()} />);

    await userEvent.click(await screen.findByRole('button', { name: 'Cancel' }));

    expect(onClose).toHaveBeenCalled();
    expect(requests).toHaveLength(0);
  });
});
