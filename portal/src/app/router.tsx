import { createBrowserRouter, Navigate, type RouteObject } from 'react-router-dom';
import { NotFoundRoute } from './routes/not-found';
import { RootErrorBoundary, RootHydrateFallback, RootLayout } from './routes/root';

export const routes: RouteObject[] = [
  {
    id: 'root',
    element: <RootLayout />,
    errorElement: <RootErrorBoundary />,
    hydrateFallbackElement: <RootHydrateFallback />,
    children: [
      { index: true, element: <Navigate to="/studies" replace /> },
      {
        path: 'sign-in',
        lazy: async () => ({ Component: (await import('./routes/sign-in')).SignInRoute }),
      },
      {
        path: 'sign-in/link',
        lazy: async () => ({ Component: (await import('./routes/sign-in-link')).SignInLinkRoute }),
      },
      {
        // Public: anyone may read about a study; someone taking part continues their journey here.
        path: 's/:slug',
        lazy: async () => ({ Component: (await import('./routes/study')).StudyRoute }),
      },
      {
        // Public: the lab's task sends people back here through the api's return address, signed in or not.
        path: 'return',
        lazy: async () => ({ Component: (await import('./routes/task-return')).TaskReturnRoute }),
      },
      {
        lazy: async () => ({ Component: (await import('./routes/signed-in-layout')).SignedInLayout }),
        children: [
          {
            path: 'studies',
            lazy: async () => ({ Component: (await import('./routes/studies')).StudiesRoute }),
          },
          {
            path: 'payouts',
            lazy: async () => ({ Component: (await import('./routes/payouts')).PayoutsRoute }),
          },
        ],
      },
      // Eager: the root error boundary shows the same screen, so it is in the main bundle anyway.
      { path: '*', Component: NotFoundRoute },
    ],
  },
];

export function createAppRouter() {
  return createBrowserRouter(routes);
}
