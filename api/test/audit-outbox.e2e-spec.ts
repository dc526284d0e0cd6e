import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditService } from '../src/audit/audit.service';
import { startTestApp, TestApp } from './support/test-app';

/**
 * The audit write path: events go to the outbox inside the caller's transaction and the chain's chainer seals
 * them after the commit. Nothing of a rolled-back transaction is written, nothing committed is lost or doubled,
 * and the chain still verifies under concurrency.
 */
describe('audit outbox and chainer', () => {
  let testApp: TestApp;
  let audit: AuditService;

  beforeAll(async () => {
    testApp = await startTestApp();
    audit = testApp.app.get(AuditService);
  });
  afterAll(() => testApp?.close());

  const eventsOf = (chain: string) =>
    testApp.dataSource.query(
      `SELECT sequence, action, subject_id FROM audit_event WHERE chain = $1 ORDER BY sequence`,
      [chain],
    ) as Promise<Array<{ sequence: number; action: string; subject_id: string }>>;
  const waiting = async (chain: string) =>
    Number((await testApp.dataSource.query(`SELECT count(*) AS n FROM audit_outbox WHERE chain = $1`, [chain]))[0].n);

  it('seals a committed event into its chain before the transaction call returns', async () => {
    const chain = `outbox-${randomUUID()}`;
    await testApp.dataSource.transaction((manager) =>
      audit.record(manager, { chain, actor: null, action: 'test.committed', subjectId: 'one' }),
    );
    expect(await eventsOf(chain)).toEqual([{ sequence: 1, action: 'test.committed', subject_id: 'one' }]);
    expect(await waiting(chain)).toBe(0);
  });

  it('writes nothing for a transaction that rolls back, and keeps a savepoint’s events only when it commits', async () => {
    const chain = `outbox-${randomUUID()}`;
    await expect(
      testApp.dataSource.transaction(async (manager) => {
        await audit.record(manager, { chain, actor: null, action: 'test.rolled-back' });
        throw new Error('roll back');
      }),
    ).rejects.toThrow('roll back');
    await testApp.dataSource.transaction(async (manager) => {
      await audit.record(manager, { chain, actor: null, action: 'test.outer' });
      await manager
        .transaction(async (inner) => {
          await audit.record(inner, { chain, actor: null, action: 'test.inner-rolled-back' });
          throw new Error('inner');
        })
        .catch(() => undefined);
    });
    expect((await eventsOf(chain)).map((e) => e.action)).toEqual(['test.outer']);
    expect(await waiting(chain)).toBe(0);
  });

  it('chains every one of many concurrent transactions exactly once, and the chain verifies', async () => {
    const chain = `outbox-${randomUUID()}`;
    const n = 120;
    await Promise.all(
      Array.from({ length: n }, (_, i) =>
        testApp.dataSource.transaction(async (manager) => {
          await audit.record(manager, { chain, actor: null, action: 'test.concurrent', subjectId: String(i) });
          await audit.record(manager, { chain, actor: null, action: 'test.concurrent-second', subjectId: String(i) });
        }),
      ),
    );
    const events = await eventsOf(chain);
    expect(events.map((e) => e.sequence)).toEqual(Array.from({ length: 2 * n }, (_, i) => i + 1));
    const subjects = events.filter((e) => e.action === 'test.concurrent').map((e) => Number(e.subject_id));
    expect(new Set(subjects).size).toBe(n);
    // A transaction's own events keep the order they were recorded in (others may be sealed between them).
    const sequenceOf = new Map(events.map((e) => [`${e.action}:${e.subject_id}`, e.sequence]));
    for (let i = 0; i < n; i++)
      expect(sequenceOf.get(`test.concurrent:${i}`)!).toBeLessThan(sequenceOf.get(`test.concurrent-second:${i}`)!);
    expect(await waiting(chain)).toBe(0);
    expect(await audit.verify([chain])).toEqual([{ chain, events: 2 * n, intact: true, firstBreak: null }]);
  });

  it('seals rows left in the outbox by a process that stopped between commit and seal', async () => {
    const chain = `outbox-${randomUUID()}`;
    await testApp.dataSource.transaction((manager) =>
      audit.record(manager, { chain, actor: null, action: 'test.before-crash' }),
    );
    await testApp.dataSource.query(
      `INSERT INTO audit_outbox (chain, action, subject_id, data) VALUES ($1, 'test.left-behind', 'x', '{"n": 1}')`,
      [chain],
    );
    await audit.sealWaiting();
    expect((await eventsOf(chain)).map((e) => e.action)).toEqual(['test.before-crash', 'test.left-behind']);
    expect(await waiting(chain)).toBe(0);
    expect((await audit.verify([chain]))[0].intact).toBe(true);
  });
});
