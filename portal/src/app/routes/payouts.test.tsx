import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { SETUP_CHECK_INTERVAL_MS, SETUP_CHECKS } from '@/features/payouts/api/get-payout-account';
import type { MyPayouts } from '@/features/payouts/api/get-my-payouts';
import { leaveForExternalPage } from '@/lib/external-page';
import { installFakeApi, participant, problem } from '@/test/fake-api';
import { renderApp } from '@/test/render-app';

vi.mock('@/lib/external-page', async (importOriginal) => ({
  ...(await importOriginal<typeof import('@/lib/external-page')>()),
  leaveForExternalPage: vi.fn(),
}));

const none = { exists: false, payoutsEnabled: false, onboarding: 'none' as const };
const started = { exists: true, payoutsEnabled: false, onboarding: 'started' as const };
const ready = { exists: true, payoutsEnabled: true, onboarding: 'complete' as const };
const onboardingUrl = 'http://127.0.0.1:3200/onboarding/acctlink_demo_1';
const taxNote =
  'Payments for taking part in research can count as income. Rules differ by country; if you are unsure, ask a tax adviser.';
const year = new Date().getUTCFullYear();

// Invented demo payments, one of each status a participant meets.
const payouts: MyPayouts = {
  items: [
    {
      id: 'p6',
      studyTitle: 'Wayfinding cues',
      stepTitle: 'Session 1: learning the building',
      kind: 'step',
      amountMinor: 1000,
      currency: 'USD',
      status: 'reversed',
      createdAt: '2026-02-01T10:00:00.000Z',
      paidAt: null,
      receipt: null,
    },
    {
      id: 'p5',
      studyTitle: 'Wayfinding cues',
      stepTitle: null,
      kind: 'bonus',
      amountMinor: 500,
      currency: 'USD',
      status: 'failed',
      createdAt: '2026-02-12T10:00:00.000Z',
      paidAt: null,
      receipt: null,
    },
    {
      id: 'p4',
      studyTitle: 'Wayfinding cues',
      stepTitle: 'Session 3: finding rooms again',
      kind: 'step',
      amountMinor: 1500,
      currency: 'USD',
      status: 'approved',
      createdAt: '2026-02-12T09:00:00.000Z',
      paidAt: null,
      receipt: null,
    },
    {
      id: 'p3',
      studyTitle: 'Wayfinding cues',
      stepTitle: 'Session 2: finding rooms',
      kind: 'step',
      amountMinor: 1200,
      currency: 'USD',
      status: 'owed',
      createdAt: '2026-02-05T09:00:00.000Z',
      paidAt: null,
      receipt: null,
    },
    {
      id: 'p2',
      studyTitle: 'Checkout flows',
      stepTitle: 'First checkout',
      kind: 'step',
      amountMinor: 99_950,
      currency: 'USD',
      status: 'owed',
      createdAt: '2026-02-04T09:00:00.000Z',
      paidAt: null,
      receipt: null,
    },
    {
      id: 'p1',
      studyTitle: 'Wayfinding cues',
      stepTitle: 'Session 1: learning the building',
      kind: 'step',
      amountMinor: 1000,
      currency: 'USD',
      status: 'paid',
      createdAt: '2026-02-01T10:00:00.000Z',
      paidAt: '2026-02-03T15:00:00.000Z',
      receipt: 'wayfinding-cues-0001',
    },
  ],
  account: ready,
  paidThisYearMinor: { USD: 1000 },
  pendingMinor: { USD: 103_150 },
  taxNote,
};
const noPayouts: MyPayouts = { items: [], account: none, paidThisYearMinor: {}, pendingMinor: {}, taxNote };

function atPayouts(handlers: Parameters<typeof installFakeApi>[0] = {}) {
  return installFakeApi({
    'GET /api/auth/me': { status: 200, body: participant },
    'GET /api/me/payout-account': { status: 200, body: none },
    'GET /api/me/payouts': { status: 200, body: noPayouts },
    'POST /api/me/payout-account': { status: 200, body: { url: onboardingUrl, account: started } },
    ...handlers,
  });
}

const setupPanel = async () =>
  within(await screen.findByRole('region', { name: 'How you get paid' }, { timeout: 8_000 }));

beforeEach(() => vi.mocked(leaveForExternalPage).mockClear());
afterEach(() => vi.useRealTimers());

