import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { EntityManager } from 'typeorm';
import { EnrollmentEntity } from '../src/enrollments/entities/enrollment.entity';
import { StepCompletionService } from '../src/enrollments/step-completion.service';
import { ReminderSweepService } from '../src/reminders/reminder-sweep.service';
import { JOB_NAMES, JobQueueService } from '../src/jobs/job-queue.service';
import { activeConsentVersion, prepareToOpen, signedUpParticipant } from './support/consent-fixtures';
import { expectStatus } from './support/http';
import { Browser, draftBetweenStudy, signedInStaff } from './support/study-fixtures';
import { startTestApp, TestApp } from './support/test-app';

let testApp: TestApp;
let coordinator: Browser;
let researcher: Browser;

beforeAll(async () => {
  testApp = await startTestApp();
  coordinator = await signedInStaff(testApp, 'coordinator');
  researcher = await signedInStaff(testApp, 'researcher');
});
afterAll(async () => {
  await testApp.close();
});

interface StepSpec {
  title: string;
  payMinor: number;
  settings: {
    verification: string;
    taskUrl?: string;
    opensAfterDays: number;
    opensFrom: string;
    dueWithinDays?: number | null;
    sharedCode?: string;
  };
}

const TASK_URL = 'https://tasks.example.test/route-session';

/** A recruiting study whose steps are set up as given, with an active consent form. */
async function recruitingStudy(specs: StepSpec[]) {
  const { studyId, conditionIds } = await draftBetweenStudy(coordinator);
  const stepIds: string[] = [];
  for (const spec of specs) {
    const list = await expectStatus(
      coordinator.post(`/api/studies/${studyId}/steps`).send({ title: spec.title, payMinor: spec.payMinor }),
      201,
    );
    const step = list.items.find((s: { title: string }) => s.title === spec.title);
    await expectStatus(coordinator.put(`/api/studies/${studyId}/steps/${step.id}`).send(spec.settings), 200);
    stepIds.push(step.id);
  }
  const version = await activeConsentVersion(coordinator, studyId);
  await expectStatus(coordinator.post(`/api/studies/${studyId}/open`), 200);
  return { studyId, conditionIds, stepIds, version };
}

async function signedUp(studyId: string, version: { id: string; fingerprint: string }, prefix: string) {
  return signedUpParticipant(testApp, studyId, version, prefix, 'Sam Tester');
}

/** Follows the start route to the task, then returns to the return address the task was given. */
async function returnFromTask(
  browser: Browser,
  studyId: string,
  stepId: string,
  edit: (returnPath: string) => string = (p) => p,
) {
  const { url } = await expectStatus(browser.get(`/api/studies/${studyId}/enrollments/me/steps/${stepId}/start`), 200);
  const task = new URL(url);
  const returnAddress = new URL(task.searchParams.get('return')!);
  const response = await browser.get(edit(returnAddress.pathname)).redirects(0);
  expect(response.status).toBe(302);
  return { task, location: new URL(response.headers.location as string) };
}

async function auditActions(studyId: string): Promise<string[]> {
  const rows: Array<{ action: string }> = await testApp.dataSource.query(
    `SELECT action FROM audit_event WHERE chain = $1 ORDER BY sequence`,
    [studyId],
  );
  return rows.map((r) => r.action);
}

async function completionsOf(enrollmentId: string): Promise<number> {
  const [row] = await testApp.dataSource.query(
    `SELECT count(*)::int AS n FROM step_completion WHERE enrollment_id = $1 AND undone_at IS NULL`,
    [enrollmentId],
  );
  return row.n;
}

const returnLinkSession: StepSpec = {
  title: 'Online session',
  payMinor: 1200,
  settings: {
    verification: 'return-link',
    taskUrl: TASK_URL,
    opensAfterDays: 0,
    opensFrom: 'assignment',
    dueWithinDays: 3,
  },
};

