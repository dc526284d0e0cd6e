// First-load benchmark: what a browser downloads to show a page of each app under `npm start`, which serves the
// production builds through `vite preview` (gzip on). A fresh chromium profile (empty cache) opens each page and the
// encoded (on-the-wire) body sizes of every response are summed, the HTML, scripts, styles and fonts alike.
// The pages' api calls (data, not code) are left out of the sum and printed beside it. Run through
// run-first-load.sh, which starts the api with the demo scenario so each page renders as a visitor sees it.
// Target: the portal's first load ≤ 250 KB on the wire; admin printed for information.
// Exit 0 when met, 2 when missed, 1 when the run failed.
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium } from 'playwright-core';

const CHROMIUM = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
const PORTAL_TARGET_KB = 250;

const apps = [
  {
    name: 'portal',
    port: Number(process.env.BENCH_PORTAL_PORT ?? 5297),
    // Participants arrive on a study's link; the home page lists their studies.
    paths: ['/s/wayfinding-cues', '/'],
    targetKb: PORTAL_TARGET_KB,
  },
  { name: 'admin', port: Number(process.env.BENCH_ADMIN_PORT ?? 5298), paths: ['/sign-in'], targetKb: null },
];

/** Opens `url` in a fresh profile and sums the encoded sizes of the responses that are not api calls. */
async function measurePage(url) {
  const profileDir = await mkdtemp(join(tmpdir(), 'evenhand-first-load-'));
  const context = await chromium.launchPersistentContext(profileDir, {
    executablePath: CHROMIUM,
    headless: true,
    args: ['--no-sandbox', '--disable-gpu', '--no-first-run', '--disable-background-networking'],
  });
  try {
    const page = context.pages()[0] ?? (await context.newPage());
    const pending = [];
    page.on('requestfinished', (request) => {
      const isApi = new URL(request.url()).pathname.startsWith('/api/');
      pending.push(request.sizes().then((sizes) => ({ url: request.url(), isApi, bytes: sizes.responseBodySize })));
    });
    await page.goto(url, { waitUntil: 'networkidle' });
    const responses = await Promise.all(pending);
    const files = responses.filter((response) => !response.isApi);
    const apiCalls = responses.filter((response) => response.isApi);
    const sum = (list) => list.reduce((total, response) => total + response.bytes, 0);
    return { files, apiCalls: apiCalls.length, apiBytes: sum(apiCalls), bytes: sum(files) };
  } finally {
    await context.close();
    await rm(profileDir, { recursive: true, force: true });
  }
}

async function main() {
  const verdicts = [];
  for (const app of apps) {
    for (const path of app.paths) {
      const result = await measurePage(`http://127.0.0.1:${app.port}${path}`);
      const kb = result.bytes / 1024;
      const met = app.targetKb === null ? null : kb <= app.targetKb;
      console.log(
        JSON.stringify({
          bench: 'first-load',
          app: app.name,
          path,
          files: result.files.length,
          kilobytesOnTheWire: Number(kb.toFixed(1)),
          apiCallsLeftOut: result.apiCalls,
          apiKilobytes: Number((result.apiBytes / 1024).toFixed(1)),
          largest: result.files
            .sort((a, b) => b.bytes - a.bytes)
            .slice(0, 4)
            .map((file) => `${new URL(file.url).pathname} ${(file.bytes / 1024).toFixed(1)} KB`),
          target: app.targetKb === null ? null : `≤ ${app.targetKb} KB`,
          met,
        }),
      );
      if (met !== null) verdicts.push(met);
    }
  }
  const allMet = verdicts.every(Boolean);
  console.log(`[bench] first load: ${allMet ? 'every target met' : 'target MISSED'}`);
  return allMet ? 0 : 2;
}

main().then(
  (code) => process.exit(code),
  (error) => {
    console.error(error);
    process.exit(1);
  },
);
