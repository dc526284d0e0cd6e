import { mkdir } from 'node:fs/promises';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { e2eEnv } from './env';

/**
 * Numbered PNGs per journey, so the folder reads in order: the full page, or only what is on screen (for a dialog,
 * which a full-page capture draws over a stretched page).
 */
export function screenshotTaker(journey: string) {
  let step = 0;
  return async (page: Page, name: string, { fullPage = true } = {}): Promise<string> => {
    step += 1;
    await mkdir(e2eEnv.screenshotDir, { recursive: true });
    const path = join(e2eEnv.screenshotDir, `${journey}-${String(step).padStart(2, '0')}-${name}.png`);
    await page.screenshot({ path, fullPage });
    return path;
  };
}
