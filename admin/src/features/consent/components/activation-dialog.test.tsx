import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it, vi } from 'vitest';
import { stubApi } from '@/test/api-stub';
import { renderWithProviders } from '@/test/render-with-providers';
import { draftVersion, studyId } from '../test/consent-fixtures';
import { ActivationDialog } from './activation-dialog';

const version = draftVersion();
const activatePath = `/api/studies/${studyId}/consent-versions/${version.id}/activate`;

function renderDialog(props: Partial<React.ComponentProps<typeof ActivationDialog>> = {}) {
  const handlers = { onClose: vi.fn(), onActivated: vi.fn() };
  renderWithProviders(
    <ActivationDialog studyId={studyId} version={version} activeVersionNumber={2} open {...handlers} {...props} />,
  );
  return handlers;
}

describe('ActivationDialog', { timeout: 15_000 }, () => {
  it('explains that activation fixes the text, retires the previous version and asks everyone to sign again', async () => {
    const { requests } = stubApi({});
    renderDialog();

    expect(await screen.findByText('Activate version 3?')).toBeInTheDocument();
    expect(screen.getByText('The text is fixed.')).toBeInTheDocument();
    expect(screen.getByText(/SHA-256 fingerprint is computed now/)).toBeInTheDocument();
    expect(screen.getByText('Version 2 is retired.')).toBeInTheDocument();
    expect(screen.getByText('Everyone enrolled is asked to sign again.')).toBeInTheDocument();
    expect(screen.getByText('HLREB-2026-031-A2')).toBeInTheDocument();
    expect(requests).toHaveLength(0);
  });

  it('says consent opens, and asks no one to re-sign, when no version is active yet', async () => {
    stubApi({});
    renderDialog({ activeVersionNumber: null });

    expect(await screen.findByText('Consent opens.')).toBeInTheDocument();
    expect(screen.queryByText('Everyone enrolled is asked to sign again.')).not.toBeInTheDocument();
  });

  it('activates on confirmation and hands back the active version', async () => {
    const active = {
      ...version,
      status: 'active',
      fingerprint: 'e5b32837e18bc7456919aac1f4c156c4ce23110ee631096b85d4f44fb295094a',
    };
    const { requests } = stubApi({ [`POST ${activatePath}`]: { status: 200, body: active } });
    const { onActivated } = renderDialog();

    await userEvent.click(await screen.findByRole('button', { name: 'Activate version 3' }));

    await waitFor(() => expect(onActivated).toHaveBeenCalledWith(active));
    expect(requests).toEqual([expect.objectContaining({ method: 'POST', path: activatePath })]);
  });

  it('shows the api’s 409 with each field it names, and stays open', async () => {
    stubApi({
      [`POST ${activatePath}`]: {
        status: 409,
        body: {
          statusCode: 409,
          code: 'CONSENT_VERSION_NOT_READY',
          message: 'The version is not ready to activate.',
          errors: [
            { field: 'approvedAt', message: 'the approval date is required' },
            { field: 'letter', message: 'upload the approval letter (PDF) first' },
          ],
        },
      },
    });
    const { onActivated } = renderDialog();

    await userEvent.click(await screen.findByRole('button', { name: 'Activate version 3' }));

    const alert = await screen.findByRole('alert');
    expect(alert).toHaveTextContent('The version is not ready to activate.');
    expect(alert).toHaveTextContent('Approval date: the approval date is required');
    expect(alert).toHaveTextContent('Approval letter: upload the approval letter (PDF) first');
    expect(screen.getByText('Activate version 3?')).toBeInTheDocument();
    expect(onActivated).not.toHaveBeenCalled();
  });

  it('sends nothing when cancelled', async () => {
    const { requests } = stubApi({});
    const { onClose } = renderDialog();

    await userEvent.click(await screen.findByRole('button', { name: 'Cancel' }));

    expect(onClose).toHaveBeenCalled();
    expect(requests).toHaveLength(0);
  });
});
