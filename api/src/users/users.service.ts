import { Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import * as bcrypt from 'bcryptjs';
import { DataSource, EntityManager, In } from 'typeorm';
import { queryRows } from '../database/raw-query';
import { AuditService } from '../audit';
import type { SessionUser } from '../common/auth/session-user';
import { UserException } from './user.exception';
import {
  CreateStaffUserDto,
  ListUsersQueryDto,
  StaffUserDto,
  StaffUserPageDto,
  UpdateStaffUserDto,
} from './dto/user.dto';
import { STAFF_ROLES, UserEntity } from './entities/user.entity';

const BCRYPT_ROUNDS = 10;

export function toStaffUserDto(user: UserEntity): StaffUserDto {
  return {
    id: user.id,
    email: user.email,
    name: user.name,
    role: user.role,
    active: user.active,
    createdAt: user.createdAt.toISOString(),
    lastSignInAt: user.lastSignInAt ? user.lastSignInAt.toISOString() : null,
  };
}

@Injectable()
export class UsersService {
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly audit: AuditService,
  ) {}

  private get users() {
    return this.dataSource.getRepository(UserEntity);
  }

  findActiveById(id: string): Promise<UserEntity | null> {
    return this.users.findOne({ where: { id, active: true } });
  }

  /** The active accounts among these ids (any order; inactive or unknown ids are left out). */
  findActiveByIds(ids: string[]): Promise<UserEntity[]> {
    return ids.length ? this.users.find({ where: { id: In(ids), active: true } }) : Promise.resolve([]);
  }

  findByEmail(email: string, manager: EntityManager = this.dataSource.manager): Promise<UserEntity | null> {
    return manager.findOne(UserEntity, { where: { email: email.trim().toLowerCase() } });
  }

  /** Hashes a password the way staff passwords are stored. */
  hashPassword(password: string): Promise<string> {
    return bcrypt.hash(password, BCRYPT_ROUNDS);
  }

  /** Checks a staff password; runs a comparison even for unknown users so timing does not reveal them. */
  async verifyStaffPassword(email: string, password: string): Promise<UserEntity | null> {
    const user = await this.findByEmail(email);
    const hash = user?.passwordHash ?? '$2b$10$CwTycUXWue0Thq9StjUM0uJ8.jtFXRkTTXs7VfF1C5Yqv6ErhqYry';
    const matches = await bcrypt.compare(password, hash);
    if (!user || !user.passwordHash || !matches || !user.active || user.role === 'participant') return null;
    return user;
  }

  /** A staff member changes their own password; the current one must be given, and the new one must differ. */
  async changeOwnPassword(actor: SessionUser, currentPassword: string, newPassword: string): Promise<void> {
    const user = await this.users.findOne({ where: { id: actor.id } });
    if (!user || !user.passwordHash || user.role === 'participant')
      throw new UserException('FORBIDDEN', 'Only staff accounts have a password.');
    if (!(await bcrypt.compare(currentPassword, user.passwordHash))) {
      throw new UserException('VALIDATION_FAILED', 'The current password is not right.', [
        { field: 'currentPassword', message: 'is not your current password' },
      ]);
    }
    if (currentPassword === newPassword) {
      throw new UserException('VALIDATION_FAILED', 'Choose a password different from the current one.', [
        { field: 'newPassword', message: 'must differ from the current password' },
      ]);
    }
    const passwordHash = await this.hashPassword(newPassword);
    await this.dataSource.transaction(async (manager) => {
      await manager.update(UserEntity, { id: user.id }, { passwordHash });
      await this.audit.record(manager, {
        actor,
        action: 'user.password-changed',
        subjectType: 'user',
        subjectId: user.id,
        data: { email: user.email },
      });
    });
  }

  /** Sets a new password from a reset link, in the caller's transaction; every session of the person ends. */
  async setPasswordFromReset(manager: EntityManager, userId: string, newPassword: string): Promise<void> {
    const passwordHash = await this.hashPassword(newPassword);
    await manager.update(UserEntity, { id: userId }, { passwordHash });
    await manager.query(`UPDATE refresh_token SET revoked_at = now() WHERE user_id = $1 AND revoked_at IS NULL`, [
      userId,
    ]);
  }

  async markSignedIn(manager: EntityManager, userId: string): Promise<void> {
    await manager.update(UserEntity, { id: userId }, { lastSignInAt: new Date() });
  }

  /** A participant signs in by e-mailed link; the first use creates the account. */
  async findOrCreateParticipant(
    manager: EntityManager,
    email: string,
  ): Promise<{ user: UserEntity; created: boolean }> {
    const normalized = email.trim().toLowerCase();
    const inserted = await queryRows(
      manager,
      `INSERT INTO user_account (email, role) VALUES ($1, 'participant') ON CONFLICT (email) DO NOTHING RETURNING id`,
      [normalized],
    );
    const user = await manager.findOneOrFail(UserEntity, { where: { email: normalized } });
    return { user, created: inserted.length > 0 };
  }

  async listStaff(query: ListUsersQueryDto): Promise<StaffUserPageDto> {
    const builder = this.users
      .createQueryBuilder('user')
      .where('user.role IN (:...roles)', { roles: [...STAFF_ROLES] });
    if (query.search?.trim()) {
      const pattern = `%${query.search
        .trim()
        .toLowerCase()
        .replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
      builder.andWhere('(lower(user.email) LIKE :pattern OR lower(user.name) LIKE :pattern)', { pattern });
    }
    const [items, total] = await builder
      .orderBy('user.name', 'ASC')
      .addOrderBy('user.email', 'ASC')
      .skip((query.page - 1) * query.pageSize)
      .take(query.pageSize)
      .getManyAndCount();
    return { items: items.map(toStaffUserDto), total, page: query.page, pageSize: query.pageSize };
  }

  async getStaff(id: string): Promise<StaffUserDto> {
    const user = await this.users.findOne({ where: { id } });
    if (!user || user.role === 'participant') throw new UserException('NOT_FOUND', 'No staff member with this id.');
    return toStaffUserDto(user);
  }

  async createStaff(actor: SessionUser, input: CreateStaffUserDto): Promise<StaffUserDto> {
    const passwordHash = await this.hashPassword(input.password);
    return this.dataSource.transaction(async (manager) => {
      if (await this.findByEmail(input.email, manager)) {
        throw new UserException('EMAIL_TAKEN', 'An account with this e-mail already exists.', [
          { field: 'email', message: 'An account with this e-mail already exists.' },
        ]);
      }
      const user = await manager.save(
        manager.create(UserEntity, {
          email: input.email,
          name: input.name,
          role: input.role,
          passwordHash,
          active: true,
        }),
      );
      await this.audit.record(manager, {
        actor,
        action: 'user.created',
        subjectType: 'user',
        subjectId: user.id,
        data: { email: user.email, role: user.role },
      });
      return toStaffUserDto(user);
    });
  }

  async updateStaff(actor: SessionUser, id: string, input: UpdateStaffUserDto): Promise<StaffUserDto> {
    return this.dataSource.transaction(async (manager) => {
      const user = await manager.findOne(UserEntity, { where: { id }, lock: { mode: 'pessimistic_write' } });
      if (!user || user.role === 'participant') throw new UserException('NOT_FOUND', 'No staff member with this id.');
      if (user.id === actor.id && input.active === false) {
        throw new UserException('OWN_ACCOUNT_PROTECTED', 'You cannot deactivate your own account.', [
          { field: 'active', message: 'You cannot deactivate your own account.' },
        ]);
      }
      if (user.id === actor.id && input.role && input.role !== user.role) {
        throw new UserException('OWN_ACCOUNT_PROTECTED', 'You cannot change your own role.', [
          { field: 'role', message: 'You cannot change your own role.' },
        ]);
      }
      const changes: Record<string, { from: unknown; to: unknown }> = {};
      for (const key of ['name', 'role', 'active'] as const) {
        if (input[key] !== undefined && input[key] !== user[key]) {
          changes[key] = { from: user[key], to: input[key] };
          (user as unknown as Record<string, unknown>)[key] = input[key];
        }
      }
      if (Object.keys(changes).length === 0) return toStaffUserDto(user);
      const saved = await manager.save(user);
      if (changes.active?.to === false) {
        await manager.query(`UPDATE refresh_token SET revoked_at = now() WHERE user_id = $1 AND revoked_at IS NULL`, [
          user.id,
        ]);
      }
      await this.audit.record(manager, {
        actor,
        action: changes.active?.to === false ? 'user.deactivated' : 'user.updated',
        subjectType: 'user',
        subjectId: user.id,
        data: { email: user.email, changes },
      });
      return toStaffUserDto(saved);
    });
  }
}
