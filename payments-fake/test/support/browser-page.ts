// A real browser for the browser-script journey: Debian's chromium driven by playwright-core, and a
// tiny page server on another loopback port (so every call to the stand-in is cross-origin, as from
// the admin app) that includes /v1/stripe.js and then loads the real @stripe/stripe-js.

import { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { createServer, type Server } from 'node:http';
import { createRequire } from 'node:module';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';

export const CHROMIUM_PATH = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
export const SCREENSHOT_DIR =
  process.env.SCREENSHOT_DIR ?? path.resolve(__dirname, '../../../.local/screenshots/payments-fake');

export interface BrowserSession {
  context: BrowserContext;
  page: Page;
  /** Every request the page tried to send off this machine (all of them are refused). */
  offMachineRequests: string[];
  close(): Promise<void>;
}

export async function openBrowser(): Promise<BrowserSession> {
  if (!existsSync(CHROMIUM_PATH)) {
    throw new Error(
      `No chromium at ${CHROMIUM_PATH}: install Debian's chromium (apt-get install -y chromium) or set CHROMIUM_PATH. ` +
        'The root `npm test` installs it before running this suite.',
    );
  }
  const profileDir = mkdtempSync(path.join(process.env.TMPDIR ?? tmpdir(), 'payments-fake-chromium-'));
  const context = await chromium.launchPersistentContext(profileDir, {
    executablePath: CHROMIUM_PATH,
    headless: true,
    viewport: { width: 720, height: 640 },
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
  const offMachineRequests: string[] = [];
  await context.route('**/*', async (route) => {
    const url = new URL(route.request().url());
    if (url.hostname === '127.0.0.1') {
      await route.continue();
      return;
    }
    offMachineRequests.push(url.href);
    await route.abort('blockedbyclient');
  });
  const page = context.pages()[0] ?? (await context.newPage());
  return {
    context,
    page,
    offMachineRequests,
    close: async () => {
      await context.close();
      rmSync(profileDir, { recursive: true, force: true });
    },
  };
}

export async function screenshot(page: Page, name: string): Promise<string> {
  mkdirSync(SCREENSHOT_DIR, { recursive: true });
  const file = path.join(SCREENSHOT_DIR, `${name}.png`);
  await page.screenshot({ path: file, fullPage: true });
  return file;
}

export interface TestPage {
  url: string;
  close(): Promise<void>;
}

// The page an app like the admin would have: the stand-in's script tag first, then the app module,
// which calls loadStripe() from the real package and mounts the card element.
function pageHtml(scriptUrl: string): string {
  return `<!doctype html>
<html lang="en">
<head>
  <meta charset="utf-8">
  <title>Fund a study (payments-fake test page)</title>
  <script src="${scriptUrl}"></script>
  <script type="module" src="/app.mjs"></script>
  <style>
    body { font-family: system-ui, sans-serif; margin: 32px; max-width: 520px; color: #1f2933; }
    #card-error { min-height: 1.4em; color: #b42318; }
  </style>
</head>
<body>
  <main>
    <h1>Fund a study</h1>
    <form id="pay">
      <div id="card"></div>
      <p id="card-error" role="alert"></p>
      <button type="submit">Pay $250.00</button>
    </form>
  </main>
</body>
</html>`;
}

function appModule(publishableKey: string): string {
  return `import { loadStripe } from '/stripe-js.mjs';

const cardEvents = [];
window.cardEvents = cardEvents;
window.appReady = (async () => {
  const stripe = await loadStripe(${JSON.stringify(publishableKey)});
  const elements = stripe.elements({ appearance: { variables: { colorPrimary: '#1d4ed8', borderRadius: '4px' } } });
  const card = elements.create('card');
  for (const type of ['change', 'ready', 'focus', 'blur']) card.on(type, (event) => cardEvents.push({ type, ...event }));
  card.on('change', (event) => {
    document.getElementById('card-error').textContent = event.error ? event.error.message : '';
  });
  const ready = new Promise((resolve) => card.once('ready', resolve));
  card.mount('#card');
  await ready;
  window.testApp = {
    stripeVersion: window.Stripe.version,
    confirm: (clientSecret, billingDetails) =>
      stripe.confirmCardPayment(clientSecret, { payment_method: { card, billing_details: billingDetails } }),
    retrieve: (clientSecret) => stripe.retrievePaymentIntent(clientSecret),
    clear: () => card.clear(),
  };
})();
`;
}

/** Serves the test page on a free loopback port, pointing its script tag at the stand-in. */
export async function startTestPage(standInUrl: string, publishableKey: string): Promise<TestPage> {
  const stripeJsFile = path.join(
    path.dirname(createRequire(__filename).resolve('@stripe/stripe-js/package.json')),
    'dist/index.mjs',
  );
  const stripeJs = readFileSync(stripeJsFile, 'utf8');
  const server: Server = createServer((req, res) => {
    const send = (type: string, body: string) =>
      res.writeHead(200, { 'Content-Type': type, 'Cache-Control': 'no-store' }).end(body);
    if (req.url === '/') send('text/html; charset=utf-8', pageHtml(`${standInUrl}/v1/stripe.js`));
    else if (req.url === '/app.mjs') send('text/javascript; charset=utf-8', appModule(publishableKey));
    else if (req.url === '/stripe-js.mjs') send('text/javascript; charset=utf-8', stripeJs);
    else res.writeHead(404).end();
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(0, '127.0.0.1', () => resolve());
  });
  return {
    url: `http://127.0.0.1:${(server.address() as AddressInfo).port}/`,
    close: () =>
      new Promise((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      }),
  };
}
