import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { e2eEnv } from './env';

export type PhoneBrowser = { context: BrowserContext; page: Page; close: () => Promise<void> };

/** Debian's chromium with a fresh profile, sized like a phone (390×844), since most participants arrive on one. */
export async function launchPhoneBrowser(): Promise<PhoneBrowser> {
  const profileDir = await mkdtemp(join(tmpdir(), 'evenhand-portal-e2e-'));
  const context = await chromium.launchPersistentContext(profileDir, {
    executablePath: e2eEnv.chromiumPath,
    headless: true,
    viewport: { width: 390, height: 844 },
    deviceScaleFactor: 2,
    isMobile: true,
    hasTouch: true,
    args: [
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
    ],
  });
  const page = context.pages()[0] ?? (await context.newPage());
  return {
    context,
    page,
    close: async () => {
      await context.close();
      await rm(profileDir, { recursive: true, force: true });
    },
  };
}
