import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { RandomizationService } from '../src/randomization/randomization.service';
import { generateSlots } from '../src/randomization/derive-sequence';
import { parseSchemeParameters } from '../src/randomization/scheme-parameters';
import { expectStatus } from './support/http';
import { prepareToOpen } from './support/consent-fixtures';
import { Browser, draftBetweenStudy, insertEnrollments, signedInStaff, uniqueSlug } from './support/study-fixtures';
import { startTestApp, TestApp } from './support/test-app';

let testApp: TestApp;
let researcher: Browser;
let randomization: RandomizationService;
const actor = { id: null, email: 'test-runner' };

beforeAll(async () => {
  // A pool large enough for the concurrency tests below.
  testApp = await startTestApp();
  researcher = await signedInStaff(testApp, 'researcher');
  randomization = testApp.app.get(RandomizationService);
});
afterAll(async () => {
  await testApp.close();
});

async function allocateInOwnTransaction(
  studyId: string,
  enrollmentId: string,
  covariates: Record<string, number | string>,
) {
  return testApp.dataSource.transaction((manager) =>
    randomization.allocate(manager, actor, { studyId, enrollmentId, covariates }),
  );
}

async function sealedSeed(studyId: string): Promise<string> {
  const [row] = await testApp.dataSource.query(`SELECT seed FROM assignment_scheme WHERE study_id = $1`, [studyId]);
  return row.seed;
}

describe('study set-up', () => {
  it('creates a study with conditions, steps and pay, and makes the creator a member', async () => {
    const study = await expectStatus(
      researcher.post('/api/studies').send({
        slug: uniqueSlug('setup'),
        title: 'Set-up test',
        design: 'between',
        budgetMinor: 50000,
        currency: 'EUR',
      }),
      201,
    );
    expect(study).toMatchObject({
      status: 'draft',
      blinded: true,
      currency: 'EUR',
      budgetMinor: 50000,
      designLocked: false,
    });
    const members = await expectStatus(researcher.get(`/api/studies/${study.id}/members`), 200);
    expect(members.items.map((m: { email: string }) => m.email)).toEqual(['researcher@evenhand.test']);

    const steps = await expectStatus(
      researcher.post(`/api/studies/${study.id}/steps`).send({ title: 'Session 1', payMinor: 1500 }),
      201,
    );
    await expectStatus(
      researcher.post(`/api/studies/${study.id}/steps`).send({ title: 'Intro', payMinor: 500, position: 1 }),
      201,
    );
    const list = await expectStatus(researcher.get(`/api/studies/${study.id}/steps`), 200);
    expect(list.items.map((s: { title: string; position: number }) => [s.position, s.title])).toEqual([
      [1, 'Intro'],
      [2, 'Session 1'],
    ]);
    expect(list).toMatchObject({ totalPayMinor: 2000, hasPayOverrides: false, currency: 'EUR' });
    expect(steps.items).toHaveLength(1);
  });

  it('refuses pay that is not whole minor units, naming the field', async () => {
    const study = await expectStatus(
      researcher.post('/api/studies').send({ slug: uniqueSlug('pay'), title: 'Pay', design: 'between' }),
      201,
    );
    const body = await expectStatus(
      researcher.post(`/api/studies/${study.id}/steps`).send({ title: 'S', payMinor: 12.5 }),
      400,
      'VALIDATION_FAILED',
    );
    expect(body.errors[0].field).toBe('payMinor');
  });

  it('records a per-condition pay override with its reason and flags it', async () => {
    const { studyId, conditionIds } = await draftBetweenStudy(researcher);
    const created = await expectStatus(
      researcher.post(`/api/studies/${studyId}/steps`).send({ title: 'Session', payMinor: 1000 }),
      201,
    );
    const stepId = created.items[0].id;
    const withOverride = await expectStatus(
      researcher
        .put(`/api/studies/${studyId}/steps/${stepId}/pay-overrides/${conditionIds[1]}`)
        .send({ payMinor: 1200, reason: 'Longer session in this arm' }),
      200,
    );
    expect(withOverride.hasPayOverrides).toBe(true);
    expect(withOverride.items[0].payOverrides).toEqual([
      expect.objectContaining({ conditionId: conditionIds[1], payMinor: 1200 }),
    ]);
    const [event] = await testApp.dataSource.query(
      `SELECT data FROM audit_event WHERE chain = $1 AND action = 'step.pay-override-recorded'`,
      [studyId],
    );
    expect(event.data.reason).toBe('Longer session in this arm');
  });

  it('refuses a scheme whose block sizes are not multiples of the total weight', async () => {
    const { studyId } = await draftBetweenStudy(researcher);
    const body = await expectStatus(
      researcher.put(`/api/studies/${studyId}/assignment-scheme`).send({ method: 'permuted-blocks', blockSizes: [3] }),
      400,
      'VALIDATION_FAILED',
    );
    expect(body.errors.some((e: { field: string }) => e.field.startsWith('blockSizes'))).toBe(true);
  });

  it('refuses a within-subjects method for a between-subjects study', async () => {
    const { studyId } = await draftBetweenStudy(researcher);
    await expectStatus(
      researcher.put(`/api/studies/${studyId}/assignment-scheme`).send({ method: 'williams' }),
      400,
      'VALIDATION_FAILED',
    );
  });

  it('hides the study from a researcher who is not a member', async () => {
    const { studyId } = await draftBetweenStudy(researcher);
    const admin = await signedInStaff(testApp, 'admin');
    const email = `outsider-${Date.now()}@evenhand.test`;
    await expectStatus(
      admin.post('/api/users').send({ email, name: 'Outsider', role: 'researcher', password: 'a-long-password-1' }),
      201,
    );
    const outsider = testApp.browser();
    await expectStatus(outsider.post('/api/auth/sign-in').send({ email, password: 'a-long-password-1' }), 200);
    await expectStatus(outsider.get(`/api/studies/${studyId}`), 404, 'NOT_FOUND');
    await expectStatus(outsider.get(`/api/studies/${studyId}/assignment`), 404, 'NOT_FOUND');
  });
});

