import type { Test } from 'supertest';
import { expect } from 'vitest';

/**
 * The one request helper: asserts the status, and for every failure that the body has the api's problem shape
 * (and the expected code, when given). Returns the parsed body.
 */
export async function expectStatus<Body = any>(pending: Test, status: number, code?: string): Promise<Body> {
  const response = await pending;
  if (response.status !== status) {
    throw new Error(`Expected ${status}, got ${response.status}: ${JSON.stringify(response.body)}`);
  }
  if (status >= 400) {
    expect(response.body).toMatchObject({ statusCode: status, code: expect.any(String), message: expect.any(String) });
    if (code) expect(response.body.code).toBe(code);
  }
  return response.body as Body;
}

export function cookiesOf(response: { headers: Record<string, unknown> }): string[] {
  const header = response.headers['set-cookie'];
  return Array.isArray(header) ? header : header ? [String(header)] : [];
}
