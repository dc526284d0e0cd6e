import type { INestApplication, INestApplicationContext } from '@nestjs/common';
import { Module } from '@nestjs/common';
import { NestFactory } from '@nestjs/core';
import type { AddressInfo } from 'node:net';
import { configureApp } from '../app-setup';
import { AppModule } from '../app.module';
import { BenchRoutesModule } from './bench-routes.module';

/** The api plus the bare-INSERT baseline route, for the benchmarks only. */
@Module({ imports: [AppModule, BenchRoutesModule] })
class BenchAppModule {}

/**
 * Settings the benchmarks boot with. The pool is sized through DATABASE_POOL_MAX before the app starts: rebuilding
 * a live data source (destroy, setOptions, initialize) would drop the subscribers services registered on it, the
 * audit service's commit hook among them, and the benchmark would measure a path without audit events.
 */
function benchEnvironment(databaseUrl: string, connections: number): void {
  process.env.DATABASE_URL = databaseUrl;
  process.env.DATABASE_POOL_MAX = String(connections);
  process.env.RUN_WORKERS = 'false';
  process.env.BENCH_ROUTES = 'true';
}

/** The application context the in-process benchmarks measure: no job workers, a pool of `connections`. */
export async function bootBenchContext(databaseUrl: string, connections: number): Promise<INestApplicationContext> {
  benchEnvironment(databaseUrl, connections);
  return NestFactory.createApplicationContext(AppModule, { logger: ['error', 'warn'] });
}

/** The whole api served over HTTP on 127.0.0.1 (port 0: any free one), with the bare-INSERT route. */
export async function bootBenchHttpApp(
  databaseUrl: string,
  connections: number,
  port = 0,
): Promise<{ app: INestApplication; baseUrl: string }> {
  benchEnvironment(databaseUrl, connections);
  const app = await NestFactory.create(BenchAppModule, { logger: ['error', 'warn'], rawBody: true });
  configureApp(app);
  await app.listen(port, '127.0.0.1');
  const address = app.getHttpServer().address() as AddressInfo;
  return { app, baseUrl: `http://127.0.0.1:${address.port}/api` };
}
