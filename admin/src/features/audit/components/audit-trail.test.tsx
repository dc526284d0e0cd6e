import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { stubApi } from '@/test/api-stub';
import { renderWithProviders } from '@/test/render-with-providers';
import { AuditTrail } from './audit-trail';

const wayfinding = '8da5576c-4820-4de3-867c-b951081f13b2';
const coordinatorId = 'c942b3e0-8b3e-4780-8792-01441f5b2505';

const approval = {
  id: '52ab97a2-3ce0-44cb-a0fa-636b16f6182e',
  chain: wayfinding,
  sequence: 231,
  at: '2026-12-01T19:47:10.709Z',
  actorId: coordinatorId,
  actorEmail: 'coordinator@evenhand.test',
  action: 'payout.approved',
  subjectType: 'study',
  subjectId: wayfinding,
  data: { count: 3, amountMinor: 3600 },
  previousHash: 'aeb65c396df39992caf37be4752ad7efafa61d7f225a9540ce5bb026d640f5cb',
  hash: 'ab2785ceba4aab052d26e5294c64a6fed1ff3fbfcdc2ecbecd1650129e35bad1',
  keyId: 'dev-1',
  family: 'payouts',
  name: 'Payouts approved',
  sentence: 'Coordinator C. Vasquez-Hale approved 3 payouts, $36.00 in all.',
  actorPhrase: 'Coordinator C. Vasquez-Hale',
  participantReference: null,
  studyTitle: 'Wayfinding cues',
  amount: { minor: 3600, currency: 'USD' },
};

const filters = {
  families: [
    { key: 'steps', label: 'Steps', description: '' },
    { key: 'payouts', label: 'Payouts', description: '' },
    { key: 'funding', label: 'Funding', description: '' },
  ],
  staff: [
    {
      id: coordinatorId,
      name: 'Corin Vasquez-Hale',
      email: 'coordinator@evenhand.test',
      role: 'coordinator',
      phrase: 'Coordinator C. Vasquez-Hale',
    },
  ],
  studies: [{ id: wayfinding, title: 'Wayfinding cues', slug: 'wayfinding-cues' }],
};

const base = {
  'GET /api/audit': { status: 200, body: { items: [approval], total: 1, page: 1, pageSize: 50 } },
  'GET /api/audit/filters': { status: 200, body: filters },
  'GET /api/audit/receipts': {
    status: 200,
    body: {
      items: [
        {
          id: 'f1e2d3c4-0000-4000-8000-000000000004',
          number: 4,
          issuedAt: '2026-12-01T20:17:00.000Z',
          reason: 'scheduled',
          chains: 3,
        },
      ],
    },
  },
};

