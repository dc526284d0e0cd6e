import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { e2eEnv } from './env';

export type JourneyBrowser = { context: BrowserContext; page: Page; close: () => Promise<void> };
export type PhoneBrowser = JourneyBrowser;
export type ScreenSize = 'phone' | 'desktop';

/** Most participants arrive on a phone (390×844); a desktop window (1280×900) is the other screen a journey checks. */
const screens = {
  phone: { viewport: { width: 390, height: 844 }, deviceScaleFactor: 2, isMobile: true, hasTouch: true },
  desktop: { viewport: { width: 1280, height: 900 }, deviceScaleFactor: 1, isMobile: false, hasTouch: false },
} as const;

/** Debian's chromium with a fresh profile (so no session), sized like a phone or a desktop window. */
export async function launchBrowser(size: ScreenSize): Promise<JourneyBrowser> {
  const profileDir = await mkdtemp(join(tmpdir(), 'evenhand-portal-e2e-'));
  const context = await chromium.launchPersistentContext(profileDir, {
    executablePath: e2eEnv.chromiumPath,
    headless: true,
    ...screens[size],
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

/** Debian's chromium with a fresh profile, sized like a phone (390×844), since most participants arrive on one. */
export function launchPhoneBrowser(): Promise<PhoneBrowser> {
  return launchBrowser('phone');
}
