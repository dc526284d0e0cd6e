import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { AuditService } from '../src/audit/audit.service';
import { SignedCopyService } from '../src/consent/signed-copy/signed-copy.service';
import { prepareToOpen } from './support/consent-fixtures';
import { expectStatus } from './support/http';
import { sessionFor } from './support/session';
import { Browser, draftBetweenStudy, signedInStaff } from './support/study-fixtures';
import { startTestApp, TestApp } from './support/test-app';

/**
 * Two api processes on one database, as a deployment with two replicas runs them: each has its own connection
 * pool, job workers (pg-boss) and audit chainer. Signings spread across both must still take distinct slots, the
 * study's audit chain must verify, and every background job must be taken by exactly one of them.
 */
describe('two api processes on one database', () => {
  let first: TestApp;
  let second: TestApp;

  beforeAll(async () => {
    first = await startTestApp({ RUN_WORKERS: 'true' });
    second = await startTestApp({ RUN_WORKERS: 'true' });
  });
  afterAll(async () => {
    vi.restoreAllMocks();
    await first?.close();
    await second?.close();
  });

  it('gives signers spread across both distinct slots, keeps the chain whole and makes each signed copy once', async () => {
    const coordinator = await signedInStaff(first, 'coordinator');
    const { studyId } = await draftBetweenStudy(coordinator);
    const version = await prepareToOpen(coordinator, studyId);
    await expectStatus(coordinator.post(`/api/studies/${studyId}/open`), 200);
    const copiesMadeBy = [first, second].map((app) => vi.spyOn(app.app.get(SignedCopyService), 'makeSignedCopy'));

    const people = 40;
    const signers: Browser[] = [];
    for (let i = 0; i < people; i++) {
      const [user] = await first.dataSource.query(
        `INSERT INTO user_account (email, role) VALUES ($1, 'participant') RETURNING id`,
        [`two-processes-${Date.now().toString(36)}-${i}@example.test`],
      );
      const { accessToken } = await sessionFor(first, user.id);
      // Every other person reaches the second process, as a load balancer would spread them.
      const browser = (i % 2 === 0 ? first : second).browser().set('Cookie', `eh_access=${accessToken}`);
      signers.push(browser as unknown as Browser);
      await expectStatus(browser.post(`/api/studies/${studyId}/enrollments/me`), 201);
      // Both strata of the pretest factor (cut at 65).
      await expectStatus(
        browser.put(`/api/studies/${studyId}/enrollments/me/screening`).send({ answers: { pretest: (i * 7) % 100 } }),
        200,
      );
    }
    const responses = await Promise.all(
      signers.map((browser, i) =>
        browser
          .post(`/api/studies/${studyId}/enrollments/me/signature`)
          .send({ versionId: version.id, fingerprint: version.fingerprint, typedName: `Signer ${i + 1}` }),
      ),
    );
    expect(responses.map((r) => r.status)).toEqual(Array(people).fill(201));

    // Every slot is taken once, each stratum's taken positions run 1…k without a gap, and sequences never repeat.
    const strata: Array<{ stratum_key: string; positions: number[]; takers: number }> = await first.dataSource.query(
      `SELECT stratum_key, array_agg(position ORDER BY position) AS positions, count(DISTINCT taken_by)::int AS takers
       FROM allocation_slot WHERE study_id = $1 AND taken_by IS NOT NULL GROUP BY stratum_key`,
      [studyId],
    );
    expect(strata.length).toBe(2);
    for (const stratum of strata) {
      expect(stratum.positions).toEqual(Array.from({ length: stratum.positions.length }, (_, i) => i + 1));
      expect(stratum.takers).toBe(stratum.positions.length);
    }
    expect(strata.reduce((sum, s) => sum + s.takers, 0)).toBe(people);
    const [allocations] = await first.dataSource.query(
      `SELECT count(*)::int AS n, count(DISTINCT sequence)::int AS sequences, count(DISTINCT enrollment_id)::int AS people
       FROM allocation WHERE study_id = $1`,
      [studyId],
    );
    expect(allocations).toEqual({ n: people, sequences: people, people });

    // Both processes sealed events into the same chain; it verifies from either.
    const verdict = await second.app.get(AuditService).verify([studyId]);
    expect(verdict[0]).toMatchObject({ chain: studyId, intact: true, firstBreak: null });

    // The signed-copy jobs: every copy made and e-mailed, each job run by exactly one process, once.
    await expect
      .poll(
        async () => {
          const [row] = await first.dataSource.query(
            `SELECT count(*)::int AS n FROM signature s JOIN enrollment e ON e.id = s.enrollment_id
             WHERE e.study_id = $1 AND s.copy_emailed_at IS NOT NULL`,
            [studyId],
          );
          return row.n;
        },
        { timeout: 60_000, interval: 250 },
      )
      .toBe(people);
    const signatureIds: string[] = (
      await first.dataSource.query(
        `SELECT s.id FROM signature s JOIN enrollment e ON e.id = s.enrollment_id WHERE e.study_id = $1`,
        [studyId],
      )
    ).map((row: { id: string }) => row.id);
    const runs = copiesMadeBy.flatMap((spy) => spy.mock.calls.map(([signatureId]) => signatureId));
    const mine = runs.filter((id) => signatureIds.includes(id));
    expect(mine.sort()).toEqual([...signatureIds].sort());
  }, 180_000);
});
