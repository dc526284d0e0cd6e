import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { installFakeApi, participant } from '@/test/fake-api';
import { consentToSign, pdfBytes, publicStudy, signedEnrollment, studyId } from '@/test/participant-fixtures';
import { renderApp } from '@/test/render-app';

const enrollmentPath = `/api/studies/${studyId}/enrollments/me`;
const completePath = `${enrollmentPath}/steps/s1/complete`;
const atFirstStep = signedEnrollment();
const afterFirstStep = signedEnrollment({
  status: 'active',
  steps: atFirstStep.steps.map((step, index) => ({
    ...step,
    status: index === 0 ? 'done' : index === 1 ? 'open' : 'locked',
    completedAt: index === 0 ? '2026-02-05T10:00:00.000Z' : null,
    hasCompletionCode: true,
  })),
  earned: { earnedMinor: 1250, paidMinor: 0, stillToBePaidMinor: 1250 },
});

const problemReply = (statusCode: number, code: string, message: string, more: Record<string, unknown> = {}) => ({
  status: statusCode,
  body: { statusCode, code, message, ...more },
});

function atSteps(handlers: Parameters<typeof installFakeApi>[0] = {}) {
  return installFakeApi({
    'GET /api/auth/me': { status: 200, body: participant },
    'GET /api/public/studies/wayfinding-cues': { status: 200, body: publicStudy },
    [`GET ${enrollmentPath}`]: { status: 200, body: atFirstStep },
    [`GET ${enrollmentPath}/consent.pdf`]: { status: 200, raw: { bytes: pdfBytes, contentType: 'application/pdf' } },
    [`POST ${completePath}`]: { status: 200, body: afterFirstStep },
    ...handlers,
  });
}

async function openFirstStep() {
  const user = userEvent.setup();
  renderApp('/s/wayfinding-cues');
  const step = (await screen.findByRole('heading', { name: 'Step 1 · First session' }, { timeout: 8_000 })).closest(
    'li',
  );
  if (!step) throw new Error('Step 1 is not in a list item');
  return { user, step: within(step) };
}

