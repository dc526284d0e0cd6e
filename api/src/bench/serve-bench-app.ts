/**
 * `node dist/bench/serve-bench-app.js`: one more api process for the signing benchmark, serving the same database
 * (DATABASE_URL) over HTTP on 127.0.0.1, as a second replica behind a load balancer would. It prints one line,
 * `{"baseUrl":"http://127.0.0.1:…/api"}`, once it listens, and closes cleanly on SIGTERM or SIGINT.
 */
import 'reflect-metadata';
import { bootBenchHttpApp } from './bench-app';
import { wholeNumberSetting } from './bench-database';

async function main(): Promise<void> {
  const databaseUrl = process.env.DATABASE_URL;
  if (!databaseUrl) throw new Error('DATABASE_URL is required');
  const connections = wholeNumberSetting('BENCH_POOL', 32, 1, 200);
  const { app, baseUrl } = await bootBenchHttpApp(databaseUrl, connections, 0);
  let closing = false;
  const close = () => {
    if (closing) return;
    closing = true;
    void app.close().then(() => process.exit(0));
  };
  process.on('SIGTERM', close);
  process.on('SIGINT', close);
  console.log(JSON.stringify({ baseUrl }));
}

main().catch((error: Error) => {
  console.error(`[serve-bench-app] ${error.stack ?? error.message}`);
  process.exit(1);
});
