import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it, vi } from 'vitest';
import { stubApi } from '@/test/api-stub';
import { renderWithProviders } from '@/test/render-with-providers';
import type { Step, StepList } from '../api/get-steps';
import { StepSettingsForm } from './step-settings-form';

const studyId = '43474abc-f2c2-4790-8e76-1092b9661cd1';
const step: Step = {
  id: '0f1e2d3c-4b5a-4978-8a6b-5c4d3e2f1a0b',
  position: 2,
  title: 'Session 2: finding the rooms',
  description: '',
  payMinor: 1250,
  hasCompletionCode: false,
  verification: 'staff',
  taskUrl: null,
  opensAfterDays: 7,
  opensFrom: 'previous-step',
  dueWithinDays: 3,
  payOverrides: [],
};
const list = (changes: Partial<Step>): StepList => ({
  items: [{ ...step, ...changes }],
  currency: 'USD',
  totalPayMinor: 1250,
  hasPayOverrides: false,
});
const path = `/api/studies/${studyId}/steps/${step.id}`;

describe('StepSettingsForm', { timeout: 20_000 }, () => {
  it('asks for the task address of a return-link step, then saves verification and window', async () => {
    const { requests } = stubApi({
      [`PUT ${path}`]: {
        status: 200,
        body: list({ verification: 'return-link', taskUrl: 'https://tasks.example.org/s2' }),
      },
    });
    const onSaved = vi.fn();
    renderWithProviders(<StepSettingsForm studyId={studyId} step={step} onSaved={onSaved} onCancel={() => {}} />);

    expect(screen.getByLabelText('Opens after (days)')).toHaveValue('7');
    expect(screen.getByLabelText('Due within (days)')).toHaveValue('3');
    await userEvent.click(screen.getByRole('radio', { name: /Return link from an external task/ }));
    await userEvent.click(screen.getByRole('button', { name: 'Save how it is checked' }));
    expect(await screen.findByText('Enter the address of the external task.')).toBeInTheDocument();
    expect(requests).toHaveLength(0);

    await userEvent.type(screen.getByLabelText('Address of the external task'), 'tasks.example.org');
    await userEvent.click(screen.getByRole('button', { name: 'Save how it is checked' }));
    expect(await screen.findByText('Enter a web address starting with http:// or https://.')).toBeInTheDocument();

    await userEvent.clear(screen.getByLabelText('Address of the external task'));
    await userEvent.type(screen.getByLabelText('Address of the external task'), 'https://tasks.example.org/s2');
    await userEvent.click(screen.getByRole('radio', { name: /No due date/ }));
    await userEvent.click(screen.getByRole('button', { name: 'Save how it is checked' }));
    await waitFor(() => expect(onSaved).toHaveBeenCalled());
    expect(requests[0]?.body).toEqual({
      verification: 'return-link',
      taskUrl: 'https://tasks.example.org/s2',
      opensAfterDays: 7,
      opensFrom: 'previous-step',
      dueWithinDays: null,
    });
  });

  it('warns that a shared code can be passed around and requires one when the step has none', async () => {
    const { requests } = stubApi({
      [`PUT ${path}`]: { status: 200, body: list({ verification: 'shared-code', hasCompletionCode: true }) },
    });
    const onSaved = vi.fn();
    renderWithProviders(<StepSettingsForm studyId={studyId} step={step} onSaved={onSaved} onCancel={() => {}} />);

    await userEvent.click(screen.getByRole('radio', { name: /One code for the whole step/ }));
    expect(screen.getByText(/Anyone who learns this code can claim the step’s pay/)).toBeInTheDocument();
    await userEvent.click(screen.getByRole('button', { name: 'Save how it is checked' }));
    expect(await screen.findByText('Enter the code everyone will type.')).toBeInTheDocument();

    await userEvent.type(screen.getByLabelText('The code everyone types'), 'ROOM-42');
    await userEvent.click(screen.getByRole('button', { name: 'Save how it is checked' }));
    await waitFor(() => expect(onSaved).toHaveBeenCalled());
    expect(requests[0]?.body).toMatchObject({
      verification: 'shared-code',
      taskUrl: null,
      sharedCode: 'ROOM-42',
      dueWithinDays: 3,
    });
  });

  it('shows the api’s field errors on their fields', async () => {
    stubApi({
      [`PUT ${path}`]: {
        status: 400,
        body: {
          statusCode: 400,
          code: 'VALIDATION_FAILED',
          message: 'Check the highlighted fields.',
          errors: [{ field: 'opensAfterDays', message: 'opensAfterDays must not be greater than 3650' }],
        },
      },
    });
    renderWithProviders(<StepSettingsForm studyId={studyId} step={step} onSaved={() => {}} onCancel={() => {}} />);

    await userEvent.click(screen.getByRole('button', { name: 'Save how it is checked' }));
    expect(await screen.findByText('opensAfterDays must not be greater than 3650')).toBeInTheDocument();
    expect(screen.getByLabelText('Opens after (days)')).toHaveAttribute('aria-invalid', 'true');
  });

  it('refuses a window that is not a whole number of days', async () => {
    const { requests } = stubApi({});
    renderWithProviders(<StepSettingsForm studyId={studyId} step={step} onSaved={() => {}} onCancel={() => {}} />);

    await userEvent.clear(screen.getByLabelText('Due within (days)'));
    await userEvent.type(screen.getByLabelText('Due within (days)'), '2.5');
    await userEvent.click(screen.getByRole('button', { name: 'Save how it is checked' }));
    expect(
      await screen.findByText('Enter a whole number of days from 0 to 3650, or choose no due date.'),
    ).toBeInTheDocument();
    expect(requests).toHaveLength(0);
  });
});
