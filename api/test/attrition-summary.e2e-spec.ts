import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AttritionService } from '../src/attrition/attrition.service';
import { AttritionSummaryService } from '../src/attrition/attrition-summary.service';
import { dayOf } from './support/attrition-fixtures';
import { draftBetweenStudy, signedInStaff } from './support/study-fixtures';
import { startTestApp, TestApp } from './support/test-app';

let testApp: TestApp;
let attrition: AttritionService;
let summary: AttritionSummaryService;

beforeAll(async () => {
  testApp = await startTestApp();
  attrition = testApp.app.get(AttritionService);
  summary = testApp.app.get(AttritionSummaryService);
});
afterAll(async () => {
  await testApp.close();
});

/** One thing that happens to a study; `who` picks an enrollment, `day` (fractional) when it happened. */
type Step =
  | { kind: 'join'; pretest: number; device: string | boolean; status: 'invited' | 'screened' | 'consented' }
  | { kind: 'assign'; who: number; arm: number; day: number; stratum: string | null }
  | { kind: 'activate'; who: number }
  | { kind: 'complete'; who: number; day: number | null }
  | { kind: 'withdraw'; who: number; day: number | null; reason: string | null }
  | { kind: 'lose'; who: number; day: number | null; reason: string | null }
  | { kind: 'undo-lost'; who: number }
  | { kind: 'exclude'; who: number; day: number | null }
  | { kind: 'pay'; who: number; amount: number; foreign: boolean; override: boolean }
  | {
      kind: 'payout-status';
      which: number;
      status: 'approved' | 'sending' | 'paid' | 'failed' | 'cancelled' | 'reversed';
    }
  | {
      kind: 'contact';
      who: number;
      day: number;
      type: 'invitation' | 'reminder' | 'reconsent-request' | 'staff-message';
    }
  | { kind: 'forget-contact'; which: number }
  | { kind: 'covariates'; who: number; pretest: number }
  | { kind: 'compact' }
  | { kind: 'close'; day: number };

const who = fc.nat(40);
const when = fc.double({ min: 0, max: 60, noNaN: true }).map((d) => Math.round(d * 1e4) / 1e4);
const maybeWhen = fc.option(when, { freq: 6 });
const reason = fc.option(fc.constantFrom('moved away', 'too much travel', 'no reply'), { freq: 2 });

const step: fc.Arbitrary<Step> = fc.oneof(
  {
    weight: 5,
    arbitrary: fc.record({
      kind: fc.constant('join' as const),
      pretest: fc.integer({ min: 40, max: 90 }).map((p) => p / 2),
      device: fc.constantFrom<string | boolean>('phone', 'laptop', true),
      status: fc.constantFrom('invited' as const, 'screened' as const, 'consented' as const),
    }),
  },
  {
    weight: 5,
    arbitrary: fc.record({
      kind: fc.constant('assign' as const),
      who,
      arm: fc.nat(2),
      day: when,
      stratum: fc.option(fc.constantFrom('pretest:0', 'pretest:1'), { freq: 5 }),
    }),
  },
  { weight: 2, arbitrary: fc.record({ kind: fc.constant('activate' as const), who }) },
  { weight: 3, arbitrary: fc.record({ kind: fc.constant('complete' as const), who, day: maybeWhen }) },
  { weight: 2, arbitrary: fc.record({ kind: fc.constant('withdraw' as const), who, day: maybeWhen, reason }) },
  { weight: 2, arbitrary: fc.record({ kind: fc.constant('lose' as const), who, day: maybeWhen, reason }) },
  { weight: 1, arbitrary: fc.record({ kind: fc.constant('undo-lost' as const), who }) },
  { weight: 1, arbitrary: fc.record({ kind: fc.constant('exclude' as const), who, day: maybeWhen }) },
  {
    weight: 4,
    arbitrary: fc.record({
      kind: fc.constant('pay' as const),
      who,
      amount: fc.constantFrom(0, 250, 500, 1000, 1500),
      foreign: fc.nat(4).map((n) => n === 0),
      override: fc.nat(4).map((n) => n === 0),
    }),
  },
  {
    weight: 3,
    arbitrary: fc.record({
      kind: fc.constant('payout-status' as const),
      which: fc.nat(60),
      status: fc.constantFrom(
        'approved' as const,
        'sending' as const,
        'paid' as const,
        'failed' as const,
        'cancelled' as const,
        'reversed' as const,
      ),
    }),
  },
  {
    weight: 3,
    arbitrary: fc.record({
      kind: fc.constant('contact' as const),
      who,
      day: fc.double({ min: -2, max: 60, noNaN: true }).map((d) => Math.round(d * 100) / 100),
      type: fc.constantFrom(
        'invitation' as const,
        'reminder' as const,
        'reconsent-request' as const,
        'staff-message' as const,
      ),
    }),
  },
  { weight: 1, arbitrary: fc.record({ kind: fc.constant('forget-contact' as const), which: fc.nat(60) }) },
  {
    weight: 1,
    arbitrary: fc.record({
      kind: fc.constant('covariates' as const),
      who,
      pretest: fc.integer({ min: 40, max: 90 }).map((p) => p / 2),
    }),
  },
  { weight: 2, arbitrary: fc.record({ kind: fc.constant('compact' as const) }) },
  { weight: 1, arbitrary: fc.record({ kind: fc.constant('close' as const), day: fc.integer({ min: 20, max: 70 }) }) },
);

