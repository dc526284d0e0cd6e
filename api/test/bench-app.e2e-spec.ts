import 'reflect-metadata';
import type { INestApplicationContext } from '@nestjs/common';
import { randomUUID } from 'node:crypto';
import { DataSource } from 'typeorm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditService } from '../src/audit/audit.service';
import { bootBenchContext, bootBenchHttpApp } from '../src/bench/bench-app';
import { startTestApp } from './support/test-app';
import type { PostgresDriver } from 'typeorm/driver/postgres/PostgresDriver';

/**
 * The benchmarks must measure the path the api really runs: an app booted the way they boot it writes its audit
 * events (a rebuilt pool once dropped the audit service's commit hook, so benchmarks wrote none).
 */
describe('an app booted as the benchmarks boot it', () => {
  let app: INestApplicationContext;
  const saved = { ...process.env };

  beforeAll(async () => {
    app = await bootBenchContext(process.env.DATABASE_URL!, 32);
  });
  afterAll(async () => {
    await app?.close();
    restoreEnvironment(saved);
  });

  it('writes the audit events recorded in its transactions', async () => {
    const dataSource = app.get(DataSource);
    const audit = app.get(AuditService);
    const chain = `bench-check-${randomUUID()}`;
    await dataSource.transaction((manager) => audit.record(manager, { chain, actor: null, action: 'bench.checked' }));
    const rows = await dataSource.query(`SELECT action FROM audit_event WHERE chain = $1`, [chain]);
    expect(rows).toEqual([{ action: 'bench.checked' }]);
  });

  it('opens the pool at the size the benchmark asks for', async () => {
    const dataSource = app.get(DataSource);
    await Promise.all(Array.from({ length: 32 }, () => dataSource.query('SELECT pg_sleep(0.05)')));
    const pool = (dataSource.driver as PostgresDriver).master as { totalCount: number; options: { max: number } };
    expect(pool.options.max).toBe(32);
    expect(pool.totalCount).toBe(32);
  });
});

describe('the bare-INSERT baseline route', () => {
  const saved = { ...process.env };
  afterAll(() => restoreEnvironment(saved));

  it("is served by the benchmark's HTTP app, in the same app that writes audit events", async () => {
    const { app, baseUrl } = await bootBenchHttpApp(process.env.DATABASE_URL!, 4);
    try {
      const before = Number((await app.get(DataSource).query(`SELECT count(*) AS n FROM bench_scratch`))[0].n);
      const response = await fetch(`${baseUrl}/bench/bare-insert`, {
        method: 'POST',
        headers: { 'content-type': 'application/json' },
        body: '{}',
      });
      expect(response.status).toBe(200);
      const after = Number((await app.get(DataSource).query(`SELECT count(*) AS n FROM bench_scratch`))[0].n);
      expect(after).toBe(before + 1);
      const chain = `bench-http-${randomUUID()}`;
      await app
        .get(DataSource)
        .transaction((manager) =>
          app.get(AuditService).record(manager, { chain, actor: null, action: 'bench.checked' }),
        );
      expect(
        await app.get(DataSource).query(`SELECT count(*)::int AS n FROM audit_event WHERE chain = $1`, [chain]),
      ).toEqual([{ n: 1 }]);
    } finally {
      await app.close();
      restoreEnvironment(saved);
    }
  });

  it('does not exist in the api itself', async () => {
    const testApp = await startTestApp();
    try {
      const response = await testApp
        .browser()
        .post('/api/bench/bare-insert')
        .set('content-type', 'application/json')
        .send({});
      expect(response.status).toBe(404);
    } finally {
      await testApp.close();
    }
  });
});

function restoreEnvironment(saved: NodeJS.ProcessEnv): void {
  for (const key of Object.keys(process.env)) if (!(key in saved)) delete process.env[key];
  Object.assign(process.env, saved);
}
