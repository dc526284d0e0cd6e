import { applyDecorators, createParamDecorator, ExecutionContext, SetMetadata } from '@nestjs/common';
import type { UserRole } from './roles';
import type { SessionUser } from './session-user';

export const IS_PUBLIC = 'evenhand:public';
export const ROLES = 'evenhand:roles';

/** Opts a route out of the global sign-in requirement. */
export const Public = () => SetMetadata(IS_PUBLIC, true);

export const OPTIONAL_SESSION = 'evenhand:optional-session';

/** A public route that still reads the session when there is one (`CurrentUser` is then set, else undefined). */
export const PublicWithOptionalSession = () =>
  applyDecorators(SetMetadata(IS_PUBLIC, true), SetMetadata(OPTIONAL_SESSION, true));

export const BEFORE_TWO_FACTOR_SETUP = 'evenhand:before-two-factor-setup';

/**
 * A route an admin may still use when the lab requires two-factor sign-in of admins and theirs is not set up yet
 * (their own account, the set-up itself); every other route answers 403 TWO_FACTOR_SETUP_REQUIRED until it is.
 */
export const AllowedBeforeTwoFactorSetup = () => SetMetadata(BEFORE_TWO_FACTOR_SETUP, true);

/** Limits a route to these roles (checked by the global guard after sign-in). */
export const Roles = (...roles: UserRole[]) => SetMetadata(ROLES, roles);

export const CurrentUser = createParamDecorator(
  (_data: unknown, context: ExecutionContext): SessionUser => context.switchToHttp().getRequest().user,
);
