import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { stubApi } from '@/test/api-stub';
import { renderWithProviders } from '@/test/render-with-providers';
import type { Study } from '../api/get-study';
import { StudyLifecycleActions } from './study-lifecycle-actions';

const study: Study = {
  id: '43474abc-f2c2-4790-8e76-1092b9661cd1',
  slug: 'corridor-signs',
  title: 'Corridor signs',
  status: 'draft',
  design: 'between',
  protocolNumber: 'HLCL-2027-021',
  summary: '',
  estimatedMinutes: null,
  targetSize: null,
  budgetMinor: 0,
  currency: 'USD',
  blinded: true,
  labName: '',
  contactEmail: null,
  openedAt: null,
  closedAt: null,
  createdAt: '2027-01-04T10:00:00.000Z',
  designLocked: false,
  archivedAt: null,
  ethicsApprovalReference: null,
  assignedCount: 0,
  editRules: [],
};

describe('StudyLifecycleActions', () => {
  it('explains that opening seals the sequence and shows the api’s 409 in the dialog', async () => {
    stubApi({
      [`POST /api/studies/${study.id}/open`]: {
        status: 409,
        body: {
          statusCode: 409,
          code: 'STUDY_NOT_READY_TO_OPEN',
          message: 'The study cannot open yet: add at least two conditions; activate a consent version.',
          errors: [
            { field: 'conditions', message: 'add at least two conditions' },
            { field: 'consent', message: 'activate a consent version' },
          ],
        },
      },
    });
    renderWithProviders(<StudyLifecycleActions study={study} />);

    await userEvent.click(screen.getByRole('button', { name: 'Open study' }));
    expect(await screen.findByText('Open the study?')).toBeInTheDocument();
    expect(screen.getByRole('alertdialog')).toHaveTextContent(/seals the assignment sequence/);
    expect(screen.getByRole('alertdialog')).toHaveTextContent(/fingerprint/);

    await userEvent.click(screen.getAllByRole('button', { name: 'Open study' }).at(-1) as HTMLElement);
    const missing = await screen.findByRole('list', { name: 'Still needed before opening' });
    expect(
      within(missing)
        .getAllByRole('listitem')
        .map((item) => item.textContent),
    ).toEqual(['Conditions: add at least two conditions', 'Consent form: activate a consent version']);
    // The named items, not the raw message.
    expect(screen.queryByText(/The study cannot open yet: add at least/)).not.toBeInTheDocument();
  });

  it('asks before closing, says the seed is revealed, then posts close', async () => {
    const { requests } = stubApi({
      [`POST /api/studies/${study.id}/close`]: { status: 200, body: { ...study, status: 'closed' } },
    });
    renderWithProviders(<StudyLifecycleActions study={{ ...study, status: 'recruiting' }} />);

    expect(screen.queryByRole('button', { name: 'Open study' })).not.toBeInTheDocument();
    await userEvent.click(screen.getByRole('button', { name: 'Close study' }));
    expect(await screen.findByText('Close the study?')).toBeInTheDocument();
    expect(screen.getByRole('alertdialog')).toHaveTextContent(/secret seed is revealed/);
    expect(requests).toHaveLength(0);

    await userEvent.click(screen.getAllByRole('button', { name: 'Close study' }).at(-1) as HTMLElement);
    await waitFor(() => expect(requests.map((request) => request.path)).toContain(`/api/studies/${study.id}/close`));
  });
});