describe('getting paid: the payout setup', () => {
  it('offers to set up payouts for someone who has not, and sends them to the payment service’s page', async () => {
    const user = userEvent.setup();
    const fakeApi = atPayouts();
    renderApp('/payouts');

    const panel = await setupPanel();
    expect(panel.getByText('Not set up yet')).toBeInTheDocument();
    await user.click(panel.getByRole('button', { name: 'Set up how you get paid' }));

    await waitFor(() => expect(leaveForExternalPage).toHaveBeenCalledWith(onboardingUrl));
    expect(fakeApi.callsTo('POST', '/api/me/payout-account')).toHaveLength(1);
    // Stays busy while the browser leaves, so a second tap cannot ask for a second link.
    expect(panel.getByRole('button', { name: 'Opening the payment service…' })).toBeDisabled();
  });

  it('asks someone who started to finish', async () => {
    atPayouts({ 'GET /api/me/payout-account': { status: 200, body: started } });
    renderApp('/payouts');

    const panel = await setupPanel();
    expect(panel.getByText('Not finished')).toBeInTheDocument();
    expect(panel.getByRole('button', { name: 'Continue setting up' })).toBeEnabled();
  });

  it('shows a finished setup as set up, with nothing left to do', async () => {
    atPayouts({ 'GET /api/me/payout-account': { status: 200, body: ready } });
    renderApp('/payouts');

    const panel = await setupPanel();
    expect(panel.getByText('Set up')).toBeInTheDocument();
    expect(panel.getByText(/Your pay goes to the bank account you gave the payment service/)).toBeInTheDocument();
    expect(panel.queryByRole('button')).not.toBeInTheDocument();
    expect(screen.queryByText('You’re set up')).not.toBeInTheDocument();
  });

  it('tells someone whose details the payment service is still checking that nothing is needed from them', async () => {
    atPayouts({ 'GET /api/me/payout-account': { status: 200, body: { ...started, onboarding: 'complete' } } });
    renderApp('/payouts');

    const panel = await setupPanel();
    expect(panel.getByText('Being checked')).toBeInTheDocument();
    expect(panel.getByText(/you do not need to do anything/)).toBeInTheDocument();
  });

  it('coming back from the payment service, checks again until payouts are enabled, then says so', async () => {
    const fakeApi = atPayouts({
      'GET /api/me/payout-account': (_request, callNumber) => ({
        status: 200,
        body: callNumber === 1 ? started : ready,
      }),
    });
    renderApp('/payouts?onboarding=done');

    expect(
      await screen.findByText(/Checking your setup with the payment service/, {}, { timeout: 8_000 }),
    ).toBeInTheDocument();
    expect(
      await screen.findByText('You’re set up', {}, { timeout: SETUP_CHECK_INTERVAL_MS + 3_000 }),
    ).toBeInTheDocument();
    expect(fakeApi.callsTo('GET', '/api/me/payout-account').length).toBeGreaterThanOrEqual(2);
    expect((await setupPanel()).getByText('Set up')).toBeInTheDocument();
  });

  it('stops checking after a few tries and offers to continue the setup', async () => {
    vi.useFakeTimers({ shouldAdvanceTime: true });
    const fakeApi = atPayouts({ 'GET /api/me/payout-account': { status: 200, body: started } });
    renderApp('/payouts?onboarding=done');

    await screen.findByText(/Checking your setup with the payment service/, {}, { timeout: 8_000 });
    await vi.advanceTimersByTimeAsync(SETUP_CHECK_INTERVAL_MS * (SETUP_CHECKS + 2));

    const panel = await setupPanel();
    expect(await panel.findByRole('button', { name: 'Continue setting up' })).toBeInTheDocument();
    expect(fakeApi.callsTo('GET', '/api/me/payout-account')).toHaveLength(SETUP_CHECKS);
  });

  it('offers a fresh link when the last one expired', async () => {
    const user = userEvent.setup();
    const fakeApi = atPayouts({ 'GET /api/me/payout-account': { status: 200, body: started } });
    renderApp('/payouts?onboarding=expired');

    const panel = await setupPanel();
    expect(panel.getByText('That setup link has expired')).toBeInTheDocument();
    await user.click(panel.getByRole('button', { name: 'Get a new setup link' }));

    await waitFor(() => expect(leaveForExternalPage).toHaveBeenCalledWith(onboardingUrl));
    expect(fakeApi.callsTo('POST', '/api/me/payout-account')).toHaveLength(1);
  });

  it('says so when the payment service cannot be reached, and does not leave the page', async () => {
    const user = userEvent.setup();
    atPayouts({
      'POST /api/me/payout-account': problem(502, 'PROVIDER_UNAVAILABLE', 'Payment provider did not answer'),
    });
    renderApp('/payouts');

    await user.click((await setupPanel()).getByRole('button', { name: 'Set up how you get paid' }));

    const alert = await screen.findByRole('alert');
    expect(alert).toHaveTextContent('We could not open the payment service');
    expect(alert).toHaveTextContent('Something went wrong on our side. Please try again in a moment.');
    expect(leaveForExternalPage).not.toHaveBeenCalled();
  });

  it('refuses to follow a setup link that is not a web address', async () => {
    const user = userEvent.setup();
    atPayouts({
      'POST /api/me/payout-account': { status: 200, body: { url: 'javascript:alert(1)', account: started } },
    });
    renderApp('/payouts');

    await user.click((await setupPanel()).getByRole('button', { name: 'Set up how you get paid' }));

    expect(await screen.findByText('We could not open the payment service')).toBeInTheDocument();
    expect(leaveForExternalPage).not.toHaveBeenCalled();
  });
});

