import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it, vi } from 'vitest';
import { stubApi } from '@/test/api-stub';
import { renderWithProviders } from '@/test/render-with-providers';
import { AddMemberForm } from './add-member-form';

const studyId = '5b0d8f5e-2a41-4c39-b2a4-3f4c1e9d7a10';
const person = (id: string, name: string, role: string) => ({
  id,
  email: `${name.split(' ')[0]!.toLowerCase()}@evenhand.test`,
  name,
  role,
  active: true,
  createdAt: '2025-01-06T09:30:00.000Z',
  lastSignInAt: null,
});
const staff = [
  person('0e7c1c3a-7d0b-4a5e-9c55-1b1f5c0e2a01', 'Ilse Coordinator', 'coordinator'),
  person('0e7c1c3a-7d0b-4a5e-9c55-1b1f5c0e2a02', 'Tam Admin', 'admin'),
  person('0e7c1c3a-7d0b-4a5e-9c55-1b1f5c0e2a03', 'Oren Member', 'researcher'),
];
const members = [{ userId: staff[2]!.id, email: staff[2]!.email, name: staff[2]!.name, role: 'researcher' as const }];
const usersAnswer = { status: 200, body: { items: staff, total: 3, page: 1, pageSize: 50 } };

describe('AddMemberForm', () => {
  it('offers only people who are not members yet, and only the role that fits their staff role', async () => {
    const { requests } = stubApi({
      'GET /api/users': usersAnswer,
      [`POST /api/studies/${studyId}/members`]: { status: 201, body: { items: [] } },
    });
    const onAdded = vi.fn();
    renderWithProviders(<AddMemberForm studyId={studyId} members={members} onAdded={onAdded} onCancel={vi.fn()} />);

    await userEvent.click(await screen.findByRole('button', { name: /Staff member/ }));
    expect(await screen.findByRole('option', { name: /Ilse Coordinator/ })).toBeInTheDocument();
    expect(screen.queryByRole('option', { name: /Oren Member/ })).not.toBeInTheDocument();
    await userEvent.click(screen.getByRole('option', { name: /Ilse Coordinator/ }));

    // A coordinator can only join as a coordinator, so it is chosen for them and nothing else is offered.
    await userEvent.click(screen.getByRole('button', { name: /Role in this study/ }));
    const roles = await screen.findAllByRole('option');
    expect(roles.map((option) => option.textContent)).toEqual([expect.stringMatching(/^Coordinator/)]);
    await userEvent.keyboard('{Escape}');

    await userEvent.click(screen.getByRole('button', { name: 'Add to study' }));
    await waitFor(() => expect(onAdded).toHaveBeenCalledWith('Ilse Coordinator'));
    expect(requests.find((r) => r.method === 'POST')).toMatchObject({
      body: { email: 'ilse@evenhand.test', role: 'coordinator' },
    });
  });

  it('offers an admin every membership role and shows the api’s refusal in its own words', async () => {
    stubApi({
      'GET /api/users': usersAnswer,
      [`POST /api/studies/${studyId}/members`]: {
        status: 400,
        body: {
          statusCode: 400,
          code: 'VALIDATION_FAILED',
          message: 'tam@evenhand.test is a coordinator; add them to the study as a coordinator.',
          errors: [{ field: 'role', message: 'must be coordinator, the person’s staff role' }],
        },
      },
    });
    renderWithProviders(<AddMemberForm studyId={studyId} members={[]} onAdded={vi.fn()} onCancel={vi.fn()} />);

    await userEvent.click(await screen.findByRole('button', { name: /Staff member/ }));
    await userEvent.click(await screen.findByRole('option', { name: /Tam Admin/ }));
    await userEvent.click(screen.getByRole('button', { name: 'Add to study' }));
    expect(await screen.findByText('Choose a role in the study.')).toBeInTheDocument();

    await userEvent.click(screen.getByRole('button', { name: /Role in this study/ }));
    const roles = await screen.findAllByRole('option');
    expect(roles).toHaveLength(3);
    await userEvent.click(screen.getByRole('option', { name: /Auditor/ }));
    await userEvent.click(screen.getByRole('button', { name: 'Add to study' }));
    expect(
      await screen.findByText('tam@evenhand.test is a coordinator; add them to the study as a coordinator.'),
    ).toBeInTheDocument();
  });
  it('keeps the list closed while a search is on its way, so a click cannot land on a list that is changing', async () => {
    stubApi({ 'GET /api/users': usersAnswer });
    renderWithProviders(<AddMemberForm studyId={studyId} members={members} onAdded={vi.fn()} onCancel={vi.fn()} />);
    const chooser = await screen.findByRole('button', { name: /Staff member/ });
    await waitFor(() => expect(chooser).toBeEnabled());

    await userEvent.type(screen.getByRole('searchbox', { name: 'Find a staff member' }), 'ilse');
    expect(screen.getByRole('button', { name: /Staff member/ })).toBeDisabled();
    expect(screen.getByRole('button', { name: /Staff member/ })).toHaveTextContent('Searching…');
    await waitFor(() => expect(screen.getByRole('button', { name: /Staff member/ })).toBeEnabled());
  });
});
