// Assembles the stand-in: the provider's REST API under /v1, the browser script at /v1/stripe.js,
// the hosted onboarding pages, the control routes under /_control and GET /health; with a state
// file, restores the saved world before listening and keeps the file up to date.

import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import express, { type NextFunction, type Request, type Response } from 'express';
import { controlRouter } from '../control/control-routes';
import { browserScriptRouter } from '../hosted/browser-script-routes';
import { onboardingRouter } from '../hosted/onboarding-routes';
import { accountLinkRoutes } from '../resources/account-links';
import { accountRoutes } from '../resources/accounts';
import { balanceRoutes } from '../resources/balance';
import { eventRoutes } from '../resources/events';
import { paymentIntentRoutes } from '../resources/payment-intents';
import { payoutRoutes } from '../resources/payouts';
import { transferRoutes } from '../resources/transfers';
import { ProviderWorld, type ProviderWorldOptions } from '../state/provider-world';
import { checkStateFolder, readStateFile } from '../state/state-file';
import { StateSaver } from '../state/state-saver';
import { restoreWorld, resumeWorld } from '../state/world-snapshot';
import { providerApiRouter } from './provider-api';
import type { ProviderRoute } from './provider-route';

export const PROVIDER_ROUTES: readonly ProviderRoute[] = [
  ...accountRoutes,
  ...accountLinkRoutes,
  ...balanceRoutes,
  ...transferRoutes,
  ...payoutRoutes,
  ...paymentIntentRoutes,
  ...eventRoutes,
];

export interface PaymentsFakeOptions {
  webhookUrl: string | null;
  webhookSecret: string;
  /** Base of hosted page links; when left out, the address the server listens on. */
  publicUrl?: string;
  fundsPendingMs?: number;
  payoutSettleMs?: number;
  webhookRetryDelaysMs?: readonly number[];
  webhookReorderWindowMs?: number;
  webhookTimeoutMs?: number;
  /** The built browser script to serve at /v1/stripe.js (default: dist/browser of this package). */
  browserScriptFile?: string;
  /** Keeps the world in this file across restarts (see state/state-saver.ts); absent: memory only. */
  stateFile?: string | null;
}

// Growing retry delays, after the provider's practice of retrying failed deliveries with
// exponential back-off (https://docs.stripe.com/webhooks#retries); shortened for local use.
export const DEFAULT_WEBHOOK_RETRY_DELAYS_MS = [1_000, 5_000, 30_000, 120_000, 600_000, 1_800_000];

export function worldOptions(options: PaymentsFakeOptions): ProviderWorldOptions {
  return {
    publicUrl: options.publicUrl ?? 'http://127.0.0.1',
    webhook: { url: options.webhookUrl, secret: options.webhookSecret },
    webhookRetryDelaysMs: options.webhookRetryDelaysMs ?? DEFAULT_WEBHOOK_RETRY_DELAYS_MS,
    webhookReorderWindowMs: options.webhookReorderWindowMs ?? 250,
    webhookTimeoutMs: options.webhookTimeoutMs ?? 10_000,
    fundsPendingMs: options.fundsPendingMs ?? 0,
    payoutSettleMs: options.payoutSettleMs ?? 2_000,
    onboardingLinkTtlSeconds: 300,
    onboardingSessionTtlSeconds: 1800,
  };
}

export function createPaymentsFakeApp(
  world: ProviderWorld,
  options: { browserScriptFile?: string } = {},
): express.Express {
  const app = express();
  app.disable('x-powered-by');
  app.set('etag', false);
  // Told after every request, GETs included: opening an onboarding link uses it up, and a fault
  // switch counts down on any call. The state saver skips the write when nothing changed.
  app.use((_req: Request, res: Response, next: NextFunction) => {
    res.once('close', () => world.noteChange());
    next();
  });
  app.get('/health', (_req, res) => {
    res.json({ status: 'ok' });
  });
  app.use('/_control', controlRouter(world));
  app.use(onboardingRouter(world));
  app.use(browserScriptRouter(options.browserScriptFile));
  app.use(providerApiRouter(world, PROVIDER_ROUTES));
  app.use((_req: Request, res: Response) => {
    res.status(404).json({ error: { type: 'invalid_request_error', message: 'Not found.' } });
  });
  app.use((error: unknown, _req: Request, res: Response, _next: NextFunction) => {
    console.error('payments-fake: unexpected failure', error);
    res.status(500).json({ error: { type: 'api_error', message: 'Something went wrong on our end.' } });
  });
  return app;
}

export interface RunningPaymentsFake {
  url: string;
  port: number;
  world: ProviderWorld;
  server: Server;
  /** The state file in use, or null when the state lives in memory only. */
  stateFile: string | null;
  /** `savedAt` of the snapshot the world was restored from; null when it started empty. */
  restoredSavedAt: string | null;
  close(): Promise<void>;
}

function listen(app: express.Express, host: string, port: number): Promise<Server> {
  return new Promise((resolve, reject) => {
    const server = app.listen(port, host);
    server.once('error', reject);
    server.once('listening', () => resolve(server));
  });
}

/**
 * Starts the stand-in on host:port (port 0 picks a free one). With `stateFile`, a saved world is
 * restored first; an unreadable file, or one that is not a version 1 snapshot, rejects with a
 * StateFileError naming the file, and the file is left as it is.
 */
export async function startPaymentsFake(
  options: PaymentsFakeOptions & { host: string; port: number },
): Promise<RunningPaymentsFake> {
  const world = new ProviderWorld(worldOptions(options));
  const stateFile = options.stateFile ?? null;
  let restoredSavedAt: string | null = null;
  if (stateFile !== null) {
    checkStateFolder(stateFile);
    const snapshot = readStateFile(stateFile);
    if (snapshot) {
      restoreWorld(world, snapshot);
      restoredSavedAt = snapshot.savedAt;
    }
  }
  const app = createPaymentsFakeApp(world, { browserScriptFile: options.browserScriptFile });
  let server: Server;
  try {
    server = await listen(app, options.host, options.port);
  } catch (error) {
    world.close();
    throw error;
  }
  const address = server.address() as AddressInfo;
  const host = address.family === 'IPv6' ? `[${address.address}]` : address.address;
  const url = `http://${host}:${address.port}`;
  if (!options.publicUrl) world.publicUrl = url;
  const saver = stateFile === null ? undefined : new StateSaver(world, stateFile);
  if (restoredSavedAt !== null) resumeWorld(world);
  return {
    url,
    port: address.port,
    world,
    server,
    stateFile,
    restoredSavedAt,
    close: async () => {
      world.close();
      await new Promise<void>((done, fail) => {
        server.close((error) => (error ? fail(error) : done()));
        server.closeAllConnections();
      });
      // After the server has stopped, so no request changes the world behind the last write.
      saver?.close();
      await saver?.idle();
    },
  };
}