describe('getting paid: the payments', () => {
  it('adds up what is owed, on its way and paid, in dollars and cents', async () => {
    atPayouts({ 'GET /api/me/payouts': { status: 200, body: payouts } });
    renderApp('/payouts');

    const pay = within(await screen.findByRole('region', { name: 'Your pay' }, { timeout: 8_000 }));
    // owed 1,200 + 99,950; on its way: approved 1,500 + failed 500; paid 1,000; the returned one counts nowhere.
    expect(pay.getByText('Owed to you').nextElementSibling).toHaveTextContent('$1,011.50');
    expect(pay.getByText('On its way').nextElementSibling).toHaveTextContent('$20.00');
    expect(pay.getByText('Paid to you').nextElementSibling).toHaveTextContent('$10.00');
  });

  it('lists every payment with its status, date and, once paid, the receipt number', async () => {
    atPayouts({ 'GET /api/me/payouts': { status: 200, body: payouts } });
    renderApp('/payouts');

    const list = await screen.findByRole('list', { name: 'Payments' }, { timeout: 8_000 });
    const rows = within(list).getAllByRole('listitem');
    expect(rows).toHaveLength(6);
    const paid = within(rows[5]!);
    expect(paid.getByText('Session 1: learning the building')).toBeInTheDocument();
    expect(paid.getByText('Paid')).toBeInTheDocument();
    expect(paid.getByText('Paid on February 3, 2026')).toBeInTheDocument();
    expect(paid.getByText('wayfinding-cues-0001').parentElement).toHaveTextContent(
      'Receipt number wayfinding-cues-0001',
    );
    expect(within(rows[3]!).getByText('Waiting for approval')).toBeInTheDocument();
    expect(within(rows[3]!).getByText('$12.00')).toBeInTheDocument();
    expect(within(rows[4]!).getByText('$999.50')).toBeInTheDocument();
    expect(within(rows[1]!).getByText('Completion bonus')).toBeInTheDocument();
    expect(within(rows[1]!).getByText('Delayed')).toBeInTheDocument();
    expect(within(rows[0]!).getByText('Returned')).toBeInTheDocument();
    expect(within(rows[0]!).queryByText(/Receipt number/)).not.toBeInTheDocument();
  });

  it('shows the year’s paid total with the tax note and the finance-office caution', async () => {
    atPayouts({ 'GET /api/me/payouts': { status: 200, body: payouts } });
    renderApp('/payouts');

    const thisYear = within(await screen.findByRole('region', { name: 'This year' }, { timeout: 8_000 }));
    expect(thisYear.getByText(`Paid to you in ${year}`).nextElementSibling).toHaveTextContent('$10.00');
    expect(thisYear.getByText(taxNote)).toBeInTheDocument();
    expect(thisYear.getByText(/finance office decides how your payments are made and reported/)).toBeInTheDocument();
  });

  it('says plainly when there are no payments yet', async () => {
    atPayouts();
    renderApp('/payouts');

    expect(await screen.findByText('No payments yet', {}, { timeout: 8_000 })).toBeInTheDocument();
    expect(screen.getByRole('link', { name: 'Go to your studies' })).toHaveAttribute('href', '/studies');
    expect(screen.getByText(`Paid to you in ${year}`).nextElementSibling).toHaveTextContent('Nothing yet');
    expect(screen.queryByRole('list', { name: 'Payments' })).not.toBeInTheDocument();
  });

  it('shows an error with a way to try again when the payments cannot be loaded', async () => {
    const user = userEvent.setup();
    atPayouts({
      'GET /api/me/payouts': (_request, callNumber) =>
        callNumber === 1 ? problem(503, 'INTERNAL', 'Database unavailable') : { status: 200, body: payouts },
    });
    renderApp('/payouts');

    expect(await screen.findByText('We could not load your payments', {}, { timeout: 8_000 })).toBeInTheDocument();
    await user.click(screen.getByRole('button', { name: 'Try again' }));
    expect(await screen.findByRole('list', { name: 'Payments' })).toBeInTheDocument();
  });

  it('is one of the two places in the signed-in navigation, marked as the current one', async () => {
    atPayouts();
    renderApp('/payouts');

    const navigation = within(await screen.findByRole('navigation', { name: 'Your account' }, { timeout: 8_000 }));
    expect(navigation.getByRole('link', { name: 'Getting paid' })).toHaveAttribute('aria-current', 'page');
    expect(navigation.getByRole('link', { name: 'Your studies' })).toHaveAttribute('href', '/studies');
    expect(navigation.getByRole('link', { name: 'Your studies' })).not.toHaveAttribute('aria-current');
  });
});
