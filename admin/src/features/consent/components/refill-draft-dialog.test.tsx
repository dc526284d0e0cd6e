import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it, vi } from 'vitest';
import { stubApi } from '@/test/api-stub';
import { renderWithProviders } from '@/test/render-with-providers';
import { consentTemplate, draftVersion, studyId } from '../test/consent-fixtures';
import { RefillDraftDialog } from './refill-draft-dialog';

const version = draftVersion();
const refillPath = `/api/studies/${studyId}/consent-versions/${version.id}/refill`;
const templates = { 'GET /api/consent-templates': { status: 200, body: { items: [consentTemplate] } } };

// A dialog with a dozen fields renders slowly on the shared test machines.
describe('RefillDraftDialog', { timeout: 15_000 }, () => {
  it('starts from the values the draft was filled with, warns that the text is replaced, and sends the edited values', async () => {
    const refilled = draftVersion({
      body: '# Consent to take part in a research study: Wayfinding cues\n\nThe study is run by Harbor Lane Institute.',
    });
    const { requests } = stubApi({ ...templates, [`POST ${refillPath}`]: { status: 200, body: refilled } });
    const onRefilled = vi.fn();
    renderWithProviders(
      <RefillDraftDialog
        studyId={studyId}
        version={version}
        open
        unsavedEdits={false}
        onClose={vi.fn()}
        onRefilled={onRefilled}
      />,
    );

    expect(await screen.findByLabelText('Investigator in charge')).toHaveValue('Dr. Ines Valcourt');
    expect(screen.getByLabelText('Days until payment is sent')).toHaveValue('7');
    expect(screen.getByRole('checkbox', { name: 'De-identified data may be used in future research' })).toBeChecked();
    expect(screen.getByLabelText('Institution')).toHaveValue('');
    expect(screen.getByText('This replaces the whole form text with the template’s wording.')).toBeInTheDocument();
    expect(screen.queryByText(/edits in the text box that are not saved/)).not.toBeInTheDocument();
    expect(screen.getByText('Templates are a starting point, not legal advice.')).toBeInTheDocument();

    await userEvent.click(screen.getByLabelText('Institution'));
    await userEvent.paste('Harbor Lane Institute');
    await userEvent.clear(screen.getByLabelText('Days until payment is sent'));
    await userEvent.click(screen.getByRole('button', { name: 'Replace the text' }));

    await waitFor(() => expect(onRefilled).toHaveBeenCalledWith(refilled));
    // Cleared fields are left out, so the api marks them "to fill" again rather than keeping the old value.
    expect(requests.find((request) => request.method === 'POST')?.body).toEqual({
      values: {
        institutionName: 'Harbor Lane Institute',
        investigatorName: 'Dr. Ines Valcourt',
        futureUseDeidentified: true,
      },
    });
  });

  it('says unsaved edits in the text box are lost too', async () => {
    stubApi(templates);
    renderWithProviders(
      <RefillDraftDialog
        studyId={studyId}
        version={version}
        open
        unsavedEdits
        onClose={vi.fn()}
        onRefilled={vi.fn()}
      />,
    );

    expect(await screen.findByText(/including the edits in the text box that are not saved yet/)).toBeInTheDocument();
  });

  it('shows the api’s refusal above the form and a field error on its field', async () => {
    let answer = 0;
    stubApi({
      ...templates,
      [`POST ${refillPath}`]: () =>
        answer++ === 0
          ? {
              status: 409,
              body: {
                statusCode: 409,
                code: 'CONSENT_VERSION_NOT_DRAFT',
                message: 'Version 3 is active, so its text is fixed; create a new draft to change the wording.',
              },
            }
          : {
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
    const onRefilled = vi.fn();
    renderWithProviders(
      <RefillDraftDialog
        studyId={studyId}
        version={version}
        open
        unsavedEdits={false}
        onClose={vi.fn()}
        onRefilled={onRefilled}
      />,
    );

    await userEvent.click(await screen.findByRole('button', { name: 'Replace the text' }));
    expect(
      await screen.findByText('Version 3 is active, so its text is fixed; create a new draft to change the wording.'),
    ).toBeInTheDocument();
    await userEvent.click(screen.getByRole('button', { name: 'Replace the text' }));
    await waitFor(() =>
      expect(screen.getByLabelText('Investigator in charge')).toHaveAccessibleDescription(
        'investigatorName must be shorter than or equal to 200 characters',
      ),
    );
    expect(onRefilled).not.toHaveBeenCalled();
  });

  it('explains, instead of a form, when the draft’s template is no longer on the server', async () => {
    const { requests } = stubApi(templates);
    const orphan = draftVersion({ templateId: 'consent/retired-template' });
    renderWithProviders(
      <RefillDraftDialog
        studyId={studyId}
        version={orphan}
        open
        unsavedEdits={false}
        onClose={vi.fn()}
        onRefilled={vi.fn()}
      />,
    );

    expect(
      await screen.findByText(
        /The template this draft was made from \(consent\/retired-template\) is no longer on this server/,
      ),
    ).toBeInTheDocument();
    expect(screen.queryByRole('button', { name: 'Replace the text' })).not.toBeInTheDocument();
    expect(requests.filter((request) => request.method === 'POST')).toHaveLength(0);
  });
});
