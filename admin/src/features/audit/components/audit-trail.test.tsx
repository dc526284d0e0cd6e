import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { stubApi } from '@/test/api-stub';
import { renderWithProviders } from '@/test/render-with-providers';
import { AuditTrail } from './audit-trail';

const wayfinding = '8da5576c-4820-4de3-867c-b951081f13b2';
const studyTitles = new Map([[wayfinding, 'Wayfinding cues']]);

const events = [
  {
    id: '52ab97a2-3ce0-44cb-a0fa-636b16f6182e',
    chain: wayfinding,
    sequence: 231,
    at: '2026-12-01T19:47:10.709Z',
    actorId: 'c942b3e0-8b3e-4780-8792-01441f5b2505',
    actorEmail: 'coordinator@evenhand.test',
    action: 'consent.draft-created',
    subjectType: 'consent-version',
    subjectId: 'ac60ba3a-ff1c-4855-ae31-4968ee783167',
    data: { version: 3, templateId: 'consent/minimal-risk-paid-study' },
    previousHash: 'aeb65c396df39992caf37be4752ad7efafa61d7f225a9540ce5bb026d640f5cb',
    hash: 'ab2785ceba4aab052d26e5294c64a6fed1ff3fbfcdc2ecbecd1650129e35bad1',
  },
];

describe('AuditTrail', { timeout: 15_000 }, () => {
  it('shows an event’s data, previous hash and hash when its row is expanded', async () => {
    stubApi({ 'GET /api/audit': { status: 200, body: { items: events, total: 1, page: 1, pageSize: 50 } } });
    renderWithProviders(<AuditTrail studyTitles={studyTitles} />);

    const toggle = await screen.findByRole('button', { name: 'Show details of event 231 in Wayfinding cues' });
    expect(screen.getByRole('cell', { name: 'Wayfinding cues' })).toBeInTheDocument();
    expect(screen.queryByText(events[0]!.previousHash)).not.toBeInTheDocument();

    await userEvent.click(toggle);

    expect(toggle).toHaveAttribute('aria-expanded', 'true');
    expect(screen.getByText(events[0]!.previousHash)).toBeInTheDocument();
    expect(screen.getByText(events[0]!.hash)).toBeInTheDocument();
    expect(screen.getByText(/"templateId": "consent\/minimal-risk-paid-study"/)).toBeInTheDocument();
  });

  it('filters by chain and action on the server and starts again from page 1', async () => {
    const { requests } = stubApi({ 'GET /api/audit': { status: 200, body: { items: events, total: 1, page: 1, pageSize: 50 } } });
    renderWithProviders(<AuditTrail studyTitles={studyTitles} />, { route: '/audit?page=3' });
    await screen.findByRole('table', { name: 'Audit events, newest first' });

    await userEvent.selectOptions(screen.getByLabelText('Chain'), 'Lab-wide');
    await userEvent.selectOptions(screen.getByLabelText('Action'), 'Signed in');

    await waitFor(() => expect(requests.at(-1)?.query.get('action')).toBe('auth.signed-in'));
    expect(requests[0]?.query.get('page')).toBe('3');
    expect(requests.at(-1)?.query.get('chain')).toBe('lab');
    expect(requests.at(-1)?.query.get('page')).toBe('1');
  });

  it('reports each chain as intact or broken, with the first broken link', async () => {
    stubApi({
      'GET /api/audit': { status: 200, body: { items: events, total: 1, page: 1, pageSize: 50 } },
      'GET /api/audit/verify': {
        status: 200,
        body: {
          intact: false,
          checkedAt: '2026-12-01T19:50:00.000Z',
          chains: [
            { chain: wayfinding, events: 231, intact: false, firstBreak: { sequence: 17, reason: 'hash does not match the event' } },
            { chain: 'lab', events: 3, intact: true, firstBreak: null },
          ],
        },
      },
    });
    renderWithProviders(<AuditTrail studyTitles={studyTitles} />);

    await userEvent.click(screen.getByRole('button', { name: 'Check integrity' }));

    const chains = await screen.findByRole('list', { name: 'Chains checked' });
    expect(screen.getByText(/^1 of 2 chains are broken\./)).toBeInTheDocument();
    const [study, lab] = within(chains).getAllByRole('listitem');
    expect(study).toHaveTextContent('BrokenWayfinding cues231 eventsFirst broken link: event 17 (hash does not match the event)');
    expect(lab).toHaveTextContent('IntactLab-wide3 events');
  });
});
