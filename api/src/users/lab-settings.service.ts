import { Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource } from 'typeorm';
import { AuditService } from '../audit';
import type { SessionUser } from '../common/auth/session-user';
import { UserException } from './user.exception';
import { queryRows } from '../database/raw-query';
import { LabSettingsDto, UpdateLabSettingsDto } from './dto/lab-settings.dto';

/** The lab's own settings: one row (`lab_setting`), changed only by admins, every change audited. */
@Injectable()
export class LabSettingsService {
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly audit: AuditService,
  ) {}

  async get(): Promise<LabSettingsDto> {
    const [row] = await queryRows<{ two_factor_required_for_admins: boolean; updated_at: Date }>(
      this.dataSource.manager,
      `SELECT two_factor_required_for_admins, updated_at FROM lab_setting WHERE id`,
    );
    return {
      twoFactorRequiredForAdmins: row?.two_factor_required_for_admins ?? false,
      updatedAt: (row?.updated_at ?? new Date(0)).toISOString(),
    };
  }

  /**
   * Turning the requirement on needs the admin's own two-factor sign-in first, so the person switching it is never
   * the one locked out by it.
   */
  async update(actor: SessionUser, body: UpdateLabSettingsDto): Promise<LabSettingsDto> {
    await this.dataSource.transaction(async (manager) => {
      const [current] = await queryRows<{ two_factor_required_for_admins: boolean }>(
        manager,
        `SELECT two_factor_required_for_admins FROM lab_setting WHERE id FOR UPDATE`,
      );
      if (current?.two_factor_required_for_admins === body.twoFactorRequiredForAdmins) return;
      if (body.twoFactorRequiredForAdmins) {
        const [own] = await queryRows<{ on: boolean }>(
          manager,
          `SELECT two_factor_enabled_at IS NOT NULL AS on FROM user_account WHERE id = $1`,
          [actor.id],
        );
        if (!own?.on) {
          throw new UserException(
            'TWO_FACTOR_OFF',
            'Turn on two-factor sign-in for your own account first, then require it of every admin.',
            [{ field: 'twoFactorRequiredForAdmins', message: 'needs your own two-factor sign-in turned on first' }],
          );
        }
      }
      await manager.query(
        `INSERT INTO lab_setting (id, two_factor_required_for_admins, updated_at) VALUES (true, $1, now())
         ON CONFLICT (id) DO UPDATE SET two_factor_required_for_admins = EXCLUDED.two_factor_required_for_admins, updated_at = now()`,
        [body.twoFactorRequiredForAdmins],
      );
      await this.audit.record(manager, {
        actor,
        action: 'lab.two-factor-requirement-changed',
        subjectType: 'lab',
        data: { twoFactorRequiredForAdmins: body.twoFactorRequiredForAdmins },
      });
    });
    return this.get();
  }
}
