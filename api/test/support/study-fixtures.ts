import { expect } from 'vitest';
import { expectStatus } from './http';
import type { TestApp } from './test-app';

export type Browser = ReturnType<TestApp['browser']>;

export async function signedInStaff(
  testApp: TestApp,
  role: 'admin' | 'coordinator' | 'researcher' | 'auditor',
): Promise<Browser> {
  const browser = testApp.browser();
  await expectStatus(
    browser.post('/api/auth/sign-in').send({ email: `${role}@evenhand.test`, password: 'evenhand-demo' }),
    200,
  );
  return browser;
}

let counter = 0;
export function uniqueSlug(prefix: string): string {
  counter += 1;
  return `${prefix}-${Date.now().toString(36)}-${counter}`;
}

/** A between-subjects study with conditions, a pretest factor and a scheme, still in draft. */
export async function draftBetweenStudy(
  browser: Browser,
  options: { conditions?: string[]; cutPoints?: number[]; scheme?: Record<string, unknown> } = {},
): Promise<{ studyId: string; conditionIds: string[] }> {
  const study = await expectStatus(
    browser.post('/api/studies').send({
      slug: uniqueSlug('t'),
      title: 'Test study',
      design: 'between',
      protocolNumber: 'HLCL-TEST-001',
      labName: 'Harbor Lane Cognition Lab',
      estimatedMinutes: 45,
      targetSize: 120,
    }),
    201,
  );
  const conditionIds: string[] = [];
  for (const name of options.conditions ?? ['alpha', 'beta']) {
    const condition = await expectStatus(
      browser
        .post(`/api/studies/${study.id}/conditions`)
        .send({ internalName: name, participantLabel: `Version ${name}` }),
      201,
    );
    conditionIds.push(condition.id);
  }
  await expectStatus(
    browser.put(`/api/studies/${study.id}/stratification-factors`).send({
      factors: [{ key: 'pretest', label: 'Pretest score', kind: 'numeric', cutPoints: options.cutPoints ?? [65] }],
    }),
    200,
  );
  await expectStatus(
    browser
      .put(`/api/studies/${study.id}/assignment-scheme`)
      .send(options.scheme ?? { method: 'stratified-blocks', blockSizes: [2, 4] }),
    200,
  );
  expect(conditionIds.length).toBeGreaterThan(1);
  return { studyId: study.id, conditionIds };
}

/** Creates participant accounts and enrollments directly, as the roster import will. */
export async function insertEnrollments(
  testApp: TestApp,
  studyId: string,
  covariates: Array<Record<string, number | string>>,
): Promise<string[]> {
  const ids: string[] = [];
  const tag = `${Date.now().toString(36)}${Math.random().toString(36).slice(2, 6)}`;
  for (let i = 0; i < covariates.length; i++) {
    const [user] = await testApp.dataSource.query(
      `INSERT INTO user_account (email, role) VALUES ($1, 'participant') RETURNING id`,
      [`p-${tag}-${i}@example.test`],
    );
    const [enrollment] = await testApp.dataSource.query(
      `INSERT INTO enrollment (study_id, participant_id, reference, status, covariates) VALUES ($1, $2, $3, 'consented', $4) RETURNING id`,
      [studyId, user.id, `R-${tag}-${i}`, JSON.stringify(covariates[i])],
    );
    ids.push(enrollment.id);
  }
  return ids;
}
