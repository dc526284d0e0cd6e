import { Injectable, OnModuleInit } from '@nestjs/common';
import { JwtService } from '@nestjs/jwt';
import { InjectDataSource } from '@nestjs/typeorm';
import { randomUUID } from 'node:crypto';
import { DataSource, EntityManager } from 'typeorm';
import { AuditService } from '../audit';
import type { SessionUser } from '../common/auth/session-user';
import { AuthException } from './auth.exception';
import { AppConfig } from '../config/app-config';
import { queryRows } from '../database/raw-query';
import { JOB_NAMES, JobQueueService } from '../jobs/job-queue.service';
import { MailService } from '../mail/mail.service';
import { UserEntity } from '../users';
import { UsersService } from '../users';
import { MeDto } from './dto/auth.dto';
import { RefreshTokenEntity } from './entities/refresh-token.entity';
import { hashToken, newOpaqueToken, passwordResetToken, signInLinkToken, successorToken } from './session-tokens';
import { passwordResetMail } from './password-reset-mail';
import { signInLinkMail } from './sign-in-link-mail';
import { SecondFactor, TwoFactorService } from './two-factor.service';
import { LabSettingsService } from '../users';

export interface IssuedSession {
  user: MeDto;
  accessToken: string;
  refreshToken: string;
  studySlug?: string | null;
}

/** The payload of a queued link request. */
interface SignInLinkRequest {
  email: string;
  studySlug: string | null;
}

export interface ClientInfo {
  ip: string | null;
  userAgent: string | null;
}

export function toMeDto(user: UserEntity, twoFactorSetupNeeded = false): MeDto {
  return {
    id: user.id,
    email: user.email,
    name: user.name,
    role: user.role,
    active: user.active,
    twoFactorEnabled: Boolean(user.twoFactorEnabledAt),
    twoFactorSetupNeeded,
  };
}

