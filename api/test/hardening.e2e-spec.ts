import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { UsersService } from '../src/users/users.service';
import { MailService } from '../src/mail/mail.service';
import { FULL_CONSENT_VALUES, TINY_PDF } from './support/consent-fixtures';
import { cookiesOf, expectStatus } from './support/http';
import { signInTokenFrom, uniqueAddress, waitForMail } from './support/mailbox';
import { draftBetweenStudy, signedInStaff } from './support/study-fixtures';
import { startTestApp, TestApp } from './support/test-app';

let testApp: TestApp;

beforeAll(async () => {
  testApp = await startTestApp();
});
afterAll(async () => {
  await testApp.close();
});

/** Polls until the check passes, with a generous deadline (state, not the clock). */
async function eventually(check: () => Promise<void>, timeoutMs = 30_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    try {
      return await check();
    } catch (error) {
      if (Date.now() > deadline) throw error;
      await new Promise((resolve) => setTimeout(resolve, 200));
    }
  }
}

function fieldsOf(body: { errors?: Array<{ field: string }> }): string[] {
  return (body.errors ?? []).map((e) => e.field);
}

function nested(depth: number): string {
  return `${'{"a":'.repeat(depth)}1${'}'.repeat(depth)}`;
}

describe('bodies the api refuses before reading them', () => {
  it('answers JSON nested thousands of levels deep with a 400, also on anonymous sign-in', async () => {
    const body = await expectStatus(
      testApp
        .browser()
        .post('/api/auth/sign-in-link')
        .set('content-type', 'application/json')
        .send(`{"email":${nested(3000)}}`),
      400,
      'VALIDATION_FAILED',
    );
    expect(fieldsOf(body)[0]).toMatch(/^email/);
  });

  it('answers a body over the size limit with 413 in the problem shape', async () => {
    const big = JSON.stringify({ email: 'someone@example.test', studySlug: 'x'.repeat(2 * 1024 * 1024) });
    await expectStatus(
      testApp.browser().post('/api/auth/sign-in-link').set('content-type', 'application/json').send(big),
      413,
      'PAYLOAD_TOO_LARGE',
    );
  });
});

describe('null where a field cannot be null', () => {
  it('names the field on the study, condition, step, user and consent-draft routes', async () => {
    const admin = await signedInStaff(testApp, 'admin');
    const { studyId, conditionIds } = await draftBetweenStudy(admin);
    const step = (
      await expectStatus(admin.post(`/api/studies/${studyId}/steps`).send({ title: 'Session 1', payMinor: 500 }), 201)
    ).items[0];
    const draft = await expectStatus(
      admin
        .post(`/api/studies/${studyId}/consent-versions`)
        .send({ templateId: 'consent/minimal-risk-paid-study', values: FULL_CONSENT_VALUES }),
      201,
    );
    const [staff] = await testApp.dataSource.query(
      `SELECT id FROM user_account WHERE email = 'researcher@evenhand.test'`,
    );

    const cases: Array<[string, ReturnType<typeof admin.patch>, string]> = [
      ['study', admin.patch(`/api/studies/${studyId}`).send({ title: null }), 'title'],
      [
        'condition',
        admin.patch(`/api/studies/${studyId}/conditions/${conditionIds[0]}`).send({ participantLabel: null }),
        'participantLabel',
      ],
      ['step', admin.patch(`/api/studies/${studyId}/steps/${step.id}`).send({ title: null }), 'title'],
      ['user', admin.patch(`/api/users/${staff.id}`).send({ name: null }), 'name'],
      [
        'consent draft',
        admin
          .post(`/api/studies/${studyId}/consent-versions`)
          .send({ templateId: 'consent/minimal-risk-paid-study', values: null }),
        'values',
      ],
      [
        'consent refill',
        admin
          .post(`/api/studies/${studyId}/consent-versions/${draft.id}/refill`)
          .send({ values: { ...FULL_CONSENT_VALUES, studyPurpose: null } }),
        'values.studyPurpose',
      ],
    ];
    for (const [name, pending, field] of cases) {
      const body = await expectStatus(pending, 400, 'VALIDATION_FAILED').catch((error: Error) => {
        throw new Error(`${name}: ${error.message}`);
      });
      expect(fieldsOf(body), name).toContain(field);
    }
  });

  it('still takes null where the contract says a field may be null', async () => {
    const admin = await signedInStaff(testApp, 'admin');
    const { studyId } = await draftBetweenStudy(admin);
    const step = (
      await expectStatus(admin.post(`/api/studies/${studyId}/steps`).send({ title: 'Session 1', payMinor: 500 }), 201)
    ).items[0];
    await expectStatus(
      admin.put(`/api/studies/${studyId}/steps/${step.id}`).send({
        verification: 'staff',
        taskUrl: null,
        opensAfterDays: 0,
        opensFrom: 'assignment',
        dueWithinDays: null,
      }),
      200,
    );
  });
});

