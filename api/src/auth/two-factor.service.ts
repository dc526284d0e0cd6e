import { Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import * as QRCode from 'qrcode';
import { DataSource, EntityManager } from 'typeorm';
import { AuditService } from '../audit';
import type { SessionUser } from '../common/auth/session-user';
import { AuthException } from './auth.exception';
import { AppConfig } from '../config/app-config';
import { queryRows } from '../database/raw-query';
import { UsersService } from '../users';
import { ConfirmTwoFactorDto, RecoveryCodesDto, TwoFactorSetupDto, TwoFactorStatusDto } from './dto/two-factor.dto';
import {
  acceptedTotpStep,
  decryptTotpSecret,
  encryptTotpSecret,
  hashRecoveryCode,
  newRecoveryCodes,
  newTotpSecret,
  totpAddress,
} from './two-factor';

export type SecondFactor = { code?: string; recoveryCode?: string };
export type SecondFactorOutcome =
  | { ok: true; method: 'code' | 'recovery-code'; recoveryCodesLeft?: number }
  | { ok: false; method: 'code' | 'recovery-code' | 'none' };

interface TwoFactorRow {
  email: string;
  role: string;
  two_factor_secret: string | null;
  two_factor_pending_secret: string | null;
  two_factor_enabled_at: Date | null;
  two_factor_last_step: string | null;
}

/** Staff members' optional second sign-in factor: set-up with a QR code, codes that work once, recovery codes. */
@Injectable()
export class TwoFactorService {
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly config: AppConfig,
    private readonly users: UsersService,
    private readonly audit: AuditService,
  ) {}

  private async row(manager: EntityManager, userId: string, lock = false): Promise<TwoFactorRow | undefined> {
    const [row] = await queryRows<TwoFactorRow>(
      manager,
      `SELECT email, role, two_factor_secret, two_factor_pending_secret, two_factor_enabled_at, two_factor_last_step
       FROM user_account WHERE id = $1${lock ? ' FOR UPDATE' : ''}`,
      [userId],
    );
    return row;
  }

  private async requiredFor(manager: EntityManager, role: string): Promise<boolean> {
    if (role !== 'admin') return false;
    const [setting] = await queryRows<{ required: boolean }>(
      manager,
      `SELECT two_factor_required_for_admins AS required FROM lab_setting WHERE id`,
    );
    return setting?.required ?? false;
  }

  async status(user: SessionUser): Promise<TwoFactorStatusDto> {
    const manager = this.dataSource.manager;
    const row = await this.row(manager, user.id);
    const [left] = await queryRows<{ n: number }>(
      manager,
      `SELECT count(*)::int AS n FROM two_factor_recovery_code WHERE user_id = $1 AND used_at IS NULL`,
      [user.id],
    );
    return {
      enabled: Boolean(row?.two_factor_enabled_at),
      enabledAt: row?.two_factor_enabled_at ? row.two_factor_enabled_at.toISOString() : null,
      recoveryCodesLeft: row?.two_factor_enabled_at ? (left?.n ?? 0) : 0,
      required: await this.requiredFor(manager, user.role),
    };
  }

  /** Offers a new secret (kept encrypted until a code from it is confirmed). Refused while one is already on. */
  async beginSetup(user: SessionUser): Promise<TwoFactorSetupDto> {
    const row = await this.row(this.dataSource.manager, user.id);
    if (!row || row.role === 'participant')
      throw new AuthException('FORBIDDEN', 'Two-factor sign-in is for staff accounts.');
    if (row.two_factor_enabled_at) {
      throw new AuthException(
        'TWO_FACTOR_ALREADY_ON',
        'Two-factor sign-in is already on. Turn it off first to set up a new authenticator app.',
      );
    }
    const secret = newTotpSecret();
    await this.dataSource.manager.query(`UPDATE user_account SET two_factor_pending_secret = $2 WHERE id = $1`, [
      user.id,
      encryptTotpSecret(secret, this.config.jwtSecret),
    ]);
    const otpauthUrl = totpAddress(secret, row.email);
    const svg = await QRCode.toString(otpauthUrl, { type: 'svg', errorCorrectionLevel: 'M', margin: 2 });
    return { secret, otpauthUrl, qrCodeDataUrl: `data:image/svg+xml;base64,${Buffer.from(svg).toString('base64')}` };
  }

  /** A code from the offered secret turns two-factor sign-in on and hands out fresh recovery codes, once. */
  async confirmSetup(user: SessionUser, body: ConfirmTwoFactorDto): Promise<RecoveryCodesDto> {
    return this.dataSource.transaction(async (manager) => {
      const row = await this.row(manager, user.id, true);
      if (!row || row.two_factor_enabled_at)
        throw new AuthException('TWO_FACTOR_ALREADY_ON', 'Two-factor sign-in is already on.');
      if (!row.two_factor_pending_secret) {
        throw new AuthException(
          'TWO_FACTOR_SETUP_NOT_STARTED',
          'Start the set-up first: choose “Set up two-factor sign-in” to get a QR code.',
        );
      }
      const secret = decryptTotpSecret(row.two_factor_pending_secret, this.config.jwtSecret);
      const step = await acceptedTotpStep(secret, body.code, Date.now() / 1000, null);
      if (step === null) {
        throw new AuthException(
          'VALIDATION_FAILED',
          'That code does not match. Enter the newest 6-digit code your authenticator app shows.',
          [{ field: 'code', message: 'does not match the authenticator app’s current code' }],
        );
      }
      await manager.query(
        `UPDATE user_account SET two_factor_secret = two_factor_pending_secret, two_factor_pending_secret = NULL,
           two_factor_enabled_at = now(), two_factor_last_step = $2 WHERE id = $1`,
        [user.id, step],
      );
      const recoveryCodes = await this.replaceRecoveryCodes(manager, user.id);
      await this.audit.record(manager, {
        actor: user,
        action: 'auth.two-factor-enabled',
        subjectType: 'user',
        subjectId: user.id,
        data: { email: row.email },
      });
      return { recoveryCodes };
    });
  }

  /** Turning it off needs the password; an admin cannot while the lab requires it of admins. */
  async disable(user: SessionUser, password: string): Promise<void> {
    await this.checkPassword(user, password);
    await this.dataSource.transaction(async (manager) => {
      const row = await this.row(manager, user.id, true);
      if (!row?.two_factor_enabled_at) return;
      if (await this.requiredFor(manager, row.role)) {
        throw new AuthException(
          'TWO_FACTOR_REQUIRED_BY_LAB',
          'The lab requires two-factor sign-in of admins, so it cannot be turned off for your account.',
        );
      }
      await manager.query(
        `UPDATE user_account SET two_factor_secret = NULL, two_factor_pending_secret = NULL, two_factor_enabled_at = NULL, two_factor_last_step = NULL WHERE id = $1`,
        [user.id],
      );
      await manager.query(`DELETE FROM two_factor_recovery_code WHERE user_id = $1`, [user.id]);
      await this.audit.record(manager, {
        actor: user,
        action: 'auth.two-factor-disabled',
        subjectType: 'user',
        subjectId: user.id,
        data: { email: row.email },
      });
    });
  }

  /** New recovery codes replace every old one (used or not); needs the password. */
  async renewRecoveryCodes(user: SessionUser, password: string): Promise<RecoveryCodesDto> {
    await this.checkPassword(user, password);
    return this.dataSource.transaction(async (manager) => {
      const row = await this.row(manager, user.id, true);
      if (!row?.two_factor_enabled_at) throw new AuthException('TWO_FACTOR_OFF', 'Turn on two-factor sign-in first.');
      const recoveryCodes = await this.replaceRecoveryCodes(manager, user.id);
      await this.audit.record(manager, {
        actor: user,
        action: 'auth.recovery-codes-renewed',
        subjectType: 'user',
        subjectId: user.id,
        data: { email: row.email },
      });
      return { recoveryCodes };
    });
  }

  /**
   * Checks the second factor at sign-in, in the caller's transaction: a code is accepted once (its step is kept), a
   * recovery code is marked used in the statement that finds it.
   */
  async checkAtSignIn(manager: EntityManager, userId: string, factor: SecondFactor): Promise<SecondFactorOutcome> {
    const row = await this.row(manager, userId, true);
    if (!row?.two_factor_enabled_at || !row.two_factor_secret) return { ok: true, method: 'code' };
    if (factor.code) {
      const secret = decryptTotpSecret(row.two_factor_secret, this.config.jwtSecret);
      const lastStep = row.two_factor_last_step === null ? null : Number(row.two_factor_last_step);
      const step = await acceptedTotpStep(secret, factor.code, Date.now() / 1000, lastStep);
      if (step === null) return { ok: false, method: 'code' };
      await manager.query(`UPDATE user_account SET two_factor_last_step = $2 WHERE id = $1`, [userId, step]);
      return { ok: true, method: 'code' };
    }
    if (factor.recoveryCode) {
      const used = await queryRows(
        manager,
        `UPDATE two_factor_recovery_code SET used_at = now() WHERE user_id = $1 AND code_hash = $2 AND used_at IS NULL RETURNING id`,
        [userId, hashRecoveryCode(factor.recoveryCode)],
      );
      if (used.length === 0) return { ok: false, method: 'recovery-code' };
      const [left] = await queryRows<{ n: number }>(
        manager,
        `SELECT count(*)::int AS n FROM two_factor_recovery_code WHERE user_id = $1 AND used_at IS NULL`,
        [userId],
      );
      await this.audit.record(manager, {
        actor: { id: userId, email: row.email },
        action: 'auth.recovery-code-used',
        subjectType: 'user',
        subjectId: userId,
        data: { email: row.email, recoveryCodesLeft: left?.n ?? 0 },
      });
      return { ok: true, method: 'recovery-code', recoveryCodesLeft: left?.n ?? 0 };
    }
    return { ok: false, method: 'none' };
  }

  private async checkPassword(user: SessionUser, password: string): Promise<void> {
    if (!(await this.users.verifyStaffPassword(user.email, password))) {
      throw new AuthException('VALIDATION_FAILED', 'That is not your password.', [
        { field: 'password', message: 'is not your current password' },
      ]);
    }
  }

  private async replaceRecoveryCodes(manager: EntityManager, userId: string): Promise<string[]> {
    const codes = newRecoveryCodes();
    await manager.query(`DELETE FROM two_factor_recovery_code WHERE user_id = $1`, [userId]);
    await manager.query(`INSERT INTO two_factor_recovery_code (user_id, code_hash) SELECT $1, unnest($2::text[])`, [
      userId,
      codes.map(hashRecoveryCode),
    ]);
    return codes;
  }
}
