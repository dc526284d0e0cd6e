import { render, screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { createMemoryRouter, RouterProvider } from 'react-router-dom';
import { beforeEach, describe, expect, it, vi } from 'vitest';
import { AppProvider } from '@/app/provider';
import { leaveForExternalPage } from '@/lib/external-page';
import { createQueryClient } from '@/lib/query-client';
import { queryKeys } from '@/lib/query-keys';
import { installFakeApi } from '@/test/fake-api';
import { signedEnrollment, studyId } from '@/test/participant-fixtures';
import type { EnrollmentStep } from '../api/get-my-enrollment';
import { YourSteps } from './your-steps';

vi.mock('@/lib/external-page', async (importOriginal) => ({
  ...(await importOriginal<typeof import('@/lib/external-page')>()),
  leaveForExternalPage: vi.fn(),
}));

beforeEach(() => vi.mocked(leaveForExternalPage).mockClear());

const base = signedEnrollment().steps[0]!;
const step = (overrides: Partial<EnrollmentStep>): EnrollmentStep => ({ ...base, ...overrides });
const taskAddress =
  'https://tasks.harborlane.test/wayfinding/1?ref=WC-0042&token=abc&return=https%3A%2F%2Fportal.test%2Fapi%2Freturn%2Fabc';
const startPath = (stepId: string) => `/api/studies/${studyId}/enrollments/me/steps/${stepId}/start`;

function renderSteps(steps: EnrollmentStep[], { onNeedsReconsent = vi.fn() } = {}) {
  const queryClient = createQueryClient();
  queryClient.setDefaultOptions({ queries: { retry: false, staleTime: Infinity }, mutations: { retry: false } });
  const router = createMemoryRouter(
    [
      {
        path: '/',
        element: (
          <YourSteps
            studyId={studyId}
            steps={steps}
            currency="USD"
            earned={{ earnedMinor: 1250, paidMinor: 0, stillToBePaidMinor: 1250 }}
            contactEmail="wayfinding@harborlane.test"
            onNeedsReconsent={onNeedsReconsent}
          />
        ),
      },
    ],
    { initialEntries: ['/'] },
  );
  render(
    <AppProvider queryClient={queryClient}>
      <RouterProvider router={router} />
    </AppProvider>,
  );
  return { queryClient, onNeedsReconsent, user: userEvent.setup() };
}

/** The list item of the step whose heading ends with `title`. */
function stepItem(title: string) {
  const heading = screen.getByRole('heading', { name: new RegExp(`· ${title}$`) });
  const item = heading.closest('li');
  if (!item) throw new Error(`${title} is not in a list item`);
  return within(item);
}

// Times show in the reader's zone, so only the date and the minutes are fixed.
const at = (date: string) => new RegExp(`${date}, 2026 at \\d{1,2}:05\\s[AP]M`);

describe('the steps list', () => {
  it('shows each step’s window in plain words, with its status and pay', () => {
    renderSteps([
      step({
        id: 'a',
        position: 1,
        title: 'Done one',
        status: 'done',
        completedAt: '2026-02-05T10:00:00.000Z',
        payMinor: 1250,
      }),
      step({
        id: 'b',
        position: 2,
        title: 'Open one',
        status: 'open',
        dueAt: '2026-03-15T14:05:00.000Z',
        payMinor: 1500,
      }),
      step({ id: 'c', position: 3, title: 'Late one', status: 'overdue', dueAt: '2026-03-01T14:05:00.000Z' }),
      step({
        id: 'd',
        position: 4,
        title: 'Later one',
        status: 'upcoming',
        opensAt: '2026-03-12T14:05:00.000Z',
        dueAt: '2026-03-19T14:05:00.000Z',
      }),
      step({ id: 'e', position: 5, title: 'Next in line', status: 'waiting', opensAt: null, dueAt: null }),
      step({ id: 'f', position: 6, title: 'Open, no date', status: 'open', dueAt: null }),
    ]);

    expect(screen.getByText('1 of 6 done')).toBeInTheDocument();

    const done = stepItem('Done one');
    expect(done.getByText('Done')).toBeInTheDocument();
    expect(done.getByText('on February 5, 2026')).toBeInTheDocument();
    expect(
      done.getByText((_text, element) => element?.tagName === 'P' && element.textContent === '$12.50 earned'),
    ).toBeInTheDocument();

    const open = stepItem('Open one');
    expect(open.getByText('Ready for you')).toBeInTheDocument();
    expect(open.getByText(/^Do it by /)).toHaveTextContent(at('March 15'));
    expect(open.getByText('$15.00')).toBeInTheDocument();

    const late = stepItem('Late one');
    expect(late.getByText('Overdue')).toBeInTheDocument();
    expect(late.getByText(/^Overdue since .+, but you can still do it\.$/)).toHaveTextContent(at('March 1'));
    expect(late.getByLabelText('Completion code')).toBeInTheDocument();

    const later = stepItem('Later one');
    expect(later.getByText('Not open yet')).toBeInTheDocument();
    const opens = later.getByText(/^Opens on /);
    expect(opens).toHaveTextContent(at('March 12'));
    expect(opens).toHaveTextContent(at('March 19'));
    expect(later.queryByLabelText('Completion code')).not.toBeInTheDocument();
    expect(
      later.getByText(/At the end of this step you are given a code\. Once the step opens, you enter it here\./),
    ).toBeInTheDocument();

    const waiting = stepItem('Next in line');
    expect(waiting.getByText('Not open yet')).toBeInTheDocument();
    expect(waiting.getByText('Opens after you finish the previous step.')).toBeInTheDocument();

    expect(stepItem('Open, no date').getByText('Open now, with no deadline.')).toBeInTheDocument();
    // A code form on the open and overdue code steps only.
    expect(screen.getAllByRole('button', { name: 'I finished this step' })).toHaveLength(3);
  });

  it('says the research team marks a staff step done, with nothing to enter or open', () => {
    renderSteps([
      step({
        id: 'lab',
        title: 'Lab visit',
        verification: 'staff',
        hasCompletionCode: false,
        hasTask: false,
        status: 'open',
      }),
    ]);

    const lab = stepItem('Lab visit');
    expect(
      lab.getByText(
        /The research team marks this step done after your session\. There is nothing for you to enter here\./,
      ),
    ).toBeInTheDocument();
    expect(lab.queryByRole('button')).not.toBeInTheDocument();
    expect(lab.queryByLabelText('Completion code')).not.toBeInTheDocument();
  });

  it('offers the task on an open task step, saying they will be brought back, and no code form for a return-link step', () => {
    renderSteps([
      step({ id: 's1', title: 'First session', verification: 'return-link', hasTask: true, hasCompletionCode: false }),
    ]);

    const first = stepItem('First session');
    const button = first.getByRole('button', { name: 'Open the task' });
    expect(button).toHaveAccessibleDescription(
      /Step 1 · First session.*When you finish it, you are brought back here and the step is marked done\./,
    );
    expect(first.queryByLabelText('Completion code')).not.toBeInTheDocument();
  });

  it('offers both the task and the code form on a per-participant code step with a task', () => {
    renderSteps([
      step({
        id: 's1',
        title: 'First session',
        verification: 'participant-code',
        hasTask: true,
        hasCompletionCode: true,
        status: 'overdue',
      }),
    ]);

    const first = stepItem('First session');
    expect(first.getByRole('button', { name: 'Open the task' })).toHaveAccessibleDescription(
      /If that does not happen, enter the code/,
    );
    expect(first.getByLabelText('Completion code')).toBeInTheDocument();
  });

  it('explains a task step that has not opened, without a button', () => {
    renderSteps([
      step({
        id: 's2',
        title: 'Second session',
        verification: 'return-link',
        hasTask: true,
        hasCompletionCode: false,
        status: 'waiting',
        dueAt: null,
      }),
    ]);

    const second = stepItem('Second session');
    expect(
      second.getByText(/You do this step in an online task\. The button to open it appears here once the step opens\./),
    ).toBeInTheDocument();
    expect(second.queryByRole('button', { name: 'Open the task' })).not.toBeInTheDocument();
  });

  it('says so when a return-link step has no task address yet', () => {
    renderSteps([
      step({ id: 's1', title: 'First session', verification: 'return-link', hasTask: false, hasCompletionCode: false }),
    ]);

    expect(
      stepItem('First session').getByText(/The link to this step’s online task is not ready yet/),
    ).toBeInTheDocument();
    expect(screen.queryByRole('button')).not.toBeInTheDocument();
  });

  it('shows a step on hold with no way to do it', () => {
    renderSteps([
      step({ id: 's1', title: 'First session', verification: 'return-link', hasTask: true, status: 'locked' }),
    ]);

    const first = stepItem('First session');
    expect(first.getByText('On hold')).toBeInTheDocument();
    expect(first.getByText('You cannot do this step just now.')).toBeInTheDocument();
    expect(screen.queryByRole('button')).not.toBeInTheDocument();
  });

  it('asks for the task address and leaves for it', async () => {
    const fakeApi = installFakeApi({ [`GET ${startPath('s1')}`]: { status: 200, body: { url: taskAddress } } });
    const { user } = renderSteps([
      step({ id: 's1', title: 'First session', verification: 'return-link', hasTask: true, hasCompletionCode: false }),
    ]);

    await user.click(screen.getByRole('button', { name: 'Open the task' }));

    await waitFor(() => expect(leaveForExternalPage).toHaveBeenCalledWith(taskAddress));
    expect(fakeApi.callsTo('GET', startPath('s1'))).toHaveLength(1);
    expect(screen.getByRole('button', { name: 'Opening the task…' })).toBeDisabled();
  });

  it('does not leave for an address that is not a web page', async () => {
    installFakeApi({ [`GET ${startPath('s1')}`]: { status: 200, body: { url: 'javascript:alert(1)' } } });
    const { user } = renderSteps([
      step({ id: 's1', title: 'First session', verification: 'return-link', hasTask: true, hasCompletionCode: false }),
    ]);

    await user.click(screen.getByRole('button', { name: 'Open the task' }));

    expect(await screen.findByRole('alert')).toHaveTextContent('We could not open the task');
    expect(leaveForExternalPage).not.toHaveBeenCalled();
    expect(screen.getByRole('button', { name: 'Open the task' })).toBeEnabled();
  });

  it('says why the task cannot be opened yet and refreshes the steps', async () => {
    installFakeApi({
      [`GET ${startPath('s1')}`]: {
        status: 409,
        body: {
          statusCode: 409,
          code: 'STEP_NOT_AVAILABLE',
          message: 'This step opens after the one before it is done.',
          errors: [{ field: 'stepId', message: 'This step opens after the one before it is done.' }],
        },
      },
    });
    const { user, queryClient } = renderSteps([
      step({ id: 's1', title: 'First session', verification: 'return-link', hasTask: true, hasCompletionCode: false }),
    ]);
    const invalidate = vi.spyOn(queryClient, 'invalidateQueries');

    await user.click(screen.getByRole('button', { name: 'Open the task' }));

    const alert = await screen.findByRole('alert');
    expect(alert).toHaveTextContent('We could not open the task');
    expect(alert).toHaveTextContent('This step opens after the one before it is done.');
    expect(invalidate).toHaveBeenCalledWith({ queryKey: queryKeys.myEnrollmentAll(studyId) });
    expect(leaveForExternalPage).not.toHaveBeenCalled();
  });

  it('sends them to the new consent form when it changed before the task', async () => {
    installFakeApi({
      [`GET ${startPath('s1')}`]: {
        status: 409,
        body: {
          statusCode: 409,
          code: 'CONSENT_VERSION_STALE',
          message: 'The consent form has changed: please read and sign the new version before your next step.',
          currentVersion: {
            versionId: '9a8b7c6d-5e4f-4a3b-8c2d-1e0f9a8b7c6d',
            version: 3,
            fingerprint: 'f'.repeat(64),
          },
        },
      },
    });
    const { user, onNeedsReconsent } = renderSteps([
      step({ id: 's1', title: 'First session', verification: 'return-link', hasTask: true, hasCompletionCode: false }),
    ]);

    await user.click(screen.getByRole('button', { name: 'Open the task' }));

    await waitFor(() => expect(onNeedsReconsent).toHaveBeenCalledTimes(1));
    expect(screen.queryByRole('alert')).not.toBeInTheDocument();
    expect(leaveForExternalPage).not.toHaveBeenCalled();
  });
});
