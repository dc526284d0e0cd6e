import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn, UpdateDateColumn } from 'typeorm';
import type { UserRole } from '../../common/auth/roles';

export { STAFF_ROLES, USER_ROLES } from '../../common/auth/roles';
export type { StaffRole, UserRole } from '../../common/auth/roles';

@Entity({ name: 'user_account' })
@Index('user_account_email_key', ['email'], { unique: true })
export class UserEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  /** Stored lower-cased so that one address is one account. */
  @Column({ type: 'text' })
  email: string;

  @Column({ type: 'text', default: '' })
  name: string;

  @Column({ type: 'text' })
  role: UserRole;

  /** bcrypt hash; staff only. Participants sign in by e-mailed link and have none. */
  @Column({ name: 'password_hash', type: 'text', nullable: true })
  passwordHash: string | null;

  @Column({ type: 'boolean', default: true })
  active: boolean;

  /** The authenticator secret, encrypted (`two-factor-secret.ts`); set while two-factor sign-in is on. */
  @Column({ name: 'two_factor_secret', type: 'text', nullable: true, select: false })
  twoFactorSecret: string | null;

  /** A secret offered at set-up and not yet confirmed with a code, encrypted like the one in use. */
  @Column({ name: 'two_factor_pending_secret', type: 'text', nullable: true, select: false })
  twoFactorPendingSecret: string | null;

  @Column({ name: 'two_factor_enabled_at', type: 'timestamptz', nullable: true })
  twoFactorEnabledAt: Date | null;

  /** The last 30-second step a code was accepted for: a code works once. */
  @Column({ name: 'two_factor_last_step', type: 'bigint', nullable: true, select: false })
  twoFactorLastStep: string | null;

  @Column({ name: 'last_sign_in_at', type: 'timestamptz', nullable: true })
  lastSignInAt: Date | null;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;

  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' })
  updatedAt: Date;
}
