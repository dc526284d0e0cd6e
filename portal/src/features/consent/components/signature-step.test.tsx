import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { beforeEach, describe, expect, it } from 'vitest';
import { drawStroke, stubCanvas, stubMark } from '@/test/canvas-stub';
import { installFakeApi, participant } from '@/test/fake-api';
import {
  assignment,
  consentToSign,
  enrollment,
  fingerprint,
  pdfBytes,
  publicStudy,
  signedEnrollment,
  studyId,
  versionId,
} from '@/test/participant-fixtures';
import { renderApp } from '@/test/render-app';

const signaturePath = `/api/studies/${studyId}/enrollments/me/signature`;
const signed = {
  status: 201,
  body: { signatureId: 'sig-1', signedAt: '2026-02-03T14:05:00.000Z', assignment, enrollment: signedEnrollment() },
};
const pdf = { status: 200, raw: { bytes: pdfBytes, contentType: 'application/pdf' } };
// The browser's own zone goes with the signature; under test that is the zone the test process runs in.
const timeZone = Intl.DateTimeFormat().resolvedOptions().timeZone;

function atSigning(handlers: Parameters<typeof installFakeApi>[0] = {}) {
  // Four reading pages were read; the fifth screen is the signature.
  localStorage.setItem(`evenhand:consent-reading:${studyId}:${versionId}`, '4');
  return installFakeApi({
    'GET /api/auth/me': { status: 200, body: participant },
    'GET /api/public/studies/wayfinding-cues': { status: 200, body: publicStudy },
    [`GET /api/studies/${studyId}/enrollments/me`]: {
      status: 200,
      body: enrollment({ status: 'screened', next: 'consent' }),
    },
    [`GET /api/studies/${studyId}/enrollments/me/consent`]: { status: 200, body: consentToSign() },
    [`POST ${signaturePath}`]: signed,
    [`GET /api/studies/${studyId}/enrollments/me/consent.pdf`]: pdf,
    ...handlers,
  });
}

async function openSignature() {
  const user = userEvent.setup();
  renderApp('/s/wayfinding-cues');
  // The first render also loads the route's code, which can take a moment.
  await screen.findByRole('heading', { name: 'Sign the consent form' }, { timeout: 3_000 });
  return user;
}

beforeEach(() => stubCanvas());