/** Plays one history into the tables, the way the services would leave them, statement by statement. */
class HistoryPlayer {
  private readonly enrollments: Array<{ id: string; participantId: string }> = [];
  private readonly payouts: string[] = [];
  private readonly contacts: string[] = [];
  private count = 0;

  constructor(
    private readonly studyId: string,
    private readonly arms: Array<{ conditionId: string; order: string[] }>,
    private readonly currency: string,
    private readonly tag: string,
  ) {}

  private get db() {
    return testApp.dataSource;
  }

  private pick(index: number): { id: string; participantId: string } | undefined {
    return this.enrollments.length === 0 ? undefined : this.enrollments[index % this.enrollments.length];
  }

  async play(step: Step): Promise<void> {
    if (step.kind === 'join') {
      this.count += 1;
      const [user] = await this.db.query(
        `INSERT INTO user_account (email, role) VALUES ($1, 'participant') RETURNING id`,
        [`${this.tag}-${this.count}@example.test`],
      );
      const [row] = await this.db.query(
        `INSERT INTO enrollment (study_id, participant_id, reference, status, covariates, invited_at)
         VALUES ($1, $2, $3, $4, $5, $6) RETURNING id`,
        [
          this.studyId,
          user.id,
          `${this.tag.toUpperCase()}-${this.count}`,
          step.status,
          JSON.stringify({ pretest: step.pretest, device: step.device }),
          dayOf(-1),
        ],
      );
      this.enrollments.push({ id: row.id, participantId: user.id });
      return;
    }
    if (step.kind === 'compact') return summary.compact();
    if (step.kind === 'close') {
      await this.db.query(`UPDATE study SET status = 'closed', closed_at = $2 WHERE id = $1`, [
        this.studyId,
        dayOf(step.day),
      ]);
      return;
    }
    if (step.kind === 'payout-status') {
      if (this.payouts.length === 0) return;
      await this.db.query(`UPDATE payout SET status = $2 WHERE id = $1`, [
        this.payouts[step.which % this.payouts.length],
        step.status,
      ]);
      return;
    }
    if (step.kind === 'forget-contact') {
      if (this.contacts.length === 0) return;
      const [id] = this.contacts.splice(step.which % this.contacts.length, 1);
      await this.db.query(`DELETE FROM contact WHERE id = $1`, [id]);
      return;
    }
    const enrollment = this.pick(step.who);
    if (!enrollment) return;
    const { id } = enrollment;
    switch (step.kind) {
      case 'assign': {
        const arm = this.arms[step.arm % this.arms.length];
        await this.db.query(
          `UPDATE enrollment SET status = 'assigned', condition_id = $2, condition_order = $3, assigned_at = $4, stratum_key = $5 WHERE id = $1`,
          [id, arm.conditionId, JSON.stringify(arm.order), dayOf(step.day), step.stratum],
        );
        return;
      }
      case 'activate':
        await this.db.query(`UPDATE enrollment SET status = 'active' WHERE id = $1 AND status = 'assigned'`, [id]);
        return;
      case 'complete':
        await this.db.query(`UPDATE enrollment SET status = 'completed', completed_at = $2 WHERE id = $1`, [
          id,
          step.day === null ? null : dayOf(step.day),
        ]);
        return;
      case 'withdraw':
        await this.db.query(
          `UPDATE enrollment SET status = 'withdrew', withdrew_at = $2, withdrawal_reason = $3 WHERE id = $1`,
          [id, step.day === null ? null : dayOf(step.day), step.reason],
        );
        return;
      case 'lose':
        await this.db.query(`UPDATE enrollment SET status = 'lost', lost_at = $2, lost_reason = $3 WHERE id = $1`, [
          id,
          step.day === null ? null : dayOf(step.day),
          step.reason,
        ]);
        return;
      case 'undo-lost':
        await this.db.query(
          `UPDATE enrollment SET status = 'active', lost_at = NULL, lost_reason = NULL WHERE id = $1 AND status = 'lost'`,
          [id],
        );
        return;
      case 'exclude':
        await this.db.query(
          `UPDATE enrollment SET status = 'excluded', excluded_at = $2, exclusion_reason = 'did not meet criteria' WHERE id = $1`,
          [id, step.day === null ? null : dayOf(step.day)],
        );
        return;
      case 'pay': {
        const [row] = await this.db.query(
          `INSERT INTO payout (study_id, enrollment_id, participant_id, kind, amount_minor, currency, pay_override, status, idempotency_key)
           VALUES ($1, $2, $3, 'step', $4, $5, $6, 'owed', gen_random_uuid()::text) RETURNING id`,
          [
            this.studyId,
            id,
            enrollment.participantId,
            step.amount,
            step.foreign ? 'XTS' : this.currency,
            step.override,
          ],
        );
        this.payouts.push(row.id);
        return;
      }
      case 'contact': {
        const [row] = await this.db.query(
          `INSERT INTO contact (study_id, enrollment_id, kind, sent_at, subject) VALUES ($1, $2, $3, $4, 'A note') RETURNING id`,
          [this.studyId, id, step.type, dayOf(step.day)],
        );
        this.contacts.push(row.id);
        return;
      }
      case 'covariates':
        await this.db.query(`UPDATE enrollment SET covariates = jsonb_set(covariates, '{pretest}', $2) WHERE id = $1`, [
          id,
          JSON.stringify(step.pretest),
        ]);
        return;
    }
  }
}

