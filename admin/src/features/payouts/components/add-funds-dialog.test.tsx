import { screen } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it, vi } from 'vitest';
import { stubApi } from '@/test/api-stub';
import { renderWithProviders } from '@/test/render-with-providers';
import { AddFundsDialog } from './add-funds-dialog';

const studyId = 'fd81ba27-7b62-43f7-9ccb-3494ef5fcdc7';
const fundingPath = `/api/studies/${studyId}/funding`;

function openDialog() {
  return renderWithProviders(
    <AddFundsDialog studyId={studyId} currency="USD" open onClose={vi.fn()} onFunded={vi.fn()} />,
  );
}

describe('AddFundsDialog', { timeout: 15_000 }, () => {
  it('refuses an empty amount, a third decimal and less than the minimum, without calling the api', async () => {
    const { requests } = stubApi({});
    openDialog();
    await screen.findByText('Add funds by card');
    const amount = screen.getByLabelText('Amount (USD)');
    const submit = screen.getByRole('button', { name: 'Continue to card' });

    await userEvent.click(submit);
    expect(await screen.findByText('Enter an amount.')).toBeInTheDocument();
    expect(amount).toHaveAttribute('aria-invalid', 'true');

    await userEvent.type(amount, '12.345');
    await userEvent.click(submit);
    expect(await screen.findByText('USD amounts have at most 2 digits after the point.')).toBeInTheDocument();

    await userEvent.clear(amount);
    await userEvent.type(amount, '0.99');
    await userEvent.click(submit);
    expect(await screen.findByText('Add at least $1.00.')).toBeInTheDocument();

    await userEvent.clear(amount);
    await userEvent.type(amount, 'ten');
    await userEvent.click(submit);
    expect(await screen.findByText('Enter an amount in numbers, like 15 or 15.50.')).toBeInTheDocument();

    expect(requests).toHaveLength(0);
  });

  it('sends the amount in minor units and moves on to the card', async () => {
    const { requests } = stubApi({
      [`POST ${fundingPath}`]: {
        status: 201,
        body: {
          fundingId: 'a1b2c3d4-0000-4000-8000-000000000001',
          clientSecret: 'pi_1_secret_2',
          publishableKey: 'pk_test_1',
          scriptUrl: 'http://127.0.0.1:3200/v1/stripe.js',
          amountMinor: 125050,
          currency: 'USD',
        },
      },
    });
    openDialog();
    await userEvent.type(await screen.findByLabelText('Amount (USD)'), '1,250.50');
    await userEvent.click(screen.getByRole('button', { name: 'Continue to card' }));

    expect(await screen.findByText('$1,250.50', { selector: 'strong' })).toBeInTheDocument();
    expect(requests.find((request) => request.path === fundingPath)?.body).toEqual({ amountMinor: 125050 });
  });

  it('shows the api refusal on the amount field', async () => {
    stubApi({
      [`POST ${fundingPath}`]: {
        status: 409,
        body: { statusCode: 409, code: 'STUDY_CLOSED', message: 'A closed study takes no more funding.' },
      },
    });
    openDialog();
    await userEvent.type(await screen.findByLabelText('Amount (USD)'), '50');
    await userEvent.click(screen.getByRole('button', { name: 'Continue to card' }));
    expect(await screen.findByRole('alert')).toHaveTextContent('A closed study takes no more funding.');
  });
});
