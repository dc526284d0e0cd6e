import fc from 'fast-check';
import type { OpenAPIObject } from '@nestjs/swagger';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildOpenApiDocument } from '../src/app-setup';
import { FULL_CONSENT_VALUES } from './support/consent-fixtures';
import { expectStatus } from './support/http';
import { Browser, draftBetweenStudy, insertEnrollments, signedInStaff } from './support/study-fixtures';
import { startTestApp, TestApp } from './support/test-app';

/**
 * Walks every JSON operation of the api's own OpenAPI document with a seeded set of malformed bodies (fast-check) as
 * a signed-in admin and anonymously. Every input is invalid by construction, so every answer must be a 4xx in the
 * problem shape, and no table may gain or lose a row.
 */

const SEED = 20_260_417;
const INPUTS_PER_OPERATION = 24;
const UNKNOWN_ID = '7d0f5a8e-3c1b-4e7a-9f2d-5b6c8a9e0f11';

interface Schema {
  type?: string;
  $ref?: string;
  nullable?: boolean;
  properties?: Record<string, Schema>;
  items?: Schema;
  allOf?: Schema[];
  enum?: unknown[];
}

interface Operation {
  method: 'post' | 'put' | 'patch' | 'delete' | 'get';
  template: string;
  path: string;
  schema: Schema | null;
  queryParameters: string[];
}

interface Input {
  kind: string;
  raw: string;
}

let testApp: TestApp;
let admin: Browser;
let document: OpenAPIObject;
const pathIds: Record<string, string> = {};

beforeAll(async () => {
  // No workers: nothing queued by earlier files may change a table while the fuzz counts rows.
  testApp = await startTestApp({ RUN_WORKERS: 'false' });
  admin = await signedInStaff(testApp, 'admin');
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
  const [enrollmentId] = await insertEnrollments(testApp, studyId, [{ pretest: 70 }]);
  const [staff] = await testApp.dataSource.query(
    `SELECT id FROM user_account WHERE email = 'researcher@evenhand.test'`,
  );
  const [study] = await testApp.dataSource.query(`SELECT slug FROM study WHERE id = $1`, [studyId]);
  Object.assign(pathIds, {
    studyId,
    conditionId: conditionIds[0],
    stepId: step.id,
    versionId: draft.id,
    enrollmentId,
    id: staff.id,
    slug: study.slug,
  });
  document = buildOpenApiDocument(testApp.app);
});
afterAll(async () => {
  await testApp?.close();
});

function resolve(schema: Schema | undefined): Schema {
  if (!schema) return {};
  if (schema.$ref) {
    const name = schema.$ref.split('/').pop()!;
    return resolve((document.components?.schemas as Record<string, Schema>)[name]);
  }
  if (schema.allOf?.length) return resolve(schema.allOf[0]);
  return schema;
}

function operations(): Operation[] {
  const found: Operation[] = [];
  for (const [template, item] of Object.entries(document.paths)) {
    for (const method of ['get', 'post', 'put', 'patch', 'delete'] as const) {
      const operation = (item as Record<string, any>)[method];
      if (!operation) continue;
      const path = template.replace(/\{([^}]+)\}/g, (_, name: string) => pathIds[name] ?? UNKNOWN_ID);
      const json = operation.requestBody?.content?.['application/json']?.schema as Schema | undefined;
      const queryParameters = (operation.parameters ?? [])
        .filter((p: { in: string }) => p.in === 'query')
        .map((p: { name: string }) => p.name);
      if (json || queryParameters.length)
        found.push({ method, template, path, schema: json ? resolve(json) : null, queryParameters });
    }
  }
  return found;
}

/** A value of a type the property does not take. */
function wrongTypeFor(schema: Schema): unknown {
  switch (resolve(schema).type) {
    case 'string':
      return { not: 'a string' };
    case 'integer':
    case 'number':
      return 'twelve';
    case 'boolean':
      return 'maybe';
    case 'array':
      return 'not-a-list';
    default:
      return 7;
  }
}

const unstorable = fc
  .tuple(
    fc.string({ maxLength: 12 }),
    fc.constantFrom('\u0000', '\ud800', '\udfff', '\udc00x\ud83d'),
    fc.string({ maxLength: 12 }),
  )
  .map(([a, bad, b]) => `${a}${bad}${b}`);