describe('sealed sequence', () => {
  it('publishes a commitment when the study opens and hides internal names while blinded', async () => {
    const { studyId } = await draftBetweenStudy(researcher);
    const before = await expectStatus(researcher.get(`/api/studies/${studyId}/assignment`), 200);
    expect(before.commitment).toBeNull();
    await prepareToOpen(researcher, studyId);
    await expectStatus(researcher.post(`/api/studies/${studyId}/open`), 200);
    const after = await expectStatus(researcher.get(`/api/studies/${studyId}/assignment`), 200);
    expect(after.commitment).toMatch(/^[0-9a-f]{64}$/);
    expect(after.seed).toBeNull();
    const conditions = await expectStatus(researcher.get(`/api/studies/${studyId}/conditions`), 200);
    expect(
      conditions.items.map((c: { internalName: string | null; code: string }) => [c.code, c.internalName]),
    ).toEqual([
      ['A', null],
      ['B', null],
    ]);
    const [event] = await testApp.dataSource.query(
      `SELECT data FROM audit_event WHERE chain = $1 AND action = 'assignment.committed'`,
      [studyId],
    );
    expect(event.data.commitment).toBe(after.commitment);
  });

  it('takes exactly slots 1..300 with no duplicate under 300 concurrent allocations in one stratum', async () => {
    const { studyId } = await draftBetweenStudy(researcher);
    await prepareToOpen(researcher, studyId);
    await expectStatus(researcher.post(`/api/studies/${studyId}/open`), 200);
    const enrollments = await insertEnrollments(
      testApp,
      studyId,
      Array.from({ length: 300 }, () => ({ pretest: 70 })),
    );
    const outcomes = await Promise.all(enrollments.map((id) => allocateInOwnTransaction(studyId, id, { pretest: 70 })));
    const positions = outcomes.map((o) => o.slotPosition).sort((a, b) => a! - b!);
    expect(positions).toEqual(Array.from({ length: 300 }, (_, i) => i + 1));
    const [{ taken }] = await testApp.dataSource.query(
      `SELECT count(DISTINCT taken_by) AS taken FROM allocation_slot WHERE study_id = $1`,
      [studyId],
    );
    expect(Number(taken)).toBe(300);
    // Each taken slot holds exactly the condition the seed generates for that position.
    const seed = await sealedSeed(studyId);
    const [scheme] = await testApp.dataSource.query(
      `SELECT sealed_parameters FROM assignment_scheme WHERE study_id = $1`,
      [studyId],
    );
    const expected = generateSlots(seed, parseSchemeParameters(scheme.sealed_parameters), outcomes[0].stratumKey, 300);
    const byPosition = new Map(outcomes.map((o) => [o.slotPosition, o.conditionId]));
    expect(
      expected.every((slot) => byPosition.get(slot.position) === (slot as { conditionId: string }).conditionId),
    ).toBe(true);
  });

  it('keeps each of 4 strata a prefix of its own generated list', async () => {
    const { studyId } = await draftBetweenStudy(researcher, { cutPoints: [25, 50, 75] });
    await prepareToOpen(researcher, studyId);
    await expectStatus(researcher.post(`/api/studies/${studyId}/open`), 200);
    const scores = Array.from({ length: 120 }, (_, i) => (i * 37) % 100);
    const enrollments = await insertEnrollments(
      testApp,
      studyId,
      scores.map((pretest) => ({ pretest })),
    );
    await Promise.all(enrollments.map((id, i) => allocateInOwnTransaction(studyId, id, { pretest: scores[i] })));
    const seed = await sealedSeed(studyId);
    const [scheme] = await testApp.dataSource.query(
      `SELECT sealed_parameters FROM assignment_scheme WHERE study_id = $1`,
      [studyId],
    );
    const parameters = parseSchemeParameters(scheme.sealed_parameters);
    const rows: Array<{ stratum_key: string; position: number; condition_id: string }> = await testApp.dataSource.query(
      `SELECT stratum_key, position, condition_id FROM allocation_slot WHERE study_id = $1 AND taken_by IS NOT NULL ORDER BY stratum_key, position`,
      [studyId],
    );
    const strata = [...new Set(rows.map((r) => r.stratum_key))];
    expect(strata).toHaveLength(4);
    for (const stratum of strata) {
      const taken = rows.filter((r) => r.stratum_key === stratum);
      expect(taken.map((r) => r.position)).toEqual(taken.map((_, i) => i + 1));
      const generated = generateSlots(seed, parameters, stratum, taken.length) as Array<{ conditionId: string }>;
      expect(taken.map((r) => r.condition_id)).toEqual(generated.map((s) => s.conditionId));
    }
  });

  it('frees the slot when the allocating transaction rolls back', async () => {
    const { studyId } = await draftBetweenStudy(researcher);
    await prepareToOpen(researcher, studyId);
    await expectStatus(researcher.post(`/api/studies/${studyId}/open`), 200);
    const [first, second] = await insertEnrollments(testApp, studyId, [{ pretest: 10 }, { pretest: 10 }]);
    await expect(
      testApp.dataSource.transaction(async (manager) => {
        await randomization.allocate(manager, actor, { studyId, enrollmentId: first, covariates: { pretest: 10 } });
        throw new Error('signing failed later in the same transaction');
      }),
    ).rejects.toThrow('signing failed');
    const outcome = await allocateInOwnTransaction(studyId, second, { pretest: 10 });
    expect(outcome.slotPosition).toBe(1);
  });

  it('gives the same enrollment its one allocation when asked twice', async () => {
    const { studyId } = await draftBetweenStudy(researcher);
    await prepareToOpen(researcher, studyId);
    await expectStatus(researcher.post(`/api/studies/${studyId}/open`), 200);
    const [only] = await insertEnrollments(testApp, studyId, [{ pretest: 90 }]);
    const once = await allocateInOwnTransaction(studyId, only, { pretest: 90 });
    const twice = await allocateInOwnTransaction(studyId, only, { pretest: 90 });
    expect(twice).toEqual({ ...once, slotPosition: null });
    const [{ n }] = await testApp.dataSource.query(`SELECT count(*) AS n FROM allocation WHERE enrollment_id = $1`, [
      only,
    ]);
    expect(Number(n)).toBe(1);
  });

  it('refuses scheme, condition and stratification changes after the first assignment', async () => {
    const { studyId } = await draftBetweenStudy(researcher);
    await prepareToOpen(researcher, studyId);
    await expectStatus(researcher.post(`/api/studies/${studyId}/open`), 200);
    const [only] = await insertEnrollments(testApp, studyId, [{ pretest: 30 }]);
    await allocateInOwnTransaction(studyId, only, { pretest: 30 });
    await expectStatus(
      researcher.put(`/api/studies/${studyId}/assignment-scheme`).send({ method: 'simple' }),
      409,
      'STUDY_DETAIL_FIXED',
    );
    await expectStatus(
      researcher.post(`/api/studies/${studyId}/conditions`).send({ internalName: 'late', participantLabel: 'Late' }),
      409,
      'STUDY_DETAIL_FIXED',
    );
    await expectStatus(
      researcher.put(`/api/studies/${studyId}/stratification-factors`).send({ factors: [] }),
      409,
      'STUDY_DETAIL_FIXED',
    );
    const study = await expectStatus(researcher.get(`/api/studies/${studyId}`), 200);
    expect(study.designLocked).toBe(true);
  });

  it('re-seals with a new commitment when the design changes after opening but before anyone is assigned', async () => {
    const { studyId } = await draftBetweenStudy(researcher);
    await prepareToOpen(researcher, studyId);
    await expectStatus(researcher.post(`/api/studies/${studyId}/open`), 200);
    const first = (await expectStatus(researcher.get(`/api/studies/${studyId}/assignment`), 200)).commitment;
    // Blocks of 6 fit two conditions and three alike, so the scheme stays valid when a third is added.
    await expectStatus(
      researcher
        .put(`/api/studies/${studyId}/assignment-scheme`)
        .send({ method: 'stratified-blocks', blockSizes: [6] }),
      200,
    );
    const middle = (await expectStatus(researcher.get(`/api/studies/${studyId}/assignment`), 200)).commitment;
    await expectStatus(
      researcher
        .post(`/api/studies/${studyId}/conditions`)
        .send({ internalName: 'gamma', participantLabel: 'Version gamma' }),
      201,
    );
    const second = (await expectStatus(researcher.get(`/api/studies/${studyId}/assignment`), 200)).commitment;
    expect(second).toMatch(/^[0-9a-f]{64}$/);
    expect(new Set([first, middle, second]).size).toBe(3);
  });

  it('refuses a design change that the saved scheme cannot take, and says why', async () => {
    const { studyId } = await draftBetweenStudy(researcher);
    await prepareToOpen(researcher, studyId);
    await expectStatus(researcher.post(`/api/studies/${studyId}/open`), 200);
    const body = await expectStatus(
      researcher
        .post(`/api/studies/${studyId}/conditions`)
        .send({ internalName: 'gamma', participantLabel: 'Version gamma' }),
      400,
      'VALIDATION_FAILED',
    );
    expect(body.errors[0].field).toMatch(/^blockSizes/);
    const conditions = await expectStatus(researcher.get(`/api/studies/${studyId}/conditions`), 200);
    expect(conditions.items).toHaveLength(2);
  });

  it('verifies every allocation after unblinding, and reports a mismatch when one is altered in the database', async () => {
    const { studyId } = await draftBetweenStudy(researcher, {
      scheme: { method: 'minimization', coinProbability: 0.8 },
    });
    await prepareToOpen(researcher, studyId);
    await expectStatus(researcher.post(`/api/studies/${studyId}/open`), 200);
    await expectStatus(researcher.get(`/api/studies/${studyId}/assignment/verify`), 409, 'SEED_STILL_SEALED');
    const scores = Array.from({ length: 40 }, (_, i) => (i * 53) % 100);
    const enrollments = await insertEnrollments(
      testApp,
      studyId,
      scores.map((pretest) => ({ pretest })),
    );
    for (let i = 0; i < enrollments.length; i++)
      await allocateInOwnTransaction(studyId, enrollments[i], { pretest: scores[i] });

    await expectStatus(
      researcher.post(`/api/studies/${studyId}/unblind`).send({ reason: 'short' }),
      400,
      'VALIDATION_FAILED',
    );
    const unblinded = await expectStatus(
      researcher.post(`/api/studies/${studyId}/unblind`).send({ reason: 'Final analysis after the last follow-up' }),
      200,
    );
    expect(unblinded.seed).toMatch(/^[0-9a-f]{64}$/);
    const report = await expectStatus(researcher.get(`/api/studies/${studyId}/assignment/verify`), 200);
    expect(report).toMatchObject({ allMatch: true, commitmentMatches: true, matched: 40, mismatched: 0 });

    const [victim] = await testApp.dataSource.query(
      `SELECT id, condition_id, sequence FROM allocation WHERE study_id = $1 ORDER BY sequence DESC LIMIT 1`,
      [studyId],
    );
    const conditions = await expectStatus(researcher.get(`/api/studies/${studyId}/conditions`), 200);
    const other = conditions.items.find((c: { id: string }) => c.id !== victim.condition_id).id;
    // Allocation rows are append-only; only a database superuser can switch that off, as this insider does.
    await testApp.dataSource.query(`ALTER TABLE allocation DISABLE TRIGGER allocation_append_only`);
    try {
      await testApp.dataSource.query(`UPDATE allocation SET condition_id = $1 WHERE id = $2`, [other, victim.id]);
    } finally {
      await testApp.dataSource.query(`ALTER TABLE allocation ENABLE TRIGGER allocation_append_only`);
    }
    const tampered = await expectStatus(researcher.get(`/api/studies/${studyId}/assignment/verify`), 200);
    expect(tampered).toMatchObject({ allMatch: false, mismatched: 1 });
    expect(tampered.checks.find((c: { matches: boolean }) => !c.matches).arrivalPosition).toBe(victim.sequence);
  });

  it('reveals the seed at closure so the sequence can be verified', async () => {
    const { studyId } = await draftBetweenStudy(researcher);
    await prepareToOpen(researcher, studyId);
    await expectStatus(researcher.post(`/api/studies/${studyId}/open`), 200);
    const enrollments = await insertEnrollments(testApp, studyId, [{ pretest: 5 }, { pretest: 95 }, { pretest: 65 }]);
    for (const [i, id] of enrollments.entries())
      await allocateInOwnTransaction(studyId, id, { pretest: [5, 95, 65][i] });
    await expectStatus(researcher.post(`/api/studies/${studyId}/pause`), 200);
    await expectStatus(researcher.post(`/api/studies/${studyId}/close`), 200);
    await expectStatus(researcher.post(`/api/studies/${studyId}/open`), 409, 'STUDY_TRANSITION_NOT_ALLOWED');
    const report = await expectStatus(researcher.get(`/api/studies/${studyId}/assignment/verify`), 200);
    expect(report).toMatchObject({ allMatch: true, commitmentMatches: true, matched: 3 });
  });
});

