import { afterEach, describe, expect, it, vi } from 'vitest';
import { installFakeApi, problem } from '@/test/fake-api';
import { api, onSessionExpired } from './api-client';

const expired = problem(401, 'UNAUTHENTICATED', 'Access token expired');
const listeners: (() => void)[] = [];
afterEach(() => listeners.splice(0).forEach((stop) => stop()));

function watchSessionExpiry() {
  const expiredSpy = vi.fn();
  listeners.push(onSessionExpired(expiredSpy));
  return expiredSpy;
}

describe('api client session refresh', () => {
  it('refreshes once after a 401 and repeats the request', async () => {
    const fakeStudies = installFakeApi({
      'GET /api/studies': (_request, callNumber) => (callNumber === 1 ? expired : { status: 200, body: { items: [] } }),
      'POST /api/auth/refresh': { status: 200, body: {} },
    });
    const expiredSpy = watchSessionExpiry();

    const { data, response } = await api.GET('/api/studies');

    expect(response.status).toBe(200);
    expect(data).toEqual({ items: [] });
    expect(fakeStudies.requests.map((r) => `${r.method} ${r.path}`)).toEqual([
      'GET /api/studies',
      'POST /api/auth/refresh',
      'GET /api/studies',
    ]);
    expect(expiredSpy).not.toHaveBeenCalled();
  });

  it('repeats a POST with the same body after refreshing', async () => {
    const fakeApi = installFakeApi({
      'POST /api/users': (_request, callNumber) => (callNumber === 1 ? expired : { status: 201, body: {} }),
      'POST /api/auth/refresh': { status: 200, body: {} },
    });
    // Any POST will do to show the body survives the retry; the portal itself does not create users.
    const body = {
      email: 'new.person@lab.test',
      name: 'Robin Example',
      role: 'researcher' as const,
      password: 'long-enough-pass',
    };

    const { response } = await api.POST('/api/users', { body });

    expect(response.status).toBe(201);
    expect(fakeApi.callsTo('POST', '/api/users').map((r) => r.body)).toEqual([body, body]);
  });

  it('shares one refresh between requests that fail at the same time', async () => {
    const fakeApi = installFakeApi({
      'GET /api/studies': (_request, callNumber) => (callNumber === 1 ? expired : { status: 200, body: { items: [] } }),
      'GET /api/auth/me': (_request, callNumber) => (callNumber === 1 ? expired : { status: 200, body: {} }),
      'POST /api/auth/refresh': async () => {
        await new Promise((resolve) => setTimeout(resolve, 20));
        return { status: 200, body: {} };
      },
    });

    const [studies, me] = await Promise.all([api.GET('/api/studies'), api.GET('/api/auth/me')]);

    expect(studies.response.status).toBe(200);
    expect(me.response.status).toBe(200);
    expect(fakeApi.callsTo('POST', '/api/auth/refresh')).toHaveLength(1);
  });

  it('reports the session as expired when the refresh is refused, without trying again', async () => {
    const fakeApi = installFakeApi({
      'GET /api/studies': expired,
      'POST /api/auth/refresh': problem(401, 'UNAUTHENTICATED', 'Refresh token reused'),
    });
    const expiredSpy = watchSessionExpiry();

    const { response } = await api.GET('/api/studies');

    expect(response.status).toBe(401);
    expect(expiredSpy).toHaveBeenCalledTimes(1);
    expect(fakeApi.callsTo('GET', '/api/studies')).toHaveLength(1);
  });

  it('takes a 401 from the sign-in endpoints as the answer and does not refresh', async () => {
    const fakeApi = installFakeApi({
      'POST /api/auth/sign-in-link/consume': problem(401, 'UNAUTHENTICATED', 'No'),
      'POST /api/auth/refresh': { status: 200, body: {} },
    });
    const expiredSpy = watchSessionExpiry();

    const { response } = await api.POST('/api/auth/sign-in-link/consume', { body: { token: 'tok' } });

    expect(response.status).toBe(401);
    expect(fakeApi.callsTo('POST', '/api/auth/refresh')).toHaveLength(0);
    expect(expiredSpy).not.toHaveBeenCalled();
  });
});
