/**
 * Highest page number any list accepts: far past any real list, and small enough that `(page - 1) × pageSize`
 * stays a safe integer offset for PostgreSQL.
 */
export const MAX_PAGE = 100_000;
