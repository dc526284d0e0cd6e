import { parse } from 'csv-parse/sync';
import { jStat } from 'jstat';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AttritionAlertsService } from '../src/attrition/alerts/attrition-alerts.service';
import { dayOf, expectMailCount, HistoryEntry, insertHistory } from './support/attrition-fixtures';
import { activeConsentVersion } from './support/consent-fixtures';
import { expectStatus } from './support/http';
import { uniqueAddress } from './support/mailbox';
import { Browser, draftBetweenStudy, signedInStaff } from './support/study-fixtures';
import { startTestApp, TestApp } from './support/test-app';

let testApp: TestApp;
let researcher: Browser;
let admin: Browser;

beforeAll(async () => {
  testApp = await startTestApp();
  researcher = await signedInStaff(testApp, 'researcher');
  admin = await signedInStaff(testApp, 'admin');
});
afterAll(async () => {
  await testApp.close();
});

async function staffAccount(
  role: 'researcher' | 'coordinator',
  name: string,
): Promise<{ email: string; browser: Browser }> {
  const email = uniqueAddress(role);
  await expectStatus(admin.post('/api/users').send({ email, name, role, password: 'a-long-password-1' }), 201);
  const browser = testApp.browser();
  await expectStatus(browser.post('/api/auth/sign-in').send({ email, password: 'a-long-password-1' }), 200);
  return { email, browser };
}

/** An opened, blinded two-condition study with two steps (500 and 1000 minor units). */
async function openStudy(conditions: string[]): Promise<{ studyId: string; conditionIds: string[] }> {
  const { studyId, conditionIds } = await draftBetweenStudy(researcher, { conditions });
  await expectStatus(
    researcher.post(`/api/studies/${studyId}/steps`).send({ title: 'Route learning', payMinor: 500 }),
    201,
  );
  await expectStatus(
    researcher.post(`/api/studies/${studyId}/steps`).send({ title: 'Route recall', payMinor: 1000 }),
    201,
  );
  await activeConsentVersion(researcher, studyId);
  await expectStatus(researcher.post(`/api/studies/${studyId}/open`), 200);
  return { studyId, conditionIds };
}

// jstat's Student t distribution, which the statistics folder's declarations leave out.
const studentT = (jStat as unknown as { studentt: { cdf(x: number, df: number): number } }).studentt;
const sum = (values: number[]) => values.reduce((total, value) => total + value, 0);
const daysSince = (start: number, end: number) => (end - start) / 86_400_000;

