// Which requests may trigger one silent session refresh after a 401. The auth endpoints
// themselves never do: a 401 there is the real answer (or the refresh itself failing).
const NO_REFRESH_PATHS = new Set([
  '/api/auth/refresh',
  '/api/auth/sign-in',
  '/api/auth/sign-in-link',
  '/api/auth/sign-in-link/consume',
  '/api/auth/sign-out',
]);

export function mayRefreshAfter(status: number, pathname: string): boolean {
  return status === 401 && !NO_REFRESH_PATHS.has(pathname.replace(/\/+$/, ''));
}
