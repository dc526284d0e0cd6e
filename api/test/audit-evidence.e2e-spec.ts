import { execFileSync } from 'node:child_process';
import { createHash, createHmac, randomUUID } from 'node:crypto';
import { mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { canonicalJson, chainHash, GENESIS_HASH } from '../src/audit/audit-hash';
import { AuditService } from '../src/audit/audit.service';
import { AppConfig } from '../src/config/app-config';
import { RandomizationService } from '../src/randomization/randomization.service';
import { prepareToOpen, signedInParticipant } from './support/consent-fixtures';
import { expectStatus } from './support/http';
import { waitForMail } from './support/mailbox';
import { Browser, draftBetweenStudy, insertEnrollments, signedInStaff } from './support/study-fixtures';
import { startTestApp, TestApp } from './support/test-app';

let testApp: TestApp;
let auditor: Browser;
let audit: AuditService;
const TMP = join(__dirname, '../../.local/tmp');

beforeAll(async () => {
  mkdirSync(TMP, { recursive: true });
  // No scheduled receipt while rows are being tampered with: a receipt sealed mid-tamper would hide the tamper.
  testApp = await startTestApp({ AUDIT_RECEIPT_CRON: '' });
  auditor = await signedInStaff(testApp, 'auditor');
  audit = testApp.app.get(AuditService);
});
afterAll(async () => {
  await testApp.close();
});

type Row = Record<string, any>;

/** A database superuser can switch the append-only triggers off; these tests play that insider. */
async function asInsider<T>(table: 'audit_event' | 'audit_receipt', work: () => Promise<T>): Promise<T> {
  const trigger = table === 'audit_event' ? 'audit_event_append_only' : 'audit_receipt_append_only';
  await testApp.dataSource.query(`ALTER TABLE ${table} DISABLE TRIGGER ${trigger}`);
  try {
    return await work();
  } finally {
    await testApp.dataSource.query(`ALTER TABLE ${table} ENABLE TRIGGER ${trigger}`);
  }
}

async function probeChain(count: number, email = 'probe@evenhand.test'): Promise<string> {
  const chain = `evidence-probe-${randomUUID()}`;
  await testApp.dataSource.transaction(async (manager) => {
    for (let i = 1; i <= count; i++)
      await audit.record(manager, { chain, actor: { id: null, email }, action: `probe.step-${i}`, data: { i } });
  });
  return chain;
}

const rowsOf = (chain: string): Promise<Row[]> =>
  testApp.dataSource.query(`SELECT * FROM audit_event WHERE chain = $1 ORDER BY sequence`, [chain]);

/** Puts rows back exactly as they were, so the shared database stays verifiable for the other test files. */
async function restore(rows: Row[]) {
  await asInsider('audit_event', async () => {
    await testApp.dataSource.query(`DELETE FROM audit_event WHERE id = ANY($1)`, [rows.map((r) => r.id)]);
    for (const row of rows) {
      const columns = Object.keys(row);
      await testApp.dataSource.query(
        `INSERT INTO audit_event (${columns.join(', ')}) VALUES (${columns.map((_, i) => `$${i + 1}`).join(', ')})`,
        columns.map((c) => (c === 'data' ? JSON.stringify(row[c]) : row[c])),
      );
    }
  });
}

async function verdictOf(chain: string, receipt?: unknown) {
  const body =
    receipt === undefined
      ? await expectStatus(auditor.get('/api/audit/verify'), 200)
      : await expectStatus(auditor.post('/api/audit/verify').send({ receipt }), 200);
  return { body, chain: body.chains.find((c: { chain: string }) => c.chain === chain) };
}

describe('the keyed audit chain', () => {
  it('detects an event rewritten and every later hash recomputed without the key', async () => {
    const chain = await probeChain(5);
    const original = await rowsOf(chain);
    expect((await verdictOf(chain)).chain).toMatchObject({ intact: true, firstBreak: null });
    // The insider rewrites event 3 and re-links 3..5 with the only hash anyone can compute without the key:
    // plain SHA-256 in the documented layout, and an HMAC under a guessed key.
    for (const forge of ['sha256', 'guessed-hmac'] as const) {
      await asInsider('audit_event', async () => {
        let previous = original[1].hash;
        for (const row of original.slice(2)) {
          const data = row.sequence === 3 ? { i: 3, amount: 999 } : row.data;
          const fields = {
            chain,
            sequence: row.sequence,
            at: row.at.toISOString(),
            actorId: null,
            action: row.action,
            subjectType: null,
            subjectId: null,
            data,
          };
          const hash =
            forge === 'sha256'
              ? chainHash(previous, fields)
              : createHmac('sha256', 'guess')
                  .update(previous + canonicalJson(fields))
                  .digest('hex');
          await testApp.dataSource.query(
            `UPDATE audit_event SET data = $1, previous_hash = $2, hash = $3 WHERE id = $4`,
            [JSON.stringify(data), previous, hash, row.id],
          );
          previous = hash;
        }
      });
      try {
        const { body, chain: verdict } = await verdictOf(chain);
        expect(body.intact).toBe(false);
        expect(verdict.firstBreak).toEqual({ sequence: 3, reason: 'hash-mismatch' });
        expect(body.findings.find((f: { chain: string }) => f.chain === chain).message).toMatch(/event 3/);
      } finally {
        await restore(original);
      }
    }
    expect((await verdictOf(chain)).chain.intact).toBe(true);
  });

  it('detects an edited actor e-mail', async () => {
    const chain = await probeChain(3, 'real.person@evenhand.test');
    const original = await rowsOf(chain);
    await asInsider('audit_event', () =>
      testApp.dataSource.query(`UPDATE audit_event SET actor_email = 'someone.else@evenhand.test' WHERE id = $1`, [
        original[1].id,
      ]),
    );
    try {
      expect((await verdictOf(chain)).chain.firstBreak).toEqual({ sequence: 2, reason: 'hash-mismatch' });
    } finally {
      await restore(original);
    }
  });

  it('names an event signed with a key it does not hold, without failing the request', async () => {
    const chain = await probeChain(2);
    const original = await rowsOf(chain);
    await asInsider('audit_event', () =>
      testApp.dataSource.query(`UPDATE audit_event SET key_id = 'no-such-key' WHERE id = $1`, [original[1].id]),
    );
    try {
      expect((await verdictOf(chain)).chain.firstBreak).toEqual({ sequence: 2, reason: 'unknown-key' });
    } finally {
      await restore(original);
    }
  });

  it('detects the newest events deleted, against the last receipt, which auditors receive and can download', async () => {
    const chain = await probeChain(4);
    const receipt = await expectStatus(auditor.post('/api/audit/receipts'), 201);
    expect(receipt).toMatchObject({
      format: 'evenhand-audit-receipt/1',
      mac: expect.stringMatching(/^[0-9a-f]{64}$/),
      keyId: expect.any(String),
    });
    const head = receipt.chains.find((c: { chain: string }) => c.chain === chain);
    expect(head).toMatchObject({ sequence: 4, hash: (await rowsOf(chain))[3].hash });
    const downloaded = await expectStatus(auditor.get(`/api/audit/receipts/${receipt.id}`), 200);
    expect(downloaded).toEqual(receipt);
    const mail = await waitForMail('auditor@evenhand.test', 20_000, /audit receipt/i);
    expect(mail.text).toContain(receipt.id);
    expect(mail.attachments?.[0]).toMatchObject({ contentType: 'application/json' });

    const original = await rowsOf(chain);
    await asInsider('audit_event', () =>
      testApp.dataSource.query(`DELETE FROM audit_event WHERE chain = $1 AND sequence >= 3`, [chain]),
    );
    try {
      const { body, chain: verdict } = await verdictOf(chain);
      expect(body.intact).toBe(false);
      expect(verdict.firstBreak).toEqual({ sequence: 3, reason: 'missing-after-receipt' });
      expect(body.receipt).toMatchObject({ id: receipt.id, valid: true });
    } finally {
      await restore(original);
    }
    expect((await verdictOf(chain)).body.intact).toBe(true);
  });

  it('gives a clear verdict for a receipt that does not match the chain, or was altered', async () => {
    const chain = await probeChain(2);
    const receipt = await expectStatus(auditor.post('/api/audit/receipts'), 201);
    const original = await rowsOf(chain);
    // A genuine receipt, and a chain whose sealed head was later replaced.
    await asInsider('audit_event', () =>
      testApp.dataSource.query(`DELETE FROM audit_event WHERE id = $1`, [original[1].id]),
    );
    try {
      const { body, chain: verdict } = await verdictOf(chain, receipt);
      expect(body.intact).toBe(false);
      expect(verdict.firstBreak).toEqual({ sequence: 2, reason: 'missing-after-receipt' });
      expect(body.findings.find((f: { chain: string }) => f.chain === chain).message).toMatch(/receipt/);
    } finally {
      await restore(original);
    }
    const altered = {
      ...receipt,
      chains: receipt.chains.map((c: { chain: string; hash: string }) =>
        c.chain === chain ? { ...c, hash: 'f'.repeat(64) } : c,
      ),
    };
    const { body } = await verdictOf(chain, altered);
    expect(body.intact).toBe(false);
    expect(body.receipt).toMatchObject({ valid: false });
    expect(body.findings[0]).toMatchObject({ chain: null, reason: 'receipt-mac-mismatch' });
    const malformed = await expectStatus(
      auditor.post('/api/audit/verify').send({ receipt: { format: 'something else' } }),
      200,
    );
    expect(malformed).toMatchObject({ intact: false, receipt: { valid: false } });
    expect((await verdictOf(chain, receipt)).body.intact).toBe(true);
  });

  it('keeps events signed with a rotated-out key verifiable', async () => {
    const config = testApp.app.get(AppConfig);
    const keys = JSON.parse(readFileSync(config.auditKeyFile, 'utf8'));
    const rotatedFile = join(TMP, `audit-keys-rotated-${Date.now()}.json`);
    const newId = `rotated-${Date.now().toString(36)}`;
    writeFileSync(
      rotatedFile,
      JSON.stringify({
        current: newId,
        keys: { ...keys.keys, [newId]: randomUUID().replace(/-/g, '') + randomUUID().replace(/-/g, '') },
      }),
    );
    const chain = await probeChain(2);
    const rotated = await startTestApp({ AUDIT_KEY_FILE: rotatedFile, AUDIT_RECEIPT_CRON: '' });
    try {
      await rotated.dataSource.transaction((manager) =>
        rotated.app.get(AuditService).record(manager, { chain, actor: null, action: 'probe.after-rotation' }),
      );
      const rows = await rowsOf(chain);
      expect(rows.map((r) => r.key_id)).toEqual([keys.current, keys.current, newId]);
      const [verdict] = await rotated.app.get(AuditService).verify([chain]);
      expect(verdict).toEqual({ chain, events: 3, intact: true, firstBreak: null });
      // The lab chain, written under the earlier key, still verifies too.
      const [lab] = await rotated.app.get(AuditService).verify(['lab']);
      expect(lab.intact).toBe(true);
    } finally {
      await rotated.close();
      rmSync(rotatedFile, { force: true });
      // The default configuration does not hold the test's new key: take the probe chain out of the shared database.
      await asInsider('audit_event', () =>
        testApp.dataSource.query(`DELETE FROM audit_event WHERE chain = $1`, [chain]),
      );
    }
  });

  it('seals events written before keying once, says so, and then detects edits to them', async () => {
    const chain = `evidence-legacy-${randomUUID()}`;
    let previous = GENESIS_HASH;
    for (let sequence = 1; sequence <= 3; sequence++) {
      const at = new Date(Date.UTC(2026, 0, sequence, 10));
      const fields = {
        chain,
        sequence,
        at: at.toISOString(),
        actorId: null,
        action: 'legacy.event',
        subjectType: null,
        subjectId: null,
        data: { sequence },
      };
      const hash = chainHash(previous, fields);
      await testApp.dataSource.query(
        `INSERT INTO audit_event (chain, sequence, at, actor_email, action, data, previous_hash, hash) VALUES ($1, $2, $3, 'old@evenhand.test', 'legacy.event', $4, $5, $6)`,
        [chain, sequence, at, JSON.stringify({ sequence }), previous, hash],
      );
      previous = hash;
    }
    const [before] = await audit.verify([chain]);
    expect(before).toEqual({ chain, events: 3, intact: false, firstBreak: { sequence: 1, reason: 'unkeyed' } });
    await audit.sealUnkeyedChains();
    await audit.sealUnkeyedChains();
    const rows = await rowsOf(chain);
    expect(rows.map((r) => r.action)).toEqual([
      'legacy.event',
      'legacy.event',
      'legacy.event',
      'audit.unkeyed-events-sealed',
    ]);
    expect(rows[3].data).toMatchObject({ unkeyedThrough: 3 });
    expect((await audit.verify([chain]))[0]).toMatchObject({ events: 4, intact: true });
    const original = rows.slice(1, 2);
    await asInsider('audit_event', () =>
      testApp.dataSource.query(`UPDATE audit_event SET actor_email = 'forged@evenhand.test' WHERE id = $1`, [
        rows[1].id,
      ]),
    );
    try {
      expect((await audit.verify([chain]))[0].firstBreak).toEqual({ sequence: 4, reason: 'unkeyed-events-changed' });
    } finally {
      await restore(original);
    }
  });

  it('refuses to change or remove an audit receipt', async () => {
    const receipt = await expectStatus(auditor.post('/api/audit/receipts'), 201);
    await expect(
      testApp.dataSource.query(`UPDATE audit_receipt SET mac = 'x' WHERE id = $1`, [receipt.id]),
    ).rejects.toThrow(/append-only/);
    await expect(testApp.dataSource.query(`DELETE FROM audit_receipt WHERE id = $1`, [receipt.id])).rejects.toThrow(
      /append-only/,
    );
  });
});

describe('one record of assignment', () => {
  let researcher: Browser;
  let studyId: string;
  let conditionIds: string[];
  let enrollments: string[];

  beforeAll(async () => {
    researcher = await signedInStaff(testApp, 'researcher');
    ({ studyId, conditionIds } = await draftBetweenStudy(researcher));
    await prepareToOpen(researcher, studyId);
    await expectStatus(researcher.post(`/api/studies/${studyId}/open`), 200);
    enrollments = await insertEnrollments(testApp, studyId, [{ pretest: 10 }, { pretest: 90 }, { pretest: 20 }]);
    const randomization = testApp.app.get(RandomizationService);
    for (const [i, enrollmentId] of enrollments.entries()) {
      await testApp.dataSource.transaction(async (manager) => {
        const outcome = await randomization.allocate(
          manager,
          { id: null, email: 'test-runner' },
          { studyId, enrollmentId, covariates: { pretest: [10, 90, 20][i] } },
        );
        // As signing does: the enrollment gets the allocation's condition in the same transaction.
        await manager.query(
          `UPDATE enrollment SET status = 'assigned', condition_id = $1, stratum_key = $2 WHERE id = $3`,
          [outcome.conditionId, outcome.stratumKey, enrollmentId],
        );
      });
    }
    await expectStatus(
      researcher.post(`/api/studies/${studyId}/unblind`).send({ reason: 'Checking the record of assignment' }),
      200,
    );
  });

  const otherCondition = async (enrollmentId: string) => {
    const [row] = await testApp.dataSource.query(`SELECT condition_id FROM enrollment WHERE id = $1`, [enrollmentId]);
    return conditionIds.find((id) => id !== row.condition_id)!;
  };

  it('refuses an enrollment condition that differs from its allocation', async () => {
    await expect(
      testApp.dataSource.query(`UPDATE enrollment SET condition_id = $1 WHERE id = $2`, [
        await otherCondition(enrollments[0]),
        enrollments[0],
      ]),
    ).rejects.toThrow(/allocation/);
    await expect(
      testApp.dataSource.query(`UPDATE enrollment SET condition_id = NULL WHERE id = $1`, [enrollments[0]]),
    ).rejects.toThrow(/allocation/);
    expect((await expectStatus(researcher.get(`/api/studies/${studyId}/assignment/verify`), 200)).allMatch).toBe(true);
  });

  it('refuses to change or remove an allocation', async () => {
    await expect(
      testApp.dataSource.query(`UPDATE allocation SET condition_id = $1 WHERE enrollment_id = $2`, [
        await otherCondition(enrollments[1]),
        enrollments[1],
      ]),
    ).rejects.toThrow(/append-only/);
    await expect(
      testApp.dataSource.query(`DELETE FROM allocation WHERE enrollment_id = $1`, [enrollments[1]]),
    ).rejects.toThrow(/append-only/);
  });

  it('reports an enrollment whose condition was changed behind the database’s back', async () => {
    const target = enrollments[2];
    const [before] = await testApp.dataSource.query(`SELECT condition_id FROM enrollment WHERE id = $1`, [target]);
    const forged = await otherCondition(target);
    await testApp.dataSource.query(`ALTER TABLE enrollment DISABLE TRIGGER enrollment_matches_allocation`);
    try {
      await testApp.dataSource.query(`UPDATE enrollment SET condition_id = $1 WHERE id = $2`, [forged, target]);
    } finally {
      await testApp.dataSource.query(`ALTER TABLE enrollment ENABLE TRIGGER enrollment_matches_allocation`);
    }
    const report = await expectStatus(researcher.get(`/api/studies/${studyId}/assignment/verify`), 200);
    expect(report.allMatch).toBe(false);
    expect(report.enrollmentMismatches).toEqual([
      expect.objectContaining({
        enrollmentId: target,
        reason: 'differs-from-allocation',
        enrollment: { conditionId: forged, order: null },
        allocation: { conditionId: before.condition_id, order: null },
      }),
    ]);
    const check = report.checks.find((c: { enrollmentId: string }) => c.enrollmentId === target);
    expect(check).toMatchObject({ matches: true, enrollmentMatches: false });
  });
});

describe('the sealed signed copy', () => {
  it('carries a PDF signature that pdfsig (poppler-utils) reports valid, and a digest mismatch after one byte changes', async () => {
    const coordinator = await signedInStaff(testApp, 'coordinator');
    const { studyId } = await draftBetweenStudy(coordinator);
    const version = await prepareToOpen(coordinator, studyId);
    await expectStatus(coordinator.post(`/api/studies/${studyId}/open`), 200);
    const { browser } = await signedInParticipant(testApp);
    await expectStatus(browser.post(`/api/studies/${studyId}/enrollments/me`), 201);
    await expectStatus(
      browser.put(`/api/studies/${studyId}/enrollments/me/screening`).send({ answers: { pretest: 70 } }),
      200,
    );
    await expectStatus(
      browser
        .post(`/api/studies/${studyId}/enrollments/me/signature`)
        .send({ versionId: version.id, fingerprint: version.fingerprint, typedName: 'Sam Example' }),
      201,
    );
    let pdf: Buffer | undefined;
    for (let i = 0; i < 120 && !pdf; i++) {
      const response = await browser
        .get(`/api/studies/${studyId}/enrollments/me/consent.pdf`)
        .buffer(true)
        .parse((res, done) => {
          const chunks: Buffer[] = [];
          res.on('data', (chunk: Buffer) => chunks.push(chunk));
          res.on('end', () => done(null, Buffer.concat(chunks)));
        });
      if (response.status === 200) pdf = response.body as Buffer;
      else await new Promise((resolve) => setTimeout(resolve, 250));
    }
    expect(pdf, 'signed copy never became ready').toBeDefined();
    const [stored] = await testApp.dataSource.query(
      `SELECT s.pdf_sha256 FROM signature s JOIN enrollment e ON e.id = s.enrollment_id WHERE e.study_id = $1`,
      [studyId],
    );
    expect(stored.pdf_sha256).toBe(createHash('sha256').update(pdf!).digest('hex'));
    // Outside check: pdfsig from Debian's poppler-utils validates the embedded CMS signature over the byte ranges.
    const file = join(TMP, `signed-copy-${Date.now()}.pdf`);
    writeFileSync(file, pdf!);
    expect(execFileSync('pdfsig', [file]).toString()).toContain('Signature is Valid.');
    const changed = Buffer.from(pdf!);
    // One byte inside the signed ranges: a letter of the lab's name in the signature dictionary.
    const at = changed.indexOf('Harbor Lane Cognition Lab');
    expect(at).toBeGreaterThan(0);
    changed[at] = 'J'.charCodeAt(0);
    writeFileSync(file, changed);
    expect(execFileSync('pdfsig', [file]).toString()).toContain('Digest Mismatch.');
    rmSync(file, { force: true });
  });
});
