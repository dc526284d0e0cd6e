import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { stubApi } from '@/test/api-stub';
import { renderWithProviders } from '@/test/render-with-providers';
import type { SchemeContext } from '../utils/scheme-settings';
import { SchemeForm } from './scheme-form';

const studyId = '0d9f8e7c-6b5a-4c3d-8e2f-1a0b9c8d7e6f';
const threeConditions: SchemeContext = {
  design: 'between',
  conditionWeights: [1, 1, 1],
  factors: [{ key: 'sense_of_direction', kind: 'numeric' }],
};

const savedAssignment = {
  method: 'stratified-blocks',
  settings: { blockSizes: [3, 6] },
  commitment: null,
  committedAt: null,
  sealedParameters: null,
  seed: null,
  seedRevealedAt: null,
  unblindedAt: null,
  unblindReason: null,
  allocated: 0,
  balance: [],
  pretestNote: 'Evenhand never assigns by a pretest cut-off.',
};

function renderForm(context: SchemeContext = threeConditions) {
  return renderWithProviders(
    <SchemeForm studyId={studyId} context={context} savedMethod={null} savedSettings={{}} resealsOnSave={false} />,
  );
}

const blockSizes = () => screen.getByLabelText('Allowed block sizes');
const save = () => userEvent.click(screen.getByRole('button', { name: 'Save scheme' }));

describe('SchemeForm', () => {
  it('offers only the between-subjects methods, each explained', () => {
    stubApi({});
    renderForm();
    const radios = screen.getAllByRole('radio').map((radio) => radio.textContent);
    expect(radios).toHaveLength(5);
    expect(screen.getByRole('radio', { name: /Stratified permuted blocks/ })).toHaveTextContent(/each stratum/);
    expect(screen.queryByRole('radio', { name: /Williams/ })).not.toBeInTheDocument();
  });

  it('refuses block size 4 when the total weight is 3, inline and without sending', async () => {
    const { requests } = stubApi({});
    renderForm();

    await userEvent.click(screen.getByRole('radio', { name: /Stratified permuted blocks/ }));
    await userEvent.clear(blockSizes());
    await userEvent.type(blockSizes(), '3, 4');
    await save();

    await waitFor(() => expect(blockSizes()).toHaveAttribute('aria-invalid', 'true'));
    expect(blockSizes()).toHaveAccessibleDescription(/4 is not a multiple of the total weight 3 \(1 \+ 1 \+ 1\)/);
    expect(requests).toHaveLength(0);
  });

  it('uses the weights: with 2 : 1 : 1 a block of 6 is refused and 4, 8 are saved', async () => {
    const { requests } = stubApi({
      'PUT /api/studies/0d9f8e7c-6b5a-4c3d-8e2f-1a0b9c8d7e6f/assignment-scheme': {
        status: 200,
        body: { ...savedAssignment, settings: { blockSizes: [4, 8] } },
      },
    });
    renderForm({ ...threeConditions, conditionWeights: [2, 1, 1] });

    await userEvent.click(screen.getByRole('radio', { name: /Stratified permuted blocks/ }));
    await userEvent.clear(blockSizes());
    await userEvent.type(blockSizes(), '6');
    await save();
    expect(await screen.findByText(/6 is not a multiple of the total weight 4/)).toBeInTheDocument();
    expect(requests).toHaveLength(0);

    await userEvent.clear(blockSizes());
    await userEvent.type(blockSizes(), '4, 8');
    await save();
    await waitFor(() => expect(requests).toHaveLength(1));
    expect(requests[0]).toMatchObject({ method: 'PUT', body: { method: 'stratified-blocks', blockSizes: [4, 8] } });
  });

  it('says a stratified scheme needs a factor when there is none', async () => {
    const { requests } = stubApi({});
    renderForm({ ...threeConditions, factors: [] });

    await userEvent.click(screen.getByRole('radio', { name: /Stratified permuted blocks/ }));
    await save();

    expect(await screen.findByRole('alert')).toHaveTextContent('add at least one factor first');
    expect(requests).toHaveLength(0);
  });

  it('starts minimization at the biased coin 2/3 and sends exactly 2/3', async () => {
    const { requests } = stubApi({
      'PUT /api/studies/0d9f8e7c-6b5a-4c3d-8e2f-1a0b9c8d7e6f/assignment-scheme': {
        status: 200,
        body: { ...savedAssignment, method: 'minimization', settings: {} },
      },
    });
    renderForm();

    await userEvent.click(screen.getByRole('radio', { name: /Minimization/ }));
    const coin = screen.getByLabelText('Probability of the least-imbalanced condition');
    expect(coin).toHaveValue('2/3');
    expect(coin).toHaveAccessibleDescription(/Efron, 1971/);
    await save();

    await waitFor(() => expect(requests).toHaveLength(1));
    expect(requests[0]?.body).toEqual({ method: 'minimization', measure: 'range', coinProbability: 2 / 3 });
  });

  it('puts the api’s block size error on the block sizes field', async () => {
    stubApi({
      'PUT /api/studies/0d9f8e7c-6b5a-4c3d-8e2f-1a0b9c8d7e6f/assignment-scheme': {
        status: 400,
        body: {
          statusCode: 400,
          code: 'VALIDATION_FAILED',
          message: 'The assignment settings are not valid.',
          errors: [{ field: 'blockSizes[1]', message: '9 is not a multiple of the total weight 2' }],
        },
      },
    });
    // The form was given an out-of-date design; the api's check is the one that counts.
    renderForm({ ...threeConditions, conditionWeights: [1, 1, 1] });

    await userEvent.click(screen.getByRole('radio', { name: /Permuted blocks/ }));
    await userEvent.clear(blockSizes());
    await userEvent.type(blockSizes(), '3, 9');
    await save();

    await waitFor(() => expect(blockSizes()).toHaveAccessibleDescription('9 is not a multiple of the total weight 2'));
  });
});