describe('the dropout watch read from its maintained summary', () => {
  let researcher: Awaited<ReturnType<typeof signedInStaff>>;
  let runs = 0;
  let reportsCompared = 0;

  beforeAll(async () => {
    researcher = await signedInStaff(testApp, 'researcher');
  });

  // Where the full computation refuses a history (a within-subjects study nobody is randomized in yet has no arms
  // to compare), the summary must refuse it with the same error.
  async function outcome(studyId: string, source: 'summary' | 'full', now: Date): Promise<unknown> {
    try {
      return (await attrition.compute(studyId, undefined, { source, now })).dto;
    } catch (error) {
      return { refused: error instanceof Error ? `${error.name}: ${error.message}` : String(error) };
    }
  }

  async function expectSameAsFullComputation(studyId: string, now: Date): Promise<void> {
    const full = await outcome(studyId, 'full', now);
    expect(await outcome(studyId, 'summary', now)).toEqual(full);
    if (!(full as { refused?: string }).refused) reportsCompared += 1;
  }

  it('equals the full computation after any history of joins, assignments, pay, dropouts, undo and compaction', async () => {
    await fc.assert(
      fc.asyncProperty(
        fc.array(step, { minLength: 1, maxLength: 45 }),
        fc.constantFrom('between' as const, 'within' as const),
        fc.array(fc.nat(44), { maxLength: 3 }),
        async (history, design, checkpoints) => {
          runs += 1;
          const { studyId, conditionIds } = await draftBetweenStudy(researcher, { conditions: ['near', 'far'] });
          if (design === 'within')
            await testApp.dataSource.query(`UPDATE study SET design = 'within' WHERE id = $1`, [studyId]);
          const [{ currency }] = await testApp.dataSource.query(`SELECT currency FROM study WHERE id = $1`, [studyId]);
          const arms = [
            { conditionId: conditionIds[0], order: [conditionIds[0], conditionIds[1]] },
            { conditionId: conditionIds[1], order: [conditionIds[1], conditionIds[0]] },
            { conditionId: conditionIds[0], order: [conditionIds[0], conditionIds[1]] },
          ];
          const player = new HistoryPlayer(studyId, arms, currency, `sum${runs}${Date.now().toString(36)}`);
          const now = dayOf(75);
          for (const [i, entry] of history.entries()) {
            await player.play(entry);
            if (checkpoints.includes(i)) await expectSameAsFullComputation(studyId, now);
          }
          await expectSameAsFullComputation(studyId, now);
          // Censoring at a different "now" moves only the open follow-up times, in both computations alike.
          await expectSameAsFullComputation(studyId, dayOf(90.5));
        },
      ),
      { numRuns: 25, seed: 1_764_700_800 },
    );
    // Most histories produce a whole report, not a refusal, so the comparison above is about figures.
    expect(reportsCompared).toBeGreaterThan(25);
  }, 300_000);

  it('keeps counting the same after the study switches design and everything is compacted', async () => {
    const { studyId, conditionIds } = await draftBetweenStudy(researcher, { conditions: ['near', 'far'] });
    const arms = [{ conditionId: conditionIds[0], order: [conditionIds[1], conditionIds[0]] }];
    const [{ currency }] = await testApp.dataSource.query(`SELECT currency FROM study WHERE id = $1`, [studyId]);
    const player = new HistoryPlayer(studyId, arms, currency, `switch${Date.now().toString(36)}`);
    for (const entry of [
      { kind: 'join', pretest: 50, device: 'phone', status: 'consented' },
      { kind: 'join', pretest: 60, device: 'laptop', status: 'consented' },
      { kind: 'assign', who: 0, arm: 0, day: 1, stratum: null },
      { kind: 'complete', who: 0, day: 9.5 },
      { kind: 'assign', who: 1, arm: 0, day: 2, stratum: 'pretest:0' },
    ] satisfies Step[])
      await player.play(entry);
    await testApp.dataSource.query(`UPDATE study SET design = 'within' WHERE id = $1`, [studyId]);
    await summary.compact();
    const [state] = await testApp.dataSource.query(
      `SELECT count(*)::int AS rows FROM attrition_followed_delta WHERE study_id = $1`,
      [studyId],
    );
    expect(state.rows).toBe(0);
    await expectSameAsFullComputation(studyId, dayOf(30));
    const report = await attrition.report(studyId);
    expect(report.overall.randomized).toBe(2);
  });
});
