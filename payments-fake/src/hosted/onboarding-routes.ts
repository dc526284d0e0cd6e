// The hosted onboarding flow behind an account link: opening the link uses it up and starts a
// short session; finishing the form marks the account onboarded (account.updated) and sends the
// holder to return_url; an expired or already used link sends them to refresh_url.

import express, { type Request, type Response } from 'express';
import { randomToken } from '../ids/object-id';
import { completeOnboarding } from '../resources/accounts';
import type { OnboardingSessionRecord, ProviderWorld } from '../state/provider-world';
import {
  checkOnboardingForm,
  renderMessagePage,
  renderOnboardingPage,
  type OnboardingForm,
  type OnboardingPageInput,
} from './onboarding-page';

function sendHtml(res: Response, status: number, html: string): void {
  res.status(status).set('Cache-Control', 'no-store').type('html').send(html);
}

function pageInput(
  world: ProviderWorld,
  session: OnboardingSessionRecord,
  form: OnboardingForm,
  errors: OnboardingPageInput['errors'],
): OnboardingPageInput | undefined {
  const account = world.accounts.get(session.accountId);
  if (!account) return undefined;
  return {
    actionPath: `/onboarding/sessions/${session.id}`,
    platformName: 'Evenhand',
    email: account.email,
    country: account.country ?? world.platformCountry,
    currency: account.default_currency ?? world.platformCurrency,
    form,
    errors,
  };
}

function firstValue(value: unknown): string {
  if (Array.isArray(value)) return typeof value[0] === 'string' ? value[0] : '';
  return typeof value === 'string' ? value : '';
}

export function onboardingRouter(world: ProviderWorld): express.Router {
  const router = express.Router();
  const goneMessage = () =>
    renderMessagePage(
      'Link not valid',
      'This setup link is not valid. Go back to the site that sent you and ask for a new link.',
    );

  router.get('/onboarding/:token', (req: Request, res: Response) => {
    const link = world.accountLinks.get(req.params.token as string);
    if (!link) {
      sendHtml(res, 404, goneMessage());
      return;
    }
    if (link.used || world.clock.nowSeconds() >= link.expiresAt) {
      res.redirect(302, link.refreshUrl);
      return;
    }
    link.used = true;
    const session: OnboardingSessionRecord = {
      id: randomToken(32),
      linkToken: link.token,
      accountId: link.accountId,
      refreshUrl: link.refreshUrl,
      returnUrl: link.returnUrl,
      expiresAt: world.clock.nowSeconds() + world.options.onboardingSessionTtlSeconds,
      finished: false,
    };
    world.onboardingSessions.set(session.id, session);
    const input = pageInput(world, session, { fullName: '', confirmed: false }, {});
    if (!input) {
      sendHtml(res, 404, goneMessage());
      return;
    }
    sendHtml(res, 200, renderOnboardingPage(input));
  });

  router.post(
    '/onboarding/sessions/:sessionId',
    express.urlencoded({ extended: false, limit: '16kb' }),
    async (req: Request, res: Response) => {
      const session = world.onboardingSessions.get(req.params.sessionId as string);
      if (!session) {
        sendHtml(res, 404, goneMessage());
        return;
      }
      if (session.finished || world.clock.nowSeconds() >= session.expiresAt) {
        res.redirect(303, session.refreshUrl);
        return;
      }
      const body = (req.body ?? {}) as Record<string, unknown>;
      const action = firstValue(body.action);
      if (action === 'leave') {
        session.finished = true;
        res.redirect(303, session.returnUrl);
        return;
      }
      const form: OnboardingForm = {
        fullName: firstValue(body.full_name),
        confirmed: firstValue(body.confirmed) === 'yes',
      };
      const errors = checkOnboardingForm(form);
      if (Object.keys(errors).length > 0) {
        const input = pageInput(world, session, form, errors);
        sendHtml(res, input ? 422 : 404, input ? renderOnboardingPage(input) : goneMessage());
        return;
      }
      const account = completeOnboarding(world, session.accountId, {
        name: form.fullName.trim(),
        ip: req.ip ?? null,
        userAgent: req.get('user-agent') ?? null,
      });
      if (!account) {
        sendHtml(res, 404, goneMessage());
        return;
      }
      session.finished = true;
      // The person is sent back only once the finished onboarding would survive a crash.
      await world.durable();
      res.redirect(303, session.returnUrl);
    },
  );

  return router;
}