describe('return links from an external task', () => {
  it('sends the participant to the task with their reference and a signed return address that marks the step done once', async () => {
    const { studyId, stepIds, version } = await recruitingStudy([
      returnLinkSession,
      {
        ...returnLinkSession,
        title: 'Lab visit',
        settings: { verification: 'staff', opensAfterDays: 0, opensFrom: 'assignment' },
      },
    ]);
    const { browser, me } = await signedUp(studyId, version, 'returner');
    expect(me.steps[0]).toMatchObject({ verification: 'return-link', hasTask: true, status: 'open' });
    expect(me.steps[0].dueAt).not.toBeNull();

    const { task, location } = await returnFromTask(browser, studyId, stepIds[0]);
    expect(task.origin + task.pathname).toBe(TASK_URL);
    expect(task.searchParams.get('ref')).toBe(me.reference);
    expect(location.pathname).toBe('/return');
    expect(Object.fromEntries(location.searchParams)).toMatchObject({ result: 'done', step: stepIds[0] });

    const after = await expectStatus(browser.get(`/api/studies/${studyId}/enrollments/me`), 200);
    expect(after.steps[0]).toMatchObject({ status: 'done' });
    expect(after.earned.earnedMinor).toBe(1200);
    const [completion] = await testApp.dataSource.query(
      `SELECT verified_by, evidence FROM step_completion WHERE enrollment_id = $1`,
      [me.id],
    );
    expect(completion.verified_by).toBe('return-link');
    expect(completion.evidence.keyId).toBe(1);

    // Coming back a second time owes nothing more.
    const again = await returnFromTask(browser, studyId, stepIds[0]);
    expect(again.location.searchParams.get('result')).toBe('already-done');
    expect(await completionsOf(me.id)).toBe(1);
  });

  it('refuses a forged or altered link and another person using someone else’s link, recording only the attempt', async () => {
    const { studyId, stepIds, version } = await recruitingStudy([returnLinkSession]);
    const owner = await signedUp(studyId, version, 'link-owner');
    const other = await signedUp(studyId, version, 'link-borrower');
    const { url } = await expectStatus(
      owner.browser.get(`/api/studies/${studyId}/enrollments/me/steps/${stepIds[0]}/start`),
      200,
    );
    const returnPath = new URL(new URL(url).searchParams.get('return')!).pathname;
    const token = returnPath.split('/').pop()!;

    // The other participant's reference swapped in: the signature no longer matches.
    const swapped = token.replace(owner.me.reference, other.me.reference);
    const forged = await other.browser.get(`/api/return/${swapped}`).redirects(0);
    expect(new URL(forged.headers.location as string).searchParams.get('reason')).toBe('forged');
    // A later expiry written in.
    const parts = token.split('.');
    parts[3] = String(Number(parts[3]) + 86_400);
    const extended = await owner.browser.get(`/api/return/${parts.join('.')}`).redirects(0);
    expect(new URL(extended.headers.location as string).searchParams.get('reason')).toBe('forged');
    // Garbage.
    const garbage = await owner.browser.get('/api/return/not-a-token').redirects(0);
    expect(new URL(garbage.headers.location as string).searchParams.get('reason')).toBe('malformed');
    // The real link, used by someone else while signed in.
    const borrowed = await other.browser.get(returnPath).redirects(0);
    expect(new URL(borrowed.headers.location as string).searchParams.get('reason')).toBe('other-person');

    expect(await completionsOf(owner.me.id)).toBe(0);
    expect(await completionsOf(other.me.id)).toBe(0);
    expect((await auditActions(studyId)).filter((a) => a === 'step.return-refused')).toHaveLength(3);
    const [labRefusal] = await testApp.dataSource.query(
      `SELECT count(*)::int AS n FROM audit_event WHERE action = 'step.return-refused' AND data->>'reason' = 'malformed'`,
    );
    expect(labRefusal.n).toBeGreaterThan(0);
  });

  it('keeps links signed with the previous key working after a rotation, within the grace period', async () => {
    const { studyId, stepIds, version } = await recruitingStudy([returnLinkSession]);
    const person = await signedUp(studyId, version, 'rotation');
    const { url } = await expectStatus(
      person.browser.get(`/api/studies/${studyId}/enrollments/me/steps/${stepIds[0]}/start`),
      200,
    );
    const setup = await expectStatus(coordinator.post(`/api/studies/${studyId}/steps/return-link/rotate-key`), 200);
    expect(setup.keyId).toBe(2);
    expect(setup.returnAddressTemplate).toMatch(/\/api\/return\/\{token\}$/);
    const [rotated] = await testApp.dataSource.query(
      `SELECT data FROM audit_event WHERE chain = $1 AND action = 'step.return-key-rotated'`,
      [studyId],
    );
    expect(rotated.data.keyId).toBe(2);
    const response = await person.browser.get(new URL(new URL(url).searchParams.get('return')!).pathname).redirects(0);
    expect(new URL(response.headers.location as string).searchParams.get('result')).toBe('done');
  });
});

