import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { stubApi } from '@/test/api-stub';
import { renderWithProviders } from '@/test/render-with-providers';
import { BulkCompletionDialog, referenceFileProblem } from './bulk-completion-dialog';

const studyId = '8da5576c-4820-4de3-867c-b951081f13b2';
const steps = [
  { id: '11111111-2222-4333-8444-555555555555', position: 1, title: 'Session 1: learning the route' },
  { id: '66666666-7777-4888-9999-000000000000', position: 2, title: 'Session 2: the lab visit' },
];
const completionsPath = `/api/studies/${studyId}/steps/${steps[1]?.id}/completions`;

const result = {
  completed: 1,
  alreadyDone: 1,
  failed: 1,
  rows: [
    { line: 1, reference: 'P-7KQ2MX', outcome: 'completed', message: null },
    { line: 2, reference: 'P-3X66FX', outcome: 'already-done', message: null },
    { line: 3, reference: 'P-NOSUCH', outcome: 'failed', message: 'no participant with this reference in the study' },
  ],
};

async function chooseStep(title: string) {
  await userEvent.click(screen.getByRole('button', { name: /^Step/ }));
  await userEvent.click(await screen.findByRole('option', { name: title }));
}

describe('BulkCompletionDialog', { timeout: 30_000 }, () => {
  it('sends the pasted references for the chosen step and shows each line’s outcome, failed lines first', async () => {
    const { requests } = stubApi({ [`POST ${completionsPath}`]: { status: 200, body: result } });
    renderWithProviders(<BulkCompletionDialog studyId={studyId} steps={steps} open onClose={() => {}} />);

    await userEvent.click(screen.getByRole('button', { name: 'Mark done' }));
    expect(await screen.findByText('Choose the step to mark done.')).toBeInTheDocument();
    expect(screen.getByText('Paste at least one participant reference, one per line.')).toBeInTheDocument();

    await chooseStep('Step 2: Session 2: the lab visit');
    await userEvent.click(screen.getByLabelText('Participant references, one per line'));
    await userEvent.paste('reference\nP-7KQ2MX\n\n P-3X66FX \nP-NOSUCH');
    expect(screen.getByText('3 references listed.')).toBeInTheDocument();
    await userEvent.click(screen.getByRole('button', { name: 'Mark done' }));

    const report = await screen.findByRole('region', { name: 'Completion report' });
    await waitFor(() => expect(requests).toHaveLength(1));
    expect(requests[0]?.body).toEqual({ references: ['P-7KQ2MX', 'P-3X66FX', 'P-NOSUCH'] });
    const rows = within(report).getAllByRole('row').slice(1);
    expect(rows.map((row) => row.textContent)).toEqual([
      '3P-NOSUCHNot markedno participant with this reference in the study',
      '1P-7KQ2MXMarked done',
      '2P-3X66FXAlready done',
    ]);
    expect(within(report).getByRole('list', { name: 'Completion summary' })).toHaveTextContent(
      '1marked done now1already done, left as they were1line not marked',
    );
  });

  it('reads the first column of an uploaded CSV into the list', async () => {
    const { requests } = stubApi({
      [`POST ${completionsPath}`]: { status: 200, body: { completed: 2, alreadyDone: 0, failed: 0, rows: [] } },
    });
    renderWithProviders(<BulkCompletionDialog studyId={studyId} steps={steps} open onClose={() => {}} />);

    const csv = new File(['reference,attended\r\nP-7KQ2MX,yes\r\n"P-3X66FX",yes\r\n'], 'session-2.csv', {
      type: 'text/csv',
    });
    await userEvent.upload(
      screen.getByLabelText('Or read the references from a file (.csv or .txt, first column)'),
      csv,
    );
    expect(await screen.findByText(/2 references from the first column/)).toBeInTheDocument();
    expect(screen.getByLabelText('Participant references, one per line')).toHaveValue('P-7KQ2MX\nP-3X66FX');

    await chooseStep('Step 2: Session 2: the lab visit');
    await userEvent.click(screen.getByRole('button', { name: 'Mark done' }));
    await waitFor(() => expect(requests[0]?.body).toEqual({ references: ['P-7KQ2MX', 'P-3X66FX'] }));
  });

  it('shows the api’s refusal of the whole list on the list', async () => {
    stubApi({
      [`POST /api/studies/${studyId}/steps/${steps[0]?.id}/completions`]: {
        status: 400,
        body: {
          statusCode: 400,
          code: 'VALIDATION_FAILED',
          message: 'Check the list.',
          errors: [{ field: 'references', message: 'references must contain no more than 5000 elements' }],
        },
      },
    });
    renderWithProviders(<BulkCompletionDialog studyId={studyId} steps={steps} open onClose={() => {}} />);

    await chooseStep('Step 1: Session 1: learning the route');
    await userEvent.type(screen.getByLabelText('Participant references, one per line'), 'P-7KQ2MX');
    await userEvent.click(screen.getByRole('button', { name: 'Mark done' }));
    expect(await screen.findByText('references must contain no more than 5000 elements')).toBeInTheDocument();
    expect(screen.getByLabelText('Participant references, one per line')).toHaveAttribute('aria-invalid', 'true');
  });
});

describe('referenceFileProblem', () => {
  it('refuses files that are not text lists, empty or too large', () => {
    expect(referenceFileProblem({ name: 'list.xlsx', size: 10 })).toMatch(/not a text or CSV file/);
    expect(referenceFileProblem({ name: 'list.csv', size: 0 })).toBe('list.csv is empty.');
    expect(referenceFileProblem({ name: 'list.txt', size: 2 * 1024 * 1024 })).toMatch(/larger than 1 MB/);
    expect(referenceFileProblem({ name: 'list.txt', size: 200 })).toBeNull();
  });
});