describe('dropout watch of a study with a known history', () => {
  let studyId: string;
  let audio: string;
  let map: string;
  let before: number;
  let report: any;

  beforeAll(async () => {
    ({
      studyId,
      conditionIds: [audio, map],
    } = await openStudy(['audio cues', 'map cues']));
    // Condition A (audio cues), 10 randomized: 6 completed on day 10, 1 withdrew on day 2, 1 lost on day 5, 2 active.
    const pretestA = [60, 70, 60, 70, 60, 70, 60, 70, 60, 70];
    const a: HistoryEntry[] = pretestA.map((pretest, i) => ({
      conditionId: audio,
      status: i < 6 ? 'completed' : i === 6 ? 'withdrew' : i === 7 ? 'lost' : 'active',
      endDay: i < 6 ? 10 : i === 6 ? 2 : i === 7 ? 5 : undefined,
      reason: i === 6 ? 'moved away' : undefined,
      covariates: { pretest, device: i < 5 ? 'phone' : 'laptop' },
      stratumKey: pretest >= 65 ? 'pretest:1' : 'pretest:0',
      stepsDone: i < 6 ? 2 : i === 6 || i >= 8 ? 1 : 0,
      // Completers paid 1500 (one also has a cancelled 700, which counts for nothing, and a failed 300, still earned), the withdrawer
      // paid 500, the lost one owed 500, each active one approved 500.
      payouts:
        i === 0
          ? [
              [1500, 'paid'],
              [700, 'cancelled'],
              [300, 'failed'],
            ]
          : i < 6
            ? [[1500, 'paid']]
            : i === 6
              ? [[500, 'paid']]
              : i === 7
                ? [[500, 'owed']]
                : [[500, 'approved']],
    }));
    // Condition B (map cues), 10 randomized: 3 completed on day 10, 3 withdrew on day 1, 2 lost on day 3,
    // 1 excluded after randomization on day 4, 1 active.
    const pretestB = [62, 72, 62, 72, 62, 72, 62, 72, 62, 72];
    const b: HistoryEntry[] = pretestB.map((pretest, i) => ({
      conditionId: map,
      status: i < 3 ? 'completed' : i < 6 ? 'withdrew' : i < 8 ? 'lost' : i === 8 ? 'excluded' : 'active',
      endDay: i < 3 ? 10 : i < 6 ? 1 : i < 8 ? 3 : i === 8 ? 4 : undefined,
      reason:
        i === 3 || i === 4
          ? 'too long'
          : i === 6
            ? 'no reply to reminders'
            : i === 8
              ? 'ineligible after review'
              : undefined,
      covariates: { pretest, device: i < 7 ? 'phone' : 'laptop' },
      stratumKey: pretest >= 65 ? 'pretest:1' : 'pretest:0',
      stepsDone: i < 3 ? 2 : 0,
      payouts: i < 3 ? [[1500, 'paid']] : i === 6 || i === 7 ? [[500, 'paid']] : [],
    }));
    // Not randomized: 2 invited, 1 screened, 1 consented, 2 excluded at screening (one with a reason).
    const waiting: HistoryEntry[] = [
      { status: 'invited' },
      { status: 'invited' },
      { status: 'screened' },
      { status: 'consented', covariates: { pretest: 99 } },
      { status: 'excluded', endDay: 0, reason: 'pretest below range' },
      { status: 'excluded', endDay: 0 },
    ];
    await insertHistory(testApp, studyId, [...a, ...b, ...waiting], `att-${Date.now().toString(36)}`);
    before = Date.now();
    report = await expectStatus(researcher.get(`/api/studies/${studyId}/attrition`), 200);
  });

  it('counts every condition and both rates by hand', () => {
    // A: dropped = 1 + 1 = 2 → dropout so far 2/10; window ended for 10 − 2 active = 8, of whom 6 completed → 2/8.
    // B: dropped = 3 + 2 + 1 = 6 → 6/10; window ended for 9, 3 completed → 6/9.
    expect(report.conditions).toEqual([
      expect.objectContaining({
        conditionId: audio,
        name: 'A',
        randomized: 10,
        active: 2,
        completed: 6,
        withdrew: 1,
        lost: 1,
        excludedAfterRandomization: 0,
        dropped: 2,
        dropoutRateSoFar: 0.2,
        attritionRate: 0.25,
        windowEnded: { randomized: 8, completed: 6 },
      }),
      expect.objectContaining({
        conditionId: map,
        name: 'B',
        randomized: 10,
        active: 1,
        completed: 3,
        withdrew: 3,
        lost: 2,
        excludedAfterRandomization: 1,
        dropped: 6,
        dropoutRateSoFar: 0.6,
        windowEnded: { randomized: 9, completed: 3 },
      }),
    ]);
    expect(report.conditions[1].attritionRate).toBeCloseTo(6 / 9, 12);
    // Overall: 8 of 20 dropped so far; WWC attrition 8 of the 17 whose window ended.
    expect(report.overall).toMatchObject({
      randomized: 20,
      dropped: 8,
      dropoutRateSoFar: 0.4,
      windowEndedRandomized: 17,
      attrited: 8,
    });
    expect(report.overall.attritionRate).toBeCloseTo(8 / 17, 12);
    expect(report.differentialAttrition).toBeCloseTo(6 / 9 - 2 / 8, 12);
  });

  it('gives the WWC verdict against the first condition', () => {
    // Pair B vs A: pooled overall 8/17 = 47.1 % lies between rows 47 and 48 of the WWC Procedures and Standards Handbook
    // v4.0 boundary table; the stricter is row 48 (cautious 1.3, optimistic 4.4 points); the differential of 41.7 points
    // is far above both.
    expect(report.wwc).toMatchObject({
      comparisonConditionId: audio,
      cautious: 'high-attrition',
      optimistic: 'high-attrition',
    });
    expect(report.wwc.pairs).toEqual([
      expect.objectContaining({
        conditionId: map,
        comparisonConditionId: audio,
        overallPercentRow: 48,
        overallPercentRows: [47, 48],
        cautious: { verdict: 'high-attrition', maxDifferentialPercent: 1.3, overallPercentRow: 48 },
        optimistic: { verdict: 'high-attrition', maxDifferentialPercent: 4.4, overallPercentRow: 48 },
      }),
    ]);
  });

  it("uses Fisher's exact test on the small 2×2 table, and says there is no continuity correction", () => {
    // Table [[2, 8], [6, 4]]: every expected count is 4 (< 5). Hypergeometric P(X = x) = C(8, x)·C(12, 10 − x) / C(20, 10)
    // with C(20, 10) = 184756 (Fisher 1935, by hand): the tables no more likely than x = 2 (13860) are x = 0, 1, 2, 6, 7, 8,
    // 66 + 1760 + 13860 + 13860 + 1760 + 66 = 31372, so two-sided p = 31372 / 184756.
    expect(report.dropoutTest).toMatchObject({
      method: 'fisher-exact',
      statistic: null,
      df: null,
      continuityCorrection: false,
      tableConditionIds: [audio, map],
    });
    expect(report.dropoutTest.pValue).toBeCloseTo(31372 / 184756, 10);
  });

  it('draws Kaplan–Meier curves in days since assignment and runs the log-rank test', () => {
    const stillActiveDays = daysSince(dayOf(0).getTime(), before);
    const [curveA, curveB] = report.survival.curves;
    // A: day 2, 10 at risk, 1 dropout → 0.9; day 5, 9 at risk → 0.8; completers censored on day 10, the active ones today.
    expect(curveA.points.map((p: any) => [p.time, p.atRisk, p.events, p.censored])).toEqual([
      [2, 10, 1, 0],
      [5, 9, 1, 0],
      [10, 8, 0, 6],
      [expect.closeTo(stillActiveDays, 2), 2, 0, 2],
    ]);
    expect(curveA.points.map((p: any) => p.survival)).toEqual([0.9, 0.8, 0.8, 0.8].map((s) => expect.closeTo(s, 12)));
    // B: day 1, 3 of 10 → 0.7; day 3, 2 of 7 → 0.5; day 4, 1 of 5 → 0.4.
    expect(curveB.points.map((p: any) => p.survival)).toEqual(
      [0.7, 0.5, 0.4, 0.4, 0.4].map((s) => expect.closeTo(s, 12)),
    );
    // Log-rank by hand: O_A = 2, E_A = 1.5 + 10/17 + 1.125 + 9/14 + 9/13 = 4.548400; V = 0.671053 + 0.242215 + 0.459375
    // + 0.229592 + 0.213018 = 1.815252; X² = (O − E)² / V = 3.57765 on 1 df; p from jStat's chi-square distribution.
    expect(report.survival.logRank.df).toBe(1);
    expect(report.survival.logRank.statistic).toBeCloseTo(3.57765, 4);
    expect(report.survival.logRank.pValue).toBeCloseTo(1 - jStat.chisquare.cdf(3.5776543, 1), 6);
    expect(report.survival.timeUnit).toBe('days');
  });

  it('compares pay by condition, paid and earned', () => {
    // Paid per randomized: A (6·1500 + 500) / 10 = 950, B (3·1500 + 2·500) / 10 = 550; per completer 1500 in both.
    // Earned adds A's owed 500, two approved 500s and the failed 300 (still owed to them, to be retried): A 1130, B 550.
    // Cancelled payouts count for nothing.
    const paid = report.payParity.paid;
    expect(report.payParity).toMatchObject({ currency: 'USD', payOverrideRecorded: false });
    expect(paid.conditions.map((c: any) => [c.perRandomized.mean, c.perCompleter.mean])).toEqual([
      [950, 1500],
      [550, 1500],
    ]);
    expect(paid.perRandomized.largestMeanDifference).toBe(400);
    expect(paid.perCompleter.test.notComputable).toBe('no-variation-within-a-condition');
    expect(report.payParity.earned.conditions.map((c: any) => c.perRandomized.mean)).toEqual([1130, 550]);
    // For two groups Welch's ANOVA is the square of Welch's t (Welch 1947): s²_A = 525000, s²_B = 469444.4 by hand,
    // t² = 400² / (52500 + 46944.44) = 1.608939 on Welch–Satterthwaite df 17.944; p from jStat's t distribution.
    const test = paid.perRandomized.test;
    expect(test.statistic).toBeCloseTo(160000 / (52500 + 46944.444444), 5);
    expect(test.df2).toBeCloseTo(17.944, 3);
    expect(test.pValue).toBeCloseTo(2 * (1 - studentT.cdf(Math.sqrt(test.statistic), test.df2)), 8);
  });

  it('checks covariate balance among all randomized and among completers', () => {
    const row = (covariate: string) => report.covariateBalance.find((r: any) => r.covariate === covariate);
    // pretest: means 67 vs 65, both SDs √(250/9) → d = 2 / 5.2705 = 0.3795; completers 65.33 (s² 33.33) vs 65 (s² 30)
    // → d = 0.3333 / √31.667 = 0.0592 (Austin 2009 formulas, by hand).
    expect(row('pretest').allRandomized.d).toBeCloseTo(2 / Math.sqrt(250 / 9), 10);
    // Chance range with ten per condition: all twenty pretests (S² = 27.368, N − 1 denominator) give 1.96·√(S²·(1/10 + 1/10))
    // = 4.586 points of mean difference, 0.870 in d: the difference of 2 points is well within chance, so no flag.
    expect(row('pretest').allRandomized.chanceRange).toBeCloseTo(
      (jStat.normal.inv(0.975, 0, 1) * Math.sqrt((520 / 19) * 0.2)) / Math.sqrt(250 / 9),
      8,
    );
    expect(row('pretest').allRandomized.imbalanced).toBe(false);
    expect(row('pretest').completers.d).toBeCloseTo((196 / 3 - 65) / Math.sqrt((100 / 3 + 30) / 2), 10);
    expect(row('pretest').completers.imbalanced).toBe(false);
    // device=phone: 7/10 vs 5/10 → 0.2 / √((0.21 + 0.25) / 2) = 0.4170; completers 3/3 vs 5/6.
    expect(row('device=phone').allRandomized.d).toBeCloseTo(0.2 / Math.sqrt(0.23), 10);
    expect(row('device=phone').completers.d).toBeCloseTo((1 - 5 / 6) / Math.sqrt(5 / 36 / 2), 10);
    expect(row('device=laptop').allRandomized.d).toBeCloseTo(-0.2 / Math.sqrt(0.23), 10);
  });

  it('fills the CONSORT 2010 boxes with counts and reasons', () => {
    expect(report.flow).toMatchObject({
      assessedForEligibility: 26,
      excludedBeforeRandomization: {
        total: 2,
        reasons: [
          { reason: 'pretest below range', count: 1 },
          { reason: null, count: 1 },
        ],
        otherReasons: 0,
      },
      awaitingRandomization: { total: 4, invited: 2, screened: 1, consented: 1 },
      randomized: 20,
    });
    expect(report.flow.arms).toEqual([
      expect.objectContaining({
        conditionId: audio,
        name: 'A',
        allocated: 10,
        stillInFollowUp: 2,
        analysed: 10,
        completers: 6,
        withdrew: { total: 1, reasons: [{ reason: 'moved away', count: 1 }], otherReasons: 0 },
      }),
      expect.objectContaining({
        conditionId: map,
        allocated: 10,
        stillInFollowUp: 1,
        analysed: 10,
        completers: 3,
        withdrew: {
          total: 3,
          reasons: [
            { reason: 'too long', count: 2 },
            { reason: null, count: 1 },
          ],
          otherReasons: 0,
        },
        lostToFollowUp: {
          total: 2,
          reasons: [
            { reason: 'no reply to reminders', count: 1 },
            { reason: null, count: 1 },
          ],
          otherReasons: 0,
        },
        excludedAfterRandomization: {
          total: 1,
          reasons: [{ reason: 'ineligible after review', count: 1 }],
          otherReasons: 0,
        },
      }),
    ]);
  });

  it('shows codes, never internal names, while the study is blinded, and says when it computed', () => {
    expect(report.blinded).toBe(true);
    expect(JSON.stringify(report)).not.toMatch(/audio cues|map cues/);
    expect(Date.parse(report.computedAt)).toBeGreaterThanOrEqual(before - 60_000);
    expect(report.cautions.join(' ')).toMatch(/screening aids/);
  });

  it('tests dropout within the randomization strata (pretest bands), by hand', () => {
    // Strata pretest:0 and pretest:1, five per condition each. Dropped: A 1 of 5 in both; B 3 of 5 in both.
    expect(report.stratified).toMatchObject({ strata: ['pretest:0', 'pretest:1'], stratified: true });
    // Cochran–Mantel–Haenszel by hand (Mantel & Haenszel 1959): per stratum E a = 5·4/10 = 2, a = 1, Var a = 5·5·4·6 / (10²·9) = 2/3;
    // X² = (−2)² / (4/3) = 3 on 1 df.
    expect(report.stratified.cmh).toMatchObject({ method: 'cochran-mantel-haenszel', df: 1, strataUsed: 2 });
    expect(report.stratified.cmh.statistic).toBeCloseTo(3, 10);
    expect(report.stratified.cmh.pValue).toBeCloseTo(1 - jStat.chisquare.cdf(3, 1), 10);
    // Stratified log-rank by hand, each stratum with its own risk sets. pretest:0 — day 1 (B), 10 at risk, E_A = 1/2,
    // V = 1/4; day 2 (A), 9, E_A = 5/9, V = 20/81; day 3 (B), 8, 1/2, 1/4; day 4 (B), 7, 4/7, 12/49. pretest:1 — day 1
    // (two in B), 10, E_A = 1, V = 2·(8/9)·(1/4); day 3 (B), 8, 5/8, 15/64; day 5 (A), 7, 5/7, 10/49. O_A = 2.
    const expectedA = 1 / 2 + 5 / 9 + 1 / 2 + 4 / 7 + 1 + 5 / 8 + 5 / 7;
    const variance = 1 / 4 + 20 / 81 + 1 / 4 + 12 / 49 + (2 * 8) / 9 / 4 + 15 / 64 + 10 / 49;
    expect(report.stratified.logRank.groups.map((g: any) => g.observed)).toEqual([2, 6]);
    expect(report.stratified.logRank.groups[0].expected).toBeCloseTo(expectedA, 10);
    expect(report.stratified.logRank.statistic).toBeCloseTo((2 - expectedA) ** 2 / variance, 10);
  });

  it('gives the hazard ratio of B against A (Efron ties) and Welch intervals for the pay differences', () => {
    const cox = report.survival.cox;
    expect(cox).toMatchObject({
      method: 'cox-proportional-hazards',
      ties: 'efron',
      comparisonConditionId: audio,
      converged: true,
    });
    const [ratio] = cox.hazardRatios;
    expect(ratio.conditionId).toBe(map);
    // B loses people faster: hazard ratio above 1, its Wald interval around it on the log scale.
    expect(ratio.hazardRatio).toBeGreaterThan(1);
    expect(Math.log(ratio.hazardRatio)).toBeCloseTo((Math.log(ratio.lower) + Math.log(ratio.upper)) / 2, 10);
    expect(Math.log(ratio.upper) - Math.log(ratio.hazardRatio)).toBeCloseTo(
      jStat.normal.inv(0.975, 0, 1) * ratio.standardError,
      10,
    );
    // Paid per randomized, B − A = 550 − 950 = −400, SE = √(46944.44 + 52500) (Welch 1947), df 17.944; t quantile from jStat.
    const [difference] = report.payParity.paid.perRandomized.differences;
    expect(difference).toMatchObject({
      conditionId: map,
      comparisonConditionId: audio,
      method: 'welch-t',
      difference: -400,
    });
    const se = Math.sqrt(469444.444444 / 10 + 525000 / 10);
    const t = (jStat as unknown as { studentt: { inv(p: number, df: number): number } }).studentt.inv(
      0.975,
      difference.df,
    );
    expect(difference.df).toBeCloseTo(17.944, 3);
    expect(difference.lower).toBeCloseTo(-400 - t * se, 3);
    expect(difference.upper).toBeCloseTo(-400 + t * se, 3);
  });

  it('reads cumulative dropout at the planned study length off the curves once every step has a due date', async () => {
    // Without due dates the schedule sets no end.
    expect(report.survival.plannedLength).toMatchObject({ days: null, unknown: 'a-step-has-no-due-date' });
    await testApp.dataSource.query(
      `UPDATE step SET opens_from = 'assignment', opens_after_days = 0, due_within_days = 8 WHERE study_id = $1`,
      [studyId],
    );
    const planned = (await expectStatus(researcher.get(`/api/studies/${studyId}/attrition`), 200)).survival
      .plannedLength;
    // Kaplan–Meier at day 8: A 0.8, B 0.4 (the curves above), so 20 % and 60 % dropped out by then.
    expect(planned.days).toBe(8);
    expect(planned.conditions.map((c: any) => c.cumulative.cumulative)).toEqual([
      expect.closeTo(0.2, 12),
      expect.closeTo(0.6, 12),
    ]);
  });

  it('compares against the condition the researcher picks, and names a bad pick', async () => {
    const picked = await expectStatus(
      researcher.get(`/api/studies/${studyId}/attrition`).query({ comparisonConditionId: map }),
      200,
    );
    expect(picked.wwc.pairs.map((p: any) => [p.conditionId, p.comparisonConditionId])).toEqual([[audio, map]]);
    const body = await expectStatus(
      researcher.get(`/api/studies/${studyId}/attrition`).query({ comparisonConditionId: 'compass' }),
      400,
      'VALIDATION_FAILED',
    );
    expect(body.errors).toEqual([{ field: 'comparisonConditionId', message: "is not one of the study's conditions" }]);
  });

  it('answers 404 to a researcher who is not a member, for the report, the export and the alerts', async () => {
    const { browser: outsider } = await staffAccount('researcher', 'Outside Researcher');
    await expectStatus(outsider.get(`/api/studies/${studyId}/attrition`), 404, 'NOT_FOUND');
    await expectStatus(outsider.get(`/api/studies/${studyId}/export.csv`), 404, 'NOT_FOUND');
    await expectStatus(outsider.get(`/api/studies/${studyId}/attrition/alerts`), 404, 'NOT_FOUND');
  });

  it('exports one CSV row per enrollment that parses back', async () => {
    const response = await researcher
      .get(`/api/studies/${studyId}/export.csv`)
      .buffer(true)
      .parse((res, done) => {
        let text = '';
        res.setEncoding('utf8');
        res.on('data', (chunk: string) => (text += chunk));
        res.on('end', () => done(null, text));
      });
    expect(response.status).toBe(200);
    expect(response.headers['content-type']).toBe('text/csv; charset=utf-8');
    expect(response.headers['content-disposition']).toMatch(/^attachment; filename=".+\.csv"$/);
    const rows: Record<string, string>[] = parse(response.body as string, { columns: true, skip_empty_lines: true });
    expect(rows).toHaveLength(26);
    expect(Object.keys(rows[0])).toEqual([
      'reference',
      'condition',
      'stratum',
      'device',
      'pretest',
      'status',
      'assigned_at',
      'completed_at',
      'dropped_out_at',
      'counted_as',
      'steps_done',
      'paid_minor',
      'earned_minor',
      'currency',
    ]);
    expect(new Set(rows.map((r) => r.reference)).size).toBe(26);
    const first = rows[0];
    expect(first).toMatchObject({
      condition: 'A',
      stratum: 'pretest:0',
      device: 'phone',
      pretest: '60',
      status: 'completed',
      steps_done: '2',
      paid_minor: '1500',
      earned_minor: '1800',
      currency: 'USD',
    }); // 1500 paid + 300 failed (still owed)
    expect(first.assigned_at).toBe(dayOf(0).toISOString());
    expect(first.completed_at).toBe(dayOf(10).toISOString());
    const withdrawn = rows.find((r) => r.condition === 'B' && r.status === 'withdrew')!;
    expect(withdrawn.dropped_out_at).toBe(dayOf(1).toISOString());
    expect(withdrawn.counted_as).toBe('dropped');
    expect(rows.filter((r) => r.counted_as === 'still-active')).toHaveLength(3);
    expect(rows.filter((r) => r.counted_as === 'not-randomized')).toHaveLength(6);
    expect(rows.filter((r) => r.condition === '').length).toBe(6);
    expect(sum(rows.map((r) => Number(r.paid_minor)))).toBe(9500 + 5500);
    expect(sum(rows.map((r) => Number(r.steps_done)))).toBe(6 * 2 + 1 + 2 + 3 * 2);
    expect(response.body).not.toMatch(/audio cues|map cues/);
  });

  it('counts everyone once the study is closed, and shows names once it is unblinded', async () => {
    await expectStatus(researcher.post(`/api/studies/${studyId}/close`), 200);
    const closed = await expectStatus(researcher.get(`/api/studies/${studyId}/attrition`), 200);
    // Window ended for all 20: A (10 − 6) / 10 = 0.4, B (10 − 3) / 10 = 0.7, overall 11 / 20.
    expect(closed.conditions.map((c: any) => [c.windowEnded.randomized, c.attritionRate])).toEqual([
      [10, 0.4],
      [10, 0.7],
    ]);
    expect(closed.overall.attritionRate).toBe(0.55);
    // One counting rule (COUNTING_RULE): the 2 + 1 still active at the close did not complete, in every panel.
    expect(closed.conditions.map((c: any) => [c.active, c.incompleteAtClose, c.dropped])).toEqual([
      [0, 2, 4],
      [0, 1, 7],
    ]);
    expect(closed.dropoutTest.chiSquare.expected.reduce((t: number, row: number[]) => t + row[0], 0)).toBeCloseTo(
      11,
      9,
    );
    expect(closed.survival.curves.map((c: any) => c.points.reduce((t: number, p: any) => t + p.events, 0))).toEqual([
      4, 7,
    ]);
    expect(
      closed.flow.arms.map((a: any) => [a.stillInFollowUp, a.incompleteAtClose, a.analysed, a.completers]),
    ).toEqual([
      [0, 2, 10, 6],
      [0, 1, 10, 3],
    ]);
    expect(closed.countingRule).toMatch(/Once the study is closed, anyone still active did not complete/);
    // The export follows the same rule: the three still active at the close are incomplete, dropped out at the closing time.
    const exported = await researcher
      .get(`/api/studies/${studyId}/export.csv`)
      .buffer(true)
      .parse((res, done) => {
        let text = '';
        res.setEncoding('utf8');
        res.on('data', (chunk: string) => (text += chunk));
        res.on('end', () => done(null, text));
      });
    const exportedRows: Record<string, string>[] = parse(exported.body as string, {
      columns: true,
      skip_empty_lines: true,
    });
    const incomplete = exportedRows.filter((r) => r.counted_as === 'incomplete-at-close');
    expect(incomplete).toHaveLength(3);
    expect(incomplete.every((r) => r.dropped_out_at === new Date(closed.survival.censoredAt).toISOString())).toBe(true);
    const [{ closed_at }] = await testApp.dataSource.query(`SELECT closed_at FROM study WHERE id = $1`, [studyId]);
    expect(closed.survival.censoredAt).toBe(new Date(closed_at).toISOString());

    await expectStatus(researcher.post(`/api/studies/${studyId}/unblind`).send({ reason: 'Analysis finished' }), 200);
    const unblinded = await expectStatus(researcher.get(`/api/studies/${studyId}/attrition`), 200);
    expect(unblinded.blinded).toBe(false);
    expect(unblinded.conditions.map((c: any) => c.name)).toEqual(['audio cues', 'map cues']);
  });
});

