import { CanActivate, ExecutionContext, Injectable } from '@nestjs/common';
import { Reflector } from '@nestjs/core';
import { JwtService } from '@nestjs/jwt';
import type { Request } from 'express';
import { UsersService } from '../../users/users.service';
import type { UserRole } from '../../users/entities/user.entity';
import { DomainException } from '../errors/domain.exception';
import { IS_PUBLIC, OPTIONAL_SESSION, ROLES } from './auth.decorators';
import { ACCESS_COOKIE, SessionUser } from './session-user';

/**
 * The global guard: every route needs a valid session unless marked @Public(), and @Roles() narrows it.
 * The user is re-read on every request so a deactivation takes effect at once.
 */
@Injectable()
export class SessionGuard implements CanActivate {
  constructor(
    private readonly reflector: Reflector,
    private readonly jwt: JwtService,
    private readonly users: UsersService,
  ) {}

  async canActivate(context: ExecutionContext): Promise<boolean> {
    const targets = [context.getHandler(), context.getClass()];
    const request = context.switchToHttp().getRequest<Request & { user?: SessionUser }>();
    if (this.reflector.getAllAndOverride<boolean>(IS_PUBLIC, targets)) {
      if (this.reflector.getAllAndOverride<boolean>(OPTIONAL_SESSION, targets)) await this.readOptionalSession(request);
      return true;
    }

    const token: unknown = request.cookies?.[ACCESS_COOKIE];
    if (typeof token !== 'string' || token === '') throw new DomainException('UNAUTHENTICATED', 'Please sign in.');
    let subject: string;
    try {
      subject = (await this.jwt.verifyAsync<{ sub: string }>(token)).sub;
    } catch {
      throw new DomainException('UNAUTHENTICATED', 'Your session has expired. Please sign in again.');
    }
    const user = await this.users.findActiveById(subject);
    if (!user) throw new DomainException('UNAUTHENTICATED', 'Please sign in.');
    request.user = { id: user.id, email: user.email, name: user.name, role: user.role };

    const roles = this.reflector.getAllAndOverride<UserRole[] | undefined>(ROLES, targets);
    if (roles && !roles.includes(user.role)) {
      throw new DomainException('FORBIDDEN', 'Your role does not allow this.');
    }
    return true;
  }

  /** Sets the user when the request carries a valid session; anything less leaves it unset. */
  private async readOptionalSession(request: Request & { user?: SessionUser }): Promise<void> {
    const token: unknown = request.cookies?.[ACCESS_COOKIE];
    if (typeof token !== 'string' || token === '') return;
    try {
      const user = await this.users.findActiveById((await this.jwt.verifyAsync<{ sub: string }>(token)).sub);
      if (user) request.user = { id: user.id, email: user.email, name: user.name, role: user.role };
    } catch {
      // An expired or altered session counts as none.
    }
  }
}