describe('strings the database cannot store', () => {
  it('refuses a NUL character in an anonymous e-mail field, naming it', async () => {
    const body = await expectStatus(
      testApp.browser().post('/api/auth/sign-in-link').send({ email: 'nul\u0000@example.test' }),
      400,
      'VALIDATION_FAILED',
    );
    expect(fieldsOf(body)).toEqual(['email']);
    const signIn = await expectStatus(
      testApp.browser().post('/api/auth/sign-in').send({ email: 'admin@evenhand.test\u0000', password: 'x' }),
      400,
    );
    expect(fieldsOf(signIn)).toEqual(['email']);
  });

  it('refuses a lone surrogate in a study title and inside nested values, naming the path', async () => {
    const admin = await signedInStaff(testApp, 'admin');
    const { studyId } = await draftBetweenStudy(admin);
    const title = await expectStatus(
      admin
        .patch(`/api/studies/${studyId}`)
        .set('content-type', 'application/json')
        .send('{"title":"broken \\ud800 title"}'),
      400,
    );
    expect(fieldsOf(title)).toEqual(['title']);
    const nestedValue = await expectStatus(
      admin.post(`/api/studies/${studyId}/consent-versions`).send({
        templateId: 'consent/minimal-risk-paid-study',
        values: { ...FULL_CONSENT_VALUES, investigatorName: 'Dr \u0000' },
      }),
      400,
    );
    expect(fieldsOf(nestedValue)).toEqual(['values.investigatorName']);
  });

  it('refuses a NUL in a path segment and in a query string', async () => {
    await expectStatus(testApp.browser().get('/api/public/studies/bad%00slug'), 400, 'VALIDATION_FAILED');
    const admin = await signedInStaff(testApp, 'admin');
    const body = await expectStatus(admin.get('/api/users?search=a%00b'), 400, 'VALIDATION_FAILED');
    expect(fieldsOf(body)).toEqual(['search']);
  });
});

describe('list pages', () => {
  it('refuses a page number past any real page on the roster, payouts, audit and users lists', async () => {
    const admin = await signedInStaff(testApp, 'admin');
    const { studyId } = await draftBetweenStudy(admin);
    for (const path of [
      `/api/studies/${studyId}/enrollments`,
      `/api/studies/${studyId}/payouts`,
      '/api/audit',
      '/api/users',
    ]) {
      const body = await expectStatus(admin.get(`${path}?page=99999999999999999999`), 400, 'VALIDATION_FAILED').catch(
        (error: Error) => {
          throw new Error(`${path}: ${error.message}`);
        },
      );
      expect(fieldsOf(body), path).toEqual(['page']);
    }
  });
});

