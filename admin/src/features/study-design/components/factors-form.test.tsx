import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it, vi } from 'vitest';
import { stubApi } from '@/test/api-stub';
import { renderWithProviders } from '@/test/render-with-providers';
import { FactorsForm } from './factors-form';

const studyId = '43474abc-f2c2-4790-8e76-1092b9661cd1';
const path = `PUT /api/studies/${studyId}/stratification-factors`;
const pretestNote = 'Evenhand never assigns by a pretest cut-off (everyone above a score to one condition).';

function renderForm() {
  return renderWithProviders(
    <FactorsForm studyId={studyId} factors={[]} pretestNote={pretestNote} onSaved={vi.fn()} onCancel={vi.fn()} />,
  );
}

describe('FactorsForm', () => {
  it('explains, once a numeric pretest is added, that it stratifies and never decides by cut-off', async () => {
    stubApi({});
    renderForm();
    expect(screen.queryByText(pretestNote)).not.toBeInTheDocument();

    await userEvent.click(screen.getByRole('button', { name: 'Add factor' }));
    expect(screen.getByText('A pretest balances the assignment; it never decides it')).toBeInTheDocument();
    expect(screen.getByText(pretestNote)).toBeInTheDocument();

    await userEvent.click(screen.getByRole('button', { name: /Kind/ }));
    await userEvent.click(await screen.findByRole('option', { name: /Categorical/ }));
    expect(screen.queryByText(pretestNote)).not.toBeInTheDocument();
  });

  it('previews the levels of cut point 50 as “<50 / ≥50” and saves the cut as a number', async () => {
    const { requests } = stubApi({ [path]: { status: 200, body: { items: [], pretestNote } } });
    renderForm();

    await userEvent.click(screen.getByRole('button', { name: 'Add factor' }));
    await userEvent.type(
      screen.getByLabelText('Question participants answer'),
      'How good is your sense of direction (0–100)?',
    );
    await userEvent.type(screen.getByLabelText('Key'), 'sense_of_direction');
    await userEvent.type(screen.getByLabelText('Cut points'), '50');
    expect(screen.getByText('<50 / ≥50')).toBeInTheDocument();
    await userEvent.click(screen.getByRole('button', { name: 'Save factors' }));

    await waitFor(() => expect(requests).toHaveLength(1));
    expect(requests[0]?.body).toEqual({
      factors: [
        {
          key: 'sense_of_direction',
          label: 'How good is your sense of direction (0–100)?',
          kind: 'numeric',
          cutPoints: [50],
          minimizationWeight: 1,
        },
      ],
    });
  });

  it('refuses falling cut points and puts the api’s row errors on the row’s fields', async () => {
    const { requests } = stubApi({
      [path]: {
        status: 400,
        body: {
          statusCode: 400,
          code: 'VALIDATION_FAILED',
          message: 'Some fields are missing or invalid.',
          errors: [{ field: 'factors.0.key', message: 'key must start with a letter' }],
        },
      },
    });
    renderForm();

    await userEvent.click(screen.getByRole('button', { name: 'Add factor' }));
    await userEvent.type(screen.getByLabelText('Question participants answer'), 'Pretest score');
    await userEvent.type(screen.getByLabelText('Key'), 'pretest');
    await userEvent.type(screen.getByLabelText('Cut points'), '65, 40');
    await userEvent.click(screen.getByRole('button', { name: 'Save factors' }));
    expect(await screen.findByText('40 comes after 65; list cut points from low to high.')).toBeInTheDocument();
    expect(requests).toHaveLength(0);

    await userEvent.clear(screen.getByLabelText('Cut points'));
    await userEvent.type(screen.getByLabelText('Cut points'), '40, 65');
    await userEvent.click(screen.getByRole('button', { name: 'Save factors' }));
    await waitFor(() =>
      expect(screen.getByLabelText('Key')).toHaveAccessibleDescription('key must start with a letter'),
    );
  });
});
