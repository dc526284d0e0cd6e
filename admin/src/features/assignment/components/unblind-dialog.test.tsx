import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it, vi } from 'vitest';
import { stubApi } from '@/test/api-stub';
import { renderWithProviders } from '@/test/render-with-providers';
import { UnblindDialog } from './unblind-dialog';

const studyId = '8da5576c-4820-4de3-867c-b951081f13b2';
const unblindPath = `POST /api/studies/${studyId}/unblind`;
const unblinded = {
  method: 'stratified-blocks',
  settings: { blockSizes: [3, 6] },
  commitment: 'cfd28da421c67e5e342021be7b6173aa1a19c42cee28817e4b208c3887a6480b',
  committedAt: '2026-12-01T19:45:15.720Z',
  sealedParameters: {},
  seed: '4f1c2a7b9e0d3c5a8b6f4e2d1c0b9a8f7e6d5c4b3a291807f6e5d4c3b2a19080',
  seedRevealedAt: '2027-02-01T09:00:00.000Z',
  unblindedAt: '2027-02-01T09:00:00.000Z',
  unblindReason: 'Data collection finished; analysis plan registered.',
  allocated: 45,
  balance: [],
  pretestNote: '',
};

const reason = () => screen.getByLabelText('Reason');
const confirmBox = () => screen.getByRole('checkbox', { name: /reveals every assignment/ });
const submit = () => userEvent.click(screen.getByRole('button', { name: 'Unblind and reveal the seed' }));

describe('UnblindDialog', () => {
  it('says what unblinding reveals before anything is sent', async () => {
    const { requests } = stubApi({});
    renderWithProviders(<UnblindDialog studyId={studyId} open onClose={vi.fn()} onUnblinded={vi.fn()} />);

    expect(await screen.findByText('Unblind this study?')).toBeInTheDocument();
    expect(screen.getByRole('alertdialog')).toHaveAccessibleDescription(/secret seed is revealed/);
    expect(requests).toHaveLength(0);
  });

  it('needs a reason of at least 10 characters and the confirmation', async () => {
    const { requests } = stubApi({});
    renderWithProviders(<UnblindDialog studyId={studyId} open onClose={vi.fn()} onUnblinded={vi.fn()} />);

    await userEvent.type(await screen.findByLabelText('Reason'), 'too short');
    await submit();

    expect(await screen.findByText(/at least 10 characters/)).toBeInTheDocument();
    expect(screen.getByText('Tick the box to confirm you understand what unblinding reveals.')).toBeInTheDocument();
    expect(reason()).toHaveAttribute('aria-invalid', 'true');
    expect(requests).toHaveLength(0);
  });

  it('posts the trimmed reason once confirmed and reports success', async () => {
    const { requests } = stubApi({ [unblindPath]: { status: 200, body: unblinded } });
    const onUnblinded = vi.fn();
    renderWithProviders(<UnblindDialog studyId={studyId} open onClose={vi.fn()} onUnblinded={onUnblinded} />);

    await userEvent.type(
      await screen.findByLabelText('Reason'),
      '  Data collection finished; analysis plan registered.  ',
    );
    await userEvent.click(confirmBox());
    await submit();

    await waitFor(() => expect(onUnblinded).toHaveBeenCalled());
    expect(requests).toEqual([
      expect.objectContaining({
        method: 'POST',
        path: `/api/studies/${studyId}/unblind`,
        body: { reason: 'Data collection finished; analysis plan registered.' },
      }),
    ]);
  });

  it('shows the api’s 409 inside the dialog and stays open', async () => {
    stubApi({
      [unblindPath]: {
        status: 409,
        body: { statusCode: 409, code: 'ALREADY_UNBLINDED', message: 'This study has already been unblinded.' },
      },
    });
    const onUnblinded = vi.fn();
    renderWithProviders(<UnblindDialog studyId={studyId} open onClose={vi.fn()} onUnblinded={onUnblinded} />);

    await userEvent.type(await screen.findByLabelText('Reason'), 'Safety review asked for the allocation.');
    await userEvent.click(confirmBox());
    await submit();

    expect(await screen.findByText('This study has already been unblinded.')).toBeInTheDocument();
    expect(screen.getByText('Unblind this study?')).toBeInTheDocument();
    expect(onUnblinded).not.toHaveBeenCalled();
  });

  it('sends nothing when cancelled', async () => {
    const { requests } = stubApi({});
    const onClose = vi.fn();
    renderWithProviders(<UnblindDialog studyId={studyId} open onClose={onClose} onUnblinded={vi.fn()} />);

    await userEvent.click(await screen.findByRole('button', { name: 'Cancel' }));
    expect(onClose).toHaveBeenCalled();
    expect(requests).toHaveLength(0);
  });
});
