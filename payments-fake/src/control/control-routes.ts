// The stand-in's own routes for tests and local development (JSON in and out, no API key):
// reset, set a balance, move the clock, settle pending money, fail a payout, fault switches,
// and the webhook delivery log. None of them exists at the real provider.

import express, { type NextFunction, type Request, type Response } from 'express';
import { readFaultChange } from '../faults/fault-switches';
import { balanceOf } from '../resources/balance';
import { failPayout, settlePayout } from '../resources/payouts';
import type { ProviderWorld } from '../state/provider-world';
import { asObject, ControlInputError, readInteger, readString, refuseUnknownFields } from './control-input';

function controlError(res: Response, status: number, message: string, param?: string): void {
  res.status(status).json({ error: { type: 'invalid_request_error', message, ...(param ? { param } : {}) } });
}

export function controlRouter(world: ProviderWorld): express.Router {
  const router = express.Router();
  router.use(express.json({ limit: '64kb', strict: false }));

  router.post('/reset', (_req, res) => {
    world.reset();
    res.json({ status: 'ok' });
  });

  router.post('/balance', (req, res) => {
    const body = asObject(req.body ?? {}, 'body');
    refuseUnknownFields(body, ['amount', 'currency', 'account']);
    const amount = readInteger(body, 'amount', { required: true, min: 0 }) as number;
    const currency = (
      readString(body, 'currency', {
        required: true,
        pattern: /^[A-Za-z]{3}$/,
        patternText: 'a three-letter currency code',
      }) as string
    ).toLowerCase();
    const accountId = readString(body, 'account') ?? world.platformAccountId;
    if (accountId !== world.platformAccountId && !world.accounts.get(accountId)) {
      throw new ControlInputError('account', `no connected account ${accountId}`);
    }
    world.ledger.setAvailable(accountId, currency, amount);
    res.json(balanceOf(world, accountId));
  });

  router.get('/faults', (_req, res) => {
    res.json(world.faults.settings());
  });
  router.post('/faults', (req, res) => {
    res.json(world.faults.apply(readFaultChange(req.body ?? {})));
  });
  router.delete('/faults', (_req, res) => {
    world.faults.clear();
    res.json(world.faults.settings());
  });

  router.post('/clock', (req, res) => {
    const body = asObject(req.body ?? {}, 'body');
    refuseUnknownFields(body, ['advanceSeconds']);
    const seconds = readInteger(body, 'advanceSeconds', { required: true, min: 0, max: 400 * 24 * 60 * 60 }) as number;
    world.clock.advance(seconds);
    world.releaseDueFunds(world.clock.nowMs());
    // Funds still pending are now due sooner on the moved clock.
    world.scheduleFundsRelease();
    res.json({ now: world.clock.nowSeconds() });
  });

  router.post('/settle', (_req, res) => {
    const before = world.ledger.nextReleaseMs() !== undefined;
    world.releaseDueFunds(Number.POSITIVE_INFINITY);
    const payoutsPaid = world.payouts
      .newestFirst((payout) => payout.status === 'pending')
      .map((payout) => payout.id)
      .filter((id) => settlePayout(world, id));
    res.json({ fundsReleased: before, payoutsPaid });
  });

  router.post('/payouts/:id/fail', (req, res) => {
    const body = asObject(req.body ?? {}, 'body');
    refuseUnknownFields(body, ['failureCode']);
    const failureCode =
      readString(body, 'failureCode', {
        pattern: /^[a-z_]+$/,
        patternText: 'a lower-case code such as account_closed',
      }) ?? 'account_closed';
    const payout = failPayout(world, req.params.id as string, failureCode);
    if (!payout) {
      controlError(res, 404, `No pending payout ${req.params.id}`, 'id');
      return;
    }
    res.json(payout);
  });

  router.get('/webhooks/deliveries', (_req, res) => {
    res.json({ deliveries: world.dispatcher.history() });
  });

  router.use((error: unknown, _req: Request, res: Response, next: NextFunction) => {
    if (error instanceof ControlInputError) {
      controlError(res, 400, error.message, error.field);
      return;
    }
    if (error instanceof SyntaxError || (error as { type?: string }).type === 'entity.parse.failed') {
      controlError(res, 400, 'body: must be valid JSON');
      return;
    }
    next(error);
  });

  return router;
}
