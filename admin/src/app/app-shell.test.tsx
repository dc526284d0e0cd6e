import { render, screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { RouterProvider, createMemoryRouter } from 'react-router-dom';
import { describe, expect, it } from 'vitest';
import { stubApi } from '@/test/api-stub';
import { AppProvider } from './provider';
import { routes } from './router';

const people = {
  admin: {
    id: 'a0000000-0000-4000-8000-000000000001',
    email: 'admin@evenhand.test',
    name: 'Demo Admin',
    role: 'admin',
    active: true,
  },
  coordinator: {
    id: 'a0000000-0000-4000-8000-000000000002',
    email: 'coordinator@evenhand.test',
    name: 'Demo Coordinator',
    role: 'coordinator',
    active: true,
  },
  participant: {
    id: 'a0000000-0000-4000-8000-000000000009',
    email: 'p001@evenhand.test',
    name: 'p001',
    role: 'participant',
    active: true,
  },
};

const unauthenticated = { status: 401, body: { statusCode: 401, code: 'UNAUTHENTICATED', message: 'Sign in first.' } };

function renderApp(path: string) {
  const router = createMemoryRouter(routes, { initialEntries: [path] });
  render(
    <AppProvider>
      <RouterProvider router={router} />
    </AppProvider>,
  );
  return router;
}

describe('app shell', () => {
  it('sends someone without a session to sign-in after one refresh attempt', async () => {
    const { requests } = stubApi({ 'GET /api/auth/me': unauthenticated, 'POST /api/auth/refresh': unauthenticated });
    const router = renderApp('/staff?q=ada');

    expect(await screen.findByRole('heading', { name: 'Sign in' })).toBeInTheDocument();
    expect(router.state.location.pathname).toBe('/sign-in');
    expect(router.state.location.state).toEqual({ from: '/staff?q=ada' });
    expect(requests.filter((request) => request.path === '/api/auth/refresh')).toHaveLength(1);
    expect(screen.getByRole('link', { name: 'participant site' })).toBeInTheDocument();
  });

  it('shows a coordinator Studies and not Staff, with the empty state from the api', async () => {
    stubApi({
      'GET /api/auth/me': { status: 200, body: people.coordinator },
      'GET /api/studies': { status: 200, body: { items: [] } },
    });
    const router = renderApp('/');

    expect(await screen.findByText('No studies yet')).toBeInTheDocument();
    expect(router.state.location.pathname).toBe('/studies');
    const nav = screen.getByRole('navigation', { name: 'Main' });
    expect(within(nav).getByRole('link', { name: 'Studies' })).toBeInTheDocument();
    expect(within(nav).queryByRole('link', { name: 'Staff' })).not.toBeInTheDocument();
    expect(screen.getByText('Demo Coordinator')).toBeInTheDocument();
    expect(screen.getByText('Coordinator')).toBeInTheDocument();
  });

  it('keeps the staff page from a coordinator who types its address', async () => {
    const { requests } = stubApi({ 'GET /api/auth/me': { status: 200, body: people.coordinator } });
    renderApp('/staff');

    expect(await screen.findByText('Not part of your role')).toBeInTheDocument();
    expect(requests.some((request) => request.path === '/api/users')).toBe(false);
  });

  it('tells a participant this site is for lab staff', async () => {
    stubApi({ 'GET /api/auth/me': { status: 200, body: people.participant } });
    renderApp('/');

    expect(await screen.findByRole('heading', { name: 'This site is for lab staff' })).toBeInTheDocument();
    expect(screen.getByRole('link', { name: 'Go to the participant site' })).toBeInTheDocument();
    expect(screen.queryByRole('navigation', { name: 'Main' })).not.toBeInTheDocument();
  });

  it('signs out and returns to sign-in', async () => {
    let signedIn = true;
    const { requests } = stubApi({
      'GET /api/auth/me': () => (signedIn ? { status: 200, body: people.coordinator } : unauthenticated),
      'GET /api/studies': { status: 200, body: { items: [] } },
      'POST /api/auth/sign-out': () => {
        signedIn = false;
        return { status: 204 };
      },
      'POST /api/auth/refresh': unauthenticated,
    });
    const router = renderApp('/studies');

    await userEvent.click(await screen.findByRole('button', { name: 'Sign out' }));

    expect(await screen.findByRole('heading', { name: 'Sign in' })).toBeInTheDocument();
    expect(router.state.location.pathname).toBe('/sign-in');
    expect(requests.some((request) => request.path === '/api/auth/sign-out')).toBe(true);
  });

  it('shows the 404 page for an unknown address', async () => {
    stubApi({});
    renderApp('/no/such/page');
    expect(await screen.findByRole('heading', { name: 'Page not found' })).toBeInTheDocument();
  });

  it('lists staff for an admin and searches on the server after typing stops', async () => {
    const { requests } = stubApi({
      'GET /api/auth/me': { status: 200, body: people.admin },
      'GET /api/users': ({ query }) => {
        const search = query.get('search');
        const everyone = [
          { ...people.admin, createdAt: '2025-01-02T08:00:00.000Z', lastSignInAt: '2025-01-06T08:00:00.000Z' },
          { ...people.coordinator, createdAt: '2025-01-02T08:00:00.000Z', lastSignInAt: null },
        ];
        const items = search ? everyone.filter((person) => person.email.includes(search)) : everyone;
        return {
          status: 200,
          body: {
            items,
            total: items.length,
            page: Number(query.get('page')),
            pageSize: Number(query.get('pageSize')),
          },
        };
      },
    });
    const router = renderApp('/');

    expect(await screen.findByRole('cell', { name: 'coordinator@evenhand.test' })).toBeInTheDocument();
    expect(router.state.location.pathname).toBe('/staff');
    expect(screen.getByRole('button', { name: 'Deactivate Demo Admin' })).toBeDisabled();

    await userEvent.type(screen.getByRole('searchbox', { name: 'Search staff by name or e-mail' }), 'coord');

    await waitFor(() => expect(screen.queryByRole('cell', { name: 'admin@evenhand.test' })).not.toBeInTheDocument());
    const userCalls = requests.filter((request) => request.path === '/api/users');
    // One call for the first page and one after the pause: typing five letters did not send five searches.
    expect(userCalls.map((request) => request.query.get('search'))).toEqual([null, 'coord']);
    expect(userCalls[1]?.query.get('page')).toBe('1');
    expect(router.state.location.search).toBe('?q=coord');
  });
});