describe('finishing a step with its completion code', () => {
  it('offers the code form on the open step only', async () => {
    atSteps();
    const { step } = await openFirstStep();

    expect(step.getByRole('form', { name: 'Step 1 · First session' })).toBeInTheDocument();
    expect(step.getByLabelText('Completion code')).toHaveAccessibleDescription(/Shown at the end of this step/);
    expect(screen.getAllByRole('button', { name: 'I finished this step' })).toHaveLength(1);
    expect(screen.getByRole('link', { name: 'Getting paid' })).toHaveAttribute('href', '/payouts');
  });

  it('says staff mark a step done when it has no code, and offers no code form there', async () => {
    const noCode = signedEnrollment();
    noCode.steps = noCode.steps.map((step, index) => (index === 0 ? { ...step, hasCompletionCode: false } : step));
    atSteps({ [`GET ${enrollmentPath}`]: { status: 200, body: noCode } });
    const { step } = await openFirstStep();

    expect(
      step.getByText(/There is no code to enter for this step: the research team marks it done/),
    ).toBeInTheDocument();
    expect(step.queryByLabelText('Completion code')).not.toBeInTheDocument();
    expect(screen.queryByRole('button', { name: 'I finished this step' })).not.toBeInTheDocument();
  });

  it('asks for the code and sends nothing when it is left empty', async () => {
    const fakeApi = atSteps();
    const { user, step } = await openFirstStep();

    await user.click(step.getByRole('button', { name: 'I finished this step' }));

    expect(await step.findByText('Please enter the code you were given at the end of this step.')).toBeInTheDocument();
    expect(step.getByLabelText('Completion code')).toHaveFocus();
    expect(fakeApi.callsTo('POST', completePath)).toHaveLength(0);
  });

  it('sends the code, then shows the step done with its pay and the new amount earned', async () => {
    const fakeApi = atSteps();
    const { user, step } = await openFirstStep();
    expect(screen.getByText('Earned so far').nextElementSibling).toHaveTextContent('$0.00');

    await user.type(step.getByLabelText('Completion code'), '  way-1-test ');
    await user.click(step.getByRole('button', { name: 'I finished this step' }));

    const thanks = await step.findByText('Thank you: step 1 is done');
    expect(fakeApi.callsTo('POST', completePath).map((request) => request.body)).toEqual([{ code: 'way-1-test' }]);
    expect(thanks.closest('[tabindex="-1"]')).toHaveFocus();
    expect(step.getByText('Done')).toBeInTheDocument();
    expect(
      step.getByText((_text, element) => element?.tagName === 'P' && element.textContent === '$12.50 earned'),
    ).toBeInTheDocument();
    expect(step.getByText(/\$12\.50 is added to what you have earned/)).toBeInTheDocument();
    expect(step.queryByLabelText('Completion code')).not.toBeInTheDocument();
    expect(screen.getByText('Earned so far').nextElementSibling).toHaveTextContent('$12.50');
    expect(screen.getByText('Still to be paid').nextElementSibling).toHaveTextContent('$12.50');
    expect(screen.getByText('1 of 3 done')).toBeInTheDocument();
    // The next step opened and has its own form.
    const second = within(screen.getByRole('heading', { name: 'Step 2 · Second session' }).closest('li')!);
    expect(second.getByRole('button', { name: 'I finished this step' })).toBeInTheDocument();
  });

  it('shows the api’s own words for a code that does not match, at the field', async () => {
    atSteps({
      [`POST ${completePath}`]: problemReply(400, 'VALIDATION_FAILED', 'That code does not match this step.', {
        errors: [{ field: 'code', message: 'does not match; check it and try again' }],
      }),
    });
    const { user, step } = await openFirstStep();

    await user.type(step.getByLabelText('Completion code'), 'WAY-WRONG');
    await user.click(step.getByRole('button', { name: 'I finished this step' }));

    expect(await step.findByText('Does not match; check it and try again.')).toBeInTheDocument();
    const input = step.getByLabelText('Completion code');
    expect(input).toHaveAttribute('aria-invalid', 'true');
    expect(input).toHaveAccessibleDescription(/Does not match; check it and try again\./);
    await waitFor(() => expect(input).toHaveFocus());
    expect(step.getByText('Ready for you')).toBeInTheDocument();
  });

  it('asks calmly for a pause after too many wrong codes, with a way to reach the research team', async () => {
    atSteps({
      [`POST ${completePath}`]: problemReply(429, 'RATE_LIMITED', 'Too many wrong codes. Please wait 15 minutes.'),
    });
    const { user, step } = await openFirstStep();

    await user.type(step.getByLabelText('Completion code'), 'WAY-WRONG');
    await user.click(step.getByRole('button', { name: 'I finished this step' }));

    const pause = await step.findByText('Let’s pause for a few minutes');
    expect(pause.closest('[role="status"]')).toHaveTextContent(/paused checking codes for 15 minutes/);
    expect(step.getByRole('link', { name: 'wayfinding@harborlane.test' })).toHaveAttribute(
      'href',
      'mailto:wayfinding@harborlane.test',
    );
    expect(step.queryByRole('alert')).not.toBeInTheDocument();
    expect(step.getByLabelText('Completion code')).not.toHaveAttribute('aria-invalid');
  });

  it('takes them to sign the new consent form when the form changed before this step', async () => {
    const newVersionId = '9a8b7c6d-5e4f-4a3b-8c2d-1e0f9a8b7c6d';
    const fakeApi = atSteps({
      [`GET ${enrollmentPath}`]: (_request, callNumber) => ({
        status: 200,
        body:
          callNumber === 1
            ? atFirstStep
            : signedEnrollment({
                next: 're-consent',
                consent: { ...atFirstStep.consent, activeVersionId: newVersionId, needsSignature: true },
                steps: atFirstStep.steps.map((step) => ({ ...step, status: 'locked' })),
              }),
      }),
      [`GET ${enrollmentPath}/consent`]: { status: 200, body: consentToSign({ versionId: newVersionId, version: 3 }) },
      [`POST ${completePath}`]: problemReply(409, 'CONSENT_VERSION_STALE', 'The consent form has changed.', {
        currentVersion: { versionId: newVersionId, version: 3, fingerprint: 'f'.repeat(64) },
      }),
    });
    const { user, step } = await openFirstStep();

    await user.type(step.getByLabelText('Completion code'), 'WAY-1-TEST');
    await user.click(step.getByRole('button', { name: 'I finished this step' }));

    expect(await screen.findByText('The consent form has changed')).toBeInTheDocument();
    // Focus leaves the vanished code form for the top: the page heading, or the form's first heading once it opens.
    const tops = [
      screen.getByRole('heading', { level: 1, name: publicStudy.title }),
      document.getElementById('reading-heading'),
    ];
    await waitFor(() => expect(tops).toContain(document.activeElement));
    expect(screen.queryByRole('heading', { name: 'Your steps' })).not.toBeInTheDocument();
    expect(fakeApi.callsTo('GET', enrollmentPath)).toHaveLength(2);
  });

  it('says what went wrong when the step cannot take a code', async () => {
    atSteps({
      [`POST ${completePath}`]: problemReply(
        409,
        'STEP_TAKES_NO_CODE',
        'This step has no completion code; the research team will check it off for you.',
      ),
    });
    const { user, step } = await openFirstStep();

    await user.type(step.getByLabelText('Completion code'), 'WAY-1-TEST');
    await user.click(step.getByRole('button', { name: 'I finished this step' }));

    const alert = await step.findByRole('alert');
    expect(alert).toHaveTextContent('We could not check your code');
    expect(alert).toHaveTextContent('the research team will check it off for you');
  });
});
