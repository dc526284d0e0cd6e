import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it, vi } from 'vitest';
import { stubApi } from '@/test/api-stub';
import { renderWithProviders } from '@/test/render-with-providers';
import { consentTemplate, draftBody, draftVersion, failingCheck, studyId } from '../test/consent-fixtures';
import { DraftEditor } from './draft-editor';

const version = draftVersion({ approvalLetter: null });
const versionPath = `/api/studies/${studyId}/consent-versions/${version.id}`;

describe('DraftEditor', { timeout: 15_000 }, () => {
  it('runs the check and moves the caret to the line a finding names', async () => {
    const { requests } = stubApi({ [`POST ${versionPath}/check`]: { status: 200, body: failingCheck } });
    renderWithProviders(
      <DraftEditor studyId={studyId} version={version} activeVersionNumber={2} onActivated={vi.fn()} />,
    );

    await userEvent.click(screen.getByRole('button', { name: 'Run the check' }));
    await userEvent.click(await screen.findByRole('button', { name: /Go to line 8/ }));

    const textarea = screen.getByLabelText('Form text (Markdown)') as HTMLTextAreaElement;
    expect(textarea).toHaveFocus();
    const line8 = 'The study is run by [to fill: institution].';
    expect(textarea.value.slice(textarea.selectionStart, textarea.selectionEnd)).toBe(line8);
    expect(textarea.selectionStart).toBe(draftBody.indexOf(line8));
    expect(requests.map((request) => request.path)).toEqual([`${versionPath}/check`]);
  });

  it('saves edited text first when the check is asked for, and sends the whole body', async () => {
    const edited = `${draftBody}\n\n## Possible risks and discomforts\nNone beyond everyday computer use.`;
    const { requests } = stubApi({
      [`PATCH ${versionPath}`]: ({ body }) => ({
        status: 200,
        body: { ...version, body: (body as { body: string }).body },
      }),
      [`POST ${versionPath}/check`]: { status: 200, body: { passes: true, findings: [], required: [], optional: [] } },
    });
    renderWithProviders(
      <DraftEditor studyId={studyId} version={version} activeVersionNumber={2} onActivated={vi.fn()} />,
    );

    const textarea = screen.getByLabelText('Form text (Markdown)');
    await userEvent.click(textarea);
    await userEvent.keyboard('{Control>}{End}{/Control}');
    await userEvent.paste('\n\n## Possible risks and discomforts\nNone beyond everyday computer use.');
    expect(screen.getByText('Unsaved changes')).toBeInTheDocument();
    await userEvent.click(screen.getByRole('button', { name: 'Save and run the check' }));

    expect(
      await screen.findByText('Every required element is present, and no placeholder is left to fill.'),
    ).toBeInTheDocument();
    await waitFor(() =>
      expect(requests.map((request) => `${request.method} ${request.path}`)).toEqual([
        `PATCH ${versionPath}`,
        `POST ${versionPath}/check`,
      ]),
    );
    expect(requests[0]?.body).toEqual({ body: edited });
  });

  it('fills the draft in again from the study and puts the new text in the text box', async () => {
    const newBody = `${draftBody.replace('[to fill: institution]', 'Harbor Lane Institute')}\n\n## Payment\nYou are paid $22.50 for the session.`;
    const { requests } = stubApi({
      'GET /api/consent-templates': { status: 200, body: { items: [consentTemplate] } },
      [`POST ${versionPath}/refill`]: { status: 200, body: { ...version, body: newBody } },
    });
    renderWithProviders(
      <DraftEditor studyId={studyId} version={version} activeVersionNumber={2} onActivated={vi.fn()} />,
    );

    const textarea = screen.getByLabelText('Form text (Markdown)') as HTMLTextAreaElement;
    await userEvent.click(textarea);
    await userEvent.paste('A sentence typed by hand.');
    await userEvent.click(screen.getByRole('button', { name: 'Fill in again from the study…' }));
    expect(await screen.findByText(/including the edits in the text box that are not saved yet/)).toBeInTheDocument();
    await userEvent.click(screen.getByLabelText('Institution'));
    await userEvent.paste('Harbor Lane Institute');
    await userEvent.click(screen.getByRole('button', { name: 'Replace the text' }));

    await waitFor(() => expect(textarea.value).toBe(newBody));
    expect(screen.queryByText('Unsaved changes')).not.toBeInTheDocument();
    expect(
      screen.getByText('Filled in again from the study and the template. The preview shows the new text.'),
    ).toBeInTheDocument();
    expect(requests.filter((request) => request.method === 'POST').map((request) => request.path)).toEqual([
      `${versionPath}/refill`,
    ]);
  });

  it('keeps activation closed until the approval letter is uploaded', () => {
    stubApi({});
    renderWithProviders(
      <DraftEditor studyId={studyId} version={version} activeVersionNumber={2} onActivated={vi.fn()} />,
    );

    expect(screen.getByRole('button', { name: 'Activate version 3…' })).toBeDisabled();
    expect(screen.getByText('Approval letter uploaded').closest('li')).toHaveTextContent('(not yet)');
  });

  it('refuses a PNG renamed to .pdf before uploading it', async () => {
    const { requests } = stubApi({});
    renderWithProviders(
      <DraftEditor studyId={studyId} version={version} activeVersionNumber={2} onActivated={vi.fn()} />,
    );

    // PNG signature bytes (ISO/IEC 15948, 5.2), named like a PDF.
    const png = new File([new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])], 'approval.pdf', {
      type: 'application/pdf',
    });
    await userEvent.upload(screen.getByLabelText('Approval letter (PDF, up to 10 MB)'), png);

    expect(await screen.findByText(/This file is not a PDF/)).toBeInTheDocument();
    expect(requests).toHaveLength(0);
  });
});