describe('AuditTrail', { timeout: 15_000 }, () => {
  it('reads as sentences, with the stored fields one click away', async () => {
    stubApi(base);
    renderWithProviders(<AuditTrail canSeal />);

    expect(
      await screen.findByText('Coordinator C. Vasquez-Hale approved 3 payouts, $36.00 in all.'),
    ).toBeInTheDocument();
    expect(screen.queryByText('payout.approved')).not.toBeInTheDocument();
    expect(screen.queryByText(approval.hash)).not.toBeInTheDocument();

    const toggle = screen.getByRole('button', {
      name: 'Details of “Coordinator C. Vasquez-Hale approved 3 payouts, $36.00 in all.”',
    });
    await userEvent.click(toggle);

    expect(toggle).toHaveAttribute('aria-expanded', 'true');
    expect(screen.getByText(approval.hash)).toBeInTheDocument();
    expect(screen.getByText('payout.approved')).toBeInTheDocument();
    expect(screen.getByText(/"amountMinor": 3600/)).toBeInTheDocument();
  });

  it('narrows by participant, staff member, dates and several kinds of action, and exports that same selection', async () => {
    const { requests } = stubApi(base);
    renderWithProviders(<AuditTrail canSeal />, { route: '/audit?page=3' });
    await screen.findByText(approval.sentence);

    await userEvent.type(screen.getByLabelText('Participant reference'), 'p-7kq2xa');
    await userEvent.click(screen.getByRole('button', { name: 'Show' }));
    await userEvent.selectOptions(
      screen.getByLabelText('Staff member'),
      'Coordinator C. Vasquez-Hale (coordinator@evenhand.test)',
    );
    await userEvent.click(screen.getByRole('checkbox', { name: 'Payouts' }));
    await userEvent.click(screen.getByRole('checkbox', { name: 'Funding' }));

    await waitFor(() => expect(requests.at(-1)?.query.getAll('family')).toEqual(['payouts', 'funding']));
    const last = requests.at(-1)!.query;
    expect(requests.find((r) => r.path === '/api/audit')?.query.get('page')).toBe('3');
    expect(last.get('participant')).toBe('p-7kq2xa');
    expect(last.get('staff')).toBe(coordinatorId);
    expect(last.get('page')).toBe('1');

    const csv = screen.getByRole('link', { name: 'Export as CSV' });
    expect(csv).toHaveAttribute(
      'href',
      `/api/audit/export.csv?participant=p-7kq2xa&staff=${coordinatorId}&family=payouts&family=funding`,
    );
    expect(screen.getByRole('link', { name: 'Verification summary' }).getAttribute('href')).toMatch(
      /^\/api\/audit\/export-summary\.txt\?participant=p-7kq2xa&/,
    );
  });

  it('says in words whether the trail is intact, naming the first failing event', async () => {
    stubApi({
      ...base,
      'GET /api/audit/verify': {
        status: 200,
        body: {
          intact: false,
          checkedAt: '2026-12-01T19:50:00.000Z',
          receipt: {
            id: 'f1e2d3c4-0000-4000-8000-000000000004',
            number: 4,
            issuedAt: '2026-12-01T20:17:00.000Z',
            source: 'latest',
            valid: true,
          },
          chains: [
            { chain: wayfinding, events: 231, intact: false, firstBreak: { sequence: 17, reason: 'hash-mismatch' } },
            { chain: 'lab', events: 3, intact: true, firstBreak: null },
          ],
          findings: [
            {
              chain: wayfinding,
              studyTitle: 'Wayfinding cues',
              sequence: 17,
              reason: 'hash-mismatch',
              message: `event 17 of chain ${wayfinding} does not match its keyed hash: a stored column was changed after it was written.`,
              event: {
                at: '2026-12-01T10:00:00.000Z',
                name: 'Payouts approved',
                sentence: 'Coordinator C. Vasquez-Hale approved 3 payouts, $36.00 in all.',
              },
            },
          ],
        },
      },
    });
    renderWithProviders(<AuditTrail canSeal />);

    await userEvent.click(screen.getByRole('button', { name: 'Check the trail' }));

    expect(await screen.findByText('Not intact.')).toBeInTheDocument();
    expect(screen.getByText(/Checked against audit receipt no\. 4 of/)).toBeInTheDocument();
    const failed = within(screen.getByRole('list', { name: 'What failed' })).getByRole('listitem');
    expect(failed).toHaveTextContent('Wayfinding cues, event 17');
    expect(failed).toHaveTextContent(
      'First failing event: “Coordinator C. Vasquez-Hale approved 3 payouts, $36.00 in all.”',
    );
    const [study, lab] = within(screen.getByRole('list', { name: 'Chains checked' })).getAllByRole('listitem');
    expect(study).toHaveTextContent('BrokenWayfinding cues231 events');
    expect(lab).toHaveTextContent('IntactLab-wide3 events');
  });

  it('lists receipts to download and seals a new one on request', async () => {
    const { requests } = stubApi({
      ...base,
      'POST /api/audit/receipts': {
        status: 201,
        body: {
          format: 'evenhand-audit-receipt/1',
          id: 'r5',
          number: 5,
          issuedAt: '2026-12-01T21:00:00.000Z',
          reason: 'on-demand',
          previous: null,
          chains: [{}, {}],
          keyId: 'dev-1',
          mac: 'ab',
        },
      },
    });
    renderWithProviders(<AuditTrail canSeal />);

    const download = await screen.findByRole('link', { name: 'Download receipt no. 4' });
    expect(download).toHaveAttribute('href', '/api/audit/receipts/f1e2d3c4-0000-4000-8000-000000000004');

    await userEvent.click(screen.getByRole('button', { name: 'Seal a receipt now' }));
    expect(await screen.findByText(/Receipt no\. 5 sealed 2 chains/)).toBeInTheDocument();
    expect(requests.filter((r) => r.method === 'POST')).toHaveLength(1);
  });
});