describe('signing the consent form', () => {
  it('shows the version, a short fingerprint with the whole one on request, and the meaning beside the button', async () => {
    atSigning();
    const user = await openSignature();

    expect(screen.getByText('Version 2')).toBeInTheDocument();
    expect(screen.getByText(/HLREB-2026-014/)).toBeInTheDocument();
    expect(screen.getByText('ba7816bf…f20015ad')).toBeInTheDocument();
    await user.click(screen.getByRole('button', { name: 'Show the whole fingerprint' }));
    expect(screen.getByLabelText(`Whole fingerprint: ${fingerprint}`)).toHaveTextContent(/^ba78 16bf 8f01 .* 15ad$/);

    const signButton = screen.getByRole('button', { name: 'Sign the form' });
    expect(signButton).toHaveAccessibleDescription(
      /your signature means: “I have read this form and agree to take part”/,
    );
  });

  it('needs the typed full name and sends nothing without it', async () => {
    const fakeApi = atSigning();
    const user = await openSignature();

    await user.click(screen.getByRole('button', { name: 'Sign the form' }));

    expect(await screen.findByText('Please type your full name.')).toBeInTheDocument();
    expect(screen.getByLabelText('Your full name')).toHaveFocus();
    await user.type(screen.getByLabelText('Your full name'), 'R');
    await user.click(screen.getByRole('button', { name: 'Sign the form' }));
    expect(await screen.findByText('Please type your full name, at least 2 letters.')).toBeInTheDocument();
    expect(fakeApi.callsTo('POST', signaturePath)).toHaveLength(0);
  });

  it('signs with the typed name alone, since the drawing is optional, then shows the condition and steps', async () => {
    const fakeApi = atSigning();
    const user = await openSignature();

    await user.type(screen.getByLabelText('Your full name'), '  Robin Ash ');
    await user.click(screen.getByRole('button', { name: 'Sign the form' }));

    expect(await screen.findByRole('heading', { name: 'Route guide A' })).toBeInTheDocument();
    expect(fakeApi.callsTo('POST', signaturePath).map((request) => request.body)).toEqual([
      { versionId, fingerprint, typedName: 'Robin Ash', timeZone },
    ]);
    expect(screen.getByText('You have signed the consent form')).toBeInTheDocument();
    expect(screen.getByText('Before each route you will hear a short spoken hint.')).toBeInTheDocument();
    expect(screen.getByText('Use headphones if you can.')).toBeInTheDocument();
    expect(screen.getByRole('heading', { name: 'Your steps' })).toBeInTheDocument();
    expect(screen.getByText('0 of 3 done')).toBeInTheDocument();
    expect(screen.getByText('Ready for you')).toBeInTheDocument();
    const download = await screen.findByRole('link', { name: 'Download your signed form (PDF)' });
    expect(download).toHaveAttribute('download', 'signed-consent-WC-0042.pdf');
    expect(download.getAttribute('href')).toMatch(/^blob:/);
  });

  it('sends a drawn mark with the signature, and none after it is cleared', async () => {
    const fakeApi = atSigning({
      [`POST ${signaturePath}`]: {
        status: 400,
        body: { statusCode: 400, code: 'VALIDATION_FAILED', message: 'Not saved', errors: [] },
      },
    });
    const user = await openSignature();
    const pad = screen.getByRole('img', { name: 'Draw your signature (optional)' });
    await user.type(screen.getByLabelText('Your full name'), 'Robin Ash');

    drawStroke(pad);
    expect(await screen.findByText('Drawing added.')).toBeInTheDocument();
    await user.click(screen.getByRole('button', { name: 'Sign the form' }));
    await waitFor(() => expect(fakeApi.callsTo('POST', signaturePath)).toHaveLength(1));

    await user.click(screen.getByRole('button', { name: 'Clear the drawing' }));
    expect(screen.getByText('No drawing yet.')).toBeInTheDocument();
    await user.click(screen.getByRole('button', { name: 'Sign the form' }));
    await waitFor(() => expect(fakeApi.callsTo('POST', signaturePath)).toHaveLength(2));

    expect(fakeApi.callsTo('POST', signaturePath).map((request) => request.body)).toEqual([
      { versionId, fingerprint, typedName: 'Robin Ash', mark: stubMark, timeZone },
      { versionId, fingerprint, typedName: 'Robin Ash', timeZone },
    ]);
  });

  it('on a changed form, says so and takes the reader to the new version from its start', async () => {
    const newVersionId = '1a2b3c4d-5e6f-4a7b-8c9d-0e1f2a3b4c5d';
    const newFingerprint = 'e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855';
    const fakeApi = atSigning({
      [`GET /api/studies/${studyId}/enrollments/me/consent`]: (_request, call) => ({
        status: 200,
        body:
          call === 1
            ? consentToSign()
            : consentToSign({ versionId: newVersionId, version: 3, fingerprint: newFingerprint }),
      }),
      [`POST ${signaturePath}`]: {
        status: 409,
        body: {
          statusCode: 409,
          code: 'CONSENT_VERSION_STALE',
          message: 'This consent version is no longer active',
          currentVersion: { versionId: newVersionId, version: 3, fingerprint: newFingerprint },
        },
      },
    });
    const user = await openSignature();

    await user.type(screen.getByLabelText('Your full name'), 'Robin Ash');
    await user.click(screen.getByRole('button', { name: 'Sign the form' }));

    expect(
      await screen.findByText('The form was updated while you were reading: this is version 3'),
    ).toBeInTheDocument();
    expect(screen.getByText(/Your signature was not saved/)).toBeInTheDocument();
    expect(screen.getByRole('heading', { name: 'Key information' })).toBeInTheDocument();
    expect(screen.getByText('Part 1 of 4')).toBeInTheDocument();
    expect(fakeApi.callsTo('GET', `/api/studies/${studyId}/enrollments/me/consent`)).toHaveLength(2);

    // Reading the new version through ends at a signature for the new version.
    await user.click(screen.getByRole('button', { name: 'Read the full form' }));
    await user.click(screen.getByRole('button', { name: 'Next: Risks and discomforts' }));
    await user.click(screen.getByRole('button', { name: 'Next: Questions' }));
    await user.click(screen.getByRole('button', { name: 'Continue to signing' }));
    expect(screen.getByText('Version 3')).toBeInTheDocument();
    expect(screen.getByText('e3b0c442…7852b855')).toBeInTheDocument();
  });

  it('says the signed copy is being prepared, and offers it once the api has made it', async () => {
    const fakeApi = atSigning({
      [`GET /api/studies/${studyId}/enrollments/me/consent.pdf`]: (_request, call) =>
        call === 1 ? { status: 404, body: { statusCode: 404, code: 'NOT_FOUND', message: 'Not ready' } } : pdf,
    });
    const user = await openSignature();
    await user.type(screen.getByLabelText('Your full name'), 'Robin Ash');
    await user.click(screen.getByRole('button', { name: 'Sign the form' }));

    expect(await screen.findByText('Your signed copy is being prepared…')).toBeInTheDocument();
    expect(
      await screen.findByRole('link', { name: 'Download your signed form (PDF)' }, { timeout: 5_000 }),
    ).toBeInTheDocument();
    expect(fakeApi.callsTo('GET', `/api/studies/${studyId}/enrollments/me/consent.pdf`)).toHaveLength(2);
  }, 10_000);

  it('checks the name as soon as the signer leaves the field, before the button is pressed', async () => {
    const fakeApi = atSigning();
    const user = await openSignature();

    await user.type(screen.getByLabelText('Your full name'), 'R');
    await user.tab();

    expect(await screen.findByText('Please type your full name, at least 2 letters.')).toBeInTheDocument();
    await user.type(screen.getByLabelText('Your full name'), 'obin Ash');
    await waitFor(() =>
      expect(screen.queryByText('Please type your full name, at least 2 letters.')).not.toBeInTheDocument(),
    );
    expect(fakeApi.callsTo('POST', signaturePath)).toHaveLength(0);
  });

  it("puts the api's refusal of the name in plain words, without its field name", async () => {
    atSigning({
      [`POST ${signaturePath}`]: {
        status: 400,
        body: {
          statusCode: 400,
          code: 'VALIDATION_FAILED',
          message: 'Some fields are not right',
          errors: [{ field: 'typedName', message: 'typedName must be your full name (2 to 200 characters)' }],
        },
      },
    });
    const user = await openSignature();

    await user.type(screen.getByLabelText('Your full name'), 'Robin Ash');
    await user.click(screen.getByRole('button', { name: 'Sign the form' }));

    expect(await screen.findByText('Please type your full name, 2 to 200 characters.')).toBeInTheDocument();
    expect(screen.queryByText(/typedName/)).not.toBeInTheDocument();
    expect(screen.getByLabelText('Your full name')).toHaveFocus();
  });

  it('after signing, moves focus to the confirmation, with the assigned instructions right under it', async () => {
    atSigning();
    const user = await openSignature();

    await user.type(screen.getByLabelText('Your full name'), 'Robin Ash');
    await user.keyboard('{Enter}');

    const confirmation = await screen.findByRole('heading', { name: 'You have signed the consent form' });
    await waitFor(() => expect(confirmation).toHaveFocus());
    const section = confirmation.closest('section')!;
    expect(section).toContainElement(screen.getByRole('heading', { name: 'Route guide A' }));
    expect(section).toContainElement(screen.getByText('Use headphones if you can.'));
  });
});