describe('per-participant codes', () => {
  it('accepts a code only from the participant it was issued to, and shows staff each person’s codes', async () => {
    const { studyId, stepIds, version } = await recruitingStudy([
      {
        title: 'In-person session',
        payMinor: 900,
        settings: { verification: 'participant-code', opensAfterDays: 0, opensFrom: 'assignment', dueWithinDays: null },
      },
    ]);
    const alice = await signedUp(studyId, version, 'code-a');
    const bob = await signedUp(studyId, version, 'code-b');
    const aliceCodes = await expectStatus(
      coordinator.get(`/api/studies/${studyId}/enrollments/${alice.me.id}/step-codes`),
      200,
    );
    const bobCodes = await expectStatus(
      coordinator.get(`/api/studies/${studyId}/enrollments/${bob.me.id}/step-codes`),
      200,
    );
    expect(aliceCodes.items[0].code).not.toBe(bobCodes.items[0].code);

    const refused = await expectStatus(
      bob.browser
        .post(`/api/studies/${studyId}/enrollments/me/steps/${stepIds[0]}/complete`)
        .send({ code: aliceCodes.items[0].code }),
      400,
      'VALIDATION_FAILED',
    );
    expect(refused.errors[0].field).toBe('code');
    expect(await completionsOf(bob.me.id)).toBe(0);
    expect(await auditActions(studyId)).toContain('step.code-refused');

    const done = await expectStatus(
      alice.browser
        .post(`/api/studies/${studyId}/enrollments/me/steps/${stepIds[0]}/complete`)
        .send({ code: aliceCodes.items[0].code.toLowerCase() }),
      200,
    );
    expect(done.steps[0].status).toBe('done');

    const csv = await coordinator.get(`/api/studies/${studyId}/step-codes.csv`);
    expect(csv.status).toBe(200);
    expect(csv.text.split('\n')[0]).toBe('reference,step_position,step_title,code');
    expect(csv.text).toContain(`${alice.me.reference},1,In-person session,${aliceCodes.items[0].code}`);
  });
});

