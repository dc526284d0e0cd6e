import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { stubApi } from '@/test/api-stub';
import { renderWithProviders } from '@/test/render-with-providers';
import { ReminderPlanSection } from './reminder-plan-section';

const studyId = '43474abc-f2c2-4790-8e76-1092b9661cd1';
const path = `/api/studies/${studyId}/reminder-plan`;
const plan = {
  rules: [{ anchor: 'opens', days: 2 }],
  suggestLostAfter: 3,
  enabled: true,
  updatedAt: null,
  previewSubject: 'Reminder: Session 1 is open',
  previewText: 'Hello,\nSession 1 of Wayfinding cues is open.',
};

describe('ReminderPlanSection', { timeout: 30_000 }, () => {
  it('says the plan is the same for every condition, shows the e-mail and saves added reminders', async () => {
    const { requests } = stubApi({
      [`GET ${path}`]: { status: 200, body: plan },
      [`PUT ${path}`]: (request) => ({
        status: 200,
        body: {
          ...plan,
          ...(request.body as object),
          updatedAt: '2027-01-05T10:00:00.000Z',
          previewSubject: 'Reminder: Session 1 is due soon',
        },
      }),
    });
    renderWithProviders(<ReminderPlanSection studyId={studyId} canEdit />);

    expect(screen.getByText('One plan for every condition, by design.')).toBeInTheDocument();
    const form = await screen.findByRole('form', { name: 'Reminder plan' });
    expect(within(form).getByLabelText('Reminder 1: days')).toHaveValue('2');
    expect(screen.getByTestId('reminder-preview')).toHaveTextContent('Subject: Reminder: Session 1 is open');

    await userEvent.click(within(form).getByRole('button', { name: 'Add a reminder' }));
    await userEvent.type(within(form).getByLabelText('Reminder 2: days'), '99');
    await userEvent.click(within(form).getByRole('button', { name: /^Reminder 2: counted/ }));
    await userEvent.click(await screen.findByRole('option', { name: 'days before the step is due' }));
    const threshold = within(form).getByLabelText('Suggest “lost to follow-up” after this many unanswered reminders');
    await userEvent.clear(threshold);
    await userEvent.type(threshold, '0');
    await userEvent.click(within(form).getByRole('button', { name: 'Save the reminder plan' }));
    expect(await within(form).findByText('Enter a whole number of days from 0 to 60.')).toBeInTheDocument();
    expect(within(form).getByText('Enter a whole number of reminders from 1 to 50.')).toBeInTheDocument();
    expect(requests.filter((request) => request.method === 'PUT')).toHaveLength(0);

    await userEvent.clear(within(form).getByLabelText('Reminder 2: days'));
    await userEvent.type(within(form).getByLabelText('Reminder 2: days'), '1');
    await userEvent.clear(threshold);
    await userEvent.type(threshold, '4');
    await userEvent.click(within(form).getByRole('button', { name: 'Save the reminder plan' }));
    expect(
      await screen.findByText(/The reminder plan was saved\. It applies to every participant in every condition\./),
    ).toBeInTheDocument();
    expect(requests.find((request) => request.method === 'PUT')?.body).toEqual({
      enabled: true,
      rules: [
        { anchor: 'opens', days: 2 },
        { anchor: 'due', days: 1 },
      ],
      suggestLostAfter: 4,
    });
    await waitFor(() =>
      expect(screen.getByTestId('reminder-preview')).toHaveTextContent('Reminder: Session 1 is due soon'),
    );
  });

  it('refuses the same reminder twice', async () => {
    const { requests } = stubApi({ [`GET ${path}`]: { status: 200, body: plan } });
    renderWithProviders(<ReminderPlanSection studyId={studyId} canEdit />);

    const form = await screen.findByRole('form', { name: 'Reminder plan' });
    await userEvent.click(within(form).getByRole('button', { name: 'Add a reminder' }));
    await userEvent.type(within(form).getByLabelText('Reminder 2: days'), '2');
    await userEvent.click(within(form).getByRole('button', { name: 'Save the reminder plan' }));
    expect(await within(form).findByText('This reminder is already in the plan.')).toBeInTheDocument();
    expect(requests.filter((request) => request.method === 'PUT')).toHaveLength(0);
  });

  it('shows the plan read-only to people who may not change it', async () => {
    stubApi({ [`GET ${path}`]: { status: 200, body: plan } });
    renderWithProviders(<ReminderPlanSection studyId={studyId} canEdit={false} />);

    expect(await screen.findByRole('list', { name: 'Planned reminders' })).toHaveTextContent(
      '2 days after the step opens',
    );
    expect(screen.getByText(/after 3 unanswered reminders/)).toBeInTheDocument();
    expect(screen.queryByRole('form', { name: 'Reminder plan' })).not.toBeInTheDocument();
  });
});
