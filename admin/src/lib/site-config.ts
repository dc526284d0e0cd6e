/** Where participants sign in; overridable at build time for other deployments. */
export const participantSiteUrl: string = import.meta.env.VITE_PORTAL_URL ?? 'http://127.0.0.1:5173';
