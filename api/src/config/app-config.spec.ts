import { describe, expect, it } from 'vitest';
import { loadConfig } from './app-config';

describe('loadConfig', () => {
  it('uses safe development defaults when nothing is set', () => {
    const config = loadConfig({});
    expect(config.port).toBe(3100);
    expect(config.host).toBe('127.0.0.1');
    expect(config.secureCookies).toBe(false);
  });

  it('reads numbers and booleans from the environment', () => {
    const config = loadConfig({ API_PORT: '4100', SECURE_COOKIES: 'true' });
    expect(config.port).toBe(4100);
    expect(config.secureCookies).toBe(true);
  });

  it('names the variable that is wrong', () => {
    expect(() => loadConfig({ API_PORT: 'eighty' })).toThrow(/API_PORT/);
    expect(() => loadConfig({ NODE_ENV: 'staging' })).toThrow(/NODE_ENV/);
  });

  it('refuses development secrets in production', () => {
    expect(() => loadConfig({ NODE_ENV: 'production' })).toThrow(/JWT_SECRET: the development default/);
  });

  it('accepts production with real secrets and turns on secure cookies', () => {
    const config = loadConfig({
      NODE_ENV: 'production',
      JWT_SECRET: 'x'.repeat(48),
      STRIPE_SECRET_KEY: 'sk_live_realistic_key',
      STRIPE_WEBHOOK_SECRET: 'whsec_realistic_secret',
    });
    expect(config.secureCookies).toBe(true);
  });

  it('refuses the benchmark routes in production and keeps them off by default', () => {
    expect(loadConfig({}).benchRoutes).toBe(false);
    expect(loadConfig({ BENCH_ROUTES: 'true' }).benchRoutes).toBe(true);
    expect(() => loadConfig({ NODE_ENV: 'production', BENCH_ROUTES: 'true' })).toThrow(
      /BENCH_ROUTES: the benchmark routes may not be served in production/,
    );
  });

  it('sizes the database pool from DATABASE_POOL_MAX', () => {
    expect(loadConfig({}).databasePoolMax).toBe(20);
    expect(loadConfig({ DATABASE_POOL_MAX: '32' }).databasePoolMax).toBe(32);
    expect(() => loadConfig({ DATABASE_POOL_MAX: '0' })).toThrow(/DATABASE_POOL_MAX/);
  });
});
