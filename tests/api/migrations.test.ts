import pg from 'pg';
import { afterAll, describe, expect, it } from 'vitest';
import { createDataSource, runMigrations } from '../../server/db/data-source';
import { migrations } from '../../server/db/migrations';
import { unique } from '../support/api';

// A database of its own: the migrations run from empty, then a second run changes nothing.
const adminUrl = process.env.TEST_PG_ADMIN_URL!;
const name = unique('migrations_');
const admin = new pg.Client({ connectionString: adminUrl });
await admin.connect();
await admin.query(`CREATE DATABASE ${name}`);
const db = createDataSource({ url: adminUrl.replace(/\/postgres$/, `/${name}`), poolSize: 2 });
await db.initialize();

afterAll(async () => {
  await db.destroy();
  await admin.query(`DROP DATABASE ${name}`);
  await admin.end();
});

async function schemaSnapshot() {
  const columns = await db.query(
    `SELECT table_name, column_name, data_type, is_nullable, column_default FROM information_schema.columns
     WHERE table_schema = 'public' ORDER BY table_name, column_name`,
  );
  const indexes = await db.query(`SELECT indexname, indexdef FROM pg_indexes WHERE schemaname = 'public' ORDER BY indexname`);
  const constraints = await db.query(
    `SELECT conname, pg_get_constraintdef(oid) AS def FROM pg_constraint WHERE connamespace = 'public'::regnamespace ORDER BY conname`,
  );
  return { columns, indexes, constraints };
}

describe('migrations', () => {
  it('run from an empty database, and a second run changes nothing', async () => {
    const first = await runMigrations(db);
    expect(first).toEqual(migrations.map((m) => new m().name));
    const afterFirst = await schemaSnapshot();
    expect(afterFirst.columns.length).toBeGreaterThan(0);

    const second = await runMigrations(db);
    expect(second).toEqual([]);
    expect(await schemaSnapshot()).toEqual(afterFirst);
  });

  it('stores the wide values intake writes with LZ4 (Debian builds PostgreSQL with it)', async () => {
    const rows: { col: string; method: string }[] = await db.query(
      `SELECT attrelid::regclass::text || '.' || attname AS col, attcompression AS method FROM pg_attribute
       WHERE attcompression <> '' ORDER BY 1`,
    );
    // 'l' is LZ4 in pg_attribute.attcompression (PostgreSQL manual, "pg_attribute").
    expect(rows).toEqual(
      ['outbox_messages.html_body', 'outbox_messages.text_body', 'referral_timeline.details', 'referrals.triage', 'routing_snapshots.candidates', 'routing_snapshots.excluded'].map(
        (col) => ({ col, method: 'l' }),
      ),
    );
  });
});