/** Malformed bodies for one operation's schema: each is invalid whatever the other fields hold. */
function malformedBodies(schema: Schema): fc.Arbitrary<Input> {
  const properties = Object.entries(schema.properties ?? {});
  const names = properties.length ? properties.map(([name]) => name) : ['value'];
  const notNullable = properties.filter(([, p]) => !resolve(p).nullable && !p.nullable).map(([name]) => name);
  const typed = properties.filter(([, p]) => resolve(p).type !== undefined || p.$ref !== undefined);
  const field = fc.constantFrom(...names);
  const kinds: Array<fc.Arbitrary<Input>> = [
    fc.tuple(field, fc.integer({ min: 1_500, max: 6_000 })).map(([name, depth]) => ({
      kind: 'deep nesting',
      raw: `{${JSON.stringify(name)}:${'{"a":['.repeat(depth)}1${']}'.repeat(depth)}}`,
    })),
    fc
      .tuple(field, unstorable)
      .map(([name, text]) => ({ kind: 'NUL/surrogate string', raw: JSON.stringify({ [name]: text }) })),
    fc
      .tuple(
        field,
        fc.constantFrom(
          '99999999999999999999999',
          '1e400',
          '-1e400',
          '1.7976931348623157e308',
          '123456789012345678901234567890.5',
        ),
      )
      .map(([name, number]) => ({
        kind: 'huge number',
        raw: `{${JSON.stringify(name)}:${number}}`,
      })),
    fc
      .tuple(field, fc.constantFrom(300_000, 2_500_000))
      .map(([name, length]) => ({ kind: 'huge string', raw: JSON.stringify({ [name]: 'x'.repeat(length) }) })),
    fc
      .constantFrom(
        '[]',
        '[{}]',
        '"text"',
        '42',
        'true',
        'null',
        '{"__proto__":{"admin":true}}',
        '{"constructor":{"prototype":{}}}',
      )
      .map((raw) => ({ kind: 'wrong top level', raw })),
  ];
  if (notNullable.length)
    kinds.push(
      fc.constantFrom(...notNullable).map((name) => ({ kind: 'null', raw: JSON.stringify({ [name]: null }) })),
    );
  if (typed.length)
    kinds.push(
      fc
        .constantFrom(...typed)
        .map(([name, p]) => ({ kind: 'wrong type', raw: JSON.stringify({ [name]: wrongTypeFor(p) }) })),
    );
  return fc.oneof(...kinds);
}

function malformedQueries(parameters: string[]): fc.Arbitrary<string> {
  const value = fc.oneof(
    fc.constantFrom('99999999999999999999', '-1', '0', '1e400', 'NaN', 'abc', '1.5', ''),
    // NUL, and UTF-8 byte sequences that would decode to surrogates.
    fc
      .tuple(
        fc.constantFrom('a', 'text'),
        fc.constantFrom('%00', '%ED%A0%80', '%ED%BF%BF', '%C0%80'),
        fc.constantFrom('', 'b'),
      )
      .map(([a, bad, b]) => `${a}${bad}${b}`),
    fc.constantFrom('x'.repeat(5_000)),
  );
  return fc
    .tuple(fc.constantFrom(...parameters), value, fc.boolean())
    .map(([name, v, twice]) => (twice ? `${name}=${v}&${name}=${v}` : `${name}=${v}`));
}

/** Paths to every string property, through nested objects and lists (`[name, 0, nested]`), three levels deep. */
function stringPaths(schema: Schema, prefix: Array<string | number> = [], depth = 0): Array<Array<string | number>> {
  const paths: Array<Array<string | number>> = [];
  for (const [name, property] of Object.entries(resolve(schema).properties ?? {})) {
    const resolved = resolve(property);
    if (resolved.type === 'string' && !resolved.enum) paths.push([...prefix, name]);
    else if (depth < 3 && resolved.type === 'array' && resolved.items) {
      const item = resolve(resolved.items);
      if (item.type === 'string' && !item.enum) paths.push([...prefix, name, 0]);
      else if (item.properties) paths.push(...stringPaths(item, [...prefix, name, 0], depth + 1));
    } else if (depth < 3 && resolved.properties) paths.push(...stringPaths(resolved, [...prefix, name], depth + 1));
  }
  return paths;
}

