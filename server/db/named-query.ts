import type { EntityManager } from 'typeorm';

// A statement that runs on every request is parsed and planned by PostgreSQL each time TypeORM sends it;
// as a named (prepared) statement it is parsed once per connection and its plan can be kept. Used for
// the few fixed statements on the intake path. Runs in the manager's transaction when it has one.
interface PgClient {
  query(config: { name: string; text: string; values: unknown[] }): Promise<{ rows: unknown[] }>;
}

export async function namedQuery<T>(manager: EntityManager, name: string, text: string, values: unknown[]): Promise<T[]> {
  const runner = manager.queryRunner as (typeof manager.queryRunner & { connect(): Promise<PgClient> }) | undefined;
  const client: PgClient = runner && !runner.isReleased ? await runner.connect() : (manager.connection.driver as unknown as { master: PgClient }).master;
  const result = await client.query({ name, text, values });
  return result.rows as T[];
}
