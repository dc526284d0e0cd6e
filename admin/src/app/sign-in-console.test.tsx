import { render, screen } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { StrictMode } from 'react';
import { RouterProvider, createMemoryRouter, type RouteObject } from 'react-router-dom';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { stubApi } from '@/test/api-stub';
import { AppProvider } from './provider';
import { routes } from './router';

/** The routes with the sign-in page's code arriving slowly, as over a real network. */
function withSlowSignInCode(routeList: RouteObject[]): RouteObject[] {
  return routeList.map((route) => ({
    ...route,
    ...(route.path === '/sign-in' && typeof route.lazy === 'function'
      ? {
          lazy: async () => {
            await new Promise((resolve) => setTimeout(resolve, 300));
            return (route.lazy as () => Promise<Partial<RouteObject>>)();
          },
        }
      : {}),
    ...(route.children ? { children: withSlowSignInCode(route.children) } : {}),
  })) as RouteObject[];
}

const unauthenticated = { status: 401, body: { statusCode: 401, code: 'UNAUTHENTICATED', message: 'Please sign in.' } };

describe('the sign-in page', () => {
  afterEach(() => vi.restoreAllMocks());

  it('is reached from a protected page and used without a console error (React’s development checks included)', async () => {
    const errors = vi.spyOn(console, 'error');
    stubApi({
      'GET /api/auth/me': unauthenticated,
      'POST /api/auth/refresh': unauthenticated,
      'POST /api/auth/sign-in': {
        status: 401,
        body: { statusCode: 401, code: 'UNAUTHENTICATED', message: 'That e-mail and password do not match.' },
      },
    });
    // Signed out on a protected page: the shell sends the person to sign in, remembering where they were.
    const router = createMemoryRouter(withSlowSignInCode(routes), { initialEntries: ['/studies'] });
    render(
      <StrictMode>
        <AppProvider>
          <RouterProvider router={router} />
        </AppProvider>
      </StrictMode>,
    );
    await userEvent.type(await screen.findByLabelText('E-mail', {}, { timeout: 5_000 }), 'coordinator@evenhand.test');
    expect(router.state.location).toMatchObject({ pathname: '/sign-in', state: { from: '/studies' } });
    await userEvent.type(screen.getByLabelText('Password'), 'not-the-password');
    await userEvent.click(screen.getByRole('button', { name: 'Sign in' }));
    expect(await screen.findByText(/do not match/)).toBeInTheDocument();
    await userEvent.clear(screen.getByLabelText('E-mail'));
    await userEvent.tab();
    await userEvent.click(screen.getByRole('button', { name: 'Sign in' }));
    expect(errors.mock.calls.map((call) => String(call[0]))).toEqual([]);
  });
});
