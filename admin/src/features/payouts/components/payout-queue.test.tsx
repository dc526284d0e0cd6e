import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { stubApi, type RecordedRequest } from '@/test/api-stub';
import { renderWithProviders } from '@/test/render-with-providers';
import { PayoutQueue } from './payout-queue';

const studyId = 'fd81ba27-7b62-43f7-9ccb-3494ef5fcdc7';
const listPath = `/api/studies/${studyId}/payouts`;
const approvePath = `${listPath}/approve`;

const base = {
  enrollmentId: 'e221b405-6b36-4066-898f-ba15023d6ae1',
  condition: 'B',
  kind: 'step',
  currency: 'USD',
  payOverride: false,
  failureReason: null,
  receiptNumber: null,
  providerTransferId: null,
  payoutAccountReady: true,
  createdAt: '2026-12-01T16:49:41.868Z',
  approvedAt: null,
  paidAt: null,
};
const first = {
  ...base,
  id: 'fe715aac-2dc1-4ddb-8130-67daeec77106',
  reference: 'P-QBKST7',
  stepTitle: 'Session 3: finding rooms again',
  amountMinor: 1500,
  status: 'owed',
  stage: 'to-approve',
};
const second = {
  ...base,
  id: '6bba9194-c85b-4fec-8e29-5adc57cb4aa7',
  enrollmentId: '0f4c7a43-2f6e-4b9b-9d55-8f7f0d7a2b11',
  reference: 'P-JMU73A',
  stepTitle: 'Session 1: learning the building',
  amountMinor: 1000,
  status: 'owed',
  stage: 'to-approve',
  payOverride: true,
};
const failed = {
  ...base,
  id: 'a37aa586-e95f-4886-89a3-0a2ceb4828c9',
  enrollmentId: '5d2e9c61-7a1b-4c3d-8e9f-0a1b2c3d4e5f',
  reference: 'P-SVVMCF',
  stepTitle: 'Session 2: a new floor',
  amountMinor: 1200,
  status: 'failed',
  stage: 'needs-attention',
  payoutAccountReady: false,
  failureReason: 'The participant has not finished setting up payouts.',
};
const paid = {
  ...base,
  id: 'c6d0f1aa-3f55-4c1e-9a4e-6f2f5e1c9b01',
  reference: 'P-QBKST7',
  stepTitle: 'Session 1: learning the building',
  amountMinor: 1000,
  status: 'paid',
  stage: 'paid',
  receiptNumber: 'wayfinding-cues-0003',
  providerTransferId: 'tr_1Hd83kQm2Ow9',
  approvedAt: '2026-12-02T10:00:00.000Z',
  paidAt: '2026-12-02T10:00:05.000Z',
};
const rows = [first, second, failed, paid];
const stages = {
  'to-approve': { count: 2, amountMinor: 2500, participants: 2 },
  'awaiting-setup': { count: 6, amountMinor: 8600, participants: 6 },
  'needs-attention': { count: 1, amountMinor: 1200, participants: 1 },
  'on-its-way': { count: 0, amountMinor: 0, participants: 0 },
  paid: { count: 1, amountMinor: 1000, participants: 1 },
  closed: { count: 0, amountMinor: 0, participants: 0 },
};

/** Answers the queue as the api does: filtered by stage or by participant. */
function listAnswer(request: RecordedRequest) {
  const stage = request.query.get('stage');
  const enrollmentId = request.query.get('enrollmentId');
  const items = rows.filter(
    (row) => (!stage || row.stage === stage) && (!enrollmentId || row.enrollmentId === enrollmentId),
  );
  return {
    status: 200,
    body: {
      items,
      total: items.length,
      page: 1,
      pageSize: 50,
      countsByStatus: { owed: 8, failed: 1, paid: 1 },
      amountByStatus: { owed: 11100, failed: 1200, paid: 1000 },
      stages,
    },
  };
}

