import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { stubApi } from '@/test/api-stub';
import { renderWithProviders } from '@/test/render-with-providers';
import { ReturnLinkPanel } from './return-link-panel';

const studyId = '43474abc-f2c2-4790-8e76-1092b9661cd1';
const setup = {
  returnAddressTemplate: 'http://127.0.0.1:5173/api/return/{token}',
  parameters: [
    { name: 'ref', meaning: "The participant's pseudonymous reference." },
    { name: 'token', meaning: 'The signed return token.' },
    { name: 'return', meaning: 'The whole return address, already filled in.' },
    { name: 'code', meaning: "This participant's code, for code steps." },
  ],
  keyId: 1,
  rotatedAt: null,
  graceDays: 14,
  validDays: 30,
};

function useClipboard(writeText: (text: string) => Promise<void>) {
  Object.defineProperty(navigator, 'clipboard', { value: { writeText }, configurable: true });
}

afterEach(() => {
  Reflect.deleteProperty(navigator, 'clipboard');
});

describe('ReturnLinkPanel', { timeout: 20_000 }, () => {
  it('shows the template and each parameter, and copies the template', async () => {
    stubApi({ [`GET /api/studies/${studyId}/steps/return-link`]: { status: 200, body: setup } });
    renderWithProviders(<ReturnLinkPanel studyId={studyId} canRotate />);

    const template = await screen.findByLabelText('Return address template');
    expect(template).toHaveValue(setup.returnAddressTemplate);
    const parameters = screen.getByLabelText('Parameters added to the task address');
    expect(
      within(parameters)
        .getAllByRole('term')
        .map((term) => term.textContent),
    ).toEqual(['ref', 'token', 'return', 'code']);

    const writeText = vi.fn(async () => {});
    useClipboard(writeText);
    await userEvent.click(screen.getByRole('button', { name: 'Copy the return address template' }));
    expect(writeText).toHaveBeenCalledWith(setup.returnAddressTemplate);
    expect(await screen.findByText('Copied')).toBeInTheDocument();
  });

  it('selects the template for copying by hand when the browser blocks the clipboard', async () => {
    stubApi({ [`GET /api/studies/${studyId}/steps/return-link`]: { status: 200, body: setup } });
    renderWithProviders(<ReturnLinkPanel studyId={studyId} canRotate={false} />);

    const template = (await screen.findByLabelText('Return address template')) as HTMLTextAreaElement;
    useClipboard(async () => {
      throw new DOMException('denied', 'NotAllowedError');
    });
    await userEvent.click(screen.getByRole('button', { name: 'Copy the return address template' }));
    expect(await screen.findByText(/the text is selected/)).toBeInTheDocument();
    expect(document.activeElement).toBe(template);
    expect(template.selectionStart).toBe(0);
    expect(template.selectionEnd).toBe(setup.returnAddressTemplate.length);
    expect(screen.queryByRole('button', { name: /Rotate the signing key/ })).not.toBeInTheDocument();
  });

  it('explains the grace period before rotating the key, then shows the new key', async () => {
    const { requests } = stubApi({
      [`GET /api/studies/${studyId}/steps/return-link`]: { status: 200, body: setup },
      [`POST /api/studies/${studyId}/steps/return-link/rotate-key`]: {
        status: 200,
        body: { ...setup, keyId: 2, rotatedAt: '2027-01-05T10:00:00.000Z' },
      },
    });
    renderWithProviders(<ReturnLinkPanel studyId={studyId} canRotate />);

    await userEvent.click(await screen.findByRole('button', { name: 'Rotate the signing key…' }));
    const dialog = await screen.findByRole('alertdialog');
    expect(dialog).toHaveTextContent('Links already handed out keep working for 14 days');
    expect(requests.filter((request) => request.method === 'POST')).toHaveLength(0);

    await userEvent.click(within(dialog).getByRole('button', { name: 'Rotate the key' }));
    expect(await screen.findByText(/New return links use key 2/)).toBeInTheDocument();
    await waitFor(() => expect(requests.some((request) => request.path.endsWith('/rotate-key'))).toBe(true));
  });
});
