import { createHash } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { uniqueAddress, waitForMail } from './support/mailbox';
import { activeConsentVersion, FULL_CONSENT_VALUES, signedInParticipant, TINY_PDF } from './support/consent-fixtures';
import { expectStatus } from './support/http';
import { Browser, draftBetweenStudy, signedInStaff } from './support/study-fixtures';
import { startTestApp, TestApp } from './support/test-app';

let testApp: TestApp;
let coordinator: Browser;

beforeAll(async () => {
  testApp = await startTestApp();
  coordinator = await signedInStaff(testApp, 'coordinator');
});
afterAll(async () => {
  await testApp.close();
});

/** A recruiting study with an active consent form and a screening question. */
async function recruitingStudy() {
  const { studyId, conditionIds } = await draftBetweenStudy(coordinator);
  await expectStatus(
    coordinator.post(`/api/studies/${studyId}/steps`).send({ title: 'Session 1', payMinor: 1500 }),
    201,
  );
  await expectStatus(
    coordinator.put(`/api/studies/${studyId}/screening-questions`).send({
      questions: [
        {
          key: 'adult',
          label: 'Are you 18 or older?',
          kind: 'yes-no',
          eligibleValues: [true],
          criterion: '18 or older',
        },
      ],
    }),
    200,
  );
  const version = await activeConsentVersion(coordinator, studyId);
  await expectStatus(coordinator.post(`/api/studies/${studyId}/open`), 200);
  return { studyId, conditionIds, version };
}

async function joinAndScreen(browser: Browser, studyId: string, pretest = 70) {
  await expectStatus(browser.post(`/api/studies/${studyId}/enrollments/me`), 201);
  return expectStatus(
    browser.put(`/api/studies/${studyId}/enrollments/me/screening`).send({ answers: { adult: true, pretest } }),
    200,
  );
}

/** A participant who joined, passed screening and signed the given version. */
async function signedUpParticipant(studyId: string, version: { id: string; fingerprint: string }): Promise<Browser> {
  const { browser } = await signedInParticipant(testApp);
  await joinAndScreen(browser, studyId);
  await expectStatus(
    browser
      .post(`/api/studies/${studyId}/enrollments/me/signature`)
      .send({ versionId: version.id, fingerprint: version.fingerprint, typedName: 'Sam Example' }),
    201,
  );
  return browser;
}

async function draftWithStep() {
  const { studyId } = await draftBetweenStudy(coordinator);
  await expectStatus(
    coordinator.post(`/api/studies/${studyId}/steps`).send({ title: 'Session 1', payMinor: 1500 }),
    201,
  );
  return studyId;
}

/** A draft filled from the paid-study template with every value, as the admin's new-draft dialog sends it. */
function fullDraft(studyId: string) {
  return expectStatus(
    coordinator
      .post(`/api/studies/${studyId}/consent-versions`)
      .send({ templateId: 'consent/minimal-risk-paid-study', values: FULL_CONSENT_VALUES }),
    201,
  );
}

