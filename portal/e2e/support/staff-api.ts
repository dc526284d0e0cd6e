import { e2eEnv } from './env';

/**
 * A staff member's session on the api, held as cookies by hand (Node's fetch keeps none), for the staff side of a
 * participant journey: setting a step's completion code, funding a study, approving pay.
 */
export class StaffApi {
  private constructor(private readonly cookie: string) {}

  static async signIn(email: string, password: string): Promise<StaffApi> {
    const response = await fetch(`${e2eEnv.apiUrl}/api/auth/sign-in`, {
      method: 'POST',
      headers: { 'Content-Type': 'application/json' },
      body: JSON.stringify({ email, password }),
    });
    if (!response.ok) throw new Error(`Signing in as ${email} answered ${response.status}: ${await response.text()}`);
    const cookie = response.headers
      .getSetCookie()
      .map((header) => header.split(';')[0])
      .join('; ');
    if (!cookie) throw new Error(`Signing in as ${email} set no session cookie`);
    return new StaffApi(cookie);
  }

  async request<T>(method: 'GET' | 'POST' | 'PUT', path: string, body?: unknown): Promise<T> {
    const response = await fetch(`${e2eEnv.apiUrl}${path}`, {
      method,
      headers: { Cookie: this.cookie, ...(body === undefined ? {} : { 'Content-Type': 'application/json' }) },
      ...(body === undefined ? {} : { body: JSON.stringify(body) }),
    });
    const text = await response.text();
    if (!response.ok) throw new Error(`${method} ${path} answered ${response.status}: ${text}`);
    return (text ? JSON.parse(text) : undefined) as T;
  }
}

/** Confirms a card payment intent on the payment service stand-in with its test Visa card, as the browser script would. */
export async function confirmCardPayment(clientSecret: string): Promise<void> {
  const intentId = clientSecret.split('_secret_')[0];
  if (!intentId?.startsWith('pi_'))
    throw new Error(`clientSecret does not start with a payment intent id: "${clientSecret}"`);
  const response = await fetch(`${e2eEnv.paymentsUrl}/v1/payment_intents/${intentId}/confirm`, {
    method: 'POST',
    headers: {
      Authorization: `Bearer ${e2eEnv.paymentsSecretKey}`,
      'Content-Type': 'application/x-www-form-urlencoded',
    },
    body: 'payment_method=pm_card_visa',
  });
  if (!response.ok) throw new Error(`Confirming ${intentId} answered ${response.status}: ${await response.text()}`);
}

/** Asks again until `check` gives a value (not undefined), or fails after `timeoutMs` saying what it waited for. */
export async function eventually<T>(
  what: string,
  check: () => Promise<T | undefined>,
  { timeoutMs = 30_000, intervalMs = 500 } = {},
): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const value = await check();
    if (value !== undefined) return value;
    if (Date.now() > deadline) throw new Error(`Waited ${timeoutMs} ms for ${what}`);
    await new Promise((resolve) => setTimeout(resolve, intervalMs));
  }
}
