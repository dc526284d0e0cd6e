// The HTTP side of the provider's REST API: key check, request decoding, acting account,
// fault switches, idempotency and the JSON answer, in that order, around every /v1 route.
// Response headers follow the provider's (https://docs.stripe.com/api/request_ids,
// https://docs.stripe.com/api/versioning, https://docs.stripe.com/api/idempotent_requests).

import express, { type NextFunction, type Request, type Response } from 'express';
import { type ApiKeyKind, apiKeyFingerprint, maskApiKey, requireTestKey } from '../auth/api-key';
import { FormBodyError, parseFormBody, type FormObject } from '../encoding/form-body';
import { ParamReader } from '../encoding/param-reader';
import { ProviderError, providerErrors } from '../errors/provider-error';
import { objectId } from '../ids/object-id';
import { IDEMPOTENCY_KEY_MAX_LENGTH } from '../idempotency/idempotency-store';
import { DEFAULT_API_VERSION, type ProviderWorld } from '../state/provider-world';
import { browserCors } from './browser-cors';
import type { ActingAccount, ProviderRoute } from './provider-route';

interface CallContext {
  requestId: string;
  apiKey: string;
  keyKind: ApiKeyKind;
  maskedKey: string;
  apiVersion: string;
  params: FormObject;
  account: ActingAccount;
}

const ALLOWED_HEADERS = 'Authorization, Content-Type, Idempotency-Key, Stripe-Account, Stripe-Version';
const EXPOSED_HEADERS = 'Request-Id, Stripe-Version, Idempotency-Key, Idempotent-Replayed, Original-Request';

function sendJson(res: Response, status: number, body: string): void {
  res.status(status).set('Content-Type', 'application/json').send(body);
}

function serialize(body: unknown): string {
  // The provider answers with indented JSON.
  return JSON.stringify(body, null, 2);
}

function sendError(res: Response, error: ProviderError): void {
  for (const [name, value] of Object.entries(error.headers)) res.set(name, value);
  sendJson(res, error.status, serialize(error.toJSON()));
}

function contextOf(res: Response): CallContext {
  return res.locals.providerCall as CallContext;
}

function decodeParams(req: Request): FormObject {
  if (req.method === 'POST') {
    const contentType = (req.get('content-type') ?? '').split(';')[0]?.trim().toLowerCase() ?? '';
    const body = typeof req.body === 'string' ? req.body : '';
    if (body.length > 0 && contentType !== '' && contentType !== 'application/x-www-form-urlencoded') {
      throw providerErrors.wrongContentType(contentType);
    }
    const query = req.originalUrl.split('?')[1] ?? '';
    return { ...parseFormBody(query), ...parseFormBody(body) };
  }
  return parseFormBody(req.originalUrl.split('?')[1] ?? '');
}

function resolveAccount(world: ProviderWorld, header: string | undefined, maskedKey: string): ActingAccount {
  const id = header?.trim();
  if (!id || id === world.platformAccountId) return { id: world.platformAccountId, isPlatform: true };
  if (!world.accounts.get(id)) throw providerErrors.accountInvalid(maskedKey, id);
  return { id, isPlatform: false };
}

function sleep(ms: number): Promise<void> {
  return new Promise((resolve) => setTimeout(resolve, ms));
}

