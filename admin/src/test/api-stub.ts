import { vi } from 'vitest';

export interface RecordedRequest {
  method: string;
  path: string;
  query: URLSearchParams;
  body: unknown;
}

export interface StubResponse {
  status: number;
  body?: unknown;
}

type Handler = StubResponse | ((request: RecordedRequest) => StubResponse | Promise<StubResponse>);

/**
 * Replaces the global fetch with canned api answers keyed by "METHOD /path", and records every request.
 * An unexpected call fails loudly with 599 so a test cannot pass by accident.
 */
export function stubApi(handlers: Record<string, Handler>) {
  const requests: RecordedRequest[] = [];
  const fetchStub = vi.fn(async (input: Request) => {
    const url = new URL(input.url);
    const text = await input.text();
    const recorded: RecordedRequest = {
      method: input.method,
      path: url.pathname,
      query: url.searchParams,
      body: text ? JSON.parse(text) : undefined,
    };
    requests.push(recorded);
    const handler = handlers[`${input.method} ${url.pathname}`];
    const answer =
      typeof handler === 'function'
        ? await handler(recorded)
        : (handler ?? { status: 599, body: { code: 'UNSTUBBED', message: `${input.method} ${url.pathname}` } });
    return new Response(answer.body === undefined ? null : JSON.stringify(answer.body), {
      status: answer.status,
      headers: answer.body === undefined ? {} : { 'Content-Type': 'application/json' },
    });
  });
  vi.stubGlobal('fetch', fetchStub);
  return { requests, fetchStub };
}