describe('matched pairs', () => {
  it('pairs a pretested cohort once, places each member on signing, and verifies after unblinding', async () => {
    const { studyId } = await draftBetweenStudy(researcher, {
      scheme: { method: 'matched-pairs', pretestKey: 'pretest' },
    });
    await prepareToOpen(researcher, studyId);
    await expectStatus(researcher.post(`/api/studies/${studyId}/open`), 200);
    const scores = [12, 88, 45, 46, 90, 13, 70];
    const enrollments = await insertEnrollments(
      testApp,
      studyId,
      scores.map((pretest) => ({ pretest })),
    );
    await testApp.dataSource.query(`UPDATE enrollment SET status = 'screened' WHERE id = ANY($1)`, [enrollments]);
    const paired = await expectStatus(researcher.post(`/api/studies/${studyId}/enrollments/pair-cohort`), 200);
    expect(paired).toMatchObject({ cohort: 7, pairs: 3, leftoverEnrollmentId: expect.any(String) });
    await expectStatus(
      researcher.post(`/api/studies/${studyId}/enrollments/pair-cohort`),
      409,
      'COHORT_ALREADY_PAIRED',
    );
    // Neighbours by pretest share a pair and get different conditions.
    const slots: Array<{ stratum_key: string; condition_id: string; reserved_for: string }> =
      await testApp.dataSource.query(
        `SELECT stratum_key, condition_id, reserved_for FROM allocation_slot WHERE study_id = $1 ORDER BY stratum_key, position`,
        [studyId],
      );
    const pairs = new Map<string, typeof slots>();
    for (const slot of slots) pairs.set(slot.stratum_key, [...(pairs.get(slot.stratum_key) ?? []), slot]);
    for (const [key, members] of pairs)
      if (key !== 'unpaired') expect(new Set(members.map((m) => m.condition_id)).size).toBe(2);
    const outcomes = await Promise.all(
      enrollments.slice(0, 4).map((id, i) => allocateInOwnTransaction(studyId, id, { pretest: scores[i] })),
    );
    for (const [i, outcome] of outcomes.entries()) {
      expect(outcome.conditionId).toBe(slots.find((s) => s.reserved_for === enrollments[i])!.condition_id);
    }
    await expectStatus(
      researcher.post(`/api/studies/${studyId}/unblind`).send({ reason: 'Checking the pairing for the audit' }),
      200,
    );
    const report = await expectStatus(researcher.get(`/api/studies/${studyId}/assignment/verify`), 200);
    expect(report).toMatchObject({ allMatch: true, commitmentMatches: true, matched: 7 });
  });
});