describe('follow-up times', () => {
  it('are exact, not whole days: two withdrawals on the same day keep their order in the curve', async () => {
    const {
      studyId,
      conditionIds: [first, second],
    } = await openStudy(['early', 'late']);
    await insertHistory(
      testApp,
      studyId,
      [
        { conditionId: first, status: 'withdrew', endDay: 1.25 },
        { conditionId: second, status: 'withdrew', endDay: 1.75 },
        { conditionId: first, status: 'completed', endDay: 10 },
        { conditionId: second, status: 'completed', endDay: 10 },
      ],
      `exact-${Date.now().toString(36)}`,
    );
    const report = await expectStatus(researcher.get(`/api/studies/${studyId}/attrition`), 200);
    expect(report.survival.curves[0].points[0].time).toBeCloseTo(1.25, 9);
    expect(report.survival.curves[1].points[0].time).toBeCloseTo(1.75, 9);
  });
});

describe('dropout alerts', () => {
  let studyId: string;
  let first: string;
  let second: string;
  let watcher: string;
  let dropouts: string[];
  let alerts: AttritionAlertsService;
  const subject = () => new RegExp(`^Dropout watch: Test study$`);

  const alertEvents = async () =>
    (await testApp.dataSource.query(
      `SELECT data FROM audit_event WHERE chain = $1 AND action = 'attrition.alert-sent' ORDER BY sequence`,
      [studyId],
    )) as { data: any }[];

  beforeAll(async () => {
    alerts = testApp.app.get(AttritionAlertsService);
    ({
      studyId,
      conditionIds: [first, second],
    } = await openStudy(['landmarks', 'street names']));
    ({ email: watcher } = await staffAccount('researcher', 'Watching Researcher'));
    await expectStatus(admin.post(`/api/studies/${studyId}/members`).send({ email: watcher, role: 'researcher' }), 201);
    // 10 + 10 randomized, everyone's window ended: the first condition all completed, the second half withdrew.
    const history: HistoryEntry[] = [
      ...Array.from({ length: 10 }, (): HistoryEntry => ({ conditionId: first, status: 'completed', endDay: 7 })),
      ...Array.from({ length: 10 }, (_, i): HistoryEntry => ({
        conditionId: second,
        status: i < 5 ? 'completed' : 'withdrew',
        endDay: i < 5 ? 7 : 2,
      })),
    ];
    const ids = await insertHistory(testApp, studyId, history, `alr-${Date.now().toString(36)}`);
    dropouts = ids.slice(15);
  });

  it('lets a researcher set the thresholds and refuses impossible ones, naming the field', async () => {
    const defaults = await expectStatus(researcher.get(`/api/studies/${studyId}/attrition/alerts`), 200);
    expect(defaults).toMatchObject({
      differentialAttrition: { enabled: false },
      logRank: { enabled: false, pValueBelow: 0.05 },
      evaluatedEveryMinutes: 5,
    });
    const bad = await expectStatus(
      researcher.put(`/api/studies/${studyId}/attrition/alerts`).send({
        differentialAttrition: { enabled: true },
        logRank: { enabled: true, pValueBelow: 2 },
        payDifference: { enabled: false, amountMinor: 500, basis: 'owed' },
      }),
      400,
      'VALIDATION_FAILED',
    );
    expect(bad.errors.map((e: any) => e.field).sort()).toEqual(['logRank.pValueBelow', 'payDifference.basis']);
    const unknown = await expectStatus(
      researcher.put(`/api/studies/${studyId}/attrition/alerts`).send({
        differentialAttrition: { enabled: true, comparisonConditionId: '00000000-0000-4000-8000-000000000000' },
        logRank: { enabled: false, pValueBelow: 0.05 },
        payDifference: { enabled: false, amountMinor: 500, basis: 'earned' },
      }),
      400,
    );
    expect(unknown.errors[0].field).toBe('differentialAttrition.comparisonConditionId');
    const coordinator = await signedInStaff(testApp, 'coordinator');
    await expectStatus(coordinator.put(`/api/studies/${studyId}/attrition/alerts`).send({}), 403, 'FORBIDDEN');

    const saved = await expectStatus(
      researcher.put(`/api/studies/${studyId}/attrition/alerts`).send({
        differentialAttrition: { enabled: true, comparisonConditionId: first },
        logRank: { enabled: false, pValueBelow: 0.01 },
        payDifference: { enabled: false, amountMinor: 250, basis: 'paid' },
      }),
      200,
    );
    expect(saved).toMatchObject({
      differentialAttrition: { enabled: true, comparisonConditionId: first, state: { crossed: false, crossings: 0 } },
      logRank: { enabled: false, pValueBelow: 0.01 },
      payDifference: { enabled: false, amountMinor: 250, basis: 'paid', currency: 'USD' },
    });
    expect(saved.watchUrl).toMatch(new RegExp(`/studies/${studyId}/watch$`));
  });

  it('e-mails the researchers once per crossing and re-arms when it goes back below', async () => {
    // 0/10 vs 5/10: pooled overall 5/20 = 25 % → WWC handbook row 25 (cautious boundary 4.8 points); differential 50 points.
    const crossing = await alerts.evaluateStudy(studyId);
    expect(crossing.newlyCrossed).toEqual(['differential-attrition']);
    expect(crossing.recipients.sort()).toEqual(['researcher@evenhand.test', watcher].sort());
    const again = await alerts.evaluateStudy(studyId);
    expect(again.newlyCrossed).toEqual([]);
    expect(await alertEvents()).toHaveLength(1);
    const [mail] = await expectMailCount(watcher, subject(), 1);
    expect(mail.text).toContain(`/studies/${studyId}/watch`);
    expect(mail.text).toMatch(
      /Differential attrition of 50\.0 percentage points is above the cautious WWC boundary of 4\.8 percentage points/,
    );

    // The five who withdrew come back and complete: no differential, the rule goes back below and re-arms.
    await testApp.dataSource.query(
      `UPDATE enrollment SET status = 'completed', completed_at = $2, withdrew_at = NULL WHERE id = ANY($1)`,
      [dropouts, dayOf(7)],
    );
    const below = await alerts.evaluateStudy(studyId);
    expect(below).toMatchObject({ newlyCrossed: [], backBelow: ['differential-attrition'] });
    const state = await expectStatus(researcher.get(`/api/studies/${studyId}/attrition/alerts`), 200);
    expect(state.differentialAttrition.state).toMatchObject({ crossed: false, crossings: 1, lastValue: 0 });

    await testApp.dataSource.query(
      `UPDATE enrollment SET status = 'withdrew', withdrew_at = $2, completed_at = NULL WHERE id = ANY($1)`,
      [dropouts, dayOf(2)],
    );
    expect((await alerts.evaluateStudy(studyId)).newlyCrossed).toEqual(['differential-attrition']);
    expect((await alerts.evaluateStudy(studyId)).newlyCrossed).toEqual([]);
    const events = await alertEvents();
    expect(events).toHaveLength(2);
    expect(events[1].data).toMatchObject({ kind: 'differential-attrition', value: 0.5 });
    await expectMailCount(watcher, subject(), 2);
  });

  it('evaluates every study with rules from the scheduled job', async () => {
    const run = await alerts.evaluateAll();
    expect(run.failed).toBe(0);
    expect(run.studies).toBeGreaterThanOrEqual(1);
    expect(await alertEvents()).toHaveLength(2);
  });
});
