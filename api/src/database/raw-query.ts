import type { EntityManager } from 'typeorm';

/**
 * Runs SQL and returns its rows whatever the statement kind (TypeORM returns `[rows, count]` for UPDATE/DELETE
 * but plain rows for SELECT/INSERT). Uses the caller's transaction when there is one.
 */
export async function queryRows<Row = Record<string, unknown>>(
  manager: EntityManager,
  sql: string,
  parameters: unknown[] = [],
): Promise<Row[]> {
  const runner = manager.queryRunner ?? manager.connection.createQueryRunner();
  try {
    const result = await runner.query(sql, parameters, true);
    return result.records as Row[];
  } finally {
    if (!manager.queryRunner) await runner.release();
  }
}
