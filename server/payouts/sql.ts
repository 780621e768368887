import type { DataSource, EntityManager } from 'typeorm';

/**
 * Rows of an UPDATE … RETURNING. TypeORM's postgres driver answers UPDATE and DELETE with
 * `[rows, affectedCount]` instead of the rows, unlike SELECT and INSERT.
 */
export async function updateReturning<T>(on: DataSource | EntityManager, sql: string, params: unknown[]): Promise<T[]> {
  const result = (await on.query(sql, params)) as unknown;
  if (Array.isArray(result) && result.length === 2 && Array.isArray(result[0]) && typeof result[1] === 'number') return result[0] as T[];
  return result as T[];
}
