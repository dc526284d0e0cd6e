import { DataSourceOptions } from 'typeorm';
import { AuditEventEntity } from '../audit/entities/audit-event.entity';
import { RefreshTokenEntity } from '../auth/entities/refresh-token.entity';
import { SignInLinkEntity } from '../auth/entities/sign-in-link.entity';
import { RateLimitWindowEntity } from '../rate-limit/entities/rate-limit-window.entity';
import { StudyMembershipEntity } from '../studies/entities/study-membership.entity';
import { StudyEntity } from '../studies/entities/study.entity';
import { UserEntity } from '../users/entities/user.entity';
import { Foundation1764600000000 } from './migrations/1764600000000-foundation';

/** Every entity, listed by hand so nothing depends on file globs. */
export const ENTITIES = [
  UserEntity,
  SignInLinkEntity,
  RefreshTokenEntity,
  StudyEntity,
  StudyMembershipEntity,
  AuditEventEntity,
  RateLimitWindowEntity,
];

/** Every migration in order. Never edit one that has landed; add a new one. */
export const MIGRATIONS = [Foundation1764600000000];

export function dataSourceOptions(databaseUrl: string): DataSourceOptions {
  return {
    type: 'postgres',
    url: databaseUrl,
    entities: ENTITIES,
    migrations: MIGRATIONS,
    migrationsTableName: 'schema_migration',
    synchronize: false,
    migrationsRun: false,
    extra: { max: 20 },
  };
}