describe('consent versions', () => {
  it('fills a draft from the template, passes the required-elements check, and fixes the fingerprint at activation', async () => {
    const studyId = await draftWithStep();
    const draft = await fullDraft(studyId);
    expect(draft).toMatchObject({ version: 1, status: 'draft', fingerprint: null });
    expect(draft.body).toContain('Test study');
    expect(draft.notice).toMatch(/not legal advice/i);
    const check = await expectStatus(
      coordinator.post(`/api/studies/${studyId}/consent-versions/${draft.id}/check`),
      200,
    );
    expect(check).toMatchObject({ passes: true, findings: [] });

    await expectStatus(
      coordinator.post(`/api/studies/${studyId}/consent-versions/${draft.id}/activate`),
      409,
      'CONSENT_VERSION_NOT_READY',
    );
    const active = await activeConsentVersion(coordinator, studyId);
    expect(active.fingerprint).toMatch(/^[0-9a-f]{64}$/);
    await expectStatus(
      coordinator.patch(`/api/studies/${studyId}/consent-versions/${active.id}`).send({ body: 'changed' }),
      409,
      'CONSENT_VERSION_NOT_DRAFT',
    );
    // The database itself refuses to edit the text of an approved version.
    await expect(
      testApp.dataSource.query(`UPDATE consent_version SET body = 'x' WHERE id = $1`, [active.id]),
    ).rejects.toThrow(/cannot change/);

    const second = await activeConsentVersion(coordinator, studyId, 'HLREB-2026-031-A1');
    const versions = await expectStatus(coordinator.get(`/api/studies/${studyId}/consent-versions`), 200);
    expect(versions.items.map((v: { version: number; status: string }) => [v.version, v.status])).toEqual([
      [3, 'active'],
      [2, 'retired'],
      [1, 'draft'],
    ]);
    expect(second.version).toBe(3);
  });

  it('refuses a draft for a study without steps, naming the field', async () => {
    const { studyId } = await draftBetweenStudy(coordinator);
    const body = await expectStatus(
      coordinator
        .post(`/api/studies/${studyId}/consent-versions`)
        .send({ templateId: 'consent/minimal-risk-paid-study' }),
      400,
    );
    expect(body.errors[0].field).toBe('steps');
  });

  it('names a missing required element when its section is removed', async () => {
    const studyId = await draftWithStep();
    const draft = await fullDraft(studyId);
    const withoutRisks = draft.body.replace(/## Possible risks and discomforts[\s\S]*?(?=\n## )/, '');
    await expectStatus(
      coordinator.patch(`/api/studies/${studyId}/consent-versions/${draft.id}`).send({ body: withoutRisks }),
      200,
    );
    // 45 CFR 46.116(b)(2): reasonably foreseeable risks or discomforts.
    const check = await expectStatus(
      coordinator.post(`/api/studies/${studyId}/consent-versions/${draft.id}/check`),
      200,
    );
    expect(check.passes).toBe(false);
    expect(check.findings.map((f: { element: string }) => f.element)).toEqual(['b2']);
  });

  it('refuses bad approval letters before storing anything', async () => {
    const studyId = await draftWithStep();
    const draft = await expectStatus(
      coordinator
        .post(`/api/studies/${studyId}/consent-versions`)
        .send({ templateId: 'consent/minimal-risk-paid-study' }),
      201,
    );
    const url = `/api/studies/${studyId}/consent-versions/${draft.id}/approval-letter`;
    const png = Buffer.from('89504e470d0a1a0a0000000d49484452', 'hex');
    const renamed = await expectStatus(
      coordinator.post(url).attach('letter', png, 'letter.pdf'),
      415,
      'UNSUPPORTED_MEDIA_TYPE',
    );
    expect(renamed.errors[0].field).toBe('letter');
    const huge = Buffer.concat([Buffer.from('%PDF-1.4\n'), Buffer.alloc(11 * 1024 * 1024, 32)]);
    await expectStatus(coordinator.post(url).attach('letter', huge, 'big.pdf'), 413, 'PAYLOAD_TOO_LARGE');
    await expectStatus(coordinator.post(url).attach('letter', Buffer.alloc(0), 'empty.pdf'), 400, 'VALIDATION_FAILED');
    const [row] = await testApp.dataSource.query(
      `SELECT approval_letter IS NULL AS empty FROM consent_version WHERE id = $1`,
      [draft.id],
    );
    expect(row.empty).toBe(true);
    const ok = await expectStatus(coordinator.post(url).attach('letter', TINY_PDF, 'approval.pdf'), 200);
    expect(ok.approvalLetter).toMatchObject({ name: 'approval.pdf', size: TINY_PDF.length });
  });
});

describe('filling a draft in again', () => {
  const refillUrl = (studyId: string, versionId: string) =>
    `/api/studies/${studyId}/consent-versions/${versionId}/refill`;

  async function draftFromTemplate(studyId: string) {
    return expectStatus(
      coordinator
        .post(`/api/studies/${studyId}/consent-versions`)
        .send({ templateId: 'consent/minimal-risk-paid-study', values: FULL_CONSENT_VALUES }),
      201,
    );
  }

  it('refills a draft from the study as it is now and the values given, replacing hand edits, and records it', async () => {
    const studyId = await draftWithStep();
    const draft = await draftFromTemplate(studyId);
    expect(draft.templateValues).toEqual(FULL_CONSENT_VALUES);
    expect(draft.body).toContain('$15.00');
    expect(draft.body).toContain('Dr. Imre Valcourt');
    await expectStatus(
      coordinator
        .patch(`/api/studies/${studyId}/consent-versions/${draft.id}`)
        .send({ body: `${draft.body}\n\nA sentence typed by hand.` }),
      200,
    );

    const steps = await expectStatus(coordinator.get(`/api/studies/${studyId}/steps`), 200);
    await expectStatus(
      coordinator.patch(`/api/studies/${studyId}/steps/${steps.items[0].id}`).send({ payMinor: 2250 }),
      200,
    );
    const values = { ...FULL_CONSENT_VALUES, investigatorName: 'Dr. Ada Lindqvist', contactPhone: undefined };
    const refilled = await expectStatus(coordinator.post(refillUrl(studyId, draft.id)).send({ values }), 200);

    expect(refilled).toMatchObject({ id: draft.id, version: draft.version, status: 'draft' });
    expect(refilled.body).toContain('$22.50');
    expect(refilled.body).not.toContain('$15.00');
    expect(refilled.body).toContain('Dr. Ada Lindqvist');
    expect(refilled.body).not.toContain('Dr. Imre Valcourt');
    expect(refilled.body).not.toContain('A sentence typed by hand.');
    expect(refilled.body).not.toContain(FULL_CONSENT_VALUES.contactPhone);
    expect(refilled.previewHtml).toContain('Dr. Ada Lindqvist');
    const { contactPhone: _dropped, ...stored } = values;
    expect(refilled.templateValues).toEqual(stored);
    const read = await expectStatus(coordinator.get(`/api/studies/${studyId}/consent-versions/${draft.id}`), 200);
    expect(read).toMatchObject({ body: refilled.body, templateValues: stored });

    const events = await testApp.dataSource.query(
      `SELECT actor_email, subject_id, data FROM audit_event WHERE chain = $1 AND action = 'consent.draft-refilled'`,
      [studyId],
    );
    expect(events).toHaveLength(1);
    expect(events[0]).toMatchObject({
      actor_email: 'coordinator@evenhand.test',
      subject_id: draft.id,
      data: { version: draft.version, templateId: draft.templateId },
    });
    expect([...events[0].data.fields].sort()).toEqual(Object.keys(stored).sort());
  });

  it('refuses to refill an activated version with 409 and leaves its text alone', async () => {
    const studyId = await draftWithStep();
    const active = await activeConsentVersion(coordinator, studyId);
    const refused = await expectStatus(
      coordinator.post(refillUrl(studyId, active.id)).send({ values: FULL_CONSENT_VALUES }),
      409,
      'CONSENT_VERSION_NOT_DRAFT',
    );
    expect(refused.message).toMatch(/version 1 is active.*create a new draft/i);
    const read = await expectStatus(coordinator.get(`/api/studies/${studyId}/consent-versions/${active.id}`), 200);
    expect(read.body).toBe(active.body);
  });

  it('refuses unknown and badly typed value fields by name, and changes nothing', async () => {
    const studyId = await draftWithStep();
    const draft = await draftFromTemplate(studyId);
    const unknown = await expectStatus(
      coordinator.post(refillUrl(studyId, draft.id)).send({ values: { ...FULL_CONSENT_VALUES, signedBy: 'Someone' } }),
      400,
      'VALIDATION_FAILED',
    );
    expect(unknown.errors).toEqual([{ field: 'values.signedBy', message: 'values.signedBy is not an allowed field' }]);
    const badNumber = await expectStatus(
      coordinator.post(refillUrl(studyId, draft.id)).send({ values: { paymentDays: 'ten' } }),
      400,
      'VALIDATION_FAILED',
    );
    expect(badNumber.errors.map((e: { field: string }) => e.field)).toEqual(['values.paymentDays']);
    const missing = await expectStatus(
      coordinator.post(refillUrl(studyId, draft.id)).send({}),
      400,
      'VALIDATION_FAILED',
    );
    expect(missing.errors.map((e: { field: string }) => e.field)).toEqual(['values']);
    // Creation checks the same fields the same way.
    const created = await expectStatus(
      coordinator
        .post(`/api/studies/${studyId}/consent-versions`)
        .send({ templateId: 'consent/minimal-risk-paid-study', values: { signedBy: 'Someone' } }),
      400,
    );
    expect(created.errors.map((e: { field: string }) => e.field)).toEqual(['values.signedBy']);

    const read = await expectStatus(coordinator.get(`/api/studies/${studyId}/consent-versions/${draft.id}`), 200);
    expect(read).toMatchObject({ body: draft.body, templateValues: FULL_CONSENT_VALUES });
    const [{ n }] = await testApp.dataSource.query(
      `SELECT count(*) AS n FROM audit_event WHERE chain = $1 AND action = 'consent.draft-refilled'`,
      [studyId],
    );
    expect(Number(n)).toBe(0);
  });

  it('answers a non-member 404 as the other consent routes do, and an auditor 403', async () => {
    const studyId = await draftWithStep();
    const draft = await draftFromTemplate(studyId);
    const admin = await signedInStaff(testApp, 'admin');
    const email = uniqueAddress('outsider');
    await expectStatus(
      admin.post('/api/users').send({ email, name: 'Outsider', role: 'coordinator', password: 'a-long-password-1' }),
      201,
    );
    const outsider = testApp.browser();
    await expectStatus(outsider.post('/api/auth/sign-in').send({ email, password: 'a-long-password-1' }), 200);

    await expectStatus(
      outsider.patch(`/api/studies/${studyId}/consent-versions/${draft.id}`).send({ body: 'x' }),
      404,
      'NOT_FOUND',
    );
    await expectStatus(
      outsider.post(refillUrl(studyId, draft.id)).send({ values: FULL_CONSENT_VALUES }),
      404,
      'NOT_FOUND',
    );
    const auditor = await signedInStaff(testApp, 'auditor');
    await expectStatus(
      auditor.post(refillUrl(studyId, draft.id)).send({ values: FULL_CONSENT_VALUES }),
      403,
      'FORBIDDEN',
    );
    await expectStatus(testApp.browser().post(refillUrl(studyId, draft.id)).send({ values: FULL_CONSENT_VALUES }), 401);

    const read = await expectStatus(coordinator.get(`/api/studies/${studyId}/consent-versions/${draft.id}`), 200);
    expect(read.body).toBe(draft.body);
  });

  it('lists the route in the OpenAPI document with its body and answer', async () => {
    const document = await expectStatus(testApp.browser().get('/api/openapi.json'), 200);
    const operation = document.paths['/api/studies/{studyId}/consent-versions/{versionId}/refill']?.post;
    expect(operation).toBeDefined();
    expect(operation.requestBody.content['application/json'].schema).toEqual({
      $ref: '#/components/schemas/RefillConsentDraftRequest',
    });
    expect(operation.responses['200'].content['application/json'].schema).toEqual({
      $ref: '#/components/schemas/ConsentVersionDto',
    });
    expect(document.components.schemas.ConsentVersionDto.required).toContain('templateValues');
  });
});

describe('signing', () => {
  it('walks the journey: public page, join, screening, consent, signature with assignment, withdrawal that keeps records', async () => {
    const { studyId, version } = await recruitingStudy();
    const study = await expectStatus(coordinator.get(`/api/studies/${studyId}`), 200);
    const page = await expectStatus(testApp.browser().get(`/api/public/studies/${study.slug}`), 200);
    expect(page).toMatchObject({
      status: 'recruiting',
      totalPayMinor: 1500,
      eligibility: [{ key: 'adult', label: '18 or older' }],
    });
    expect(JSON.stringify(page)).not.toContain('alpha');

    const { browser, email } = await signedInParticipant(testApp);
    await expectStatus(browser.post(`/api/studies/${studyId}/enrollments/me`), 201);
    await expectStatus(browser.post(`/api/studies/${studyId}/enrollments/me`), 200);
    const me = await expectStatus(browser.get(`/api/studies/${studyId}/enrollments/me`), 200);
    expect(me).toMatchObject({ status: 'invited', next: 'screening' });
    expect(me.screening.questions.map((q: { key: string; purpose: string }) => [q.key, q.purpose])).toEqual([
      ['adult', 'eligibility'],
      ['pretest', 'stratification'],
    ]);
    const bad = await expectStatus(
      browser.put(`/api/studies/${studyId}/enrollments/me/screening`).send({ answers: { adult: 'maybe' } }),
      400,
    );
    expect(bad.errors.map((e: { field: string }) => e.field).sort()).toEqual(['answers.adult', 'answers.pretest']);
    const screened = await expectStatus(
      browser.put(`/api/studies/${studyId}/enrollments/me/screening`).send({ answers: { adult: true, pretest: 80 } }),
      200,
    );
    expect(screened).toMatchObject({ eligible: true, enrollment: { status: 'screened', next: 'consent' } });

    const toSign = await expectStatus(browser.get(`/api/studies/${studyId}/enrollments/me/consent`), 200);
    expect(toSign).toMatchObject({
      versionId: version.id,
      fingerprint: version.fingerprint,
      signatureMeaning: 'I have read this form and agree to take part',
    });
    expect(toSign.sections[0].heading).toMatch(/key information/i);
    expect(toSign.readingMinutes).toBeGreaterThan(0);

    const signed = await expectStatus(
      browser
        .post(`/api/studies/${studyId}/enrollments/me/signature`)
        .send({ versionId: version.id, fingerprint: version.fingerprint, typedName: 'Sam Example' }),
      201,
    );
    expect(signed.assignment.label).toMatch(/^Version (alpha|beta)$/);
    expect(signed.enrollment).toMatchObject({ status: 'assigned', next: 'steps' });
    expect(JSON.stringify(signed)).not.toMatch(/"(alpha|beta)"/);
    const [signature] = await testApp.dataSource.query(
      `SELECT typed_name, meaning, ip, user_agent, text_fingerprint FROM signature WHERE id = $1`,
      [signed.signatureId],
    );
    expect(signature).toMatchObject({
      typed_name: 'Sam Example',
      meaning: 'I have read this form and agree to take part',
      text_fingerprint: version.fingerprint,
    });
    expect(signature.ip).toBeTruthy();

    // The signed copy is made by a job: poll until it is ready, then check the bytes against the stored hash.
    let pdf: { status: number; body: Buffer; headers: Record<string, string> } | undefined;
    for (let i = 0; i < 80; i++) {
      const response = await browser
        .get(`/api/studies/${studyId}/enrollments/me/consent.pdf`)
        .buffer(true)
        .parse((res, done) => {
          const chunks: Buffer[] = [];
          res.on('data', (chunk: Buffer) => chunks.push(chunk));
          res.on('end', () => done(null, Buffer.concat(chunks)));
        });
      if (response.status === 200) {
        pdf = response as never;
        break;
      }
      expect(response.status).toBe(404);
      await new Promise((resolve) => setTimeout(resolve, 250));
    }
    expect(pdf, 'signed copy never became ready').toBeDefined();
    expect(pdf!.body.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    const sha = createHash('sha256').update(pdf!.body).digest('hex');
    const [stored] = await testApp.dataSource.query(`SELECT pdf_sha256 FROM signature WHERE id = $1`, [
      signed.signatureId,
    ]);
    expect(stored.pdf_sha256).toBe(sha);
    expect(pdf!.headers['x-content-sha256']).toBe(sha);
    const copy = await waitForMail(email, 20_000, /signed/i);
    expect(copy.attachments?.[0]).toMatchObject({ contentType: 'application/pdf' });

    const withdrawn = await expectStatus(
      browser.post(`/api/studies/${studyId}/enrollments/me/withdraw`).send({ reason: 'Moving away' }),
      200,
    );
    expect(withdrawn).toMatchObject({ earnedMinor: 0, enrollment: { status: 'withdrew', next: 'withdrawn' } });
    const [kept] = await testApp.dataSource.query(
      `SELECT e.status, e.withdrawal_reason, (SELECT count(*) FROM signature s WHERE s.enrollment_id = e.id) AS signatures,
              (SELECT count(*) FROM allocation a WHERE a.enrollment_id = e.id) AS allocations
       FROM enrollment e WHERE e.id = $1`,
      [signed.enrollment.id],
    );
    expect(kept).toMatchObject({
      status: 'withdrew',
      withdrawal_reason: 'Moving away',
      signatures: '1',
      allocations: '1',
    });

    // The form promises the signed copy stays downloadable at any time: stopping keeps it, byte for byte.
    const afterStopping = await expectStatus(browser.get(`/api/studies/${studyId}/enrollments/me`), 200);
    expect(afterStopping).toMatchObject({ next: 'withdrawn', consent: { signedVersionId: version.id } });
    const again = await browser
      .get(`/api/studies/${studyId}/enrollments/me/consent.pdf`)
      .buffer(true)
      .parse((res, done) => {
        const chunks: Buffer[] = [];
        res.on('data', (chunk: Buffer) => chunks.push(chunk));
        res.on('end', () => done(null, Buffer.concat(chunks)));
      });
    expect(again.status).toBe(200);
    expect(
      createHash('sha256')
        .update(again.body as Buffer)
        .digest('hex'),
    ).toBe(sha);
  });

  it('records an ineligible person as excluded with the reason', async () => {
    const { studyId } = await recruitingStudy();
    const { browser } = await signedInParticipant(testApp);
    await expectStatus(browser.post(`/api/studies/${studyId}/enrollments/me`), 201);
    const result = await expectStatus(
      browser.put(`/api/studies/${studyId}/enrollments/me/screening`).send({ answers: { adult: false, pretest: 50 } }),
      200,
    );
    expect(result).toMatchObject({
      eligible: false,
      reasons: ['18 or older'],
      enrollment: { status: 'excluded', next: 'excluded' },
    });
  });

  it('refuses to join a study that is not recruiting with its own code', async () => {
    const { studyId } = await draftBetweenStudy(coordinator);
    const { browser } = await signedInParticipant(testApp);
    const refused = await expectStatus(
      browser.post(`/api/studies/${studyId}/enrollments/me`),
      409,
      'STUDY_NOT_RECRUITING',
    );
    expect(refused.message).toBe('This study is not taking new participants right now.');
    const [{ n }] = await testApp.dataSource.query(`SELECT count(*) AS n FROM enrollment WHERE study_id = $1`, [
      studyId,
    ]);
    expect(Number(n)).toBe(0);
  });

  it('refuses a stale version and a wrong fingerprint with 409 and the current version', async () => {
    const { studyId, version } = await recruitingStudy();
    const { browser } = await signedInParticipant(testApp);
    await joinAndScreen(browser, studyId);
    const wrong = await expectStatus(
      browser
        .post(`/api/studies/${studyId}/enrollments/me/signature`)
        .send({ versionId: version.id, fingerprint: 'a'.repeat(64), typedName: 'Sam Example' }),
      409,
      'CONSENT_VERSION_STALE',
    );
    expect(wrong.currentVersion).toEqual({
      versionId: version.id,
      version: version.version,
      fingerprint: version.fingerprint,
    });
    const newer = await activeConsentVersion(coordinator, studyId, 'HLREB-2026-031-A1');
    const stale = await expectStatus(
      browser
        .post(`/api/studies/${studyId}/enrollments/me/signature`)
        .send({ versionId: version.id, fingerprint: version.fingerprint, typedName: 'Sam Example' }),
      409,
      'CONSENT_VERSION_STALE',
    );
    expect(stale.currentVersion.versionId).toBe(newer.id);
    const [{ n }] = await testApp.dataSource.query(
      `SELECT count(*) AS n FROM signature s JOIN enrollment e ON e.id = s.enrollment_id WHERE e.study_id = $1`,
      [studyId],
    );
    expect(Number(n)).toBe(0);
  });

  it('turns a double submit into one signature and one assignment', async () => {
    const { studyId, version } = await recruitingStudy();
    const { browser } = await signedInParticipant(testApp);
    await joinAndScreen(browser, studyId);
    const body = { versionId: version.id, fingerprint: version.fingerprint, typedName: 'Sam Example' };
    const [a, b] = await Promise.all([
      browser.post(`/api/studies/${studyId}/enrollments/me/signature`).send(body),
      browser.post(`/api/studies/${studyId}/enrollments/me/signature`).send(body),
    ]);
    expect([a.status, b.status].sort()).toEqual([200, 201]);
    expect(a.body.signatureId).toBe(b.body.signatureId);
    expect(a.body.assignment).toEqual(b.body.assignment);
    const [{ n }] = await testApp.dataSource.query(`SELECT count(*) AS n FROM allocation WHERE study_id = $1`, [
      studyId,
    ]);
    expect(Number(n)).toBe(1);
  });

  it('marks someone lost to follow-up with the reason noted, shown on their record and in the flow', async () => {
    const { studyId, version } = await recruitingStudy();
    const browser = await signedUpParticipant(studyId, version);
    const me = await expectStatus(browser.get(`/api/studies/${studyId}/enrollments/me`), 200);
    const lost = await expectStatus(
      coordinator
        .post(`/api/studies/${studyId}/enrollments/${me.id}/lost`)
        .send({ reason: '  No reply to three reminders ' }),
      200,
    );
    expect(lost.status).toBe('lost');
    const record = await expectStatus(coordinator.get(`/api/studies/${studyId}/enrollments/${me.id}`), 200);
    expect(record).toMatchObject({ lostReason: 'No reply to three reminders', withdrawalReason: null });
    // Only someone still taking part can be lost; the first mark stands.
    await expectStatus(
      coordinator.post(`/api/studies/${studyId}/enrollments/${me.id}/lost`).send({ reason: 'again' }),
      409,
      'PARTICIPATION_STATE',
    );
    const report = await expectStatus(coordinator.get(`/api/studies/${studyId}/attrition`), 200);
    const arm = report.flow.arms.find((a: { lostToFollowUp: { total: number } }) => a.lostToFollowUp.total === 1);
    expect(arm.lostToFollowUp.reasons).toEqual([{ reason: 'No reply to three reminders', count: 1 }]);
  });

  it('gives 100 concurrent signers 100 distinct slots', async () => {
    const { studyId, version } = await recruitingStudy();
    const people: Browser[] = [];
    for (let i = 0; i < 100; i++) {
      const browser = testApp.browser();
      const [user] = await testApp.dataSource.query(
        `INSERT INTO user_account (email, role) VALUES ($1, 'participant') RETURNING id`,
        [`crowd-${Date.now()}-${i}@example.test`],
      );
      const { accessToken } = await import('./support/session').then((m) => m.sessionFor(testApp, user.id));
      people.push(browser.set('Cookie', `eh_access=${accessToken}`) as unknown as Browser);
    }
    const withCookie = (i: number) => people[i];
    for (let i = 0; i < 100; i++) await joinAndScreen(withCookie(i), studyId, 70);
    const responses = await Promise.all(
      people.map((p) =>
        p
          .post(`/api/studies/${studyId}/enrollments/me/signature`)
          .send({ versionId: version.id, fingerprint: version.fingerprint, typedName: 'Crowd Member' }),
      ),
    );
    expect(responses.map((r) => r.status)).toEqual(Array(100).fill(201));
    const slots = await testApp.dataSource.query(
      `SELECT position FROM allocation_slot WHERE study_id = $1 AND taken_by IS NOT NULL ORDER BY position`,
      [studyId],
    );
    expect(slots.map((s: { position: number }) => s.position)).toEqual(Array.from({ length: 100 }, (_, i) => i + 1));
  }, 240_000);

  it('asks enrolled people to sign a new version before their next step', async () => {
    const { studyId, version } = await recruitingStudy();
    const browser = await signedUpParticipant(studyId, version);
    const amended = await activeConsentVersion(coordinator, studyId, 'HLREB-2026-031-A1');
    const me = await expectStatus(browser.get(`/api/studies/${studyId}/enrollments/me`), 200);
    expect(me).toMatchObject({ next: 're-consent', consent: { needsSignature: true, activeVersionId: amended.id } });
    expect(me.steps.every((s: { status: string }) => s.status === 'locked')).toBe(true);
    // This study's steps have no completion codes: staff check them off.
    expect(me.steps.length).toBeGreaterThan(0);
    expect(me.steps.every((s: { hasCompletionCode: boolean }) => s.hasCompletionCode === false)).toBe(true);
    const roster = await expectStatus(
      coordinator.get(`/api/studies/${studyId}/enrollments`).query({ needsReconsent: true }),
      200,
    );
    expect(roster.total).toBe(1);
    const reminded = await expectStatus(
      coordinator.post(`/api/studies/${studyId}/enrollments/reconsent-reminders`),
      200,
    );
    expect(reminded.count).toBe(1);

    const resigned = await expectStatus(
      browser
        .post(`/api/studies/${studyId}/enrollments/me/signature`)
        .send({ versionId: amended.id, fingerprint: amended.fingerprint, typedName: 'Sam Example' }),
      201,
    );
    expect(resigned.enrollment).toMatchObject({ next: 'steps', consent: { needsSignature: false } });
    expect(resigned.enrollment.steps.every((s: { status: string }) => s.status === 'open')).toBe(true);
    const [{ n }] = await testApp.dataSource.query(`SELECT count(*) AS n FROM allocation WHERE study_id = $1`, [
      studyId,
    ]);
    expect(Number(n)).toBe(1);
  });
});

describe('the ethics approval date', () => {
  it('refuses a date after today with 400 naming the field, and keeps the draft as it was', async () => {
    const studyId = await draftWithStep();
    const draft = await fullDraft(studyId);
    // Two days ahead is tomorrow in every time zone on Earth.
    const later = new Date(Date.now() + 2 * 86_400_000).toISOString().slice(0, 10);
    const refused = await expectStatus(
      coordinator
        .patch(`/api/studies/${studyId}/consent-versions/${draft.id}`)
        .send({ approvalReference: 'HLREB-2026-099', approvedAt: later }),
      400,
      'VALIDATION_FAILED',
    );
    expect(refused.errors).toEqual([{ field: 'approvedAt', message: expect.stringMatching(/future/) }]);
    const kept = await expectStatus(coordinator.get(`/api/studies/${studyId}/consent-versions/${draft.id}`), 200);
    expect(kept).toMatchObject({ approvalReference: null, approvedAt: null });

    const today = new Date().toISOString().slice(0, 10);
    const saved = await expectStatus(
      coordinator
        .patch(`/api/studies/${studyId}/consent-versions/${draft.id}`)
        .send({ approvalReference: 'HLREB-2026-099', approvedAt: today }),
      200,
    );
    expect(saved.approvedAt).toBe(today);
  });
});

describe('what a re-consent request says changed', () => {
  it('lists the changes since the version the person signed, in the e-mail and with the form they are asked to sign', async () => {
    const { studyId, version } = await recruitingStudy();
    const { browser, email } = await signedInParticipant(testApp, 'reconsent-summary');
    await joinAndScreen(browser, studyId);
    await expectStatus(
      browser
        .post(`/api/studies/${studyId}/enrollments/me/signature`)
        .send({ versionId: version.id, fingerprint: version.fingerprint, typedName: 'Sam Example' }),
      201,
    );
    const firstView = await expectStatus(browser.get(`/api/studies/${studyId}/enrollments/me/consent`), 200);
    expect(firstView.changesSinceSigned).toEqual([]);

    const draft = await expectStatus(
      coordinator.post(`/api/studies/${studyId}/consent-versions`).send({
        templateId: 'consent/minimal-risk-paid-study',
        values: { ...FULL_CONSENT_VALUES, paymentDays: 7, dataRetentionYears: 10 },
      }),
      201,
    );
    await expectStatus(
      coordinator
        .patch(`/api/studies/${studyId}/consent-versions/${draft.id}`)
        .send({ approvalReference: 'HLREB-2026-031-A2', approvedAt: '2026-11-27' }),
      200,
    );
    await expectStatus(
      coordinator
        .post(`/api/studies/${studyId}/consent-versions/${draft.id}/approval-letter`)
        .attach('letter', TINY_PDF, 'approval.pdf'),
      200,
    );
    await expectStatus(coordinator.post(`/api/studies/${studyId}/consent-versions/${draft.id}/activate`), 200);

    const expected = [
      'Payment is now sent within 7 days of a confirmed step (it was 14 days).',
      'Your records are now kept for 10 years after the study ends (it was 5 years).',
    ];
    const view = await expectStatus(browser.get(`/api/studies/${studyId}/enrollments/me/consent`), 200);
    expect(view.changesSinceSigned).toEqual(expected);

    await expectStatus(coordinator.post(`/api/studies/${studyId}/enrollments/reconsent-reminders`), 200);
    const mail = await waitForMail(email, 20_000, /updated consent form/);
    for (const line of expected) expect(mail.text.replace(/\s+/g, ' ')).toContain(line);
  });
});

describe('roster', () => {
  it('imports a CSV with a row-by-row report, invites, and shows the record', async () => {
    const { studyId } = await recruitingStudy();
    const tag = Date.now().toString(36);
    const csv = `email,name,pretest\nr1-${tag}@example.test,Robin One,40\nnot-an-email,Bad Row,50\nr2-${tag}@example.test,,high\nr3-${tag}@example.test,Robin Three,90\n`;
    const result = await expectStatus(
      coordinator.post(`/api/studies/${studyId}/enrollments/import`).attach('file', Buffer.from(csv), 'roster.csv'),
      200,
    );
    expect(result).toMatchObject({ created: 2, alreadyEnrolled: 0 });
    expect(result.errors.map((e: { line: number; field: string }) => [e.line, e.field])).toEqual([
      [3, 'email'],
      [4, 'pretest'],
    ]);
    const again = await expectStatus(
      coordinator.post(`/api/studies/${studyId}/enrollments/import`).attach('file', Buffer.from(csv), 'roster.csv'),
      200,
    );
    expect(again).toMatchObject({ created: 0, alreadyEnrolled: 2 });
    await expectStatus(
      coordinator.post(`/api/studies/${studyId}/enrollments/import`).attach('file', Buffer.from([0, 1, 2]), 'x.csv'),
      415,
    );

    const invited = await expectStatus(coordinator.post(`/api/studies/${studyId}/enrollments/invite`).send({}), 200);
    expect(invited.count).toBe(2);
    const roster = await expectStatus(
      coordinator.get(`/api/studies/${studyId}/enrollments`).query({ search: 'robin three' }),
      200,
    );
    expect(roster.items).toHaveLength(1);
    expect(roster.items[0]).toMatchObject({ name: 'Robin Three', status: 'invited', covariates: { pretest: 90 } });
    const record = await expectStatus(
      coordinator.get(`/api/studies/${studyId}/enrollments/${roster.items[0].id}`),
      200,
    );
    expect(record.enrollment.invitationSentAt).toBeTruthy();
  });
});
