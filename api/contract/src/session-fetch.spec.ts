import { describe, expect, it, vi } from 'vitest';
import { createSessionFetch } from './session-fetch';

// Behaviour from the foundation API contract: "on a 401 the client may call refresh once and retry".
const origin = 'http://localhost';
const get = (path: string) => new Request(`${origin}${path}`);
const answer = (status: number) => new Response(null, { status });

describe('createSessionFetch', () => {
  it('passes other answers through without refreshing', async () => {
    const refresh = vi.fn(async () => true);
    const fetch = vi.fn(async () => answer(200));
    const sessionFetch = createSessionFetch({ fetch, refresh, onSessionLost: vi.fn() });

    expect((await sessionFetch(get('/api/users'))).status).toBe(200);
    expect(refresh).not.toHaveBeenCalled();
  });

  it('refreshes once on 401 and retries the same request, body included', async () => {
    const seen: string[] = [];
    const fetch = vi.fn(async (request: Request) => {
      seen.push(await request.text());
      return answer(fetch.mock.calls.length === 1 ? 401 : 201);
    });
    const refresh = vi.fn(async () => true);
    const sessionFetch = createSessionFetch({ fetch, refresh, onSessionLost: vi.fn() });

    const response = await sessionFetch(new Request(`${origin}/api/users`, { method: 'POST', body: '{"name":"Ada"}' }));

    expect(response.status).toBe(201);
    expect(refresh).toHaveBeenCalledTimes(1);
    expect(seen).toEqual(['{"name":"Ada"}', '{"name":"Ada"}']);
  });

  it('reports a lost session and returns the 401 when refreshing fails', async () => {
    const fetch = vi.fn(async () => answer(401));
    const onSessionLost = vi.fn();
    const sessionFetch = createSessionFetch({ fetch, refresh: async () => false, onSessionLost });

    expect((await sessionFetch(get('/api/studies'))).status).toBe(401);
    expect(fetch).toHaveBeenCalledTimes(1);
    expect(onSessionLost).toHaveBeenCalledTimes(1);
  });

  it('treats a refresh that throws (network down) as a lost session', async () => {
    const onSessionLost = vi.fn();
    const sessionFetch = createSessionFetch({
      fetch: async () => answer(401),
      refresh: async () => {
        throw new TypeError('Failed to fetch');
      },
      onSessionLost,
    });

    expect((await sessionFetch(get('/api/studies'))).status).toBe(401);
    expect(onSessionLost).toHaveBeenCalledTimes(1);
  });

  it('shares one refresh between requests that fail together', async () => {
    // Refresh tokens rotate and reuse revokes the family (issue #2), so two parallel refreshes would sign the person out.
    let release: (renewed: boolean) => void = () => {};
    const refresh = vi.fn(() => new Promise<boolean>((resolve) => (release = resolve)));
    const attempts = new Map<string, number>();
    const fetch = vi.fn(async (request: Request) => {
      const path = new URL(request.url).pathname;
      const attempt = (attempts.get(path) ?? 0) + 1;
      attempts.set(path, attempt);
      return answer(attempt === 1 ? 401 : 200);
    });
    const sessionFetch = createSessionFetch({ fetch, refresh, onSessionLost: vi.fn() });

    const both = Promise.all([sessionFetch(get('/api/users')), sessionFetch(get('/api/auth/me'))]);
    await vi.waitFor(() => expect(fetch).toHaveBeenCalledTimes(2));
    release(true);

    expect((await both).map((response) => response.status)).toEqual([200, 200]);
    expect(refresh).toHaveBeenCalledTimes(1);
  });

  it('never refreshes for the session calls themselves', async () => {
    const refresh = vi.fn(async () => true);
    const sessionFetch = createSessionFetch({ fetch: async () => answer(401), refresh, onSessionLost: vi.fn() });

    for (const path of ['/api/auth/sign-in', '/api/auth/refresh', '/api/auth/sign-out']) {
      expect((await sessionFetch(new Request(`${origin}${path}`, { method: 'POST' }))).status).toBe(401);
    }
    expect(refresh).not.toHaveBeenCalled();
  });
});

describe('createSessionFetch on the sign-in paths', () => {
  it.each(['/api/auth/sign-in-link', '/api/auth/sign-in-link/consume/', '/api/auth/refresh'])(
    'never refreshes after a 401 from %s',
    async (path) => {
      const refresh = vi.fn(async () => true);
      const sessionFetch = createSessionFetch({ fetch: async () => answer(401), refresh, onSessionLost: vi.fn() });
      expect((await sessionFetch(get(path))).status).toBe(401);
      expect(refresh).not.toHaveBeenCalled();
    },
  );

  it('reports a lost session when the retry after a renewal is refused too', async () => {
    const onSessionLost = vi.fn();
    const sessionFetch = createSessionFetch({
      fetch: async () => answer(401),
      refresh: async () => true,
      onSessionLost,
    });
    expect((await sessionFetch(get('/api/studies'))).status).toBe(401);
    expect(onSessionLost).toHaveBeenCalledTimes(1);
  });
});
