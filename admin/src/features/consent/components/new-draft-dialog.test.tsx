import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it, vi } from 'vitest';
import { stubApi } from '@/test/api-stub';
import { renderWithProviders } from '@/test/render-with-providers';
import { consentTemplate as template, draftVersion, studyId } from '../test/consent-fixtures';
import { NewDraftDialog } from './new-draft-dialog';

const versionsPath = `/api/studies/${studyId}/consent-versions`;

// A dialog with a dozen fields renders slowly on the shared test machines.
describe('NewDraftDialog', { timeout: 15_000 }, () => {
  it('shows the caution and only the template’s own fields, and sends only what was filled in', async () => {
    const created = draftVersion();
    const { requests } = stubApi({
      'GET /api/consent-templates': { status: 200, body: { items: [template] } },
      [`POST ${versionsPath}`]: { status: 201, body: created },
    });
    const onCreated = vi.fn();
    renderWithProviders(<NewDraftDialog studyId={studyId} open onClose={vi.fn()} onCreated={onCreated} />);

    expect(await screen.findByText('Templates are a starting point, not legal advice.')).toBeInTheDocument();
    expect(screen.queryByLabelText('Contact telephone')).not.toBeInTheDocument();
    await userEvent.click(screen.getByLabelText('Institution'));
    await userEvent.paste('Harbor Lane Institute');
    await userEvent.type(screen.getByLabelText('Days until payment is sent'), '10');
    await userEvent.click(screen.getByRole('checkbox', { name: 'De-identified data may be used in future research' }));
    await userEvent.click(screen.getByRole('button', { name: 'Create draft' }));

    await waitFor(() => expect(onCreated).toHaveBeenCalledWith(created));
    expect(requests.find((request) => request.method === 'POST')?.body).toEqual({
      templateId: 'consent/minimal-risk-paid-study',
      values: { institutionName: 'Harbor Lane Institute', paymentDays: 10, futureUseDeidentified: true },
    });
  });

  it('names a bad number and a bad e-mail before sending anything', async () => {
    const { requests } = stubApi({ 'GET /api/consent-templates': { status: 200, body: { items: [template] } } });
    renderWithProviders(<NewDraftDialog studyId={studyId} open onClose={vi.fn()} onCreated={vi.fn()} />);

    await userEvent.type(await screen.findByLabelText('Days until payment is sent'), 'ten');
    await userEvent.click(screen.getByLabelText('Contact e-mail for questions'));
    await userEvent.paste('study at lab');
    await userEvent.click(screen.getByRole('button', { name: 'Create draft' }));

    expect(
      await screen.findByText('Enter the days until payment as a whole number, or leave it blank.'),
    ).toBeInTheDocument();
    expect(
      screen.getByText('Enter a valid e-mail address, like study@lab.org, or leave it blank.'),
    ).toBeInTheDocument();
    expect(requests.filter((request) => request.method === 'POST')).toHaveLength(0);
  });

  it('puts the api’s "values.<field>" errors on the field they name', async () => {
    stubApi({
      'GET /api/consent-templates': { status: 200, body: { items: [template] } },
      [`POST ${versionsPath}`]: {
        status: 400,
        body: {
          statusCode: 400,
          code: 'VALIDATION_FAILED',
          message: 'Some fields are not valid.',
          errors: [
            {
              field: 'values.investigatorName',
              message: 'investigatorName must be shorter than or equal to 200 characters',
            },
          ],
        },
      },
    });
    renderWithProviders(<NewDraftDialog studyId={studyId} open onClose={vi.fn()} onCreated={vi.fn()} />);

    await userEvent.click(await screen.findByLabelText('Investigator in charge'));
    await userEvent.paste('Dr. Ilse Marrow');
    await userEvent.click(screen.getByRole('button', { name: 'Create draft' }));

    await waitFor(() =>
      expect(screen.getByLabelText('Investigator in charge')).toHaveAccessibleDescription(
        'investigatorName must be shorter than or equal to 200 characters',
      ),
    );
  });

  it('says in plain words, at the first try, that the study needs a paid step, and sends nothing', async () => {
    const { requests } = stubApi({
      'GET /api/consent-templates': { status: 200, body: { items: [template] } },
      [`GET /api/studies/${studyId}/steps`]: { status: 200, body: { items: [], payOverrides: [] } },
    });
    renderWithProviders(<NewDraftDialog studyId={studyId} open onClose={vi.fn()} onCreated={vi.fn()} />);

    expect(
      await screen.findByText(/Steps and pay come from the study’s set-up: it has no steps yet/),
    ).toBeInTheDocument();
    await userEvent.click(screen.getByRole('button', { name: 'Create draft' }));

    expect(
      await screen.findByText(
        'Add at least one step with its pay on the Set-up tab first: the form tells people what each step pays.',
      ),
    ).toBeInTheDocument();
    expect(screen.queryByText(/steps:/)).not.toBeInTheDocument();
    expect(requests.filter((request) => request.method === 'POST')).toHaveLength(0);
  });

  it('words the api’s "steps" refusal the same way when the steps went away meanwhile', async () => {
    stubApi({
      'GET /api/consent-templates': { status: 200, body: { items: [template] } },
      [`GET /api/studies/${studyId}/steps`]: {
        status: 200,
        body: { items: [{ id: 'a4d1c2b3-0000-4000-8000-000000000001', title: 'Session 1' }], payOverrides: [] },
      },
      [`POST ${versionsPath}`]: {
        status: 400,
        body: {
          statusCode: 400,
          code: 'VALIDATION_FAILED',
          message: 'Some fields are not valid.',
          errors: [{ field: 'steps', message: 'must list at least one step with its pay' }],
        },
      },
    });
    renderWithProviders(<NewDraftDialog studyId={studyId} open onClose={vi.fn()} onCreated={vi.fn()} />);

    expect(await screen.findByText(/Steps and pay come from the study’s set-up: 1 step/)).toBeInTheDocument();
    await userEvent.click(screen.getByRole('button', { name: 'Create draft' }));

    expect(
      await screen.findByText(
        'Add at least one step with its pay on the Set-up tab first: the form tells people what each step pays.',
      ),
    ).toBeInTheDocument();
    expect(screen.queryByText(/must list at least one step/)).not.toBeInTheDocument();
  });
});
