import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { ConfigError, readConfig } from './payments-fake-config';

describe('readConfig', () => {
  it('has development defaults', () => {
    expect(readConfig({})).toEqual({
      port: 3200,
      host: '127.0.0.1',
      webhookUrl: 'http://127.0.0.1:3100/api/webhooks/payments',
      webhookSecret: 'whsec_evenhand_dev',
      publicUrl: 'http://127.0.0.1:3200',
      fundsPendingMs: 0,
      payoutSettleMs: 2000,
      stateFile: null,
    });
  });

  it('keeps the state in memory unless a state file is named, and makes its path absolute', () => {
    expect(readConfig({ PAYMENTS_FAKE_STATE_FILE: '  ' }).stateFile).toBeNull();
    expect(readConfig({ PAYMENTS_FAKE_STATE_FILE: '/srv/evenhand/payments-state.json' }).stateFile).toBe(
      '/srv/evenhand/payments-state.json',
    );
    expect(readConfig({ PAYMENTS_FAKE_STATE_FILE: '.local/payments-state.json' }).stateFile).toBe(
      path.join(process.cwd(), '.local/payments-state.json'),
    );
  });

  it('follows the port in hosted links unless a public URL is given', () => {
    expect(readConfig({ PAYMENTS_FAKE_PORT: '3299' }).publicUrl).toBe('http://127.0.0.1:3299');
    expect(readConfig({ PAYMENTS_FAKE_PUBLIC_URL: 'https://pay.example.test/' }).publicUrl).toBe(
      'https://pay.example.test',
    );
  });

  it('turns webhook delivery off with "off"', () => {
    expect(readConfig({ PAYMENTS_FAKE_WEBHOOK_URL: 'off' }).webhookUrl).toBeNull();
  });

  it('refuses bad values naming the variable', () => {
    const cases: Array<[NodeJS.ProcessEnv, string]> = [
      [{ PAYMENTS_FAKE_PORT: 'eighty' }, 'PAYMENTS_FAKE_PORT'],
      [{ PAYMENTS_FAKE_PORT: '70000' }, 'PAYMENTS_FAKE_PORT'],
      [{ PAYMENTS_FAKE_WEBHOOK_URL: '127.0.0.1:3100/hook' }, 'PAYMENTS_FAKE_WEBHOOK_URL'],
      [{ PAYMENTS_FAKE_WEBHOOK_URL: 'ftp://127.0.0.1/hook' }, 'PAYMENTS_FAKE_WEBHOOK_URL'],
      [{ PAYMENTS_FAKE_PUBLIC_URL: 'not a url' }, 'PAYMENTS_FAKE_PUBLIC_URL'],
      [{ PAYMENTS_FAKE_WEBHOOK_SECRET: 'whsec with space' }, 'PAYMENTS_FAKE_WEBHOOK_SECRET'],
      [{ PAYMENTS_FAKE_HOST: 'http://host' }, 'PAYMENTS_FAKE_HOST'],
      [{ PAYMENTS_FAKE_PAYOUT_SETTLE_MS: '-5' }, 'PAYMENTS_FAKE_PAYOUT_SETTLE_MS'],
      [{ PAYMENTS_FAKE_STATE_FILE: '.local/' }, 'PAYMENTS_FAKE_STATE_FILE'],
      [{ PAYMENTS_FAKE_STATE_FILE: '.local/..' }, 'PAYMENTS_FAKE_STATE_FILE'],
      [{ PAYMENTS_FAKE_STATE_FILE: 'state\u0000.json' }, 'PAYMENTS_FAKE_STATE_FILE'],
    ];
    for (const [env, variable] of cases) {
      expect(() => readConfig(env)).toThrow(ConfigError);
      expect(() => readConfig(env)).toThrow(new RegExp(`^${variable}:`));
    }
  });
});