describe('uploads', () => {
  it('reports an over-long display name in a roster import instead of storing it', async () => {
    const admin = await signedInStaff(testApp, 'admin');
    const { studyId } = await draftBetweenStudy(admin);
    const email = uniqueAddress('long-name');
    const csv = `email,name,pretest\n${email},${'N'.repeat(4 * 1024 * 1024 - 200)},70\n`;
    const result = await expectStatus(
      admin.post(`/api/studies/${studyId}/enrollments/import`).attach('file', Buffer.from(csv), 'roster.csv'),
      200,
    );
    expect(result.created).toBe(0);
    expect(result.errors).toEqual([expect.objectContaining({ line: 2, field: 'name' })]);
    const rows = await testApp.dataSource.query(
      `SELECT 1 FROM enrollment e JOIN user_account u ON u.id = e.participant_id WHERE u.email = $1`,
      [email],
    );
    expect(rows).toHaveLength(0);
  });

  it('refuses an approval letter that starts like a PDF but does not load as one', async () => {
    const admin = await signedInStaff(testApp, 'admin');
    const { studyId } = await draftBetweenStudy(admin);
    await expectStatus(admin.post(`/api/studies/${studyId}/steps`).send({ title: 'Session 1', payMinor: 500 }), 201);
    const draft = await expectStatus(
      admin
        .post(`/api/studies/${studyId}/consent-versions`)
        .send({ templateId: 'consent/minimal-risk-paid-study', values: FULL_CONSENT_VALUES }),
      201,
    );
    const fake = Buffer.concat([Buffer.from('%PDF-1.7\n'), Buffer.alloc(4000, 0x41)]);
    const body = await expectStatus(
      admin
        .post(`/api/studies/${studyId}/consent-versions/${draft.id}/approval-letter`)
        .attach('letter', fake, 'approval.pdf'),
      415,
      'UNSUPPORTED_MEDIA_TYPE',
    );
    expect(fieldsOf(body)).toEqual(['letter']);
    // A real one still goes through.
    await expectStatus(
      admin
        .post(`/api/studies/${studyId}/consent-versions/${draft.id}/approval-letter`)
        .attach('letter', TINY_PDF, 'approval.pdf'),
      200,
    );
  });
});

describe('sessions', () => {
  it('ends the session at once on sign-out: the access cookie stops working', async () => {
    const browser = testApp.browser();
    const response = await browser
      .post('/api/auth/sign-in')
      .send({ email: 'researcher@evenhand.test', password: 'evenhand-demo' })
      .expect(200);
    const access = cookiesOf(response)
      .find((c) => c.startsWith('eh_access='))!
      .split(';')[0];
    await expectStatus(testApp.browser().get('/api/auth/me').set('Cookie', access), 200);
    await expectStatus(browser.post('/api/auth/sign-out'), 204);
    await expectStatus(testApp.browser().get('/api/auth/me').set('Cookie', access), 401, 'UNAUTHENTICATED');
  });

  it('gives two tabs refreshing at once the same new pair, and both keep working', async () => {
    const browser = testApp.browser();
    const response = await browser
      .post('/api/auth/sign-in')
      .send({ email: 'coordinator@evenhand.test', password: 'evenhand-demo' })
      .expect(200);
    const refresh = cookiesOf(response)
      .find((c) => c.startsWith('eh_refresh='))!
      .split(';')[0];
    const [first, second] = await Promise.all([
      testApp.browser().post('/api/auth/refresh').set('Cookie', refresh),
      testApp.browser().post('/api/auth/refresh').set('Cookie', refresh),
    ]);
    expect([first.status, second.status]).toEqual([200, 200]);
    const next = (r: typeof first, name: string) =>
      cookiesOf(r)
        .find((c) => c.startsWith(`${name}=`))!
        .split(';')[0];
    expect(next(first, 'eh_refresh')).toBe(next(second, 'eh_refresh'));
    expect(next(first, 'eh_refresh')).not.toBe(refresh);
    await expectStatus(testApp.browser().get('/api/auth/me').set('Cookie', next(second, 'eh_access')), 200);
    // The new token rotates normally afterwards.
    await expectStatus(testApp.browser().post('/api/auth/refresh').set('Cookie', next(first, 'eh_refresh')), 200);
  });

  it('still treats a replayed token after the grace window as theft', async () => {
    const browser = testApp.browser();
    const response = await browser
      .post('/api/auth/sign-in')
      .send({ email: 'coordinator@evenhand.test', password: 'evenhand-demo' })
      .expect(200);
    const refresh = cookiesOf(response)
      .find((c) => c.startsWith('eh_refresh='))!
      .split(';')[0];
    await expectStatus(browser.post('/api/auth/refresh'), 200);
    await testApp.dataSource.query(
      `UPDATE refresh_token SET replaced_at = now() - interval '1 hour' WHERE replaced_at IS NOT NULL AND revoked_at IS NULL`,
    );
    await expectStatus(testApp.browser().post('/api/auth/refresh').set('Cookie', refresh), 401, 'UNAUTHENTICATED');
    await expectStatus(browser.post('/api/auth/refresh'), 401, 'UNAUTHENTICATED');
  });
});