@Injectable()
export class AuthService implements OnModuleInit {
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly config: AppConfig,
    private readonly jwt: JwtService,
    private readonly users: UsersService,
    private readonly audit: AuditService,
    private readonly mail: MailService,
    private readonly jobs: JobQueueService,
    private readonly twoFactor: TwoFactorService,
    private readonly labSettings: LabSettingsService,
  ) {}

  async onModuleInit(): Promise<void> {
    await this.jobs.handle<SignInLinkRequest>(JOB_NAMES.signInLinkRequest, (request, jobId) =>
      this.sendSignInLink(request, jobId),
    );
    await this.jobs.handle<{ email: string }>(JOB_NAMES.passwordResetRequest, (request, jobId) =>
      this.sendPasswordReset(request.email, jobId),
    );
  }

  async signInWithPassword(
    email: string,
    password: string,
    factor: SecondFactor,
    client: ClientInfo,
  ): Promise<IssuedSession> {
    const user = await this.users.verifyStaffPassword(email, password);
    if (!user) {
      await this.recordRefusal(email, 'password', client);
      // One message for every cause, so the answer does not reveal which addresses have accounts.
      throw new AuthException('INVALID_CREDENTIALS', 'That e-mail and password do not match an active staff account.');
    }
    if (!user.twoFactorEnabledAt)
      return this.dataSource.transaction((manager) => this.startSession(manager, user, 'password', client));
    if (!factor.code && !factor.recoveryCode) {
      throw new AuthException(
        'TWO_FACTOR_REQUIRED',
        'Enter the 6-digit code from your authenticator app, or one of your recovery codes.',
      );
    }
    const session = await this.dataSource.transaction(async (manager) => {
      const check = await this.twoFactor.checkAtSignIn(manager, user.id, factor);
      return check.ok ? this.startSession(manager, user, 'password', client, check.method) : null;
    });
    if (session) return session;
    await this.recordRefusal(email, factor.code ? 'two-factor-code' : 'recovery-code', client);
    throw new AuthException(
      'TWO_FACTOR_INVALID',
      factor.code
        ? 'That code is not right, or it was used already. Enter the newest 6-digit code your authenticator app shows.'
        : 'That recovery code is not right, or it was used already. Each recovery code works once.',
    );
  }

  private async recordRefusal(
    email: string,
    method: 'password' | 'two-factor-code' | 'recovery-code',
    client: ClientInfo,
  ): Promise<void> {
    await this.audit.record(this.dataSource.manager, {
      actor: null,
      action: 'auth.sign-in-failed',
      subjectType: 'email',
      subjectId: email,
      data: { method, ...client },
    });
  }

  /**
   * Queues the request and does nothing else, so the answer takes the same time whatever the address: whether it
   * belongs to staff, to a participant or to no one is looked up only in the job.
   */
  async requestSignInLink(email: string, studySlug: string | undefined): Promise<void> {
    const request: SignInLinkRequest = { email, studySlug: studySlug ?? null };
    await this.jobs.enqueue(this.dataSource.manager, JOB_NAMES.signInLinkRequest, request);
  }

  /**
   * The job behind a link request: a link is only made for addresses that may sign in by link. The token is derived
   * from the job id, so a job that runs twice finds its link already made and sends no second e-mail.
   */
  private async sendSignInLink(request: SignInLinkRequest, jobId: string): Promise<void> {
    const existing = await this.users.findByEmail(request.email);
    if (existing && (existing.role !== 'participant' || !existing.active)) return;
    const token = signInLinkToken(this.config.jwtSecret, jobId);
    const minutes = Math.round(this.config.signInLinkSeconds / 60);
    const link = new URL('/sign-in/link', this.config.portalUrl);
    link.searchParams.set('token', token);
    await this.dataSource.transaction(async (manager) => {
      const inserted = await queryRows(
        manager,
        `INSERT INTO sign_in_link (email, token_hash, study_slug, expires_at) VALUES ($1, $2, $3, now() + $4 * interval '1 second')
         ON CONFLICT (token_hash) DO NOTHING RETURNING id`,
        [request.email, hashToken(token), request.studySlug, this.config.signInLinkSeconds],
      );
      if (inserted.length === 0) return;
      await this.mail.enqueue(manager, signInLinkMail(request.email, link.toString(), minutes));
    });
  }

  /** Like a link request: only queued, so the answer is the same, equally fast, whether or not the address is known. */
  async requestPasswordReset(email: string): Promise<void> {
    await this.jobs.enqueue(this.dataSource.manager, JOB_NAMES.passwordResetRequest, { email });
  }

  /** The job behind a reset request: active staff get a single-use link; anyone else gets nothing. Idempotent per job. */
  private async sendPasswordReset(email: string, jobId: string): Promise<void> {
    const user = await this.users.findByEmail(email);
    if (!user || user.role === 'participant' || !user.active || !user.passwordHash) return;
    const token = passwordResetToken(this.config.jwtSecret, jobId);
    const link = new URL('/reset-password', this.config.adminUrl);
    link.searchParams.set('token', token);
    await this.dataSource.transaction(async (manager) => {
      const inserted = await queryRows(
        manager,
        `INSERT INTO password_reset (user_id, email, token_hash, expires_at) VALUES ($1, $2, $3, now() + $4 * interval '1 second')
         ON CONFLICT (token_hash) DO NOTHING RETURNING id`,
        [user.id, user.email, hashToken(token), this.config.passwordResetSeconds],
      );
      if (inserted.length === 0) return;
      await this.mail.enqueue(
        manager,
        passwordResetMail(user.email, link.toString(), Math.round(this.config.passwordResetSeconds / 60)),
      );
    });
  }

  /** Sets the new password from a reset link (once), ends every session of the person and records it. */
  async consumePasswordReset(token: string, newPassword: string, client: ClientInfo): Promise<void> {
    await this.dataSource.transaction(async (manager) => {
      const [reset] = await queryRows<{ user_id: string; email: string }>(
        manager,
        `UPDATE password_reset SET used_at = now() WHERE token_hash = $1 AND used_at IS NULL AND expires_at > now() RETURNING user_id, email`,
        [hashToken(token)],
      );
      const user = reset ? await this.users.findActiveById(reset.user_id) : null;
      if (!reset || !user || user.role === 'participant') {
        throw new AuthException(
          'LINK_INVALID',
          'This password link is not valid any more: it was used already, has expired, or is unknown. Ask for a new one.',
        );
      }
      await this.users.setPasswordFromReset(manager, user.id, newPassword);
      await this.audit.record(manager, {
        actor: { id: user.id, email: user.email },
        action: 'user.password-reset',
        subjectType: 'user',
        subjectId: user.id,
        data: { email: user.email, ...client },
      });
    });
  }

  async consumeSignInLink(token: string, client: ClientInfo): Promise<IssuedSession> {
    return this.dataSource.transaction(async (manager) => {
      // Marking it used in the same statement that finds it makes the link single-use even under races.
      const [updated] = await queryRows<{ email: string; study_slug: string | null }>(
        manager,
        `UPDATE sign_in_link SET used_at = now()
         WHERE token_hash = $1 AND used_at IS NULL AND expires_at > now()
         RETURNING email, study_slug`,
        [hashToken(token)],
      );
      if (!updated) {
        throw new AuthException(
          'LINK_INVALID',
          'This sign-in link is not valid any more: it was used already, has expired, or is unknown. Ask for a new one.',
        );
      }
      const { user, created } = await this.users.findOrCreateParticipant(manager, updated.email);
      if (user.role !== 'participant' || !user.active) {
        throw new AuthException('LINK_INVALID', 'This sign-in link cannot be used for this account.');
      }
      if (created) {
        await this.audit.record(manager, {
          actor: { id: user.id, email: user.email },
          action: 'user.created',
          subjectType: 'user',
          subjectId: user.id,
          data: { role: 'participant', via: 'sign-in-link' },
        });
      }
      const session = await this.startSession(manager, user, 'link', client);
      return { ...session, studySlug: updated.study_slug };
    });
  }

  async refresh(refreshToken: string | undefined): Promise<IssuedSession> {
    if (!refreshToken) throw new AuthException('UNAUTHENTICATED', 'Please sign in.');
    const outcome = await this.dataSource.transaction(async (manager) => {
      const current = await manager.findOne(RefreshTokenEntity, {
        where: { tokenHash: hashToken(refreshToken) },
        lock: { mode: 'pessimistic_write' },
      });
      if (!current || current.expiresAt <= new Date()) return { kind: 'unknown' as const };
      if (
        !current.revokedAt &&
        current.replacedAt &&
        Date.now() - current.replacedAt.getTime() <= this.config.refreshGraceSeconds * 1000
      ) {
        // Another tab refreshed with this token a moment ago: hand out the same successor instead of crying theft.
        const successor = await this.sameSuccessor(manager, refreshToken, current);
        if (successor) return successor;
      }
      if (current.revokedAt || current.replacedAt) {
        await this.revokeFamily(manager, current.familyId);
        await this.audit.record(manager, {
          actor: { id: current.userId, email: null },
          action: 'auth.refresh-reuse-detected',
          subjectType: 'user',
          subjectId: current.userId,
          data: { familyId: current.familyId },
        });
        return { kind: 'reused' as const };
      }
      const user = await this.users.findActiveById(current.userId);
      if (!user) return { kind: 'unknown' as const };
      current.replacedAt = new Date();
      await manager.save(current);
      const next = await this.issueRefreshToken(manager, user.id, current.familyId, this.successorOf(refreshToken));
      return {
        kind: 'rotated' as const,
        session: {
          user: toMeDto(user),
          accessToken: await this.accessToken(user, current.familyId),
          refreshToken: next,
        },
      };
    });
    if (outcome.kind === 'rotated') return outcome.session;
    throw new AuthException(
      'UNAUTHENTICATED',
      outcome.kind === 'reused' ? 'This session was ended for safety. Please sign in again.' : 'Please sign in.',
    );
  }

  async signOut(refreshToken: string | undefined, client: ClientInfo): Promise<void> {
    if (!refreshToken) return;
    await this.dataSource.transaction(async (manager) => {
      const current = await manager.findOne(RefreshTokenEntity, { where: { tokenHash: hashToken(refreshToken) } });
      if (!current) return;
      await this.revokeFamily(manager, current.familyId);
      const user = await manager.findOne(UserEntity, { where: { id: current.userId } });
      await this.audit.record(manager, {
        actor: { id: current.userId, email: user?.email ?? null },
        action: 'auth.signed-out',
        subjectType: 'user',
        subjectId: current.userId,
        data: { ...client },
      });
    });
  }

  private async startSession(
    manager: EntityManager,
    user: UserEntity,
    method: 'password' | 'link',
    client: ClientInfo,
    secondFactor?: 'code' | 'recovery-code',
  ): Promise<IssuedSession> {
    await this.users.markSignedIn(manager, user.id);
    const sessionId = randomUUID();
    const refreshToken = await this.issueRefreshToken(manager, user.id, sessionId, newOpaqueToken().token);
    await this.audit.record(manager, {
      actor: { id: user.id, email: user.email },
      action: 'auth.signed-in',
      subjectType: 'user',
      subjectId: user.id,
      data: { method, ...(secondFactor ? { secondFactor } : {}), ...client },
    });
    const setupNeeded =
      user.role === 'admin' && !user.twoFactorEnabledAt && (await this.labSettings.get()).twoFactorRequiredForAdmins;
    return { user: toMeDto(user, setupNeeded), accessToken: await this.accessToken(user, sessionId), refreshToken };
  }

  /**
   * The signed-in person behind an access token, if its session is still live: the token's refresh-token family
   * must have a token that is neither revoked nor expired, so sign-out and theft detection end it at once.
   * One statement, by primary key and the family index.
   */
  async activeSessionUser(userId: string, sessionId: string): Promise<SessionUser | null> {
    const [row] = await queryRows<SessionUser>(
      this.dataSource.manager,
      `SELECT u.id, u.email, u.name, u.role,
              (u.role = 'admin' AND u.two_factor_enabled_at IS NULL
               AND coalesce((SELECT s.two_factor_required_for_admins FROM lab_setting s WHERE s.id), false)) AS "twoFactorSetupNeeded"
       FROM user_account u
       WHERE u.id = $1 AND u.active
         AND EXISTS (SELECT 1 FROM refresh_token t
                     WHERE t.family_id = $2 AND t.user_id = u.id AND t.revoked_at IS NULL AND t.expires_at > now())`,
      [userId, sessionId],
    );
    return row ?? null;
  }

  /** Access tokens name their session (`sid`, the refresh-token family), so each request can check it is still live. */
  private accessToken(user: UserEntity, sessionId: string): Promise<string> {
    return this.jwt.signAsync(
      { sub: user.id, role: user.role, sid: sessionId },
      { expiresIn: this.config.accessTokenSeconds },
    );
  }

  private successorOf(refreshToken: string): string {
    return successorToken(this.config.jwtSecret, refreshToken);
  }

  /** The pair a racing refresh already produced from this token, if its successor is still live. */
  private async sameSuccessor(manager: EntityManager, refreshToken: string, current: RefreshTokenEntity) {
    const successor = this.successorOf(refreshToken);
    const next = await manager.findOne(RefreshTokenEntity, {
      where: { tokenHash: hashToken(successor), familyId: current.familyId },
    });
    if (!next || next.revokedAt || next.expiresAt <= new Date()) return null;
    const user = await this.users.findActiveById(current.userId);
    if (!user) return null;
    return {
      kind: 'rotated' as const,
      session: {
        user: toMeDto(user),
        accessToken: await this.accessToken(user, current.familyId),
        refreshToken: successor,
      },
    };
  }

  private async issueRefreshToken(
    manager: EntityManager,
    userId: string,
    familyId: string,
    token: string,
  ): Promise<string> {
    await manager.insert(RefreshTokenEntity, {
      userId,
      familyId,
      tokenHash: hashToken(token),
      expiresAt: new Date(Date.now() + this.config.refreshTokenSeconds * 1000),
    });
    return token;
  }

  private async revokeFamily(manager: EntityManager, familyId: string): Promise<void> {
    await manager.query(`UPDATE refresh_token SET revoked_at = now() WHERE family_id = $1 AND revoked_at IS NULL`, [
      familyId,
    ]);
  }
}
