import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { stubApi } from '@/test/api-stub';
import { renderWithProviders } from '@/test/render-with-providers';
import { ParticipantRecord } from './participant-record';

const studyId = '8da5576c-4820-4de3-867c-b951081f13b2';
const enrollmentId = '4402fb12-dfaa-46db-8a66-c05bd2341015';
const step1 = '11111111-2222-4333-8444-555555555555';
const step2 = '66666666-7777-4888-9999-000000000000';
const step3 = 'aaaaaaaa-bbbb-4ccc-8ddd-eeeeeeeeeeee';
const recordPath = `/api/studies/${studyId}/enrollments/${enrollmentId}`;

const enrollment = {
  id: enrollmentId,
  reference: 'P-7KQ2MX',
  email: 'p012@evenhand.test',
  name: null,
  status: 'active',
  condition: 'B',
  stratumKey: null,
  covariates: {},
  needsReconsent: false,
  signedVersion: 1,
  invitationSentAt: null,
  assignedAt: '2027-01-02T09:00:00.000Z',
  createdAt: '2027-01-01T09:00:00.000Z',
  nextStep: {
    stepId: step2,
    title: 'Session 2: the lab visit',
    opensAt: '2027-01-05T09:00:00.000Z',
    dueAt: null,
    timing: 'open',
  },
  unansweredReminders: 4,
  suggestLost: true,
};

const approvedCompletion = {
  id: 'c-1',
  completedAt: '2027-01-03T10:00:00.000Z',
  verifiedBy: 'return-link',
  recordedByEmail: null,
  evidence: { keyId: 1 },
  payoutStatus: 'approved',
  canUndo: false,
};

const record = (step2Completion: object | null, undone: object[] = []) => ({
  enrollment,
  withdrawalReason: null,
  lostReason: null,
  exclusionReason: null,
  signatures: [],
  timeline: [],
  steps: [
    {
      stepId: step1,
      position: 1,
      title: 'Session 1: learning the route',
      payMinor: 1000,
      verification: 'return-link',
      status: 'done',
      opensAt: '2027-01-02T09:00:00.000Z',
      dueAt: '2027-01-09T09:00:00.000Z',
      completion: approvedCompletion,
      undone: [],
      code: null,
    },
    {
      stepId: step2,
      position: 2,
      title: 'Session 2: the lab visit',
      payMinor: 1500,
      verification: 'staff',
      status: step2Completion ? 'done' : 'open',
      opensAt: '2027-01-05T09:00:00.000Z',
      dueAt: null,
      completion: step2Completion,
      undone,
      code: null,
    },
    {
      stepId: step3,
      position: 3,
      title: 'Follow-up quiz',
      payMinor: 500,
      verification: 'participant-code',
      status: 'waiting',
      opensAt: null,
      dueAt: null,
      completion: null,
      undone: [],
      code: 'QZ-81KD',
    },
  ],
});

const staffCompletion = {
  id: 'c-2',
  completedAt: '2027-01-06T10:00:00.000Z',
  verifiedBy: 'staff',
  recordedByEmail: 'coordinator@evenhand.test',
  evidence: {},
  payoutStatus: 'owed',
  canUndo: true,
};

const contacts = {
  items: [
    {
      id: 'k1',
      kind: 'reminder',
      sentAt: '2027-01-06T08:00:00.000Z',
      subject: 'Your next session is open',
      stepTitle: 'Session 2: the lab visit',
      sentByEmail: null,
    },
    {
      id: 'k2',
      kind: 'invitation',
      sentAt: '2027-01-01T08:00:00.000Z',
      subject: 'You are invited',
      stepTitle: null,
      sentByEmail: 'coordinator@evenhand.test',
    },
  ],
  unansweredReminders: 4,
  suggestLostAfter: 3,
  suggestLost: true,
};

const codes = {
  reference: 'P-7KQ2MX',
  items: [{ stepId: step3, position: 3, title: 'Follow-up quiz', code: 'QZ-81KD' }],
};