describe('windows, staff marks and undo', () => {
  const twoSessions: StepSpec[] = [
    {
      title: 'Session 1',
      payMinor: 1000,
      settings: { verification: 'staff', opensAfterDays: 0, opensFrom: 'assignment', dueWithinDays: 2 },
    },
    {
      title: 'Session 2',
      payMinor: 1500,
      settings: { verification: 'staff', opensAfterDays: 7, opensFrom: 'previous-step', dueWithinDays: 2 },
    },
  ];

  it('refuses a step whose window has not opened, naming when it opens', async () => {
    const { studyId, stepIds, version } = await recruitingStudy(twoSessions);
    const person = await signedUp(studyId, version, 'window');
    expect(person.me.steps.map((s: { status: string }) => s.status)).toEqual(['open', 'waiting']);
    const waiting = await expectStatus(
      coordinator.post(`/api/studies/${studyId}/enrollments/${person.me.id}/steps/${stepIds[1]}/complete`),
      409,
      'STEP_NOT_AVAILABLE',
    );
    expect(waiting.errors[0]).toMatchObject({ field: 'stepId' });
    await expectStatus(
      coordinator.post(`/api/studies/${studyId}/enrollments/${person.me.id}/steps/${stepIds[0]}/complete`),
      200,
    );
    const upcoming = await expectStatus(
      coordinator.post(`/api/studies/${studyId}/enrollments/${person.me.id}/steps/${stepIds[1]}/complete`),
      409,
      'STEP_NOT_AVAILABLE',
    );
    expect(upcoming.message).toMatch(/opens on/);
    const me = await expectStatus(person.browser.get(`/api/studies/${studyId}/enrollments/me`), 200);
    expect(me.steps.map((s: { status: string }) => s.status)).toEqual(['done', 'upcoming']);
    const roster = await expectStatus(coordinator.get(`/api/studies/${studyId}/enrollments`), 200);
    expect(roster.items[0].nextStep).toMatchObject({ stepId: stepIds[1], timing: 'upcoming' });
  });

  it('undoes a completion with a reason before its payout is approved, and refuses once it is', async () => {
    const { studyId, stepIds, version } = await recruitingStudy(twoSessions);
    const person = await signedUp(studyId, version, 'undo');
    await expectStatus(
      coordinator.post(`/api/studies/${studyId}/enrollments/${person.me.id}/steps/${stepIds[0]}/complete`),
      200,
    );
    const missingReason = await expectStatus(
      coordinator.delete(`/api/studies/${studyId}/enrollments/${person.me.id}/steps/${stepIds[0]}/complete`).send({}),
      400,
      'VALIDATION_FAILED',
    );
    expect(missingReason.errors[0].field).toBe('reason');
    await expectStatus(
      coordinator
        .delete(`/api/studies/${studyId}/enrollments/${person.me.id}/steps/${stepIds[0]}/complete`)
        .send({ reason: 'Marked the wrong person' }),
      200,
    );
    const record = await expectStatus(coordinator.get(`/api/studies/${studyId}/enrollments/${person.me.id}`), 200);
    expect(record.enrollment.status).toBe('assigned');
    expect(record.steps[0]).toMatchObject({ status: 'open', completion: null });
    expect(record.steps[0].undone[0]).toMatchObject({
      reason: 'Marked the wrong person',
      undoneByEmail: 'coordinator@evenhand.test',
    });
    const payouts = await expectStatus(coordinator.get(`/api/studies/${studyId}/payouts`), 200);
    expect(payouts.items.map((p: { status: string }) => p.status)).toEqual(['cancelled']);

    // Done again, then its payout approved: the completion is fixed.
    await expectStatus(
      coordinator.post(`/api/studies/${studyId}/enrollments/${person.me.id}/steps/${stepIds[0]}/complete`),
      200,
    );
    await testApp.dataSource.query(
      `UPDATE payout SET status = 'approved', approved_at = now() WHERE enrollment_id = $1 AND status = 'owed'`,
      [person.me.id],
    );
    const refused = await expectStatus(
      coordinator
        .delete(`/api/studies/${studyId}/enrollments/${person.me.id}/steps/${stepIds[0]}/complete`)
        .send({ reason: 'Too late to change' }),
      409,
      'PAYOUT_ALREADY_APPROVED',
    );
    expect(refused.message).toMatch(/approved/);
    expect(await completionsOf(person.me.id)).toBe(1);
    expect((await auditActions(studyId)).filter((a) => a === 'step.completion-undone')).toHaveLength(1);
  });

  it('leaves nothing behind when the transaction around a completion rolls back', async () => {
    const { studyId, stepIds, version } = await recruitingStudy(twoSessions);
    const person = await signedUp(studyId, version, 'rollback');
    // The same private step the routes use, called inside a transaction that then fails.
    const progress = testApp.app.get(StepCompletionService) as unknown as {
      completeStep(
        manager: EntityManager,
        actor: object,
        studyId: string,
        enrollment: EnrollmentEntity,
        stepId: string,
        verifiedBy: string,
        evidence: object,
      ): Promise<boolean>;
    };
    const before = await auditActions(studyId);
    await expect(
      testApp.dataSource.transaction(async (manager) => {
        const entity = await manager.findOneOrFail(EnrollmentEntity, {
          where: { id: person.me.id },
          lock: { mode: 'pessimistic_write' },
        });
        expect(
          await progress.completeStep(manager, { id: null, email: null }, studyId, entity, stepIds[0], 'staff', {}),
        ).toBe(true);
        throw new Error('rolled back on purpose');
      }),
    ).rejects.toThrow('rolled back on purpose');
    expect(await completionsOf(person.me.id)).toBe(0);
    const [payouts] = await testApp.dataSource.query(`SELECT count(*)::int AS n FROM payout WHERE enrollment_id = $1`, [
      person.me.id,
    ]);
    expect(payouts.n).toBe(0);
    expect(await auditActions(studyId)).toEqual(before);
  });

  it('marks a step done for a pasted list, reporting each line and writing nothing for bad ones', async () => {
    const { studyId, stepIds, version } = await recruitingStudy(twoSessions);
    const first = await signedUp(studyId, version, 'list-a');
    const second = await signedUp(studyId, version, 'list-b');
    await expectStatus(
      coordinator.post(`/api/studies/${studyId}/enrollments/${second.me.id}/steps/${stepIds[0]}/complete`),
      200,
    );
    const report = await expectStatus(
      coordinator
        .post(`/api/studies/${studyId}/steps/${stepIds[0]}/completions`)
        .send({ references: [first.me.reference.toLowerCase(), second.me.reference, 'P-NOSUCH', first.me.reference] }),
      200,
    );
    expect(report).toMatchObject({ completed: 1, alreadyDone: 1, failed: 2 });
    expect(report.rows.map((r: { line: number; outcome: string }) => [r.line, r.outcome])).toEqual([
      [1, 'completed'],
      [2, 'already-done'],
      [3, 'failed'],
      [4, 'failed'],
    ]);
    expect(report.rows[2].message).toMatch(/no participant/);
    // Session 2 has not opened for anyone: every line fails and nothing is written.
    const notOpen = await expectStatus(
      coordinator
        .post(`/api/studies/${studyId}/steps/${stepIds[1]}/completions`)
        .send({ references: [first.me.reference] }),
      200,
    );
    expect(notOpen).toMatchObject({ completed: 0, failed: 1 });
    expect(await completionsOf(first.me.id)).toBe(1);
    const empty = await expectStatus(
      coordinator.post(`/api/studies/${studyId}/steps/${stepIds[0]}/completions`).send({ references: [] }),
      400,
      'VALIDATION_FAILED',
    );
    expect(empty.errors[0].field).toBe('references');
  });
});

