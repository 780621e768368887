import { chmodSync, mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { triage } from '@shared/domain/triage';
import { createShippingFake } from '../../fakes/shipping/shipping-fake';
import { createApp } from '../../server/app';
import { signAccessToken } from '../../server/auth/tokens';
import { ensureCluster, ensureDatabase } from '../../server/cli/lib/postgres';
import { loadConfig } from '../../server/config';
import { createDataSource, runMigrations } from '../../server/db/data-source';
import { setLogLevel } from '../../server/lib/logger';
import { inboundBoard } from '../../server/receiving';
import { summarize } from './stats';

// Shipping figures on a throwaway PostgreSQL cluster (like `npm test`):
// - the inbound board's queries for a lab with 100 000 shipments in the table (target p95 ≤ 50 ms);
// - buying a label end to end through the API against the in-process shipping fake (target p95 ≤ 150 ms).
// The lab's history is mostly delivered and checked in, as a lab's would be after a few years; a few hundred
// boxes are on their way in every state.
const SHIPMENTS = 100_000;
const OPEN = 400;

export async function benchShipping(): Promise<void> {
  const dataDir = mkdtempSync(path.join(os.tmpdir(), 'platterpost-bench-'));
  chmodSync(dataDir, 0o755);
  const port = Number(process.env.BENCH_PG_PORT ?? 54390);
  const cluster = ensureCluster({ dataDir: path.join(dataDir, 'pg'), port, settings: { fsync: 'off', synchronous_commit: 'off', full_page_writes: 'off' } });
  const fake = createShippingFake({ port: 0, apiKey: 'bench_key', webhookSecret: 'bench-secret', clockSpeed: 0 });
  await fake.start();
  try {
    await ensureDatabase(cluster, 'platterpost_bench');
    setLogLevel('warn');
    const config = loadConfig({
      NODE_ENV: 'test',
      DATABASE_URL: cluster.url('platterpost_bench'),
      LOG_LEVEL: 'warn',
      SHIPPING_API_URL: fake.baseUrl,
      SHIPPING_API_KEY: 'bench_key',
      SHIPPING_WEBHOOK_SECRET: 'bench-secret',
    });
    const db = await createDataSource({ url: config.databaseUrl, poolSize: 4 }).initialize();
    await runMigrations(db);

    // Two shops, the lab, one case per 10 boxes.
    const [lab] = await db.query(
      `INSERT INTO organizations (kind, name, slug, address_line1, city, region, postal_code, country, lat, lon, time_zone)
       VALUES ('lab', 'Bench Lab', 'bench-lab', '1 Bench Way', 'Phoenix', 'AZ', '85004', 'US', 33.45, -112.07, 'America/Phoenix') RETURNING id`,
    );
    const shops: { id: string }[] = await db.query(
      `INSERT INTO organizations (kind, name, slug, address_line1, city, region, postal_code, country, lat, lon, time_zone)
       SELECT 'partner', 'Bench Shop ' || i, 'bench-shop-' || i, '2 Counter St', 'Bismarck', 'ND', '58501', 'US', 46.8, -100.78, 'America/Chicago'
       FROM generate_series(1, 20) i RETURNING id`,
    );
    const stored = JSON.stringify({ ...triage({ mediaType: 'hdd_3_5', symptoms: ['clicking'], sensitivity: [] }), battery: null });
    await db.query(
      `INSERT INTO referrals (reference_number, reference, partner_organization_id, status, customer_name, customer_email, media_type,
         origin_postal_code, origin_country, origin_lat, origin_lon, triage, lab_organization_id, created_by_type, created_by_id, created_by_name)
       SELECT 2000000 + i, 'PPB-' || i, ($1::uuid[])[1 + i % 20], 'received', 'Bench Customer', 'bench@customer.test', 'hdd_3_5',
         '58501', 'US', 46.8, -100.78, $2::jsonb, $3, 'user', 'bench', 'Bench'
       FROM generate_series(1, $4::int) i`,
      [shops.map((s) => s.id), stored, lab.id, SHIPMENTS / 10],
    );
    const address = JSON.stringify({ name: 'x', company: null, street1: 'x', street2: null, city: 'x', state: 'x', zip: '85004', country: 'US', phone: null });
    const t0 = performance.now();
    await db.query(
      `INSERT INTO shipments (referral_id, kind, from_organization_id, to_organization_id, from_address, to_address, length_in, width_in, height_in,
         weight_oz, status, status_rank, tracking_code, carrier, service, estimated_delivery_at, delivered_at, checked_in_at, last_event_at,
         last_message, overdue_at, created_by_type, created_by_name, created_at)
       SELECT r.id, 'inbound', r.partner_organization_id, $1, $2::jsonb, $2::jsonb, 10, 8, 6, 48,
         CASE WHEN g.i <= $3 THEN (ARRAY['label_issued','in_transit','out_for_delivery','delivered','exception'])[1 + g.i % 5] ELSE 'delivered' END,
         CASE WHEN g.i <= $3 THEN (ARRAY[1,2,3,4,2])[1 + g.i % 5] ELSE 4 END,
         'BB' || lpad(g.i::text, 16, '0'), 'Brambleway', 'Ground',
         now() - (g.i % 900) * interval '1 day' + interval '3 days',
         CASE WHEN g.i > $3 OR g.i % 5 = 3 THEN now() - (g.i % 900) * interval '1 day' - (g.i % 2) * interval '1 day' END,
         CASE WHEN g.i > $3 THEN now() - (g.i % 900) * interval '1 day' END,
         now() - (g.i % 900) * interval '1 day', 'Scan', CASE WHEN g.i <= $3 AND g.i % 17 = 0 THEN now() END,
         'system', 'bench', now() - (g.i % 900) * interval '1 day'
       FROM generate_series(1, $4::int) g(i)
       JOIN referrals r ON r.reference = 'PPB-' || (1 + (g.i - 1) / 10)`,
      [lab.id, address, OPEN, SHIPMENTS],
    );
    await db.query('ANALYZE');
    console.log(`shipping: ${SHIPMENTS.toLocaleString('en-US')} shipments for one lab (${OPEN} not yet checked in) inserted in ${((performance.now() - t0) / 1000).toFixed(1)} s`);

    const actor = { userId: '00000000-0000-0000-0000-000000000000', organizationId: lab.id, organizationKind: 'lab' as const, role: 'shipping_clerk' as const };
    const ctx = { config, db };
    const queries: { label: string; query: Record<string, string> }[] = [
      { label: 'whole board', query: {} },
      { label: 'one status', query: { bucket: 'in_transit' } },
      { label: 'search by tracking code', query: { q: 'BB0000000000000123' } },
      { label: 'search by shop', query: { q: 'Bench Shop 7' } },
    ];
    for (let i = 0; i < 20; i++) await inboundBoard(ctx, actor, {});
    const board: number[] = [];
    for (let i = 0; i < 200; i++) {
      const q = queries[i % queries.length]!;
      const s = performance.now();
      await inboundBoard(ctx, actor, q.query);
      board.push(performance.now() - s);
    }
    const sample = await inboundBoard(ctx, actor, {});
    console.log(`shipping: the board shows ${sample.data.length} rows; counts ${JSON.stringify(sample.counts)}`);
    summarize('inbound board (rows + counts), 100 000 shipments in the table', board, { p95: 50 });

    // Buying a label end to end: the shop's request through the app, the SDK, the fake and back.
    const app = createApp({ config, db });
    const staff = await db.query(
      `INSERT INTO users (email, name, role, organization_id, status, password_hash) VALUES ('bench.staff@shop.test', 'Bench Staff', 'partner_staff', $1, 'active', 'x') RETURNING id`,
      [shops[0]!.id],
    );
    const token = signAccessToken({ sub: staff[0].id, role: 'partner_staff', org: shops[0]!.id, kind: 'partner' }, config.jwtSecret, 3600);
    const BUYS = 120;
    const [{ n0 }] = await db.query(`SELECT nextval('referral_number_seq')::text AS n0`);
    const cases: { id: string }[] = await db.query(
      `INSERT INTO referrals (reference_number, reference, partner_organization_id, status, customer_name, customer_email, media_type, origin_line1,
         origin_city, origin_region, origin_postal_code, origin_country, origin_lat, origin_lon, triage, lab_organization_id, created_by_type, created_by_id, created_by_name)
       SELECT $1::bigint + i, 'PPX-' || i, $2, 'accepted', 'Bench Customer', 'bench@customer.test', 'hdd_3_5', '2 Counter St', 'Bismarck', 'ND', '58501', 'US',
         46.8, -100.78, $3::jsonb, $4, 'user', 'bench', 'Bench'
       FROM generate_series(1, $5::int) i RETURNING id`,
      [n0, shops[0]!.id, stored, lab.id, BUYS],
    );
    const buys: number[] = [];
    for (const [i, c] of cases.entries()) {
      const rated = await request(app).post(`/api/referrals/${c.id}/shipments`).set('Authorization', `Bearer ${token}`).send({ parcel: { boxPreset: 'drive', weightLb: 3 } });
      if (rated.status !== 201) throw new Error(`rating failed: ${rated.status} ${JSON.stringify(rated.body)}`);
      const s = performance.now();
      const bought = await request(app).post(`/api/shipments/${rated.body.id}/buy`).set('Authorization', `Bearer ${token}`).send({ rateId: rated.body.rates[0].id });
      const ms = performance.now() - s;
      if (bought.status !== 200) throw new Error(`buying failed: ${bought.status} ${JSON.stringify(bought.body)}`);
      if (i >= 20) buys.push(ms); // the first 20 warm up
    }
    summarize('buying a label end to end (API → SDK → shipping fake → database)', buys, { p95: 150 });
    await db.destroy();
  } finally {
    await fake.stop();
    cluster.stop();
    rmSync(dataDir, { recursive: true, force: true });
  }
}
