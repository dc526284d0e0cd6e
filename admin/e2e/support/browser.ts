import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { chromium, type BrowserContext, type Page } from 'playwright-core';

export const adminUrl = (process.env.ADMIN_URL ?? 'http://127.0.0.1:5174').replace(/\/$/, '');
export const screenshotDir =
  process.env.SCREENSHOT_DIR ??
  resolve(fileURLToPath(new URL('.', import.meta.url)), '../../../.local/screenshots/admin');

export const demoPassword = 'evenhand-demo';

export interface BrowserSession {
  context: BrowserContext;
  page: Page;
  close: () => Promise<void>;
}

/** A fresh headless chromium profile per journey, so no session cookie leaks between journeys. */
export async function openBrowser(): Promise<BrowserSession> {
  const profileDir = mkdtempSync(join(process.env.TMPDIR ?? tmpdir(), 'evenhand-admin-e2e-'));
  const context = await chromium.launchPersistentContext(profileDir, {
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    headless: true,
    viewport: { width: 1280, height: 800 },
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
      rmSync(profileDir, { recursive: true, force: true });
    },
  };
}

/**
 * Waits until no Headless UI element is mid-transition (they carry data-transition while fading). One still marked
 * after 10 s is stuck, not slow: the error names it, so a failure says what was left on the screen.
 */
export async function transitionsSettled(page: Page): Promise<void> {
  try {
    await page.waitForFunction(() => document.querySelectorAll('[data-transition]').length === 0, undefined, {
      timeout: 10_000,
      polling: 100,
    });
  } catch (error) {
    const stuck = await page
      .evaluate(() =>
        Array.from(document.querySelectorAll('[data-transition]'), (element) => element.outerHTML.slice(0, 300)).join(
          '\n',
        ),
      )
      .catch(() => '(could not read the page)');
    throw new Error(`Elements still mid-transition after 10 s:\n${stuck}`, { cause: error });
  }
}

let shotNumber = 0;

/** Saves a numbered full-page PNG, e.g. `admin-staff-03-create-dialog.png`. */
export async function screenshot(page: Page, journey: string, step: string): Promise<string> {
  mkdirSync(screenshotDir, { recursive: true });
  // Let Headless UI finish fading dialogs in or out, so the picture shows where the screen settles.
  await transitionsSettled(page);
  shotNumber += 1;
  const path = join(screenshotDir, `${journey}-${String(shotNumber).padStart(2, '0')}-${step}.png`);
  await page.screenshot({ path, fullPage: true });
  return path;
}

export async function signIn(page: Page, email: string, password = demoPassword): Promise<void> {
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
}

export const phoneViewport = { width: 390, height: 844 };
export const desktopViewport = { width: 1280, height: 800 };

/** The same moment at desktop width and at a phone's 390 px, e.g. `steps-04-record.png` and `steps-05-record-phone.png`. */
export async function screenshotAtBothWidths(page: Page, journey: string, step: string): Promise<void> {
  await screenshot(page, journey, step);
  await page.setViewportSize(phoneViewport);
  await page.waitForFunction((width) => window.innerWidth === width, phoneViewport.width);
  await screenshot(page, journey, `${step}-phone`);
  await page.setViewportSize(desktopViewport);
  await page.waitForFunction((width) => window.innerWidth === width, desktopViewport.width);
}
