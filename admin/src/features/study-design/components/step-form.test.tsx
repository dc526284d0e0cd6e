import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it, vi } from 'vitest';
import { stubApi } from '@/test/api-stub';
import { renderWithProviders } from '@/test/render-with-providers';
import { StepForm } from './step-form';

const studyId = '43474abc-f2c2-4790-8e76-1092b9661cd1';
const stepsPath = `/api/studies/${studyId}/steps`;

async function fillStep(pay: string) {
  await userEvent.type(screen.getByLabelText('Step title'), 'Session 1');
  await userEvent.clear(screen.getByLabelText('Pay (USD)'));
  await userEvent.type(screen.getByLabelText('Pay (USD)'), pay);
  await userEvent.click(screen.getByRole('button', { name: 'Add step' }));
}

describe('StepForm pay messages', { timeout: 20_000 }, () => {
  it('says a pay above the ceiling as money in the study’s currency, and sends nothing', async () => {
    const { requests } = stubApi({});
    renderWithProviders(
      <StepForm studyId={studyId} currency="USD" stepCount={0} onSaved={vi.fn()} onCancel={vi.fn()} />,
    );
    await fillStep('2000000');
    expect(await screen.findByText('Pay per step: at most $1,000,000.00.')).toBeInTheDocument();
    expect(requests).toHaveLength(0);
  });

  it('asks for an amount above zero when a negative one is typed', async () => {
    stubApi({});
    renderWithProviders(
      <StepForm studyId={studyId} currency="USD" stepCount={0} onSaved={vi.fn()} onCancel={vi.fn()} />,
    );
    await fillStep('-10');
    expect(await screen.findByText('Enter an amount above zero.')).toBeInTheDocument();
  });

  it('rewrites the api’s payMinor refusal as money on the pay field', async () => {
    stubApi({
      [`POST ${stepsPath}`]: {
        status: 400,
        body: {
          statusCode: 400,
          code: 'VALIDATION_FAILED',
          message: 'Invalid',
          errors: [{ field: 'payMinor', message: 'payMinor must not be greater than 100000000' }],
        },
      },
    });
    renderWithProviders(
      <StepForm studyId={studyId} currency="EUR" stepCount={0} onSaved={vi.fn()} onCancel={vi.fn()} />,
    );
    await userEvent.type(screen.getByLabelText('Step title'), 'Session 1');
    await userEvent.type(screen.getByLabelText('Pay (EUR)'), '15');
    await userEvent.click(screen.getByRole('button', { name: 'Add step' }));
    await waitFor(() =>
      expect(screen.getByLabelText('Pay (EUR)')).toHaveAccessibleDescription(/Pay per step: at most €1,000,000\.00\./),
    );
    expect(screen.queryByText(/100000000/)).not.toBeInTheDocument();
  });
});
