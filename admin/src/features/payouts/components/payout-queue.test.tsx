import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { stubApi } from '@/test/api-stub';
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
  providerTransferId: null,
  payoutAccountReady: false,
  createdAt: '2026-12-01T16:49:41.868Z',
  approvedAt: null,
  paidAt: null,
};
const first = { ...base, id: 'fe715aac-2dc1-4ddb-8130-67daeec77106', reference: 'P-QBKST7', stepTitle: 'Session 3: finding rooms again', amountMinor: 1500, status: 'owed' };
const second = { ...base, id: '6bba9194-c85b-4fec-8e29-5adc57cb4aa7', reference: 'P-JMU73A', stepTitle: 'Session 1: learning the building', amountMinor: 1000, status: 'owed', payOverride: true };
const failed = {
  ...base,
  id: 'a37aa586-e95f-4886-89a3-0a2ceb4828c9',
  reference: 'P-SVVMCF',
  stepTitle: 'Session 2: a new floor',
  amountMinor: 1200,
  status: 'failed',
  failureReason: 'The participant has not finished setting up payouts.',
};
const listAnswer = {
  status: 200,
  body: { items: [first, second, failed], total: 3, page: 1, pageSize: 50, countsByStatus: { owed: 2, failed: 1 }, amountByStatus: { owed: 2500, failed: 1200 } },
};

describe('PayoutQueue', { timeout: 15_000 }, () => {
  it('approves only the rows that were ticked', async () => {
    const { requests } = stubApi({ [`GET ${listPath}`]: listAnswer, [`POST ${approvePath}`]: { status: 200, body: { approved: 1, amountMinor: 1000, remainingMinor: 9000 } } });
    renderWithProviders(<PayoutQueue studyId={studyId} blinded canApprove conditions={[]} />);

    expect(await screen.findByRole('button', { name: 'Retry P-SVVMCF, Session 2: a new floor' })).toBeInTheDocument();
    expect(screen.getByRole('button', { name: 'Approve selected (0)' })).toBeDisabled();
    // A failed payout cannot be approved again, only retried.
    expect(screen.queryByRole('checkbox', { name: /P-SVVMCF/ })).not.toBeInTheDocument();
    expect(screen.getByRole('button', { name: 'Retry P-SVVMCF, Session 2: a new floor' })).toBeInTheDocument();
    expect(screen.getByText('The participant has not finished setting up payouts.')).toBeInTheDocument();

    await userEvent.click(screen.getByRole('checkbox', { name: 'Select P-JMU73A, Session 1: learning the building' }));
    await userEvent.click(screen.getByRole('button', { name: 'Approve selected (1)' }));

    expect(await screen.findByText(/Approved 1 payout \(\$10\.00\)/)).toBeInTheDocument();
    expect(requests.filter((request) => request.path === approvePath).map((request) => request.body)).toEqual([{ payoutIds: [second.id] }]);
  });

  it('selects every owed payout on the page from the header box', async () => {
    const { requests } = stubApi({ [`GET ${listPath}`]: listAnswer, [`POST ${approvePath}`]: { status: 200, body: { approved: 2, amountMinor: 2500, remainingMinor: 0 } } });
    renderWithProviders(<PayoutQueue studyId={studyId} blinded canApprove conditions={[]} />);

    await userEvent.click(await screen.findByRole('checkbox', { name: 'Select every owed payout on this page' }));
    await userEvent.click(screen.getByRole('button', { name: 'Approve selected (2)' }));

    await waitFor(() => expect(requests.some((request) => request.path === approvePath)).toBe(true));
    expect((requests.find((request) => request.path === approvePath)?.body as { payoutIds: string[] }).payoutIds.sort()).toEqual([first.id, second.id].sort());
  });

  it('says how much is missing when the funded balance does not cover the approval', async () => {
    stubApi({
      [`GET ${listPath}`]: listAnswer,
      [`POST ${approvePath}`]: {
        status: 409,
        body: { statusCode: 409, code: 'CONFLICT', message: "Approving 1 payout(s) needs more than the study's funded balance. Fund the study first.", neededMinor: 1500, remainingMinor: 400 },
      },
    });
    renderWithProviders(<PayoutQueue studyId={studyId} blinded canApprove conditions={[]} />);

    await userEvent.click(await screen.findByRole('checkbox', { name: 'Select P-QBKST7, Session 3: finding rooms again' }));
    await userEvent.click(screen.getByRole('button', { name: 'Approve selected (1)' }));

    const refusal = await screen.findByText(/^Not enough funds/);
    expect(refusal).toHaveAttribute('role', 'alert');
    expect(refusal).toHaveTextContent('Not enough funds: this needs $15.00 but only $4.00 of the funded balance is left. Add funds by card, then approve again.');
    // Nothing was approved, so the selection stays for another try once the study is funded.
    expect(screen.getByRole('button', { name: 'Approve selected (1)' })).toBeEnabled();
  });

  it('flags a pay override with the caution about unequal pay, and hides approval from readers', async () => {
    stubApi({ [`GET ${listPath}`]: listAnswer });
    renderWithProviders(<PayoutQueue studyId={studyId} blinded={false} canApprove={false} conditions={[{ id: 'c1', label: 'map cues' }]} />);

    expect(await screen.findByText('Pay override')).toBeInTheDocument();
    expect(screen.getByText(/Unequal pay between conditions can change who stays/)).toBeInTheDocument();
    expect(screen.getByRole('combobox', { name: 'Condition' })).toBeInTheDocument();
    expect(screen.queryByRole('button', { name: /Approve/ })).not.toBeInTheDocument();
    expect(screen.queryByRole('button', { name: /Retry/ })).not.toBeInTheDocument();
  });
});
