import { vi } from 'vitest';

export type RecordedRequest = { method: string; path: string; search: string; body: unknown };
/** `body` goes out as JSON; `raw` as it is (a PDF, say) with its content type. */
type Reply = { status: number; body?: unknown; raw?: { bytes: string; contentType: string } };
type Handler = Reply | ((request: RecordedRequest, callNumber: number) => Reply | Promise<Reply>);

/**
 * Stands in for the api at the fetch boundary: answers by "METHOD /path" and records every call,
 * so tests see exactly what the app sent. A request nobody expected is recorded and fails loudly.
 */
export function installFakeApi(handlers: Record<string, Handler>) {
  const requests: RecordedRequest[] = [];
  const unexpected: string[] = [];

  const fetchSpy = vi.spyOn(globalThis, 'fetch').mockImplementation(async (input, init) => {
    const request = input instanceof Request ? input : new Request(input, init);
    const url = new URL(request.url);
    const text = await request.text();
    const recorded: RecordedRequest = {
      method: request.method,
      path: url.pathname,
      search: url.search,
      body: text ? (JSON.parse(text) as unknown) : undefined,
    };
    requests.push(recorded);

    const key = `${recorded.method} ${recorded.path}`;
    const handler = handlers[key];
    if (!handler) {
      unexpected.push(key);
      throw new Error(`The fake api has no answer for ${key}`);
    }
    const callNumber = requests.filter((r) => `${r.method} ${r.path}` === key).length;
    const reply = typeof handler === 'function' ? await handler(recorded, callNumber) : handler;
    if (reply.raw) {
      return new Response(reply.raw.bytes, {
        status: reply.status,
        headers: { 'Content-Type': reply.raw.contentType },
      });
    }
    return reply.body === undefined
      ? new Response(null, { status: reply.status })
      : new Response(JSON.stringify(reply.body), {
          status: reply.status,
          headers: { 'Content-Type': 'application/json' },
        });
  });

  return {
    requests,
    unexpected,
    fetchSpy,
    callsTo: (method: string, path: string) => requests.filter((r) => r.method === method && r.path === path),
  };
}

export const problem = (statusCode: number, code: string, message: string) => ({
  status: statusCode,
  body: { statusCode, code, message },
});

/** No session at all: /me says 401 and so does the one refresh attempt. */
export const signedOutHandlers = {
  'GET /api/auth/me': problem(401, 'UNAUTHENTICATED', 'Sign in first'),
  'POST /api/auth/refresh': problem(401, 'UNAUTHENTICATED', 'No valid refresh token'),
} satisfies Record<string, Handler>;

export const participant = {
  id: '3f1b6a52-3c1e-4d3e-9d55-6a0f3b2c9e11',
  email: 'robin.ash@example.test',
  name: '',
  role: 'participant' as const,
  active: true,
};
