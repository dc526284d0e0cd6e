import { Injectable } from '@nestjs/common';
import { ThrottlerGuard } from '@nestjs/throttler';
import type { Request } from 'express';

/** Counts attempts per client address and per e-mail address typed, so one address cannot be hammered from many clients either. */
@Injectable()
export class SignInThrottlerGuard extends ThrottlerGuard {
  protected override async getTracker(request: Request): Promise<string> {
    const email = typeof request.body?.email === 'string' ? request.body.email.trim().toLowerCase() : '';
    return `${request.ip ?? 'unknown'}|${email}`;
  }
}
