// Bundles the browser script (src/browser, TypeScript) into one classic script that
// GET /v1/stripe.js serves: an IIFE, so it runs from a plain <script src> and sees document.currentScript.
import { defineConfig } from 'rolldown';

export const BROWSER_SCRIPT_OUTPUT = 'dist/browser/stripe-js-stand-in.js';

export default defineConfig({
  input: 'src/browser/stripe-js-stand-in.browser.ts',
  platform: 'browser',
  tsconfig: 'tsconfig.browser.json',
  output: {
    file: BROWSER_SCRIPT_OUTPUT,
    format: 'iife',
    banner: '/* payments-fake: local stand-in for the payment provider’s browser script (test data only). */',
  },
});