describe('sign-in rate limits', () => {
  it('limits one client trying many e-mail addresses, whatever X-Forwarded-For says', async () => {
    const limited = await startTestApp({ SIGN_IN_LIMIT: '3', SIGN_IN_CLIENT_LIMIT: '5', SIGN_IN_WINDOW_SECONDS: '60' });
    try {
      await limited.dataSource.query(`DELETE FROM rate_limit_window`);
      const statuses: number[] = [];
      for (let i = 0; i < 8; i++) {
        const response = await limited
          .browser()
          .post('/api/auth/sign-in')
          .set('X-Forwarded-For', `203.0.113.${i + 1}`)
          .send({ email: `spray-${i}@evenhand.test`, password: 'wrong-password' });
        statuses.push(response.status);
      }
      expect(statuses).toEqual([401, 401, 401, 401, 401, 429, 429, 429]);
      // The link request shares the client's budget.
      await expectStatus(
        limited
          .browser()
          .post('/api/auth/sign-in-link')
          .send({ email: uniqueAddress('spray') }),
        429,
        'RATE_LIMITED',
      );
    } finally {
      await limited.dataSource.query(`DELETE FROM rate_limit_window`);
      await limited.close();
    }
  });

  it('limits one e-mail address tried from many clients behind a trusted proxy', async () => {
    const limited = await startTestApp({
      SIGN_IN_LIMIT: '3',
      SIGN_IN_CLIENT_LIMIT: '50',
      SIGN_IN_WINDOW_SECONDS: '60',
      TRUST_PROXY: 'loopback',
    });
    try {
      await limited.dataSource.query(`DELETE FROM rate_limit_window`);
      const statuses: number[] = [];
      for (let i = 0; i < 5; i++) {
        const response = await limited
          .browser()
          .post('/api/auth/sign-in')
          .set('X-Forwarded-For', `198.51.100.${i + 1}`)
          .send({ email: 'target@evenhand.test', password: `guess-${i}` });
        statuses.push(response.status);
      }
      expect(statuses).toEqual([401, 401, 401, 429, 429]);
    } finally {
      await limited.dataSource.query(`DELETE FROM rate_limit_window`);
      await limited.close();
    }
  });

  it('refuses a TRUST_PROXY value that is not an address, a subnet or a named range', async () => {
    await expect(startTestApp({ TRUST_PROXY: 'everyone' })).rejects.toThrow(/TRUST_PROXY/);
  });
});

