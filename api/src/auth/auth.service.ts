import { Injectable } from '@nestjs/common';
import { JwtService } from '@nestjs/jwt';
import { InjectDataSource } from '@nestjs/typeorm';
import { randomUUID } from 'node:crypto';
import { DataSource, EntityManager } from 'typeorm';
import { AuditService } from '../audit/audit.service';
import { DomainException } from '../common/errors/domain.exception';
import { AppConfig } from '../config/app-config';
import { queryRows } from '../database/raw-query';
import { MailService } from '../mail/mail.service';
import { UserEntity } from '../users/entities/user.entity';
import { UsersService } from '../users/users.service';
import { MeDto } from './dto/auth.dto';
import { RefreshTokenEntity } from './entities/refresh-token.entity';
import { SignInLinkEntity } from './entities/sign-in-link.entity';
import { hashToken, newOpaqueToken } from './session-tokens';
import { signInLinkMail } from './sign-in-link-mail';

export interface IssuedSession {
  user: MeDto;
  accessToken: string;
  refreshToken: string;
  studySlug?: string | null;
}

export interface ClientInfo {
  ip: string | null;
  userAgent: string | null;
}

export function toMeDto(user: UserEntity): MeDto {
  return { id: user.id, email: user.email, name: user.name, role: user.role, active: user.active };
}

@Injectable()
export class AuthService {
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly config: AppConfig,
    private readonly jwt: JwtService,
    private readonly users: UsersService,
    private readonly audit: AuditService,
    private readonly mail: MailService,
  ) {}

  async signInWithPassword(email: string, password: string, client: ClientInfo): Promise<IssuedSession> {
    const user = await this.users.verifyStaffPassword(email, password);
    if (!user) {
      await this.audit.record(this.dataSource.manager, {
        actor: null,
        action: 'auth.sign-in-failed',
        subjectType: 'email',
        subjectId: email,
        data: { method: 'password', ...client },
      });
      // One message for every cause, so the answer does not reveal which addresses have accounts.
      throw new DomainException('INVALID_CREDENTIALS', 'That e-mail and password do not match an active staff account.');
    }
    return this.dataSource.transaction((manager) => this.startSession(manager, user, 'password', client));
  }

  /** Always answers the same way; a link is only made for addresses that may sign in by link. */
  async requestSignInLink(email: string, studySlug: string | undefined): Promise<void> {
    const existing = await this.users.findByEmail(email);
    if (existing && (existing.role !== 'participant' || !existing.active)) return;
    const { token, hash } = newOpaqueToken();
    const minutes = Math.round(this.config.signInLinkSeconds / 60);
    const link = new URL('/sign-in/link', this.config.portalUrl);
    link.searchParams.set('token', token);
    await this.dataSource.transaction(async (manager) => {
      await manager.insert(SignInLinkEntity, {
        email,
        tokenHash: hash,
        studySlug: studySlug ?? null,
        expiresAt: new Date(Date.now() + this.config.signInLinkSeconds * 1000),
      });
      await this.mail.enqueue(manager, signInLinkMail(email, link.toString(), minutes));
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
        throw new DomainException('LINK_INVALID', 'This sign-in link is not valid any more: it was used already, has expired, or is unknown. Ask for a new one.');
      }
      const { user, created } = await this.users.findOrCreateParticipant(manager, updated.email);
      if (user.role !== 'participant' || !user.active) {
        throw new DomainException('LINK_INVALID', 'This sign-in link cannot be used for this account.');
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
    if (!refreshToken) throw new DomainException('UNAUTHENTICATED', 'Please sign in.');
    const outcome = await this.dataSource.transaction(async (manager) => {
      const current = await manager.findOne(RefreshTokenEntity, {
        where: { tokenHash: hashToken(refreshToken) },
        lock: { mode: 'pessimistic_write' },
      });
      if (!current || current.expiresAt <= new Date()) return { kind: 'unknown' as const };
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
      const next = await this.issueRefreshToken(manager, user.id, current.familyId);
      return { kind: 'rotated' as const, session: { user: toMeDto(user), accessToken: await this.accessToken(user), refreshToken: next } };
    });
    if (outcome.kind === 'rotated') return outcome.session;
    throw new DomainException(
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
  ): Promise<IssuedSession> {
    await this.users.markSignedIn(manager, user.id);
    const refreshToken = await this.issueRefreshToken(manager, user.id, randomUUID());
    await this.audit.record(manager, {
      actor: { id: user.id, email: user.email },
      action: 'auth.signed-in',
      subjectType: 'user',
      subjectId: user.id,
      data: { method, ...client },
    });
    return { user: toMeDto(user), accessToken: await this.accessToken(user), refreshToken };
  }

  private accessToken(user: UserEntity): Promise<string> {
    return this.jwt.signAsync({ sub: user.id, role: user.role }, { expiresIn: this.config.accessTokenSeconds });
  }

  private async issueRefreshToken(manager: EntityManager, userId: string, familyId: string): Promise<string> {
    const { token, hash } = newOpaqueToken();
    await manager.insert(RefreshTokenEntity, {
      userId,
      familyId,
      tokenHash: hash,
      expiresAt: new Date(Date.now() + this.config.refreshTokenSeconds * 1000),
    });
    return token;
  }

  private async revokeFamily(manager: EntityManager, familyId: string): Promise<void> {
    await manager.query(`UPDATE refresh_token SET revoked_at = now() WHERE family_id = $1 AND revoked_at IS NULL`, [familyId]);
  }
}
