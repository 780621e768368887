import { describe, expect, it } from 'vitest';
import type { EntityManager } from 'typeorm';
import { readTogether } from '../../server/db/reads';
import { setupApi } from '../support/api';

const { db } = await setupApi();

/** Two reads that log when they start and end, so the test can see whether they overlapped. */
function loggedReads(manager: EntityManager, log: string[]) {
  const read = (name: string) => async () => {
    log.push(`${name} start`);
    const [row] = await manager.query(`SELECT $1::text AS name, pg_sleep(0.05) IS NULL AS slept`, [name]);
    log.push(`${name} end`);
    return row.name as string;
  };
  return [read('a'), read('b')] as const;
}

describe('readTogether', () => {
  it('runs the reads side by side on the pool and answers in their order', async () => {
    const log: string[] = [];
    expect(await readTogether(db.manager, loggedReads(db.manager, log))).toEqual(['a', 'b']);
    expect(log.slice(0, 2)).toEqual(['a start', 'b start']);
  });

  it('runs them one after another inside a transaction, whose connection takes one statement at a time', async () => {
    const log: string[] = [];
    const names = await db.transaction((m) => readTogether(m, loggedReads(m, log)));
    expect(names).toEqual(['a', 'b']);
    expect(log).toEqual(['a start', 'a end', 'b start', 'b end']);
  });
});
