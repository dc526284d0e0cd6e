// `npm start` keeps running when one service crashes: run_supervised (lib.sh) restarts it and leaves the rest up.
import assert from 'node:assert/strict';
import { spawn } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { test } from 'node:test';

const lib = resolve(import.meta.dirname, '..', 'lib.sh');

async function until(check, what, timeoutMs = 30_000) {
  const deadline = Date.now() + timeoutMs;
  while (!check()) {
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

test('a crashed service is restarted, its sibling keeps running, and SIGTERM stops both', async () => {
  const dir = mkdtempSync(join(process.env.TMPDIR ?? tmpdir(), 'supervise-'));
  const crashes = join(dir, 'crashes');
  // "flaky" fails on its first start and stays up on the second; "steady" counts how often it was started.
  const flaky = `node -e "const fs=require('fs');const f='${crashes}';if(!fs.existsSync(f)){fs.writeFileSync(f,'1');process.exit(3)}fs.writeFileSync('${dir}/flaky-up','');setInterval(()=>{},1000)"`;
  const steady = `node -e "const fs=require('fs');fs.appendFileSync('${dir}/steady-starts','x');setInterval(()=>{},1000)"`;
  const child = spawn(
    'bash',
    [
      '-c',
      `source '${lib}'; run_supervised flaky,steady red,green "${flaky.replace(/"/g, '\\"')}" "${steady.replace(/"/g, '\\"')}"`,
    ],
    {
      stdio: ['ignore', 'pipe', 'pipe'],
      env: { ...process.env, TMPDIR: dir },
    },
  );
  let output = '';
  child.stdout.on('data', (chunk) => (output += chunk));
  child.stderr.on('data', (chunk) => (output += chunk));
  const exited = new Promise((done) => child.on('exit', (code) => done(code)));
  try {
    await until(() => existsSync(join(dir, 'flaky-up')), 'the crashed service to come back');
    assert.match(output, /restarted/);
    assert.equal(
      readFileSync(join(dir, 'steady-starts'), 'utf8'),
      'x',
      'the sibling was started once and never stopped',
    );
    child.kill('SIGTERM');
    assert.equal(await exited, 0);
    assert.equal(readFileSync(join(dir, 'steady-starts'), 'utf8'), 'x', 'nothing restarted on the way out');
  } finally {
    child.kill('SIGKILL');
    rmSync(dir, { recursive: true, force: true });
  }
});
