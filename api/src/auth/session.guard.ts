import { CanActivate, ExecutionContext, Injectable } from '@nestjs/common';
import { Reflector } from '@nestjs/core';
import { JwtService } from '@nestjs/jwt';
import type { Request } from 'express';
import { AuthService } from './auth.service';
import type { UserRole } from '../common/auth/roles';
import { AuthException } from './auth.exception';
import { BEFORE_TWO_FACTOR_SETUP, IS_PUBLIC, OPTIONAL_SESSION, ROLES } from '../common/auth/auth.decorators';
import { ACCESS_COOKIE, SessionUser } from '../common/auth/session-user';

/**
 * The global guard: every route needs a valid session unless marked @Public(), and @Roles() narrows it.
 * The user and the token's session are re-read on every request (one indexed lookup), so a deactivation or a
 * sign-out takes effect at once rather than when the access token expires.
 */
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

@Injectable()
export class SessionGuard implements CanActivate {
  constructor(
    private readonly reflector: Reflector,
    private readonly jwt: JwtService,
    private readonly auth: AuthService,
  ) {}

  async canActivate(context: ExecutionContext): Promise<boolean> {
    const targets = [context.getHandler(), context.getClass()];
    const request = context.switchToHttp().getRequest<Request & { user?: SessionUser }>();
    if (this.reflector.getAllAndOverride<boolean>(IS_PUBLIC, targets)) {
      if (this.reflector.getAllAndOverride<boolean>(OPTIONAL_SESSION, targets)) await this.readOptionalSession(request);
      return true;
    }

    const token: unknown = request.cookies?.[ACCESS_COOKIE];
    if (typeof token !== 'string' || token === '') throw new AuthException('UNAUTHENTICATED', 'Please sign in.');
    const user = await this.sessionUser(token);
    if (user === 'expired')
      throw new AuthException('UNAUTHENTICATED', 'Your session has expired. Please sign in again.');
    if (!user) throw new AuthException('UNAUTHENTICATED', 'Please sign in.');
    request.user = user;

    if (user.twoFactorSetupNeeded && !this.reflector.getAllAndOverride<boolean>(BEFORE_TWO_FACTOR_SETUP, targets)) {
      throw new AuthException(
        'TWO_FACTOR_SETUP_REQUIRED',
        'The lab requires admins to sign in with a two-factor code. Set it up under Your account first.',
      );
    }

    const roles = this.reflector.getAllAndOverride<UserRole[] | undefined>(ROLES, targets);
    if (roles && !roles.includes(user.role)) {
      throw new AuthException('FORBIDDEN', 'Your role does not allow this.');
    }
    return true;
  }

  /** Sets the user when the request carries a valid session; anything less leaves it unset. */
  private async readOptionalSession(request: Request & { user?: SessionUser }): Promise<void> {
    const token: unknown = request.cookies?.[ACCESS_COOKIE];
    if (typeof token !== 'string' || token === '') return;
    const user = await this.sessionUser(token);
    if (user && user !== 'expired') request.user = user;
  }

  /** The live session's user; 'expired' for a token that no longer verifies, null for an ended session. */
  private async sessionUser(token: string): Promise<SessionUser | 'expired' | null> {
    let claims: { sub?: unknown; sid?: unknown };
    try {
      claims = await this.jwt.verifyAsync<{ sub?: unknown; sid?: unknown }>(token);
    } catch {
      return 'expired';
    }
    // Tokens minted before sessions were named carry no sid; they end here and the apps refresh.
    if (
      typeof claims.sub !== 'string' ||
      typeof claims.sid !== 'string' ||
      !UUID.test(claims.sub) ||
      !UUID.test(claims.sid)
    )
      return null;
    return this.auth.activeSessionUser(claims.sub, claims.sid);
  }
}
