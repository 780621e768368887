import pg from 'pg';

/** Every statement the pg driver is handed while `work` runs in this test file (TypeORM, named statements, pool queries). */
export async function statementsOf<T>(work: () => Promise<T>): Promise<{ result: T; statements: string[] }> {
  const statements: string[] = [];
  const original = pg.Client.prototype.query;
  pg.Client.prototype.query = function (this: pg.Client, ...args: unknown[]) {
    const first = args[0] as string | { text: string };
    statements.push((typeof first === 'string' ? first : first.text).trim());
    return (original as (...a: unknown[]) => unknown).apply(this, args);
  } as typeof original;
  try {
    return { result: await work(), statements };
  } finally {
    pg.Client.prototype.query = original;
  }
}
