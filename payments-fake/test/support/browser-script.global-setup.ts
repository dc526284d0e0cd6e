// Builds the browser script from src/browser before any test runs, so GET /v1/stripe.js in the
// tests serves the current source rather than whatever an earlier `npm run build` left in dist/.
// Runs the same rolldown command as `npm run build:browser-script`.
import { execFile } from 'node:child_process';
import { createRequire } from 'node:module';
import path from 'node:path';
import { promisify } from 'node:util';

export default async function buildBrowserScript(): Promise<void> {
  const packageRoot = path.resolve(__dirname, '../..');
  const rolldownCli = path.join(
    path.dirname(createRequire(__filename).resolve('rolldown/package.json')),
    'bin/cli.mjs',
  );
  try {
    await promisify(execFile)(process.execPath, [rolldownCli, '-c', 'rolldown.config.mts'], { cwd: packageRoot });
  } catch (error) {
    const { stdout, stderr } = error as { stdout?: string; stderr?: string };
    throw new Error(`Building the browser script failed:\n${stdout ?? ''}${stderr ?? ''}`);
  }
}