/** Runs one provider route with idempotency, latency and the response-drop switch. */
function runRoute(world: ProviderWorld, route: ProviderRoute) {
  return async (req: Request, res: Response): Promise<void> => {
    const context = contextOf(res);
    if (context.keyKind === 'publishable' && !route.publishable) throw providerErrors.secretKeyRequired();
    const idempotencyKey = req.method === 'POST' ? (req.get('idempotency-key') ?? null) : null;
    const scope = `${apiKeyFingerprint(context.apiKey)}|${context.account.id}`;
    const endpoint = `${req.method} ${req.path}`;

    if (idempotencyKey !== null) {
      if (idempotencyKey.length > IDEMPOTENCY_KEY_MAX_LENGTH) throw providerErrors.idempotencyKeyTooLong();
      res.set('Idempotency-Key', idempotencyKey);
      const outcome = world.idempotency.begin({
        scope,
        key: idempotencyKey,
        endpoint,
        params: context.params,
        requestId: context.requestId,
        nowMs: world.clock.nowMs(),
      });
      switch (outcome.kind) {
        case 'replay':
          res.set('Idempotent-Replayed', 'true');
          res.set('Original-Request', outcome.originalRequestId);
          sendJson(res, outcome.response.status, outcome.response.body);
          return;
        case 'params_mismatch':
          throw providerErrors.idempotencyParamsMismatch(idempotencyKey);
        case 'endpoint_mismatch':
          throw providerErrors.idempotencyEndpointMismatch(idempotencyKey, outcome.firstEndpoint, endpoint);
        case 'in_progress':
          throw providerErrors.idempotencyKeyInUse();
        case 'fresh':
          break;
      }
    }

    let status = 200;
    let body: string;
    let storable = true;
    let errorHeaders: Record<string, string> = {};
    try {
      if (world.faults.latencyMs > 0) await sleep(world.faults.latencyMs);
      const params = new ParamReader(context.params);
      const result = route.handle(
        {
          params,
          pathParams: req.params as Record<string, string>,
          account: context.account,
          request: { id: context.requestId, idempotencyKey, apiVersion: context.apiVersion },
          maskedKey: context.maskedKey,
          keyKind: context.keyKind,
        },
        world,
      );
      body = serialize(result);
    } catch (failure) {
      const error = failure instanceof ProviderError ? failure : providerErrors.apiError();
      if (!(failure instanceof ProviderError)) console.error('payments-fake: unexpected failure', failure);
      status = error.status;
      storable = error.storable;
      errorHeaders = error.headers;
      body = serialize(error.toJSON());
    }

    if (idempotencyKey !== null) {
      if (storable) world.idempotency.complete(scope, idempotencyKey, { status, body });
      else world.idempotency.abandon(scope, idempotencyKey);
    }
    // A change is acknowledged only once it would survive a crash (with a state file; at once in memory).
    if (req.method === 'POST') await world.durable();
    if (world.faults.takeResponseDrop()) {
      // The work is done (and saved under the idempotency key) but the caller never hears back.
      req.socket.destroy();
      return;
    }
    for (const [name, value] of Object.entries(errorHeaders)) res.set(name, value);
    sendJson(res, status, body);
  };
}

export function providerApiRouter(world: ProviderWorld, routes: readonly ProviderRoute[]): express.Router {
  const router = express.Router();

  router.use('/v1', (req: Request, res: Response, next: NextFunction) => {
    res.set('Request-Id', objectId('req', 14));
    res.set('Stripe-Version', req.get('stripe-version') ?? DEFAULT_API_VERSION);
    next();
  });
  router.use(
    '/v1',
    browserCors({ methods: 'GET, POST, DELETE', allowHeaders: ALLOWED_HEADERS, exposeHeaders: EXPOSED_HEADERS }),
  );

  router.use('/v1', express.text({ type: () => true, limit: '1mb' }));

  router.use('/v1', (req: Request, res: Response, next: NextFunction) => {
    const key = requireTestKey(req.get('authorization'));
    const maskedKey = maskApiKey(key.value);
    let params: FormObject;
    try {
      params = decodeParams(req);
    } catch (failure) {
      if (failure instanceof FormBodyError) throw providerErrors.malformedBody(failure.message);
      throw failure;
    }
    const account = resolveAccount(world, req.get('stripe-account'), maskedKey);
    const context: CallContext = {
      requestId: res.get('Request-Id') as string,
      apiKey: key.value,
      keyKind: key.kind,
      maskedKey,
      apiVersion: req.get('stripe-version') ?? DEFAULT_API_VERSION,
      params,
      account,
    };
    res.locals.providerCall = context;

    const fault = world.faults.takeRequestFault();
    if (fault?.kind === 'drop_connection') {
      req.socket.destroy();
      return;
    }
    if (fault?.kind === 'fail') throw fault.status === 429 ? providerErrors.rateLimited() : providerErrors.apiError();
    next();
  });

  for (const route of routes) router[route.method](route.path, runRoute(world, route));

  router.use('/v1', (req: Request) => {
    throw providerErrors.unrecognizedUrl(req.method, req.originalUrl.split('?')[0] ?? req.originalUrl);
  });

  router.use('/v1', (error: unknown, _req: Request, res: Response, next: NextFunction) => {
    if (error instanceof ProviderError) {
      sendError(res, error);
      return;
    }
    const status = (error as { status?: number }).status;
    if (status === 413) {
      sendError(res, providerErrors.malformedBody('the body is larger than 1 MB'));
      return;
    }
    next(error);
  });

  return router;
}