describe('participant record: steps and contacts', { timeout: 30_000 }, () => {
  it('marks a step done, then undoes it only with a reason', async () => {
    let current: object = record(null);
    const { requests } = stubApi({
      [`GET ${recordPath}`]: () => ({ status: 200, body: current }),
      [`GET ${recordPath}/contacts`]: { status: 200, body: contacts },
      [`GET ${recordPath}/step-codes`]: { status: 200, body: codes },
      [`POST ${recordPath}/steps/${step2}/complete`]: () => {
        current = record(staffCompletion);
        return { status: 200, body: enrollment };
      },
      [`DELETE ${recordPath}/steps/${step2}/complete`]: () => {
        current = record(null, [
          {
            completedAt: staffCompletion.completedAt,
            undoneAt: '2027-01-06T11:00:00.000Z',
            reason: 'Wrong person ticked',
            undoneByEmail: 'coordinator@evenhand.test',
          },
        ]);
        return { status: 200, body: enrollment };
      },
    });
    renderWithProviders(
      <ParticipantRecord
        studyId={studyId}
        enrollmentId={enrollmentId}
        blinded
        backHref="/roster"
        currency="USD"
        canManage
        canSeeCodes
      />,
    );

    const first = await screen.findByRole('article', { name: 'Step 1: Session 1: learning the route' });
    expect(first).toHaveTextContent('Return link from the external task');
    expect(first).toHaveTextContent('Pay approved');
    expect(first).toHaveTextContent(/Undo is not available\. Its pay has been approved/);
    expect(within(first).queryByRole('button', { name: /Undo/ })).not.toBeInTheDocument();
    expect(screen.getByRole('article', { name: 'Step 3: Follow-up quiz' })).toHaveTextContent(
      'Once the step before it is done',
    );
    expect(
      within(await screen.findByRole('list', { name: 'Codes for each step' })).getByText('QZ-81KD'),
    ).toBeInTheDocument();

    await userEvent.click(screen.getByRole('button', { name: 'Mark step 2 done' }));
    expect(await screen.findByText('Step 2 is marked done; its pay is owed.')).toBeInTheDocument();
    const second = screen.getByRole('article', { name: 'Step 2: Session 2: the lab visit' });
    await waitFor(() =>
      expect(second).toHaveTextContent('Marked done by staff · recorded by coordinator@evenhand.test'),
    );
    expect(second).toHaveTextContent('Pay owed');

    await userEvent.click(within(second).getByRole('button', { name: 'Undo step 2' }));
    const dialog = await screen.findByRole('alertdialog');
    await userEvent.click(within(dialog).getByRole('button', { name: 'Undo the step' }));
    expect(await within(dialog).findByText(/Say in at least 5 characters/)).toBeInTheDocument();
    expect(requests.filter((request) => request.method === 'DELETE')).toHaveLength(0);

    await userEvent.type(within(dialog).getByLabelText('Reason (required)'), 'Wrong person ticked');
    await userEvent.click(within(dialog).getByRole('button', { name: 'Undo the step' }));
    expect(await screen.findByText('Step 2 is no longer done; its unapproved pay was cancelled.')).toBeInTheDocument();
    expect(requests.find((request) => request.method === 'DELETE')?.body).toEqual({ reason: 'Wrong person ticked' });
    await waitFor(() =>
      expect(screen.getByRole('article', { name: 'Step 2: Session 2: the lab visit' })).toHaveTextContent(
        /Undone before.*“Wrong person ticked”/,
      ),
    );
  });

  it('lists contacts newest first, suggests marking lost and sends a message', async () => {
    let contactLog = contacts;
    const { requests } = stubApi({
      [`GET ${recordPath}`]: { status: 200, body: record(null) },
      [`GET ${recordPath}/contacts`]: () => ({ status: 200, body: contactLog }),
      [`GET ${recordPath}/step-codes`]: { status: 200, body: codes },
      [`POST ${recordPath}/contacts`]: (request) => {
        const sent = {
          id: 'k3',
          kind: 'staff-message',
          sentAt: '2027-01-07T08:00:00.000Z',
          subject: (request.body as { subject: string }).subject,
          stepTitle: null,
          sentByEmail: 'coordinator@evenhand.test',
        };
        contactLog = { ...contacts, items: [...contacts.items, sent] };
        return { status: 201, body: contactLog };
      },
    });
    renderWithProviders(
      <ParticipantRecord
        studyId={studyId}
        enrollmentId={enrollmentId}
        blinded
        backHref="/roster"
        currency="USD"
        canManage
        canSeeCodes
      />,
    );

    const log = await screen.findByRole('list', { name: 'Contacts, newest first' });
    expect(
      within(log)
        .getAllByRole('listitem')
        .map((item) => item.textContent),
    ).toEqual([expect.stringContaining('Your next session is open'), expect.stringContaining('You are invited')]);
    expect(screen.getByText(/4 reminders have gone unanswered/)).toBeInTheDocument();

    await userEvent.click(screen.getByRole('button', { name: 'Mark lost to follow-up…' }));
    expect(await screen.findByRole('alertdialog', { name: 'Mark P-7KQ2MX lost to follow-up?' })).toBeInTheDocument();
    await userEvent.click(screen.getByRole('button', { name: 'Cancel' }));
    await waitFor(() => expect(screen.queryByRole('alertdialog')).not.toBeInTheDocument());

    await userEvent.click(screen.getByRole('button', { name: 'Send a message…' }));
    const dialog = await screen.findByRole('dialog', { name: 'Send a message to P-7KQ2MX' });
    await userEvent.click(within(dialog).getByRole('button', { name: 'Send message' }));
    expect(await within(dialog).findByText('Enter a subject.')).toBeInTheDocument();
    expect(within(dialog).getByText('Write the message.')).toBeInTheDocument();

    await userEvent.type(within(dialog).getByLabelText('Subject'), 'Can we help you book session 2?');
    await userEvent.type(within(dialog).getByLabelText('Message'), 'Reply with a time that suits you.');
    await userEvent.click(within(dialog).getByRole('button', { name: 'Send message' }));
    expect(await screen.findByText('The message was sent to p012@evenhand.test and logged.')).toBeInTheDocument();
    expect(requests.find((request) => request.method === 'POST')?.body).toEqual({
      subject: 'Can we help you book session 2?',
      message: 'Reply with a time that suits you.',
    });
    expect(
      within(screen.getByRole('list', { name: 'Contacts, newest first' })).getAllByRole('listitem')[0],
    ).toHaveTextContent('Staff messageCan we help you book session 2?');
  });

  it('offers no step or contact actions to people who may only read', async () => {
    const { requests } = stubApi({
      [`GET ${recordPath}`]: { status: 200, body: record(staffCompletion) },
      [`GET ${recordPath}/contacts`]: { status: 200, body: contacts },
    });
    renderWithProviders(
      <ParticipantRecord studyId={studyId} enrollmentId={enrollmentId} blinded backHref="/roster" currency="USD" />,
    );

    await screen.findByRole('article', { name: 'Step 2: Session 2: the lab visit' });
    await screen.findByRole('list', { name: 'Contacts, newest first' });
    expect(
      screen.queryByRole('button', { name: /Mark step|Undo step|Send a message|Mark lost/ }),
    ).not.toBeInTheDocument();
    expect(requests.some((request) => request.path.endsWith('/step-codes'))).toBe(false);
  });
});
