import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { activeConsentVersion, signedInParticipant } from './support/consent-fixtures';
import { expectStatus } from './support/http';
import { Browser, draftBetweenStudy, signedInStaff } from './support/study-fixtures';
import { startTestApp, TestApp } from './support/test-app';

let testApp: TestApp;
let coordinator: Browser;

beforeAll(async () => {
  testApp = await startTestApp();
  coordinator = await signedInStaff(testApp, 'coordinator');
});
afterAll(async () => {
  await testApp.close();
});

const direction = {
  key: 'direction',
  label: 'Sense of direction',
  kind: 'number',
  minValue: 0,
  maxValue: 100,
  eligibleMin: 20,
};

describe('numeric screening questions with a lowest and highest answer', () => {
  it('stores the range staff set, and refuses a range that runs backwards, naming the field', async () => {
    const { studyId } = await draftBetweenStudy(coordinator);
    const backwards = await expectStatus(
      coordinator
        .put(`/api/studies/${studyId}/screening-questions`)
        .send({ questions: [{ ...direction, minValue: 100, maxValue: 0 }] }),
      400,
      'VALIDATION_FAILED',
    );
    expect(backwards.errors.map((e: { field: string }) => e.field)).toContain('questions.0.maxValue');
    await expectStatus(
      coordinator.put(`/api/studies/${studyId}/screening-questions`).send({ questions: [direction] }),
      200,
    );
    const stored = await expectStatus(coordinator.get(`/api/studies/${studyId}/screening-questions`), 200);
    expect(stored.items.find((q: { key: string }) => q.key === 'direction')).toMatchObject({
      kind: 'number',
      min: 0,
      max: 100,
      eligibleMin: 20,
    });
  });

  it('refuses 150 on a 0–100 question with the question’s own words, and takes 50', async () => {
    const { studyId } = await draftBetweenStudy(coordinator);
    await expectStatus(
      coordinator.post(`/api/studies/${studyId}/steps`).send({ title: 'Session 1', payMinor: 1500 }),
      201,
    );
    await expectStatus(
      coordinator.put(`/api/studies/${studyId}/screening-questions`).send({ questions: [direction] }),
      200,
    );
    await activeConsentVersion(coordinator, studyId);
    await expectStatus(coordinator.post(`/api/studies/${studyId}/open`), 200);

    const { browser } = await signedInParticipant(testApp);
    await expectStatus(browser.post(`/api/studies/${studyId}/enrollments/me`), 201);
    const refused = await expectStatus(
      browser
        .put(`/api/studies/${studyId}/enrollments/me/screening`)
        .send({ answers: { direction: 150, pretest: 70 } }),
      400,
      'VALIDATION_FAILED',
    );
    expect(refused.message).toBe('Sense of direction: enter a number from 0 to 100.');
    expect(refused.errors).toEqual([{ field: 'answers.direction', message: 'enter a number from 0 to 100' }]);
    const me = await expectStatus(browser.get(`/api/studies/${studyId}/enrollments/me`), 200);
    expect(me.status).toBe('invited');

    const screened = await expectStatus(
      browser.put(`/api/studies/${studyId}/enrollments/me/screening`).send({ answers: { direction: 50, pretest: 70 } }),
      200,
    );
    expect(screened.eligible).toBe(true);
  });
});