describe('PayoutQueue', { timeout: 15_000 }, () => {
  it('groups the queue by what staff do next, with counts and sums for each group, instead of status filters', async () => {
    stubApi({ [`GET ${listPath}`]: listAnswer });
    renderWithProviders(<PayoutQueue studyId={studyId} blinded canApprove conditions={[]} />);

    const toApprove = await screen.findByRole('button', { name: /^Waiting for approval/ });
    expect(toApprove).toHaveAttribute('aria-expanded', 'true');
    expect(toApprove).toHaveTextContent('2 payouts · 2 participants · $25.00');
    expect(screen.getByRole('button', { name: /^Waiting for the participant’s set-up/ })).toHaveTextContent(
      '6 payouts · 6 participants · $86.00',
    );
    expect(screen.getByRole('button', { name: /^Needs attention/ })).toHaveTextContent(
      '1 payout · 1 participant · $12.00',
    );
    expect(screen.queryByRole('group', { name: 'Show payouts by status' })).not.toBeInTheDocument();

    await userEvent.click(screen.getByRole('button', { name: /^Needs attention/ }));
    expect(await screen.findByRole('button', { name: 'Retry P-SVVMCF, Session 2: a new floor' })).toBeInTheDocument();
    expect(screen.getByText('The participant has not finished setting up payouts.')).toBeInTheDocument();
    expect(screen.queryByRole('checkbox', { name: /P-SVVMCF/ })).not.toBeInTheDocument();
  });

  it('asks before approving the selected rows, counting exactly who is paid now', async () => {
    const { requests } = stubApi({
      [`GET ${listPath}`]: listAnswer,
      [`POST ${approvePath}`]: { status: 200, body: { approved: 1, amountMinor: 1000, remainingMinor: 9000 } },
    });
    renderWithProviders(<PayoutQueue studyId={studyId} blinded canApprove conditions={[]} />);

    await userEvent.click(
      await screen.findByRole('checkbox', { name: 'Select P-JMU73A, Session 1: learning the building' }),
    );
    await userEvent.click(screen.getByRole('button', { name: 'Approve selected (1)' }));

    // The defect this guards: "Approve selected" once sent money with no confirmation.
    const dialog = await screen.findByRole('alertdialog', { name: 'Send $10.00 now?' });
    expect(requests.some((request) => request.path === approvePath)).toBe(false);
    expect(dialog).toHaveTextContent('1 payout to 1 participant who has set up how they get paid.');
    await userEvent.click(within(dialog).getByRole('button', { name: 'Send $10.00' }));

    expect(await screen.findByText(/Approved 1 payout \(\$10\.00\)/)).toBeInTheDocument();
    expect(requests.filter((request) => request.path === approvePath).map((request) => request.body)).toEqual([
      { payoutIds: [second.id] },
    ]);
  });

  it('says, before approving everything waiting, who is paid now and who waits for set-up', async () => {
    const { requests } = stubApi({
      [`GET ${listPath}`]: listAnswer,
      [`POST ${approvePath}`]: { status: 200, body: { approved: 2, amountMinor: 2500, remainingMinor: 0 } },
    });
    renderWithProviders(<PayoutQueue studyId={studyId} blinded canApprove conditions={[]} />);

    await userEvent.click(await screen.findByRole('button', { name: 'Approve all waiting (2)' }));
    const dialog = await screen.findByRole('alertdialog', { name: 'Send $25.00 now?' });
    // The defect this guards: the dialog once promised the whole owed sum to people who had not set up.
    expect(dialog).toHaveTextContent('2 payouts to 2 participants who have set up how they get paid.');
    expect(dialog).toHaveTextContent(
      'Not included: 6 payouts ($86.00) to 6 participants who have not finished setting up how they get paid.',
    );
    await userEvent.click(within(dialog).getByRole('button', { name: 'Send $25.00' }));

    await waitFor(() => expect(requests.some((request) => request.path === approvePath)).toBe(true));
    expect(
      (requests.find((request) => request.path === approvePath)?.body as { payoutIds: string[] }).payoutIds.sort(),
    ).toEqual([first.id, second.id].sort());
    // "All waiting" lists the to-approve group only, never the ones waiting for set-up.
    expect(
      requests
        .filter((request) => request.path === listPath && request.query.get('pageSize') === '500')
        .every((request) => request.query.get('stage') === 'to-approve'),
    ).toBe(true);
  });

  it('asks before retrying a failed payout', async () => {
    const { requests } = stubApi({
      [`GET ${listPath}`]: listAnswer,
      [`POST /api/payouts/${failed.id}/retry`]: { status: 200, body: { queued: true } },
    });
    renderWithProviders(<PayoutQueue studyId={studyId} blinded canApprove conditions={[]} />);
    await userEvent.click(await screen.findByRole('button', { name: /^Needs attention/ }));
    await userEvent.click(await screen.findByRole('button', { name: 'Retry P-SVVMCF, Session 2: a new floor' }));
    const dialog = await screen.findByRole('alertdialog', { name: 'Send $12.00 to P-SVVMCF again?' });
    expect(requests.some((request) => request.path.endsWith('/retry'))).toBe(false);
    await userEvent.click(within(dialog).getByRole('button', { name: 'Send again' }));
    await waitFor(() =>
      expect(requests.some((request) => request.path === `/api/payouts/${failed.id}/retry`)).toBe(true),
    );
  });

  it('says how much is missing when the funded balance does not cover the approval', async () => {
    stubApi({
      [`GET ${listPath}`]: listAnswer,
      [`POST ${approvePath}`]: {
        status: 409,
        body: {
          statusCode: 409,
          code: 'BALANCE_TOO_LOW',
          message: "Approving 1 payout(s) needs more than the study's funded balance. Fund the study first.",
          neededMinor: 1500,
          remainingMinor: 400,
        },
      },
    });
    renderWithProviders(<PayoutQueue studyId={studyId} blinded canApprove conditions={[]} />);

    await userEvent.click(
      await screen.findByRole('checkbox', { name: 'Select P-QBKST7, Session 3: finding rooms again' }),
    );
    await userEvent.click(screen.getByRole('button', { name: 'Approve selected (1)' }));
    await userEvent.click(within(await screen.findByRole('alertdialog')).getByRole('button', { name: 'Send $15.00' }));

    const refusal = await screen.findByText(/^Not enough funds/);
    expect(refusal).toHaveAttribute('role', 'alert');
    expect(refusal).toHaveTextContent(
      'Not enough funds: this needs $15.00 but only $4.00 of the funded balance is left. Add funds by card, then approve again.',
    );
    expect(screen.getByRole('button', { name: 'Approve selected (1)' })).toBeEnabled();
  });

  it('shows a participant’s payment history, with the provider’s transfer id for staff only there', async () => {
    stubApi({ [`GET ${listPath}`]: listAnswer });
    renderWithProviders(<PayoutQueue studyId={studyId} blinded canApprove conditions={[]} />);
    // Rows show dates; the provider's id is not in the queue itself.
    expect(await screen.findAllByText('Dec 1, 2026')).not.toHaveLength(0);
    expect(screen.queryByText('tr_1Hd83kQm2Ow9')).not.toBeInTheDocument();

    await userEvent.click(screen.getByRole('button', { name: 'Payment history of P-QBKST7' }));
    const dialog = await screen.findByRole('dialog', { name: 'Payments to P-QBKST7' });
    expect(await within(dialog).findByText('wayfinding-cues-0003')).toBeInTheDocument();
    expect(within(dialog).getByText('tr_1Hd83kQm2Ow9')).toBeInTheDocument();
    expect(dialog).toHaveTextContent(/Earned\s*\$25\.00/);
    expect(dialog).toHaveTextContent(/Paid\s*\$10\.00/);
  });

  it('flags a pay override with the caution about unequal pay, and hides approval from readers', async () => {
    stubApi({ [`GET ${listPath}`]: listAnswer });
    renderWithProviders(
      <PayoutQueue
        studyId={studyId}
        blinded={false}
        canApprove={false}
        conditions={[{ id: 'c1', label: 'map cues' }]}
      />,
    );

    expect(await screen.findByText('Pay override')).toBeInTheDocument();
    expect(screen.getByText(/Unequal pay between conditions can change who stays/)).toBeInTheDocument();
    expect(screen.getByRole('combobox', { name: 'Condition' })).toBeInTheDocument();
    expect(screen.queryByRole('button', { name: /Approve/ })).not.toBeInTheDocument();
    expect(screen.queryByRole('button', { name: /Retry/ })).not.toBeInTheDocument();
  });
});
