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

  @Column({ name: 'last_sign_in_at', type: 'timestamptz', nullable: true })
  lastSignInAt: Date | null;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;

  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' })
  updatedAt: Date;
}
