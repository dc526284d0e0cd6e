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

/** A recruiting study with one paid step and one person who signed and was assigned. */
async function studyWithSignedParticipant() {
  const { studyId } = await draftBetweenStudy(coordinator);
  await expectStatus(
    coordinator.post(`/api/studies/${studyId}/steps`).send({ title: 'Session 1', payMinor: 1500 }),
    201,
  );
  const version = await activeConsentVersion(coordinator, studyId);
  await expectStatus(coordinator.post(`/api/studies/${studyId}/open`), 200);
  const { me } = await signedUpParticipant(testApp, studyId, version, 'follow-up', 'Sam Example', { pretest: 70 });
  return { studyId, enrollmentId: me.id as string };
}

const lostTotal = (report: { flow: { arms: { lostToFollowUp: { total: number } }[] } }) =>
  report.flow.arms.reduce((sum, arm) => sum + arm.lostToFollowUp.total, 0);

describe('undoing lost to follow-up', () => {
  it('puts the person back to taking part with a reason, audited, and the dropout counts follow', async () => {
    const { studyId, enrollmentId } = await studyWithSignedParticipant();
    const base = `/api/studies/${studyId}/enrollments/${enrollmentId}`;
    await expectStatus(coordinator.post(`${base}/lost`).send({ reason: 'No reply to three reminders' }), 200);
    expect(lostTotal(await expectStatus(coordinator.get(`/api/studies/${studyId}/attrition`), 200))).toBe(1);

    const back = await expectStatus(
      coordinator.post(`${base}/lost/undo`).send({ reason: '  She answered the fourth reminder ' }),
      200,
    );
    expect(back.status).toBe('assigned');
    const record = await expectStatus(coordinator.get(base), 200);
    expect(record.lostReason).toBeNull();
    const undone = record.timeline.find((e: { action: string }) => e.action === 'enrollment.lost-undone');
    expect(undone).toMatchObject({
      name: 'Back from lost to follow-up',
      data: { reason: 'She answered the fourth reminder' },
    });
    expect(undone.sentence).toContain('She answered the fourth reminder');
    const report = await expectStatus(coordinator.get(`/api/studies/${studyId}/attrition`), 200);
    expect(lostTotal(report)).toBe(0);
    // They can be marked lost again later, like anyone taking part.
    await expectStatus(coordinator.post(`${base}/lost`).send({ reason: 'Silent again' }), 200);
  });

  it('refuses with 409 when the person is not lost to follow-up, and 400 naming the reason when it is missing', async () => {
    const { studyId, enrollmentId } = await studyWithSignedParticipant();
    const base = `/api/studies/${studyId}/enrollments/${enrollmentId}`;
    const refused = await expectStatus(
      coordinator.post(`${base}/lost/undo`).send({ reason: 'Mistaken click' }),
      409,
      'PARTICIPATION_STATE',
    );
    expect(refused.message).toMatch(/not marked lost to follow-up/i);
    await expectStatus(coordinator.post(`${base}/lost`).send({}), 200);
    const missing = await expectStatus(coordinator.post(`${base}/lost/undo`).send({ reason: ' ' }), 400);
    expect(missing.errors.map((e: { field: string }) => e.field)).toEqual(['reason']);
    const record = await expectStatus(coordinator.get(base), 200);
    expect(record.enrollment.status).toBe('lost');
  });

  it('lets only coordinators and admins undo it', async () => {
    const { studyId, enrollmentId } = await studyWithSignedParticipant();
    const base = `/api/studies/${studyId}/enrollments/${enrollmentId}`;
    await expectStatus(coordinator.post(`${base}/lost`).send({}), 200);
    const auditor = await signedInStaff(testApp, 'auditor');
    await expectStatus(auditor.post(`${base}/lost/undo`).send({ reason: 'Trying it out' }), 403, 'FORBIDDEN');
  });
});
