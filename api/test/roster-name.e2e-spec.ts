import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { activeConsentVersion, signedUpParticipant } from './support/consent-fixtures';
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

describe('roster name', () => {
  it('shows the name a person typed when signing, and finds them by it', async () => {
    const { studyId } = await draftBetweenStudy(coordinator);
    await expectStatus(
      coordinator.post(`/api/studies/${studyId}/steps`).send({ title: 'Session 1', payMinor: 1500 }),
      201,
    );
    const version = await activeConsentVersion(coordinator, studyId);
    await expectStatus(coordinator.post(`/api/studies/${studyId}/open`), 200);
    await signedUpParticipant(testApp, studyId, version, 'roster-name', 'Ottoline Brisk-Quarry', { pretest: 70 });
    const found = await expectStatus(
      coordinator.get(`/api/studies/${studyId}/enrollments`).query({ search: 'brisk-quar' }),
      200,
    );
    expect(found.items.map((e: { name: string | null }) => e.name)).toEqual(['Ottoline Brisk-Quarry']);
  });
});
