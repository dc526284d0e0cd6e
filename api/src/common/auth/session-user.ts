import type { UserRole } from './roles';

/** The signed-in person as the guards attach it to the request. */
export interface SessionUser {
  id: string;
  email: string;
  name: string;
  role: UserRole;
  /** The lab requires two-factor sign-in of admins and this admin has not set it up. */
  twoFactorSetupNeeded?: boolean;
}

export const ACCESS_COOKIE = 'eh_access';
export const REFRESH_COOKIE = 'eh_refresh';
