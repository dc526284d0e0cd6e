import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { stubApi, type RecordedRequest } from '@/test/api-stub';
import { renderWithProviders } from '@/test/render-with-providers';
import { Roster } from './roster';

const studyId = '8da5576c-4820-4de3-867c-b951081f13b2';
const rosterPath = `/api/studies/${studyId}/enrollments`;

const signed = {
  id: '4402fb12-dfaa-46db-8a66-c05bd2341015',
  reference: 'P-3X66FX',
  email: 'p048@evenhand.test',
  name: null,
  status: 'assigned',
  condition: 'C',
  stratumKey: 'sense_of_direction=≥50',
  covariates: { sense_of_direction: 59 },
  needsReconsent: true,
  signedVersion: 1,
  invitationSentAt: null,
  assignedAt: '2026-12-01T19:45:19.016Z',
  createdAt: '2026-12-01T19:45:18.994Z',
};
const invited = {
  ...signed,
  id: '9b1f6a2e-7c3d-4e5f-8a9b-0c1d2e3f4a5b',
  reference: 'P-7QW2ZK',
  email: 'rowan.example@evenhand.test',
  name: 'Rowan Example',
  status: 'invited',
  condition: null,
  stratumKey: null,
  needsReconsent: false,
  signedVersion: null,
  assignedAt: null,
};

function rosterAnswer({ query }: RecordedRequest) {
  const needsReconsent = query.get('needsReconsent') === 'true';
  const items = needsReconsent ? [signed] : [signed, invited];
  return {
    status: 200,
    body: {
      items: query.get('pageSize') === '1' ? items.slice(0, 1) : items,
      total: items.length,
      page: 1,
      pageSize: Number(query.get('pageSize')),
      countsByStatus: { assigned: 1, invited: 1 },
    },
  };
}

// The shared test machines are often busy; these component tests get more time than the 5 s default.
describe('Roster', { timeout: 15_000 }, () => {
  it('shows status chips with counts and filters to people who still need to re-consent', async () => {
    const { requests } = stubApi({ [`GET ${rosterPath}`]: rosterAnswer });
    renderWithProviders(<Roster studyId={studyId} blinded canManage recordHref={(id) => `/r/${id}`} />);

    const filters = await screen.findByRole('group', { name: 'Show people by status' });
    expect(
      within(filters)
        .getAllByRole('button')
        .map((chip) => chip.textContent),
    ).toEqual(['All statuses2', 'Invited1', 'Assigned1']);
    expect(screen.getByRole('columnheader', { name: 'Condition (coded)' })).toBeInTheDocument();
    expect(await screen.findByRole('button', { name: 'Remind to re-consent (1)' })).toBeInTheDocument();

    await userEvent.click(screen.getByRole('button', { name: /^Needs re-consent/ }));

    await waitFor(() => expect(screen.queryByText('rowan.example@evenhand.test')).not.toBeInTheDocument());
    expect(screen.getByRole('button', { name: /^Needs re-consent/ })).toHaveAttribute('aria-pressed', 'true');
    const pageCalls = requests.filter((request) => request.query.get('pageSize') === '25');
    expect(pageCalls.at(-1)?.query.get('needsReconsent')).toBe('true');
  });

  it('offers "Mark lost" only to assigned people and sends the optional reason', async () => {
    const lostPath = `${rosterPath}/${signed.id}/lost`;
    const { requests } = stubApi({
      [`GET ${rosterPath}`]: rosterAnswer,
      [`POST ${lostPath}`]: { status: 200, body: { ...signed, status: 'lost' } },
    });
    renderWithProviders(<Roster studyId={studyId} blinded={false} canManage recordHref={(id) => `/r/${id}`} />);

    await screen.findByText('rowan.example@evenhand.test');
    expect(screen.queryByRole('button', { name: 'Mark Rowan Example lost to follow-up' })).not.toBeInTheDocument();
    expect(screen.getByRole('button', { name: 'Record a withdrawal for Rowan Example' })).toBeInTheDocument();

    await userEvent.click(screen.getByRole('button', { name: 'Mark P-3X66FX lost to follow-up' }));
    await screen.findByText('Mark P-3X66FX lost to follow-up?');
    await userEvent.type(screen.getByLabelText('Reason'), 'No reply to three reminders');
    await userEvent.click(screen.getByRole('button', { name: 'Mark lost to follow-up' }));

    expect(await screen.findByText('P-3X66FX is marked lost to follow-up.')).toBeInTheDocument();
    expect(requests.find((request) => request.path === lostPath)?.body).toEqual({
      reason: 'No reply to three reminders',
    });
  });

  it('hides the import, mail and row actions from people who may only read', async () => {
    stubApi({ [`GET ${rosterPath}`]: rosterAnswer });
    renderWithProviders(<Roster studyId={studyId} blinded canManage={false} recordHref={(id) => `/r/${id}`} />);

    await screen.findByText('rowan.example@evenhand.test');
    expect(screen.queryByRole('button', { name: 'Import CSV…' })).not.toBeInTheDocument();
    expect(screen.queryByRole('button', { name: 'Send invitations' })).not.toBeInTheDocument();
    expect(screen.queryByRole('button', { name: /Withdraw|Mark/ })).not.toBeInTheDocument();
  });
});
