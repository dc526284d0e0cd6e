import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { installFakeApi, participant } from '@/test/fake-api';
import { consentToSign, enrollment, publicStudy, screeningQuestions, studyId } from '@/test/participant-fixtures';
import { renderApp } from '@/test/render-app';

const screeningPath = `/api/studies/${studyId}/enrollments/me/screening`;

function atScreening(extra: Parameters<typeof installFakeApi>[0] = {}) {
  return installFakeApi({
    'GET /api/auth/me': { status: 200, body: participant },
    'GET /api/public/studies/wayfinding-cues': { status: 200, body: publicStudy },
    [`GET /api/studies/${studyId}/enrollments/me`]: { status: 200, body: enrollment() },
    ...extra,
  });
}

async function openScreening() {
  const user = userEvent.setup();
  renderApp('/s/wayfinding-cues');
  // The first render also loads the route's code, which can take a moment.
  await screen.findByRole('heading', { name: 'A few questions first' }, { timeout: 3_000 });
  return user;
}

describe("screening form built from the study's questions", () => {
  it('shows each kind of question as its own control, with hints from the definition', async () => {
    atScreening();
    await openScreening();

    const adult = screen.getByRole('radiogroup', { name: 'Are you 18 or older?' });
    expect(within(adult).getAllByRole('radio')).toHaveLength(2);
    expect(within(adult).getByRole('radio', { name: 'Yes' })).toBeInTheDocument();
    expect(within(adult).getByRole('radio', { name: 'No' })).toBeInTheDocument();

    const direction = screen.getByLabelText('How good is your sense of direction?');
    expect(direction).toHaveAccessibleDescription('1 means very poor, 7 means excellent. · A number from 1 to 7');
    // The browser knows the range too (number keyboards, stepping with the arrow keys).
    expect(direction).toHaveAttribute('type', 'number');
    expect(direction).toHaveAttribute('min', '1');
    expect(direction).toHaveAttribute('max', '7');

    const commute = screen.getByRole('radiogroup', { name: 'How do you usually get around town?' });
    expect(within(commute).getAllByRole('radio')).toHaveLength(4);
    expect(screen.getByRole('list', { name: 'Your progress' })).toHaveTextContent('Questions');
  });

  it('names each unanswered question and sends nothing', async () => {
    const fakeApi = atScreening();
    const user = await openScreening();

    await user.click(screen.getByRole('button', { name: 'Save my answers' }));

    expect(await screen.findByText('Please choose Yes or No.')).toBeInTheDocument();
    expect(screen.getByText('Please enter a number.')).toBeInTheDocument();
    expect(screen.getByText('Please choose one of the answers.')).toBeInTheDocument();
    expect(screen.getByRole('radiogroup', { name: 'Are you 18 or older?' })).toHaveAttribute('aria-invalid', 'true');
    // Focus goes to the first question that needs an answer.
    expect(screen.getByRole('radio', { name: 'Yes' })).toHaveFocus();
    expect(fakeApi.callsTo('PUT', screeningPath)).toHaveLength(0);
  });

  it('keeps the number within the range the question allows', async () => {
    const fakeApi = atScreening();
    const user = await openScreening();

    await user.click(screen.getByRole('radio', { name: 'Yes' }));
    await user.type(screen.getByLabelText('How good is your sense of direction?'), '9');
    await user.click(screen.getByRole('radio', { name: 'Walking' }));
    await user.click(screen.getByRole('button', { name: 'Save my answers' }));

    expect(await screen.findByText('Please enter a number from 1 to 7.')).toBeInTheDocument();
    expect(screen.getByLabelText('How good is your sense of direction?')).toHaveFocus();
    expect(fakeApi.callsTo('PUT', screeningPath)).toHaveLength(0);
  });

  it('sends the answers keyed by question, typed as the api expects, and goes on to the consent form', async () => {
    const fakeApi = atScreening({
      [`PUT ${screeningPath}`]: {
        status: 200,
        body: { eligible: true, reasons: [], enrollment: enrollment({ status: 'screened', next: 'consent' }) },
      },
      [`GET /api/studies/${studyId}/enrollments/me/consent`]: { status: 200, body: consentToSign() },
    });
    const user = await openScreening();

    await user.click(screen.getByRole('radio', { name: 'Yes' }));
    await user.type(screen.getByLabelText('How good is your sense of direction?'), '5');
    await user.click(screen.getByRole('radio', { name: 'Public transport' }));
    await user.click(screen.getByRole('button', { name: 'Save my answers' }));

    expect(await screen.findByRole('heading', { name: 'Key information' })).toBeInTheDocument();
    expect(fakeApi.callsTo('PUT', screeningPath).map((request) => request.body)).toEqual([
      { answers: { adult: true, sense_of_direction: 5, commute: 'Public transport' } },
    ]);
  });

  it('uses a list for a choice with many answers', async () => {
    const manyOptions = [
      ...screeningQuestions.slice(0, 2),
      {
        key: 'region',
        label: 'Where do you live?',
        kind: 'choice' as const,
        options: ['North', 'North-east', 'East', 'South-east', 'South', 'South-west', 'West', 'North-west'],
        purpose: 'stratification' as const,
      },
    ];
    const fakeApi = atScreening({
      [`GET /api/studies/${studyId}/enrollments/me`]: {
        status: 200,
        body: enrollment({ screening: { questions: manyOptions, answers: null, exclusionReason: null } }),
      },
      [`PUT ${screeningPath}`]: {
        status: 200,
        body: { eligible: false, reasons: ['18 or older'], enrollment: enrollment({ next: 'excluded' }) },
      },
    });
    const user = await openScreening();

    await user.click(screen.getByRole('radio', { name: 'No' }));
    await user.type(screen.getByLabelText('How good is your sense of direction?'), '2');
    await user.click(screen.getByRole('button', { name: /Where do you live\?/ }));
    await user.click(await screen.findByRole('option', { name: 'South-west' }));
    await user.click(screen.getByRole('button', { name: 'Save my answers' }));

    await waitFor(() =>
      expect(fakeApi.callsTo('PUT', screeningPath).map((request) => request.body)).toEqual([
        { answers: { adult: false, sense_of_direction: 2, region: 'South-west' } },
      ]),
    );
  });

  it('says kindly why the study is not a fit, with the reasons', async () => {
    atScreening({
      [`PUT ${screeningPath}`]: {
        status: 200,
        body: {
          eligible: false,
          reasons: ['18 or older'],
          enrollment: enrollment({
            status: 'excluded',
            next: 'excluded',
            screening: { questions: screeningQuestions, answers: null, exclusionReason: '18 or older' },
          }),
        },
      },
    });
    const user = await openScreening();

    await user.click(screen.getByRole('radio', { name: 'No' }));
    await user.type(screen.getByLabelText('How good is your sense of direction?'), '4');
    await user.click(screen.getByRole('radio', { name: 'Cycling' }));
    await user.click(screen.getByRole('button', { name: 'Save my answers' }));

    expect(
      await screen.findByRole('heading', { name: 'Thank you — this study is not the right fit this time' }),
    ).toBeInTheDocument();
    expect(screen.getByText('This study is looking for people who meet these points:')).toBeInTheDocument();
    expect(screen.getByText('18 or older')).toBeInTheDocument();
    expect(screen.getByRole('link', { name: 'wayfinding@harborlane.test' })).toHaveAttribute(
      'href',
      'mailto:wayfinding@harborlane.test',
    );
    expect(screen.queryByRole('button', { name: 'Stop taking part' })).not.toBeInTheDocument();
  });

  it('puts an answer the api refused on its question', async () => {
    atScreening({
      [`PUT ${screeningPath}`]: {
        status: 400,
        body: {
          statusCode: 400,
          code: 'VALIDATION_FAILED',
          message: 'Some answers are not right',
          errors: [{ field: 'answers.commute', message: 'is not one of the options' }],
        },
      },
    });
    const user = await openScreening();

    await user.click(screen.getByRole('radio', { name: 'Yes' }));
    await user.type(screen.getByLabelText('How good is your sense of direction?'), '6');
    await user.click(screen.getByRole('radio', { name: 'Car' }));
    await user.click(screen.getByRole('button', { name: 'Save my answers' }));

    expect(await screen.findByText('Is not one of the options.')).toBeInTheDocument();
    expect(screen.getByRole('radiogroup', { name: 'How do you usually get around town?' })).toHaveAttribute(
      'aria-invalid',
      'true',
    );
  });

  it('checks a number as soon as the person leaves the question, before saving', async () => {
    const fakeApi = atScreening();
    const user = await openScreening();

    await user.type(screen.getByLabelText('How good is your sense of direction?'), '150');
    await user.tab();

    expect(await screen.findByText('Please enter a number from 1 to 7.')).toBeInTheDocument();
    expect(fakeApi.callsTo('PUT', screeningPath)).toHaveLength(0);
  });

  it("puts an api refusal that names its own field in the question's words instead", async () => {
    atScreening({
      [`PUT ${screeningPath}`]: {
        status: 400,
        body: {
          statusCode: 400,
          code: 'VALIDATION_FAILED',
          message: 'Some answers are not right',
          errors: [{ field: 'answers.sense_of_direction', message: 'answers.sense_of_direction must be a number' }],
        },
      },
    });
    const user = await openScreening();

    await user.click(screen.getByRole('radio', { name: 'Yes' }));
    await user.type(screen.getByLabelText('How good is your sense of direction?'), '6');
    await user.click(screen.getByRole('radio', { name: 'Car' }));
    await user.click(screen.getByRole('button', { name: 'Save my answers' }));

    expect(await screen.findByText('Please enter a number from 1 to 7.')).toBeInTheDocument();
    expect(screen.queryByText(/sense_of_direction/)).not.toBeInTheDocument();
  });
});