describe('opening a study', () => {
  it('refuses to open without an active consent version and a step, naming what is missing', async () => {
    const { studyId } = await draftBetweenStudy(researcher);
    const checklist = await expectStatus(researcher.get(`/api/studies/${studyId}/opening-checklist`), 200);
    expect(checklist.ready).toBe(false);
    expect(checklist.items.map((i: { key: string; met: boolean }) => [i.key, i.met])).toEqual([
      ['conditions', true],
      ['assignmentScheme', true],
      ['steps', false],
      ['consent', false],
    ]);
    const refused = await expectStatus(researcher.post(`/api/studies/${studyId}/open`), 409, 'STUDY_NOT_READY_TO_OPEN');
    expect(refused.errors.map((e: { field: string }) => e.field)).toEqual(['steps', 'consent']);
    expect(refused.message).toMatch(/consent/);
    await prepareToOpen(researcher, studyId);
    expect((await expectStatus(researcher.get(`/api/studies/${studyId}/opening-checklist`), 200)).ready).toBe(true);
    await expectStatus(researcher.post(`/api/studies/${studyId}/open`), 200);
  });
});

describe('reminders', () => {
  it('sends the same reminders per participant in every condition over a simulated 30 days through the job queue', async () => {
    const { studyId, conditionIds } = await recruitingStudy([
      {
        title: 'Session 1',
        payMinor: 1000,
        settings: { verification: 'staff', opensAfterDays: 0, opensFrom: 'assignment', dueWithinDays: 3 },
      },
      {
        title: 'Session 2',
        payMinor: 1000,
        settings: { verification: 'staff', opensAfterDays: 10, opensFrom: 'assignment', dueWithinDays: 4 },
      },
      {
        title: 'Session 3',
        payMinor: 1000,
        settings: { verification: 'staff', opensAfterDays: 21, opensFrom: 'assignment', dueWithinDays: null },
      },
    ]);
    await expectStatus(
      coordinator.put(`/api/studies/${studyId}/reminder-plan`).send({
        rules: [
          { anchor: 'opens', days: 0 },
          { anchor: 'due', days: 2 },
          { anchor: 'due', days: 0 },
        ],
        suggestLostAfter: 3,
        enabled: true,
      }),
      200,
    );
    const start = new Date(Date.now() - 40 * 86_400_000);
    const ids: string[] = [];
    // Six people per condition assigned at the same moment, none finishing anything: everyone is owed every reminder.
    for (const [c, conditionId] of conditionIds.entries()) {
      for (let i = 0; i < 6; i++) {
        const [user] = await testApp.dataSource.query(
          `INSERT INTO user_account (email, role) VALUES ($1, 'participant') RETURNING id`,
          [`sweep-${studyId.slice(0, 8)}-${c}-${i}@example.test`],
        );
        const [row] = await testApp.dataSource.query(
          `INSERT INTO enrollment (study_id, participant_id, reference, status, condition_id, assigned_at) VALUES ($1, $2, $3, 'assigned', $4, $5) RETURNING id`,
          [studyId, user.id, `S-${c}${i}${studyId.slice(0, 4)}`, conditionId, start],
        );
        ids.push(row.id);
      }
    }
    const jobs = testApp.app.get(JobQueueService);
    for (let hours = 0; hours <= 30 * 24; hours += 12) {
      const asOf = new Date(start.getTime() + hours * 3_600_000).toISOString();
      await testApp.dataSource.transaction((manager) =>
        jobs.enqueue(manager, JOB_NAMES.sweepReminders, { asOf, studyIds: [studyId] }),
      );
    }
    // Session 1: opens, 2 days before due, due day (3); session 2: the same (3); session 3: opening only (1).
    const expected = 7;
    await expect
      .poll(
        async () => {
          const [row] = await testApp.dataSource.query(
            `SELECT count(*)::int AS n FROM contact WHERE study_id = $1 AND kind = 'reminder'`,
            [studyId],
          );
          return row.n;
        },
        { timeout: 60_000, interval: 250 },
      )
      .toBe(expected * ids.length);
    const perCondition: Array<{ condition_id: string; min: number; max: number }> = await testApp.dataSource.query(
      `SELECT e.condition_id, min(n)::int AS min, max(n)::int AS max FROM enrollment e
         JOIN (SELECT enrollment_id, count(*) AS n FROM contact WHERE kind = 'reminder' GROUP BY enrollment_id) c ON c.enrollment_id = e.id
        WHERE e.study_id = $1 GROUP BY e.condition_id`,
      [studyId],
    );
    expect(perCondition).toHaveLength(conditionIds.length);
    for (const row of perCondition) expect([row.min, row.max]).toEqual([expected, expected]);

    // Sweeping a moment already swept sends nothing more.
    expect(
      await testApp.app.get(ReminderSweepService).sweep(new Date(start.getTime() + 10 * 86_400_000), [studyId]),
    ).toBe(0);
    const log = await expectStatus(coordinator.get(`/api/studies/${studyId}/enrollments/${ids[0]}/contacts`), 200);
    expect(log.items).toHaveLength(expected);
    expect(log).toMatchObject({ unansweredReminders: expected, suggestLost: true });
    const roster = await expectStatus(coordinator.get(`/api/studies/${studyId}/enrollments?pageSize=50`), 200);
    expect(roster.items.every((e: { suggestLost: boolean }) => e.suggestLost)).toBe(true);

    const watch = await expectStatus(coordinator.get(`/api/studies/${studyId}/attrition`), 200);
    expect(watch.contacts.conditions.map((c: { meanPerParticipant: number }) => c.meanPerParticipant)).toEqual([
      expected,
      expected,
    ]);
    expect(watch.contacts.largestMeanDifference).toBe(0);
  });
});
