// Configuration from the environment, checked once at start; a bad value stops start-up with a
// message naming the variable. Pure: no framework imports.

import path from 'node:path';

export interface PaymentsFakeConfig {
  port: number;
  host: string;
  /** Where events are delivered; null turns delivery off. */
  webhookUrl: string | null;
  webhookSecret: string;
  /** Base of hosted page links (account links), as a browser reaches this server. */
  publicUrl: string;
  fundsPendingMs: number;
  payoutSettleMs: number;
  /** Absolute path of the file that keeps the state across restarts; null keeps it in memory only. */
  stateFile: string | null;
}

export class ConfigError extends Error {
  constructor(variable: string, problem: string) {
    super(`${variable}: ${problem}`);
    this.name = 'ConfigError';
  }
}

export const CONFIG_DEFAULTS = {
  PAYMENTS_FAKE_PORT: '3200',
  PAYMENTS_FAKE_HOST: '127.0.0.1',
  PAYMENTS_FAKE_WEBHOOK_URL: 'http://127.0.0.1:3100/api/webhooks/payments',
  PAYMENTS_FAKE_WEBHOOK_SECRET: 'whsec_evenhand_dev',
  // Left empty, hosted links use http://<host>:<port> (http://127.0.0.1:3200 by default).
  PAYMENTS_FAKE_PUBLIC_URL: '',
  PAYMENTS_FAKE_FUNDS_PENDING_MS: '0',
  PAYMENTS_FAKE_PAYOUT_SETTLE_MS: '2000',
  // Left empty, the state lives in memory only and is gone when the process stops.
  PAYMENTS_FAKE_STATE_FILE: '',
} as const;

type Variable = keyof typeof CONFIG_DEFAULTS;

function read(env: NodeJS.ProcessEnv, variable: Variable): string {
  const value = env[variable];
  return value === undefined || value.trim() === '' ? CONFIG_DEFAULTS[variable] : value.trim();
}

function readInteger(env: NodeJS.ProcessEnv, variable: Variable, min: number, max: number): number {
  const text = read(env, variable);
  if (!/^\d+$/.test(text)) throw new ConfigError(variable, `must be a whole number, got '${text}'`);
  const value = Number(text);
  if (value < min || value > max) throw new ConfigError(variable, `must be between ${min} and ${max}, got ${value}`);
  return value;
}

function readHttpUrl(env: NodeJS.ProcessEnv, variable: Variable): string {
  const text = read(env, variable);
  let url: URL;
  try {
    url = new URL(text);
  } catch {
    throw new ConfigError(variable, `must be an absolute URL, got '${text}'`);
  }
  if (url.protocol !== 'http:' && url.protocol !== 'https:') {
    throw new ConfigError(variable, `must use http or https, got '${url.protocol}'`);
  }
  return text;
}

/** A file path, made absolute against the folder the process was started in. */
function readFilePath(env: NodeJS.ProcessEnv, variable: Variable): string | null {
  const text = read(env, variable);
  if (text === '') return null;
  if (/[\u0000\n\r]/.test(text)) throw new ConfigError(variable, 'must not contain NUL or line-break characters');
  const name = path.basename(text);
  if (/[\\/]$/.test(text) || name === '.' || name === '..') {
    throw new ConfigError(variable, `must name a file, not a folder, got '${text}'`);
  }
  return path.resolve(text);
}

export function readConfig(env: NodeJS.ProcessEnv): PaymentsFakeConfig {
  const webhookText = read(env, 'PAYMENTS_FAKE_WEBHOOK_URL');
  const webhookSecret = read(env, 'PAYMENTS_FAKE_WEBHOOK_SECRET');
  if (/\s/.test(webhookSecret)) throw new ConfigError('PAYMENTS_FAKE_WEBHOOK_SECRET', 'must not contain spaces');
  const host = read(env, 'PAYMENTS_FAKE_HOST');
  if (/[\s/]/.test(host)) throw new ConfigError('PAYMENTS_FAKE_HOST', `must be a host name or address, got '${host}'`);
  const port = readInteger(env, 'PAYMENTS_FAKE_PORT', 0, 65535);
  const linkHost = host === '0.0.0.0' || host === '::' ? '127.0.0.1' : host.includes(':') ? `[${host}]` : host;
  const publicUrl =
    read(env, 'PAYMENTS_FAKE_PUBLIC_URL') === ''
      ? `http://${linkHost}:${port}`
      : readHttpUrl(env, 'PAYMENTS_FAKE_PUBLIC_URL');
  return {
    port,
    host,
    webhookUrl: webhookText.toLowerCase() === 'off' ? null : readHttpUrl(env, 'PAYMENTS_FAKE_WEBHOOK_URL'),
    webhookSecret,
    publicUrl: publicUrl.replace(/\/+$/, ''),
    fundsPendingMs: readInteger(env, 'PAYMENTS_FAKE_FUNDS_PENDING_MS', 0, 7 * 24 * 60 * 60 * 1000),
    payoutSettleMs: readInteger(env, 'PAYMENTS_FAKE_PAYOUT_SETTLE_MS', 0, 7 * 24 * 60 * 60 * 1000),
    stateFile: readFilePath(env, 'PAYMENTS_FAKE_STATE_FILE'),
  };
}
