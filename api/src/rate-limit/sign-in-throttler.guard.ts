import { ExecutionContext, Injectable } from '@nestjs/common';
import { ThrottlerGuard } from '@nestjs/throttler';
import type { Request } from 'express';
import { createHash } from 'node:crypto';

export const SIGN_IN_CLIENT_THROTTLER = 'sign-in-client';
export const SIGN_IN_EMAIL_THROTTLER = 'sign-in-email';

/** The e-mail address a sign-in request names, as the account would store it; '' when it names none. */
export function signInEmailOf(request: Request): string {
  const email: unknown = request.body?.email;
  return typeof email === 'string' ? email.trim().toLowerCase() : '';
}

/**
 * Two counts for every password or link sign-in request, shared by both routes: one per client address across every
 * e-mail address it tries (so spraying many accounts from one client is stopped), and one per e-mail address across
 * every client (so one account cannot be hammered from many). The client address is express's `request.ip`, which
 * follows X-Forwarded-For only from the proxies in TRUST_PROXY, and IPv6 clients count per subnet.
 */
@Injectable()
export class SignInThrottlerGuard extends ThrottlerGuard {
  protected override generateKey(context: ExecutionContext, clientAddress: string, throttlerName: string): string {
    const subject =
      throttlerName === SIGN_IN_EMAIL_THROTTLER
        ? `email:${signInEmailOf(context.switchToHttp().getRequest<Request>())}`
        : `client:${clientAddress}`;
    return createHash('sha256').update(`sign-in|${throttlerName}|${subject}`).digest('hex');
  }
}
