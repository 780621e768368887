import type { DataSource, EntityManager } from 'typeorm';

// A statement that runs on every request is parsed and planned by PostgreSQL each time TypeORM sends it;
// as a named (prepared) statement it is parsed once per connection and its plan can be kept. Used for
// the few fixed statements on the intake path. Runs in the manager's transaction when it has one.
interface PgClient {
  query(config: { name: string; text: string; values: unknown[] }): Promise<{ rows: unknown[] }>;
}

export async function namedQuery<T>(manager: EntityManager, name: string, text: string, values: unknown[]): Promise<T[]> {
  if (readOnly.has(manager)) refuseWrite(text);
  const runner = manager.queryRunner as (typeof manager.queryRunner & { connect(): Promise<PgClient> }) | undefined;
  const client: PgClient =
    runner && !runner.isReleased && !pooled.has(manager) ? await runner.connect() : (manager.connection.driver as unknown as { master: PgClient }).master;
  const result = await client.query({ name, text, values });
  return result.rows as T[];
}

// A manager that may only read (see withBatchedWrite in appends.ts): its writes all go into one batched
// statement, and anything else that would write is refused before it reaches the database.
const readOnly = new WeakSet<EntityManager>();
// Managers with no connection of their own: each statement takes one from the pool and gives it back.
const pooled = new WeakSet<EntityManager>();

/**
 * A manager for work that only reads until one final statement: every statement runs on a pool
 * connection of its own, held only while it runs; writes, locking reads and transactions are refused
 * until `allowWrites` (TypeORM's own writes open a transaction first, so they are refused too).
 */
export function readOnlyPooledManager(dataSource: DataSource): EntityManager {
  const runner = dataSource.createQueryRunner();
  runner.query = (async (sql: string, parameters?: unknown[], structured?: boolean) => {
    if (readOnly.has(runner.manager)) refuseWrite(sql);
    const own = dataSource.createQueryRunner();
    try {
      return await own.query(sql, parameters, structured as never);
    } finally {
      await own.release();
    }
  }) as typeof runner.query;
  runner.connect = () => Promise.reject(new Error('A read-only pooled manager has no connection of its own'));
  runner.startTransaction = () => Promise.reject(new Error('Only plain reads may run before the batched write, outside a transaction'));
  pooled.add(runner.manager);
  readOnly.add(runner.manager);
  return runner.manager;
}

export function allowWrites(manager: EntityManager): void {
  readOnly.delete(manager);
}

const LOCKING_READ = /\bFOR\s+(NO\s+KEY\s+UPDATE|UPDATE|KEY\s+SHARE|SHARE)\b|pg_advisory/i;

/** Throws unless `sql` is a plain SELECT: no writes, no row or advisory locks (which would need a transaction). */
export function refuseWrite(sql: string): void {
  if (!/^\s*SELECT\b/i.test(sql) || LOCKING_READ.test(sql)) {
    throw new Error(`Only plain reads may run before the batched write, outside a transaction: ${sql.slice(0, 80)}`);
  }
}

/**
 * An entity built from columns of a raw row (`prefix` + column name), as TypeORM would hydrate it, for a
 * named statement that reads an entity together with other rows.
 */
export function hydrateRow<T extends object>(manager: EntityManager, target: new () => T, raw: Record<string, unknown>, prefix = ''): T {
  const meta = manager.connection.getMetadata(target);
  const entity = meta.create() as T;
  for (const column of meta.columns) {
    const name = prefix + column.databaseName;
    if (!(name in raw)) throw new Error(`hydrateRow: ${target.name} needs column ${name}`);
    column.setEntityValue(entity, manager.connection.driver.prepareHydratedValue(raw[name], column));
  }
  return entity;
}