describe('dry run', () => {
  it('simulates 1,000 arrivals and returns balance per condition, stratum and level', async () => {
    const { studyId, conditionIds } = await draftBetweenStudy(researcher);
    const result = await expectStatus(
      researcher.post(`/api/studies/${studyId}/assignment/dry-run`).send({
        arrivals: 1000,
        covariateMix: { pretest: { kind: 'normal', mean: 60, sd: 15 } },
      }),
      200,
    );
    expect(result.arrivals).toBe(1000);
    expect(result.arms.map((a: { armId: string }) => a.armId).sort()).toEqual([...conditionIds].sort());
    expect(result.arms.reduce((sum: number, a: { count: number }) => sum + a.count, 0)).toBe(1000);
    expect(result.strata).toHaveLength(2);
    expect(result.seed).toMatch(/^[0-9a-f]{64}$/);
    // Stratified blocks of at most 4 keep every stratum within 2 of perfect balance.
    for (const stratum of result.strata) expect(stratum.imbalance).toBeLessThanOrEqual(2);
  });

  it('starts from an even mix before anyone is screened and from the screened people’s answers after', async () => {
    const { studyId } = await draftBetweenStudy(researcher, { cutPoints: [40, 60] });
    const before = await expectStatus(researcher.get(`/api/studies/${studyId}/assignment/dry-run/starting-mix`), 200);
    expect(before).toEqual({ basis: 'even', people: 0, mix: { pretest: { kind: 'normal', mean: 50, sd: 20 } } });

    await insertEnrollments(testApp, studyId, [{ pretest: 50 }, { pretest: 60 }, { pretest: 70 }, { pretest: 80 }]);
    const after = await expectStatus(researcher.get(`/api/studies/${studyId}/assignment/dry-run/starting-mix`), 200);
    // Mean 65; sample SD √(500 / 3) ≈ 12.91.
    expect(after).toEqual({ basis: 'observed', people: 4, mix: { pretest: { kind: 'normal', mean: 65, sd: 12.91 } } });
  });

  it('runs with one click: no covariate mix given means the starting mix', async () => {
    const { studyId } = await draftBetweenStudy(researcher);
    const result = await expectStatus(
      researcher.post(`/api/studies/${studyId}/assignment/dry-run`).send({ arrivals: 200 }),
      200,
    );
    expect(result.arrivals).toBe(200);
    expect(result.factorLevels.map((level: { factorId: string }) => level.factorId)).toContain('pretest');
  });

  it('names a missing covariate distribution', async () => {
    const { studyId } = await draftBetweenStudy(researcher);
    const body = await expectStatus(
      researcher.post(`/api/studies/${studyId}/assignment/dry-run`).send({ arrivals: 10, covariateMix: {} }),
      400,
      'VALIDATION_FAILED',
    );
    expect(body.errors[0].field).toContain('pretest');
  });
});
