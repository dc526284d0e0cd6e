/** Where to go after sign-in: only a path on this site, never another origin (open-redirect guard). */
export function safeReturnPath(candidate: unknown): string | null {
  if (typeof candidate !== 'string') return null;
  if (!candidate.startsWith('/') || candidate.startsWith('//') || candidate.startsWith('/\\')) return null;
  if (candidate.startsWith('/sign-in')) return null;
  return candidate;
}
