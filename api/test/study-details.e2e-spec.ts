import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { signedInParticipant } from './support/consent-fixtures';
import { expectStatus } from './support/http';
import { studyWithParticipant } from './support/payout-fixtures';
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

describe('editing study details', () => {
  it('changes every detail before the first assignment, with the protocol and the ethics approval references kept apart', async () => {
    const { studyId } = await draftBetweenStudy(coordinator);
    const changed = await expectStatus(
      coordinator.patch(`/api/studies/${studyId}`).send({
        title: 'Wayfinding, second wave',
        summary: 'Two short sessions online.',
        contactEmail: 'wave2@lab.test',
        protocolNumber: 'HLCL-2027-002',
        ethicsApprovalReference: 'HLREB-2027-118',
        targetSize: 90,
        budgetMinor: 150_000,
      }),
      200,
    );
    expect(changed).toMatchObject({
      title: 'Wayfinding, second wave',
      summary: 'Two short sessions online.',
      contactEmail: 'wave2@lab.test',
      protocolNumber: 'HLCL-2027-002',
      ethicsApprovalReference: 'HLREB-2027-118',
      targetSize: 90,
      budgetMinor: 150_000,
      assignedCount: 0,
    });
    expect(changed.editRules.length).toBeGreaterThan(0);
  });

  it('after the first assignment keeps the protocol reference, never lowers the budget and keeps the target at or above those assigned', async () => {
    const { studyId } = await studyWithParticipant(testApp, coordinator, 'details');
    await expectStatus(coordinator.patch(`/api/studies/${studyId}`).send({ budgetMinor: 100_000 }), 200);
    const study = await expectStatus(coordinator.get(`/api/studies/${studyId}`), 200);
    expect(study).toMatchObject({ designLocked: true, assignedCount: 1 });

    const protocol = await expectStatus(
      coordinator.patch(`/api/studies/${studyId}`).send({ protocolNumber: 'OTHER-1' }),
      409,
      'STUDY_DETAIL_FIXED',
    );
    expect(protocol.errors).toEqual([expect.objectContaining({ field: 'protocolNumber' })]);
    const budget = await expectStatus(
      coordinator.patch(`/api/studies/${studyId}`).send({ budgetMinor: 99_999 }),
      409,
      'STUDY_DETAIL_FIXED',
    );
    expect(budget.errors).toEqual([expect.objectContaining({ field: 'budgetMinor' })]);
    const target = await expectStatus(
      coordinator.patch(`/api/studies/${studyId}`).send({ targetSize: 0 }),
      400,
      'VALIDATION_FAILED',
    );
    expect(target.errors[0].field).toBe('targetSize');
    await expectStatus(
      coordinator.patch(`/api/studies/${studyId}`).send({ currency: 'EUR' }),
      409,
      'STUDY_DETAIL_FIXED',
    );

    // Nothing of a refused change is half-written: a good field beside a refused one is not saved either.
    await expectStatus(
      coordinator.patch(`/api/studies/${studyId}`).send({ title: 'Half', protocolNumber: 'OTHER-2' }),
      409,
      'STUDY_DETAIL_FIXED',
    );
    expect((await expectStatus(coordinator.get(`/api/studies/${studyId}`), 200)).title).not.toBe('Half');

    const allowed = await expectStatus(
      coordinator.patch(`/api/studies/${studyId}`).send({
        title: 'Renamed after opening',
        summary: 'Clearer wording.',
        contactEmail: 'desk@lab.test',
        ethicsApprovalReference: 'HLREB-2026-031-A1',
        targetSize: 1,
        budgetMinor: 120_000,
      }),
      200,
    );
    expect(allowed).toMatchObject({
      title: 'Renamed after opening',
      targetSize: 1,
      budgetMinor: 120_000,
      ethicsApprovalReference: 'HLREB-2026-031-A1',
    });
  });

  it('refuses a target below the number already assigned, naming the field', async () => {
    const { studyId } = await studyWithParticipant(testApp, coordinator, 'target');
    // A second person signs, so two are assigned.
    const versions = await expectStatus(coordinator.get(`/api/studies/${studyId}/consent-versions`), 200);
    const version = versions.items.find((v: { status: string }) => v.status === 'active');
    const { browser } = await signedInParticipant(testApp, 'target-two');
    await expectStatus(browser.post(`/api/studies/${studyId}/enrollments/me`), 201);
    await expectStatus(
      browser.put(`/api/studies/${studyId}/enrollments/me/screening`).send({ answers: { pretest: 40 } }),
      200,
    );
    await expectStatus(
      browser
        .post(`/api/studies/${studyId}/enrollments/me/signature`)
        .send({ versionId: version.id, fingerprint: version.fingerprint, typedName: 'Sam Second' }),
      201,
    );
    const below = await expectStatus(
      coordinator.patch(`/api/studies/${studyId}`).send({ targetSize: 1 }),
      409,
      'STUDY_DETAIL_FIXED',
    );
    expect(below.errors).toEqual([{ field: 'targetSize', message: expect.stringContaining('2') }]);
    expect(
      (await expectStatus(coordinator.patch(`/api/studies/${studyId}`).send({ targetSize: 2 }), 200)).targetSize,
    ).toBe(2);
  });
});

