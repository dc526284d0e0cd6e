import { RequestMethod } from '@nestjs/common';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildOpenApiDocument } from '../src/app-setup';
import { AuditService } from '../src/audit/audit.service';
import { expectStatus } from './support/http';
import { startTestApp, TestApp } from './support/test-app';

let testApp: TestApp;

beforeAll(async () => {
  testApp = await startTestApp();
});
afterAll(async () => {
  await testApp.close();
});

/** The only routes anyone may call without signing in. Adding one here is a deliberate, reviewed act. */
const PUBLIC_ROUTES = new Set([
  'POST /api/auth/sign-in',
  'POST /api/auth/sign-in-link',
  'POST /api/auth/sign-in-link/consume',
  'POST /api/auth/password-reset',
  'POST /api/auth/password-reset/consume',
  'POST /api/auth/refresh',
  'POST /api/auth/sign-out',
  'GET /api/health',
  'GET /api/public/studies/{slug}',
  // The signed return address from a lab's external task: the signature is the credential.
  'GET /api/return/{token}',
  // Authenticated by the provider's signature instead of a session.
  'POST /api/webhooks/payments',
]);

describe('route table', () => {
  it('refuses every route without a session unless it is on the public list', async () => {
    const document = buildOpenApiDocument(testApp.app);
    const routes = Object.entries(document.paths).flatMap(([path, item]) =>
      Object.keys(item)
        .filter((method) => method.toUpperCase() in RequestMethod)
        .map((method) => ({
          method,
          template: path,
          path: path.replace(/\{[^}]+\}/g, '00000000-0000-4000-8000-000000000000'),
        })),
    );
    expect(routes.length).toBeGreaterThan(8);
    const unguarded: string[] = [];
    for (const { method, path, template } of routes) {
      const key = `${method.toUpperCase()} ${template}`;
      const response = await (testApp.browser() as any)[method](path).send({});
      if (PUBLIC_ROUTES.has(key)) continue;
      if (response.status !== 401) unguarded.push(`${key} → ${response.status}`);
    }
    expect(unguarded).toEqual([]);
    // And the public list names only routes that exist.
    const known = new Set(routes.map(({ method, template }) => `${method.toUpperCase()} ${template}`));
    for (const route of PUBLIC_ROUTES) expect(known.has(route), route).toBe(true);
  });
});

describe('error shape', () => {
  it('names an unknown field', async () => {
    const body = await expectStatus(
      testApp.browser().post('/api/auth/sign-in').send({ email: 'a@b.test', password: 'x', role: 'admin' }),
      400,
      'VALIDATION_FAILED',
    );
    expect(body.errors).toEqual([{ field: 'role', message: 'role is not an allowed field' }]);
  });

  it('names a malformed e-mail and a missing password', async () => {
    const body = await expectStatus(
      testApp.browser().post('/api/auth/sign-in').send({ email: 'not-an-email' }),
      400,
      'VALIDATION_FAILED',
    );
    expect(body.errors.map((e: { field: string }) => e.field).sort()).toEqual(['email', 'password']);
  });

  it('answers malformed JSON with the same shape', async () => {
    await expectStatus(
      testApp.browser().post('/api/auth/sign-in').set('content-type', 'application/json').send('{"email": '),
      400,
    );
  });

  it('answers an unknown route with the same shape', async () => {
    await expectStatus(testApp.browser().get('/api/health/nothing-here'), 404, 'NOT_FOUND');
  });
});

describe('health and documents', () => {
  it('reports the database and queue reachable', async () => {
    const health = await expectStatus(testApp.browser().get('/api/health'), 200);
    expect(health).toMatchObject({ status: 'ok', database: 'up', queue: 'up' });
    expect(['up', 'down']).toContain(health.payments);
  });

  it('serves the OpenAPI document and its browsable view', async () => {
    const document = await expectStatus(testApp.browser().get('/api/openapi.json'), 200);
    expect(document.openapi).toMatch(/^3\./);
    expect(Object.keys(document.paths)).toContain('/api/auth/sign-in');
    const docs = await testApp.browser().get('/api/docs/').expect(200);
    expect(docs.text).toContain('swagger-ui');
  });
});

describe('rate limiting', () => {
  it('answers 429 with a clear message after too many sign-in attempts', async () => {
    const limited = await startTestApp({ SIGN_IN_LIMIT: '3', SIGN_IN_WINDOW_SECONDS: '60' });
    try {
      // The client's count is shared across addresses, so earlier sign-ins in this run would count too.
      await limited.dataSource.query(`DELETE FROM rate_limit_window`);
      const attempt = () =>
        limited
          .browser()
          .post('/api/auth/sign-in')
          .send({ email: 'rate-limit-probe@evenhand.test', password: 'wrong-password' });
      for (let i = 0; i < 3; i++) await expectStatus(attempt(), 401);
      const body = await expectStatus(attempt(), 429, 'RATE_LIMITED');
      expect(body.message).toMatch(/too many attempts/i);
    } finally {
      await limited.close();
    }
  });
});

