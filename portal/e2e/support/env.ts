import { fileURLToPath } from 'node:url';

const repoRoot = fileURLToPath(new URL('../../../', import.meta.url));

/** Addresses of the running stack; the lead's test runner passes these, the defaults match `npm start`. */
export const e2eEnv = {
  portalUrl: (process.env.PORTAL_URL ?? 'http://127.0.0.1:5173').replace(/\/+$/, ''),
  mailboxUrl: (process.env.MAILBOX_URL ?? 'http://127.0.0.1:1080').replace(/\/+$/, ''),
  /** The api itself, for the staff steps a journey does without a staff browser (setting a code, approving pay). */
  apiUrl: (process.env.EVENHAND_API_ORIGIN ?? 'http://127.0.0.1:3100').replace(/\/+$/, ''),
  /** The payment service stand-in, where a journey confirms a card payment as the provider's browser script would. */
  paymentsUrl: (process.env.PAYMENTS_FAKE_URL ?? 'http://127.0.0.1:3200').replace(/\/+$/, ''),
  /** The demo's stand-in for a lab's own task tool, where the seeded return-link steps send participants. */
  demoTaskUrl: (process.env.DEMO_TASK_URL ?? 'http://127.0.0.1:3300').replace(/\/+$/, ''),
  paymentsSecretKey: process.env.STRIPE_SECRET_KEY ?? 'sk_test_evenhand_local',
  screenshotDir: process.env.SCREENSHOT_DIR ?? `${repoRoot}.local/screenshots/portal`,
  chromiumPath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
};