describe('archiving', () => {
  it('archives only closed studies; archived studies leave the default list and can still be opened', async () => {
    const { studyId } = await draftBetweenStudy(coordinator);
    const early = await expectStatus(coordinator.post(`/api/studies/${studyId}/archive`), 409, 'STUDY_NOT_CLOSED');
    expect(early.message).toMatch(/close/i);

    await testApp.dataSource.query(`UPDATE study SET status = 'closed', closed_at = now() WHERE id = $1`, [studyId]);
    const archived = await expectStatus(coordinator.post(`/api/studies/${studyId}/archive`), 200);
    expect(archived.archivedAt).toEqual(expect.any(String));

    const list = await expectStatus(coordinator.get('/api/studies'), 200);
    expect(list.items.map((s: { id: string }) => s.id)).not.toContain(studyId);
    const archivedList = await expectStatus(coordinator.get('/api/studies').query({ archived: 'true' }), 200);
    expect(archivedList.items.map((s: { id: string }) => s.id)).toContain(studyId);
    expect(archivedList.items.every((s: { archivedAt: string | null }) => s.archivedAt !== null)).toBe(true);
    await expectStatus(coordinator.get(`/api/studies/${studyId}`), 200);
    // Archived studies are kept as they are.
    await expectStatus(coordinator.patch(`/api/studies/${studyId}`).send({ title: 'Too late' }), 409);
    await expectStatus(coordinator.get('/api/studies').query({ archived: 'maybe' }), 400, 'VALIDATION_FAILED');

    const restored = await expectStatus(coordinator.post(`/api/studies/${studyId}/unarchive`), 200);
    expect(restored.archivedAt).toBeNull();
    const back = await expectStatus(coordinator.get('/api/studies'), 200);
    expect(back.items.map((s: { id: string }) => s.id)).toContain(studyId);

    const [events] = await testApp.dataSource.query(
      `SELECT count(*) FILTER (WHERE action = 'study.archived')::int AS archived, count(*) FILTER (WHERE action = 'study.unarchived')::int AS unarchived FROM audit_event WHERE chain = $1`,
      [studyId],
    );
    expect(events).toEqual({ archived: 1, unarchived: 1 });
  });

  it('lets only designers archive (an auditor reads, never archives)', async () => {
    const auditor = await signedInStaff(testApp, 'auditor');
    const { studyId } = await draftBetweenStudy(coordinator);
    await testApp.dataSource.query(`UPDATE study SET status = 'closed', closed_at = now() WHERE id = $1`, [studyId]);
    await expectStatus(auditor.post(`/api/studies/${studyId}/archive`), 403, 'FORBIDDEN');
  });
});
