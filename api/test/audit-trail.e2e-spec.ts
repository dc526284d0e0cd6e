import { createHash } from 'node:crypto';
import { parse } from 'csv-parse/sync';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ACTION_FAMILY_KEYS } from '../src/audit/audit-sentences';
import { signedInParticipant } from './support/consent-fixtures';
import { expectStatus } from './support/http';
import { studyWithParticipant } from './support/payout-fixtures';
import { Browser, signedInStaff } from './support/study-fixtures';
import { startTestApp, TestApp } from './support/test-app';

let testApp: TestApp;
let coordinator: Browser;
let auditor: Browser;
let studyId: string;
let slug: string;
let coordinatorId: string;
let reference: string;
let enrollmentId: string;
let otherReference: string;

const today = () => new Date().toISOString().slice(0, 10);
const dayAfter = (days: number) => new Date(Date.now() + days * 86_400_000).toISOString().slice(0, 10);

type TrailItem = {
  sentence: string;
  family: string;
  name: string;
  action: string;
  actorId: string | null;
  participantReference: string | null;
  amount: { minor: number; currency: string } | null;
};

beforeAll(async () => {
  testApp = await startTestApp({ AUDIT_RECEIPT_CRON: '' });
  coordinator = await signedInStaff(testApp, 'coordinator');
  auditor = await signedInStaff(testApp, 'auditor');
  coordinatorId = (await expectStatus(coordinator.get('/api/auth/me'), 200)).id;

  // One participant finishes a paid step and is approved for payment; a second one only joins and signs.
  const first = await studyWithParticipant(testApp, coordinator, 'trail');
  studyId = first.studyId;
  enrollmentId = first.enrollmentId;
  const me = await expectStatus(first.browser.get(`/api/studies/${studyId}/enrollments/me`), 200);
  await expectStatus(
    first.browser
      .post(`/api/studies/${studyId}/enrollments/me/steps/${me.steps[0].id}/complete`)
      .send({ code: 'ONE-1111' }),
    200,
  );
  // Funded straight in the ledger: the provider's part of funding is tested in payouts.e2e-spec.ts.
  await testApp.dataSource.query(
    `INSERT INTO study_funding (study_id, payment_intent_id, amount_minor, currency, status, succeeded_at) VALUES ($1, $2, 5000, 'USD', 'succeeded', now())`,
    [studyId, `trail-${studyId}`],
  );
  const payouts: Array<{ id: string }> = await testApp.dataSource.query(
    `SELECT id FROM payout WHERE enrollment_id = $1`,
    [enrollmentId],
  );
  await expectStatus(
    coordinator.post(`/api/studies/${studyId}/payouts/approve`).send({ payoutIds: payouts.map((p) => p.id) }),
    200,
  );

  const [row] = await testApp.dataSource.query(
    `SELECT e.reference, s.slug FROM enrollment e JOIN study s ON s.id = e.study_id WHERE e.id = $1`,
    [enrollmentId],
  );
  reference = row.reference;
  slug = row.slug;

  const { browser: second } = await signedInParticipant(testApp, 'trail-other');
  await expectStatus(second.post(`/api/studies/${studyId}/enrollments/me`), 201);
  otherReference = (await expectStatus(second.get(`/api/studies/${studyId}/enrollments/me`), 200)).reference;
});
afterAll(async () => {
  await testApp.close();
});

async function trail(
  query: Record<string, string | string[]>,
): Promise<{ items: TrailItem[]; total: number; page: number; pageSize: number }> {
  return expectStatus(auditor.get('/api/audit').query(query), 200);
}

