import { fileURLToPath } from 'node:url';

const repoRoot = fileURLToPath(new URL('../../../', import.meta.url));

/** Addresses of the running stack; the lead's test runner passes these, the defaults match `npm start`. */
export const e2eEnv = {
  portalUrl: (process.env.PORTAL_URL ?? 'http://127.0.0.1:5173').replace(/\/+$/, ''),
  mailboxUrl: (process.env.MAILBOX_URL ?? 'http://127.0.0.1:1080').replace(/\/+$/, ''),
  screenshotDir: process.env.SCREENSHOT_DIR ?? `${repoRoot}.local/screenshots/portal`,
  chromiumPath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
};