describe('sign-in link requests', () => {
  it('does the same work in the request for staff and unknown addresses: queue one job, look nothing up, mail nothing', async () => {
    // Workers off here, so anything these spies see happened while answering the request.
    const quiet = await startTestApp({ RUN_WORKERS: 'false' });
    const lookups = vi.spyOn(quiet.app.get(UsersService), 'findByEmail');
    const mails = vi.spyOn(quiet.app.get(MailService), 'enqueue');
    const unknown = uniqueAddress('unknown');
    const [{ since }] = await testApp.dataSource.query(`SELECT now() AS since`);
    try {
      for (const email of ['admin@evenhand.test', unknown]) {
        expect(await expectStatus(quiet.browser().post('/api/auth/sign-in-link').send({ email }), 202)).toEqual({
          sent: true,
        });
      }
      expect(lookups).not.toHaveBeenCalled();
      expect(mails).not.toHaveBeenCalled();
      const jobs = await testApp.dataSource.query(
        `SELECT data->>'email' AS email FROM job_queue.job
         WHERE name = 'auth.sign-in-link' AND data->>'email' IN ('admin@evenhand.test', $1) AND created_on >= $2`,
        [unknown, since],
      );
      expect(jobs.map((j: { email: string }) => j.email).sort()).toEqual(['admin@evenhand.test', unknown].sort());
    } finally {
      await quiet.close();
    }
    // The worker of the main app does the rest: a link for the unknown address, none for staff.
    signInTokenFrom(await waitForMail(unknown));
    await eventually(async () => {
      const [pending] = await testApp.dataSource.query(
        `SELECT count(*)::int AS n FROM job_queue.job
         WHERE name = 'auth.sign-in-link' AND data->>'email' = 'admin@evenhand.test' AND created_on >= $1 AND state <> 'completed'`,
        [since],
      );
      expect(pending.n).toBe(0);
    });
    expect(
      await testApp.dataSource.query(`SELECT 1 FROM sign_in_link WHERE email = 'admin@evenhand.test'`),
    ).toHaveLength(0);
  });
});

describe('cross-site requests', () => {
  it('accepts only application/json on JSON routes', async () => {
    await expectStatus(
      testApp
        .browser()
        .post('/api/auth/sign-in')
        .type('form')
        .send('email=admin%40evenhand.test&password=evenhand-demo'),
      415,
      'UNSUPPORTED_MEDIA_TYPE',
    );
    await expectStatus(
      testApp
        .browser()
        .post('/api/auth/sign-in')
        .set('content-type', 'text/plain')
        .send('{"email":"admin@evenhand.test","password":"evenhand-demo"}'),
      415,
      'UNSUPPORTED_MEDIA_TYPE',
    );
    const admin = await signedInStaff(testApp, 'admin');
    const { studyId } = await draftBetweenStudy(admin);
    await expectStatus(
      admin.patch(`/api/studies/${studyId}`).set('content-type', 'text/plain').send('{"title":"Changed"}'),
      415,
    );
    // A body-less action needs no content type.
    await expectStatus(admin.get(`/api/studies/${studyId}`), 200);
  });

  it('refuses a state-changing request from a foreign origin, and takes the portal and admin origins', async () => {
    const admin = await signedInStaff(testApp, 'admin');
    const { studyId } = await draftBetweenStudy(admin);
    await expectStatus(
      admin.patch(`/api/studies/${studyId}`).set('Origin', 'https://evil.example').send({ title: 'Hijacked' }),
      403,
      'FORBIDDEN',
    );
    await expectStatus(
      testApp
        .browser()
        .post('/api/auth/sign-in')
        .set('Origin', 'https://evil.example')
        .send({ email: 'admin@evenhand.test', password: 'evenhand-demo' }),
      403,
    );
    await expectStatus(admin.patch(`/api/studies/${studyId}`).set('Origin', 'null').send({ title: 'Sandboxed' }), 403);
    const [study] = await testApp.dataSource.query(`SELECT title FROM study WHERE id = $1`, [studyId]);
    expect(study.title).toBe('Test study');

    await expectStatus(
      admin
        .patch(`/api/studies/${studyId}`)
        .set('Origin', new URL(process.env.ADMIN_URL ?? 'http://127.0.0.1:5174').origin)
        .send({ title: 'From admin' }),
      200,
    );
    await expectStatus(
      testApp
        .browser()
        .post('/api/auth/sign-in-link')
        .set('Origin', new URL(process.env.PORTAL_URL ?? 'http://127.0.0.1:5173').origin)
        .send({ email: uniqueAddress('portal') }),
      202,
    );
    // Reading is not state-changing.
    await expectStatus(admin.get(`/api/studies/${studyId}`).set('Origin', 'https://evil.example'), 200);
  });
});