describe('the audit trail in plain words', () => {
  it('tells one participant’s story in sentences, and nobody else’s', async () => {
    const page = await trail({ chain: studyId, participant: reference.toLowerCase(), pageSize: '200' });
    const sentences = page.items.map((item) => item.sentence);
    expect(sentences).toContain(`Participant ${reference} joined the study.`);
    expect(sentences).toContain(`Participant ${reference} signed consent version 1.`);
    expect(sentences).toContain(
      `Participant ${reference} finished the step “Session 1”, checked with the step’s code; $10.00 is owed. That was their last step.`,
    );
    expect(sentences.find((s) => s.includes('approved'))).toMatch(
      /^Coordinator [A-Z]\. \S+ approved 1 payout, \$10\.00 in all\.$/,
    );
    expect(page.items.find((item) => item.action === 'payout.approved')).toMatchObject({
      family: 'payouts',
      name: 'Payouts approved',
      amount: { minor: 1000, currency: 'USD' },
    });
    expect(sentences.join(' ')).not.toContain(otherReference);
    for (const item of page.items) {
      expect(ACTION_FAMILY_KEYS).toContain(item.family);
      expect(item.sentence).not.toMatch(/\b[a-z]+\.[a-z-]+\b/);
      expect(item.name).not.toContain('.');
    }
    expect(page.total).toBe(page.items.length);
  });

  it('narrows by families (several at once), by staff member and by dates', async () => {
    const both = await trail({ chain: studyId, family: ['payouts', 'steps'] });
    expect(new Set(both.items.map((item) => item.family))).toEqual(new Set(['payouts', 'steps']));
    const comma = await trail({ chain: studyId, family: 'payouts,steps' });
    expect(comma.total).toBe(both.total);

    const byCoordinator = await trail({ chain: studyId, staff: coordinatorId, pageSize: '200' });
    expect(byCoordinator.total).toBeGreaterThan(3);
    expect(byCoordinator.items.every((item) => item.actorId === coordinatorId)).toBe(true);

    expect((await trail({ chain: studyId, from: today(), to: today() })).total).toBeGreaterThan(0);
    expect((await trail({ chain: studyId, from: dayAfter(1) })).total).toBe(0);
    expect((await trail({ chain: studyId, to: dayAfter(-1) })).total).toBe(0);

    const paged = await trail({ chain: studyId, pageSize: '2', page: '2' });
    expect(paged.items).toHaveLength(2);
    expect(paged).toMatchObject({ page: 2, pageSize: 2 });
  });

  it('refuses bad filters with a 400 naming the field', async () => {
    const cases: Array<[Record<string, string | string[]>, string]> = [
      [{ family: 'payouts,bogus' }, 'family'],
      [{ family: ['steps', 'payout.paid'] }, 'family'],
      [{ from: '2026-13-45' }, 'from'],
      [{ from: 'last tuesday' }, 'from'],
      [{ to: '2026-02-30' }, 'to'],
      [{ from: '2026-12-05', to: '2026-12-01' }, 'to'],
      [{ staff: 'coordinator@evenhand.test' }, 'staff'],
      [{ participant: 'P 1; DROP' }, 'participant'],
      [{ chain: 'not-a-study' }, 'chain'],
      [{ pageSize: '500' }, 'pageSize'],
      [{ page: '0' }, 'page'],
      [{ sort: 'at' }, 'sort'],
    ];
    for (const [query, field] of cases) {
      const problem = await expectStatus(auditor.get('/api/audit').query(query), 400, 'VALIDATION_FAILED');
      expect(
        problem.errors.map((e: { field: string }) => e.field),
        JSON.stringify(query),
      ).toContain(field);
    }
    const exportProblem = await expectStatus(
      auditor.get('/api/audit/export.csv').query({ to: 'yesterday' }),
      400,
      'VALIDATION_FAILED',
    );
    expect(exportProblem.errors[0].field).toBe('to');
    // Paging belongs to the list, not to the export of the whole selection.
    await expectStatus(auditor.get('/api/audit/export.csv').query({ page: '2' }), 400, 'VALIDATION_FAILED');
  });

  it('exports the selection as CSV named by study and day, with a summary that names its receipt and the file’s hash', async () => {
    const receipt = await expectStatus(auditor.post('/api/audit/receipts'), 201);
    const query = { chain: studyId, participant: reference };
    const listed = await trail({ ...query, pageSize: '200' });

    const csv = await auditor.get('/api/audit/export.csv').query(query).buffer(true);
    expect(csv.status).toBe(200);
    expect(csv.headers['content-type']).toMatch(/^text\/csv; charset=utf-8/);
    expect(csv.headers['content-disposition']).toBe(`attachment; filename="audit-trail-${slug}-${today()}.csv"`);
    expect(csv.text.charCodeAt(0)).toBe(0xfeff);
    const rows: Array<Record<string, string>> = parse(csv.text, { bom: true, columns: true });
    expect(rows).toHaveLength(listed.total);
    expect(Object.keys(rows[0])).toEqual([
      'when_utc',
      'study',
      'kind',
      'action',
      'what_happened',
      'by',
      'participant',
      'amount',
      'currency',
      'chain',
      'link',
      'hash',
      'key_id',
      'event_id',
    ]);
    const approval = rows.find((row) => row.action === 'Payouts approved')!;
    expect(approval).toMatchObject({
      kind: 'Payouts',
      amount: '10.00',
      currency: 'USD',
      study: 'Test study',
      chain: studyId,
    });
    expect(approval.what_happened).toMatch(/approved 1 payout, \$10\.00 in all\.$/);
    expect(rows.every((row) => row.participant === reference || row.participant === '')).toBe(true);

    const summary = await auditor.get('/api/audit/export-summary.txt').query(query).buffer(true);
    expect(summary.status).toBe(200);
    expect(summary.headers['content-disposition']).toBe(
      `attachment; filename="audit-trail-${slug}-${today()}-verification.txt"`,
    );
    const text = summary.text;
    expect(text).toContain(`SHA-256 of the file: ${createHash('sha256').update(csv.text, 'utf8').digest('hex')}`);
    expect(text).toContain(`File: audit-trail-${slug}-${today()}.csv`);
    expect(text).toContain(`Participant: ${reference}`);
    expect(text).toContain(`Events listed: ${listed.total}`);
    expect(text).toContain('Verdict: intact.');
    expect(text).toContain(`Checked against audit receipt no. ${receipt.number} (${receipt.id})`);
    expect(text).toMatch(/Test study: \d+ of its \d+ events listed; intact/);
  });

  it('names the first failing event in words when the chain is broken', async () => {
    const [target] = await testApp.dataSource.query(
      `SELECT * FROM audit_event WHERE chain = $1 AND action = 'payout.approved'`,
      [studyId],
    );
    await testApp.dataSource.query(`ALTER TABLE audit_event DISABLE TRIGGER audit_event_append_only`);
    try {
      await testApp.dataSource.query(
        `UPDATE audit_event SET data = jsonb_set(data, '{amountMinor}', '100000') WHERE id = $1`,
        [target.id],
      );
      const report = await expectStatus(auditor.get('/api/audit/verify'), 200);
      const finding = report.findings.find((f: { chain: string }) => f.chain === studyId);
      expect(finding).toMatchObject({
        sequence: target.sequence,
        reason: 'hash-mismatch',
        studyTitle: 'Test study',
        event: { name: 'Payouts approved' },
      });
      expect(finding.event.sentence).toMatch(/approved 1 payout, \$1,000\.00 in all\.$/);
      const summary = await auditor.get('/api/audit/export-summary.txt').query({ chain: studyId }).buffer(true);
      expect(summary.text).toContain('Verdict: NOT intact.');
      expect(summary.text).toMatch(/First failing event: event \d+ of chain .* It reads: Coordinator/);
    } finally {
      await testApp.dataSource.query(`UPDATE audit_event SET data = $1 WHERE id = $2`, [
        JSON.stringify(target.data),
        target.id,
      ]);
      await testApp.dataSource.query(`ALTER TABLE audit_event ENABLE TRIGGER audit_event_append_only`);
    }
    expect(
      (await expectStatus(auditor.get('/api/audit/verify'), 200)).findings.filter(
        (f: { chain: string }) => f.chain === studyId,
      ),
    ).toEqual([]);
  });

  it('offers the families, staff and studies to filter by', async () => {
    const options = await expectStatus(auditor.get('/api/audit/filters'), 200);
    expect(options.families.map((f: { key: string }) => f.key)).toEqual([...ACTION_FAMILY_KEYS]);
    expect(options.staff.find((s: { id: string }) => s.id === coordinatorId)).toMatchObject({
      role: 'coordinator',
      phrase: expect.stringMatching(/^Coordinator /),
    });
    expect(options.staff.every((s: { role: string }) => s.role !== 'participant')).toBe(true);
    expect(options.studies.find((s: { id: string }) => s.id === studyId)).toMatchObject({ slug });
  });

  it('shows the participant’s record as the same sentences', async () => {
    const record = await expectStatus(coordinator.get(`/api/studies/${studyId}/enrollments/${enrollmentId}`), 200);
    const sentences = record.timeline.map((event: { sentence: string }) => event.sentence);
    expect(sentences[0]).toBe(`Participant ${reference} joined the study.`);
    expect(sentences).toContain(`Participant ${reference} signed consent version 1.`);
    expect(record.timeline.every((event: { name: string }) => !event.name.includes('.'))).toBe(true);
  });
});