function bodyWith(path: Array<string | number>, value: unknown): object {
  const [head, ...rest] = path;
  const inner = rest.length ? bodyWith(rest, value) : value;
  return typeof head === 'number' ? [inner] : { [String(head)]: inner };
}

async function rowCounts(): Promise<Record<string, number>> {
  const tables: Array<{ name: string }> = await testApp.dataSource.query(
    `SELECT table_name AS name FROM information_schema.tables
     WHERE table_schema = 'public' AND table_type = 'BASE TABLE' AND table_name NOT IN ('rate_limit_window', 'migrations')
     ORDER BY table_name`,
  );
  const counts: Record<string, number> = {};
  for (const { name } of tables)
    counts[name] = Number((await testApp.dataSource.query(`SELECT count(*)::int AS n FROM "${name}"`))[0].n);
  return counts;
}

describe('malformed input on every JSON operation', () => {
  it('answers every malformed body with a 4xx problem, never a 5xx, and changes no row counts', async () => {
    const jsonOperations = operations().filter((o) => o.schema);
    expect(jsonOperations.length).toBeGreaterThan(30);
    const before = await rowCounts();
    const serverErrors: string[] = [];
    const accepted: string[] = [];
    let sent = 0;
    for (const [who, client] of [
      ['admin', () => admin],
      ['anonymous', () => testApp.browser()],
    ] as const) {
      for (const operation of jsonOperations) {
        const inputs = fc.sample(malformedBodies(operation.schema!), { seed: SEED, numRuns: INPUTS_PER_OPERATION });
        for (const input of inputs) {
          const agent = client();
          const response = await agent[operation.method](operation.path)
            .set('content-type', 'application/json')
            .send(input.raw);
          sent += 1;
          const label = `${who} ${operation.method.toUpperCase()} ${operation.template} [${input.kind}] ${input.raw.slice(0, 80)} → ${response.status}`;
          if (response.status >= 500) serverErrors.push(`${label} ${JSON.stringify(response.body).slice(0, 200)}`);
          else if (response.status < 400) accepted.push(label);
          else
            expect(response.body, label).toMatchObject({
              statusCode: response.status,
              code: expect.any(String),
              message: expect.any(String),
            });
        }
      }
    }
    console.info(
      `input fuzz: ${jsonOperations.length} JSON operations × ${INPUTS_PER_OPERATION} bodies × 2 callers = ${sent} requests; ${serverErrors.length} answered 5xx`,
    );
    expect(serverErrors).toEqual([]);
    expect(accepted).toEqual([]);
    expect(await rowCounts()).toEqual(before);
  }, 600_000);

  it('bounds the length of every string field of every JSON body, nested ones included', async () => {
    const huge = 'x'.repeat(300_000);
    const accepted: string[] = [];
    let sent = 0;
    for (const operation of operations().filter((o) => o.schema)) {
      for (const path of stringPaths(operation.schema!)) {
        const response = await admin[operation.method](operation.path).send(bodyWith(path, huge));
        sent += 1;
        if (response.status < 400 || response.status >= 500)
          accepted.push(
            `${operation.method.toUpperCase()} ${operation.template} ${path.join('.')} → ${response.status}`,
          );
      }
    }
    console.info(`string bounds: ${sent} string fields sent 300,000 characters`);
    expect(sent).toBeGreaterThan(50);
    expect(accepted).toEqual([]);
  }, 300_000);

  it('answers malformed query strings on every operation that takes them without a 5xx', async () => {
    const queried = operations().filter((o) => o.queryParameters.length);
    expect(queried.length).toBeGreaterThan(3);
    const serverErrors: string[] = [];
    let sent = 0;
    for (const operation of queried) {
      for (const query of fc.sample(malformedQueries(operation.queryParameters), {
        seed: SEED,
        numRuns: INPUTS_PER_OPERATION,
      })) {
        const response = await admin[operation.method](`${operation.path}?${query}`);
        sent += 1;
        if (response.status >= 500)
          serverErrors.push(
            `${operation.method.toUpperCase()} ${operation.template}?${query.slice(0, 80)} → ${response.status}`,
          );
      }
    }
    console.info(
      `query fuzz: ${queried.length} operations × ${INPUTS_PER_OPERATION} query strings = ${sent} requests; ${serverErrors.length} answered 5xx`,
    );
    expect(serverErrors).toEqual([]);
  }, 300_000);
});
