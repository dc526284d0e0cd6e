import { Navigate, createBrowserRouter, type RouteObject } from 'react-router-dom';
import { LoadingState } from '@/components/ui/states';
import { RootErrorBoundary } from './routes/root-error';

export const routes: RouteObject[] = [
  {
    ErrorBoundary: RootErrorBoundary,
    hydrateFallbackElement: <LoadingState label="Opening Evenhand…" className="min-h-dvh" />,
    children: [
      { path: '/sign-in', lazy: () => import('./routes/sign-in') },
      {
        path: '/forgot-password',
        lazy: async () => ({ Component: (await import('./routes/password-pages')).ForgotPasswordPage }),
      },
      {
        path: '/reset-password',
        lazy: async () => ({ Component: (await import('./routes/password-pages')).ResetPasswordPage }),
      },
      {
        path: '/',
        lazy: () => import('./routes/app/root'),
        children: [
          { index: true, lazy: () => import('./routes/app/home') },
          { path: 'account', lazy: () => import('./routes/app/account') },
          { path: 'staff', lazy: () => import('./routes/app/staff') },
          { path: 'staff/:userId', lazy: () => import('./routes/app/staff-member') },
          { path: 'studies', lazy: () => import('./routes/app/studies') },
          { path: 'studies/new', lazy: () => import('./routes/app/study-new') },
          {
            path: 'studies/:studyId',
            lazy: () => import('./routes/app/study-layout'),
            children: [
              { index: true, element: <Navigate to="setup" replace /> },
              { path: 'setup', lazy: () => import('./routes/app/study-setup') },
              { path: 'assignment', lazy: () => import('./routes/app/study-assignment') },
              { path: 'consent', lazy: () => import('./routes/app/study-consent') },
              { path: 'roster', lazy: () => import('./routes/app/study-roster') },
              { path: 'roster/:enrollmentId', lazy: () => import('./routes/app/study-participant') },
              { path: 'watch', lazy: () => import('./routes/app/study-watch') },
              { path: 'pay', lazy: () => import('./routes/app/study-pay') },
            ],
          },
          { path: 'audit', lazy: () => import('./routes/app/audit') },
        ],
      },
      { path: '*', lazy: () => import('./routes/not-found') },
    ],
  },
];

export function createAppRouter() {
  return createBrowserRouter(routes);
}
