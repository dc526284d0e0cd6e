import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { installFakeApi, participant } from '@/test/fake-api';
import { pdfBytes, publicStudy, signedEnrollment, studyId } from '@/test/participant-fixtures';
import { renderApp } from '@/test/render-app';

const withdrawPath = `/api/studies/${studyId}/enrollments/me/withdraw`;
const earned = { earnedMinor: 1250, paidMinor: 500, stillToBePaidMinor: 750 };
const afterFirstStep = signedEnrollment({
  status: 'active',
  earned,
  steps: signedEnrollment().steps.map((step, index) => ({
    ...step,
    status: index === 0 ? 'done' : index === 1 ? 'open' : 'locked',
    completedAt: index === 0 ? '2026-02-05T10:00:00.000Z' : null,
    hasCompletionCode: true,
  })),
});
const withdrawn = {
  status: 200,
  body: {
    withdrewAt: '2026-02-09T16:30:00.000Z',
    earnedMinor: 1250,
    stillToBePaidMinor: 750,
    enrollment: { ...afterFirstStep, status: 'withdrew', next: 'withdrawn', withdrewAt: '2026-02-09T16:30:00.000Z' },
  },
};

function atSteps(handlers: Parameters<typeof installFakeApi>[0] = {}) {
  return installFakeApi({
    'GET /api/auth/me': { status: 200, body: participant },
    'GET /api/public/studies/wayfinding-cues': { status: 200, body: publicStudy },
    [`GET /api/studies/${studyId}/enrollments/me`]: { status: 200, body: afterFirstStep },
    [`GET /api/studies/${studyId}/enrollments/me/consent.pdf`]: {
      status: 200,
      raw: { bytes: pdfBytes, contentType: 'application/pdf' },
    },
    [`POST ${withdrawPath}`]: withdrawn,
    'GET /api/studies': { status: 200, body: { items: [] } },
    ...handlers,
  });
}

async function openWithdrawDialog() {
  const user = userEvent.setup();
  renderApp('/s/wayfinding-cues');
  await user.click(await screen.findByRole('button', { name: 'Stop taking part' }, { timeout: 3_000 }));
  const dialog = await screen.findByRole('dialog', { name: 'Stop taking part?' });
  return { user, dialog };
}

describe('withdrawing from a study', () => {
  it('shows what has been earned, paid and is still to be paid before anything is sent', async () => {
    const fakeApi = atSteps();
    const { dialog } = await openWithdrawDialog();

    const amounts = within(dialog);
    expect(amounts.getByText('Earned so far').nextElementSibling).toHaveTextContent('$12.50');
    expect(amounts.getByText('Already paid to you').nextElementSibling).toHaveTextContent('$5.00');
    expect(amounts.getByText('Still to be paid to you').nextElementSibling).toHaveTextContent('$7.50');
    expect(amounts.getByText(/stays on record/)).toBeInTheDocument();
    expect(amounts.getByText(/We will send you an e-mail to confirm\./)).toBeInTheDocument();
    // Focus starts on the dialog itself (named by its title), not on a button further down.
    await waitFor(() => expect(dialog).toHaveFocus());
    expect(fakeApi.callsTo('POST', withdrawPath)).toHaveLength(0);
  });

  it('keeps them in the study when they change their mind', async () => {
    const fakeApi = atSteps();
    const { user } = await openWithdrawDialog();

    await user.click(screen.getByRole('button', { name: 'No, keep taking part' }));

    await waitFor(() => expect(screen.queryByRole('dialog')).not.toBeInTheDocument());
    expect(screen.getByRole('heading', { name: 'Your steps' })).toBeInTheDocument();
    expect(fakeApi.callsTo('POST', withdrawPath)).toHaveLength(0);
  });

  it('sends the reason they gave and confirms, with the amounts', async () => {
    const fakeApi = atSteps();
    const { user } = await openWithdrawDialog();

    await user.type(screen.getByLabelText('Would you like to tell us why? (optional)'), '  Moving to another city. ');
    await user.click(screen.getByRole('button', { name: 'Yes, stop taking part' }));

    expect(await screen.findByRole('heading', { name: 'You have stopped taking part' })).toHaveFocus();
    expect(fakeApi.callsTo('POST', withdrawPath).map((request) => request.body)).toEqual([
      { reason: 'Moving to another city.' },
    ]);
    expect(screen.getByText('You earned').nextElementSibling).toHaveTextContent('$12.50');
    expect(screen.getByText('Still to be paid to you').nextElementSibling).toHaveTextContent('$7.50');
    expect(screen.getByText(/We have sent you an e-mail to confirm/)).toBeInTheDocument();
    expect(screen.queryByRole('button', { name: 'Stop taking part' })).not.toBeInTheDocument();
  });

  it('sends no reason when none is given', async () => {
    const fakeApi = atSteps();
    const { user } = await openWithdrawDialog();

    await user.click(screen.getByRole('button', { name: 'Yes, stop taking part' }));

    await screen.findByRole('heading', { name: 'You have stopped taking part' });
    expect(fakeApi.callsTo('POST', withdrawPath).map((request) => request.body)).toEqual([{}]);
  });

  it('refuses a reason over 1000 characters and sends nothing', async () => {
    const fakeApi = atSteps();
    const { user } = await openWithdrawDialog();

    await user.click(screen.getByLabelText('Would you like to tell us why? (optional)'));
    await user.paste('a'.repeat(1001));
    await user.click(screen.getByRole('button', { name: 'Yes, stop taking part' }));

    expect(await screen.findByText('Please keep your reason to 1000 characters or fewer.')).toBeInTheDocument();
    expect(fakeApi.callsTo('POST', withdrawPath)).toHaveLength(0);
  });

  it('says plainly when it did not work, and that they are still taking part', async () => {
    atSteps({
      [`POST ${withdrawPath}`]: { status: 500, body: { statusCode: 500, code: 'INTERNAL', message: 'Internal error' } },
    });
    const { user, dialog } = await openWithdrawDialog();

    await user.click(within(dialog).getByRole('button', { name: 'Yes, stop taking part' }));

    expect(await within(dialog).findByText('We could not stop your participation')).toBeInTheDocument();
    expect(within(dialog).getByText(/You are still taking part\./)).toBeInTheDocument();
  });

  it('counts the characters left, says by how many a reason is over the limit, and says so on leaving the field', async () => {
    const fakeApi = atSteps();
    const { user } = await openWithdrawDialog();
    const field = screen.getByLabelText('Would you like to tell us why? (optional)');
    expect(field).toHaveAccessibleDescription(/Up to 1000 characters; 1000 characters left\./);

    await user.click(field);
    await user.paste('a'.repeat(1200));
    expect(field).toHaveAccessibleDescription(/200 characters too many\./);
    expect(field).not.toHaveAccessibleDescription(/\b0 left/);

    await user.tab();
    expect(await screen.findByText('Please keep your reason to 1000 characters or fewer.')).toBeInTheDocument();
    expect(fakeApi.callsTo('POST', withdrawPath)).toHaveLength(0);
  });
});
