// Serves the stand-in for the provider's browser script (built from src/browser by
// `npm run build`, see rolldown.config.mts) at /v1/stripe.js and its alias /js/v3. The admin
// includes it with a plain <script src> before its own bundle, so @stripe/stripe-js finds
// window.Stripe and never loads the provider's script from the web.

import { readFile } from 'node:fs/promises';
import path from 'node:path';
import express, { type Request, type Response } from 'express';
import { browserCors } from '../app/browser-cors';

export const BROWSER_SCRIPT_PATHS = ['/v1/stripe.js', '/js/v3'];

/** Where the build puts the bundle; the same place from src/ (tests) and from dist/ (npm start). */
export const BROWSER_SCRIPT_FILE = path.resolve(__dirname, '../../dist/browser/stripe-js-stand-in.js');

export function browserScriptRouter(scriptFile = BROWSER_SCRIPT_FILE): express.Router {
  const router = express.Router();
  router.use(BROWSER_SCRIPT_PATHS, browserCors({ methods: 'GET', allowHeaders: 'Content-Type' }));
  router.get(BROWSER_SCRIPT_PATHS, async (_req: Request, res: Response) => {
    let script: string;
    try {
      // Read on every request: a rebuilt script is served without restarting the stand-in.
      script = await readFile(scriptFile, 'utf8');
    } catch {
      const message = `payments-fake: the browser script is not built (${scriptFile} is missing). Run: npm run build -w payments-fake`;
      console.error(message);
      res
        .status(503)
        .type('text/javascript; charset=utf-8')
        .set('Cache-Control', 'no-store')
        .send(`throw new Error(${JSON.stringify(message)});\n`);
      return;
    }
    res
      .status(200)
      .type('text/javascript; charset=utf-8')
      .set('Cache-Control', 'no-store')
      .set('Cross-Origin-Resource-Policy', 'cross-origin')
      .send(script);
  });
  return router;
}