describe('audit chain', () => {
  it('holds from the first row after a sequence of events, and the database refuses edits', async () => {
    const admin = testApp.browser();
    await expectStatus(
      admin.post('/api/auth/sign-in').send({ email: 'admin@evenhand.test', password: 'evenhand-demo' }),
      200,
    );
    await expectStatus(
      testApp.browser().post('/api/auth/sign-in').send({ email: 'admin@evenhand.test', password: 'bad-password' }),
      401,
    );
    await expectStatus(admin.post('/api/auth/sign-out'), 204);
    const auditor = testApp.browser();
    await expectStatus(
      auditor.post('/api/auth/sign-in').send({ email: 'auditor@evenhand.test', password: 'evenhand-demo' }),
      200,
    );
    const verdict = await expectStatus(auditor.get('/api/audit/verify'), 200);
    expect(verdict.intact).toBe(true);
    const lab = verdict.chains.find((c: { chain: string }) => c.chain === 'lab');
    expect(lab.events).toBeGreaterThanOrEqual(4);

    await expect(
      testApp.dataSource.query(`UPDATE audit_event SET action = 'edited' WHERE sequence = 1`),
    ).rejects.toThrow(/append-only/);
    await expect(testApp.dataSource.query(`DELETE FROM audit_event WHERE sequence = 1`)).rejects.toThrow(/append-only/);
  });

  it('appends the events of a transaction when it commits, in order, and never those of a rollback or a rolled-back savepoint', async () => {
    const audit = testApp.app.get(AuditService);
    const chain = `audit-probe-${Date.now()}`;
    const actions = async () =>
      (
        await testApp.dataSource.query(`SELECT action, sequence FROM audit_event WHERE chain = $1 ORDER BY sequence`, [
          chain,
        ])
      ).map((r: { action: string }) => r.action);

    await testApp.dataSource.transaction(async (manager) => {
      await audit.record(manager, { chain, actor: null, action: 'probe.first' });
      await audit.record(manager, { chain, actor: null, action: 'probe.second' });
      // Not written yet: a concurrent reader sees nothing until the commit.
      expect(await actions()).toEqual([]);
    });
    expect(await actions()).toEqual(['probe.first', 'probe.second']);

    await expect(
      testApp.dataSource.transaction(async (manager) => {
        await audit.record(manager, { chain, actor: null, action: 'probe.rolled-back' });
        throw new Error('give up');
      }),
    ).rejects.toThrow('give up');

    await testApp.dataSource.transaction(async (manager) => {
      await audit.record(manager, { chain, actor: null, action: 'probe.outer' });
      await expect(
        manager.transaction(async (inner) => {
          await audit.record(inner, { chain, actor: null, action: 'probe.inside-savepoint' });
          throw new Error('undo the savepoint');
        }),
      ).rejects.toThrow('undo the savepoint');
      await manager.transaction((inner) => audit.record(inner, { chain, actor: null, action: 'probe.kept-savepoint' }));
    });
    expect(await actions()).toEqual(['probe.first', 'probe.second', 'probe.outer', 'probe.kept-savepoint']);
    const [verdict] = await audit.verify([chain]);
    expect(verdict).toEqual({ chain, events: 4, intact: true, firstBreak: null });
  });

  it('reports the first broken link when a row is altered behind the api', async () => {
    const auditor = testApp.browser();
    await expectStatus(
      auditor.post('/api/auth/sign-in').send({ email: 'auditor@evenhand.test', password: 'evenhand-demo' }),
      200,
    );
    const [original] = await testApp.dataSource.query(
      `SELECT data FROM audit_event WHERE chain = 'lab' AND sequence = 2`,
    );
    // Only a database superuser can get past the append-only trigger; this plays someone doing exactly that.
    const tamper = async (data: unknown) => {
      await testApp.dataSource.query(`ALTER TABLE audit_event DISABLE TRIGGER audit_event_append_only`);
      try {
        await testApp.dataSource.query(`UPDATE audit_event SET data = $1 WHERE chain = 'lab' AND sequence = 2`, [
          JSON.stringify(data),
        ]);
      } finally {
        await testApp.dataSource.query(`ALTER TABLE audit_event ENABLE TRIGGER audit_event_append_only`);
      }
    };
    await tamper({ tampered: true });
    try {
      const verdict = await expectStatus(auditor.get('/api/audit/verify'), 200);
      expect(verdict.intact).toBe(false);
      expect(verdict.chains.find((c: { chain: string }) => c.chain === 'lab').firstBreak).toEqual({
        sequence: 2,
        reason: 'hash-mismatch',
      });
    } finally {
      await tamper(original.data);
    }
    expect((await expectStatus(auditor.get('/api/audit/verify'), 200)).intact).toBe(true);
  });
});
