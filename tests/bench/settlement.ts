import { chmodSync, mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import Stripe from 'stripe';
import { triage } from '@shared/domain/triage';
import { createPaymentsFake } from '../../fakes/payments/payments-fake';
import { ensureCluster, ensureDatabase } from '../../server/cli/lib/postgres';
import { loadConfig } from '../../server/config';
import { createDataSource, runMigrations } from '../../server/db/data-source';
import { setLogLevel } from '../../server/lib/logger';
import { earningsOf, runSettlement } from '../../server/payouts';
import { summarize } from './stats';

// Money figures on a throwaway PostgreSQL cluster (like `npm test`) and the in-process payments fake:
// - the monthly settlement of 2 000 shops with 100 000 commission lines, end to end: statements, one
//   transfer per shop through the official SDK, the ledger postings (target ≤ 30 s);
// - the same run again, which must pay nobody twice (it finds everything paid);
// - a shop's earnings page query with 5 000 lines over a year, some settled (target p95 ≤ 50 ms).
// The data is bulk-loaded with SQL (balanced ledger transactions; triggers off while loading, as a bulk
// load would run); the settlement itself runs with every check on.
const SHOPS = 2_000;
const LINES = 100_000;
const EARNINGS_LINES = 5_000;
const PERIOD = '2025-06';

export async function benchSettlement(): Promise<void> {
  const dataDir = mkdtempSync(path.join(os.tmpdir(), 'platterpost-bench-money-'));
  chmodSync(dataDir, 0o755);
  const port = Number(process.env.BENCH_PG_PORT ?? 54390) + 3;
  const cluster = ensureCluster({ dataDir: path.join(dataDir, 'pg'), port, settings: { fsync: 'off', synchronous_commit: 'off', full_page_writes: 'off' } });
  const secretKey = 'sk_test_bench_money';
  const fake = createPaymentsFake({ port: 0, secretKey, webhookSecret: 'whsec_bench_money' });
  await fake.start();
  try {
    await ensureDatabase(cluster, 'platterpost_bench_money');
    setLogLevel('warn');
    const config = loadConfig({
      NODE_ENV: 'test',
      DATABASE_URL: cluster.url('platterpost_bench_money'),
      LOG_LEVEL: 'warn',
      PAYMENTS_API_URL: fake.url,
      PAYMENTS_SECRET_KEY: secretKey,
      PAYMENTS_WEBHOOK_SECRET: 'whsec_bench_money',
      PAYMENTS_MAX_NETWORK_RETRIES: '0',
    });
    const db = await createDataSource({ url: config.databaseUrl, poolSize: 10 }).initialize();
    await runMigrations(db);
    const ctx = { db, config };

    // The shops, one lab, and a connected account per shop, onboarded at the fake.
    const setupStart = performance.now();
    const [lab] = await db.query(
      `INSERT INTO organizations (kind, name, slug, country, time_zone) VALUES ('lab', 'Bench Lab', 'bench-lab', 'US', 'America/Phoenix') RETURNING id`,
    );
    const shops: { id: string }[] = await db.query(
      `INSERT INTO organizations (kind, name, slug, country, time_zone)
       SELECT 'partner', 'Bench Shop ' || i, 'bench-shop-' || i, 'US', 'America/Chicago' FROM generate_series(1, $1::int + 1) i RETURNING id`,
      [SHOPS],
    );
    const stripe = new Stripe(secretKey, { host: '127.0.0.1', port: fake.port, protocol: 'http', maxNetworkRetries: 0 });
    const accounts: string[] = [];
    for (let i = 0; i < shops.length; i += 25) {
      const batch = await Promise.all(
        shops.slice(i, i + 25).map(async () => {
          const a = await stripe.accounts.create({ type: 'express', capabilities: { transfers: { requested: true } } });
          await fetch(`${fake.url}/_fake/accounts/${a.id}/onboard`, { method: 'POST' });
          return a.id;
        }),
      );
      accounts.push(...batch);
    }
    await db.query(
      `INSERT INTO payout_accounts (organization_id, provider_account_id, charges_enabled, payouts_enabled, details_submitted)
       SELECT o, a, true, true, true FROM unnest($1::uuid[], $2::text[]) AS t(o, a)`,
      [shops.map((s) => s.id), accounts],
    );

    // 100 000 paid cases in the period for the 2 000 shops, plus 5 000 over a year for the earnings shop.
    const earningsShop = shops[SHOPS]!.id;
    const settleShops = shops.slice(0, SHOPS).map((s) => s.id);
    const stored = JSON.stringify({ ...triage({ mediaType: 'hdd_2_5', symptoms: ['deleted_files'], sensitivity: [] }), battery: null });
    await db.transaction(async (m) => {
      await m.query(`SET LOCAL session_replication_role = replica`);
      await m.query(
        `INSERT INTO referrals (reference_number, reference, partner_organization_id, status, customer_name, customer_email, media_type,
           origin_postal_code, origin_country, origin_lat, origin_lon, triage, lab_organization_id, created_by_type, created_by_id, created_by_name)
         SELECT 5000000 + i, 'PPM-' || i,
                CASE WHEN i <= $1 THEN ($2::uuid[])[1 + i % $3] ELSE $4::uuid END,
                'paid', 'Bench Customer', 'bench@customer.test', 'hdd_2_5', '80202', 'US', 39.75, -104.99, $5::jsonb, $6, 'user', 'bench', 'Bench'
         FROM generate_series(1, $1::int + $7::int) i`,
        [LINES, settleShops, SHOPS, earningsShop, stored, lab.id, EARNINGS_LINES],
      );
      const [clearing] = await m.query(`INSERT INTO ledger_accounts (kind, currency) VALUES ('processor_clearing', 'USD') RETURNING id`);
      await m.query(
        `INSERT INTO ledger_accounts (kind, organization_id, currency) SELECT 'partner_commission_payable', id, 'USD' FROM organizations WHERE kind = 'partner'`,
      );
      // Each case: a balanced transaction (clearing +c, the shop's payable −c) and its commission line.
      await m.query(
        `WITH cases AS (
           SELECT r.id AS referral_id, r.partner_organization_id AS shop, r.reference_number,
                  CASE WHEN r.partner_organization_id = $2 THEN timestamptz '2025-07-15' - ((r.reference_number % 365) || ' days')::interval
                       ELSE timestamptz '2025-06-01' + ((r.reference_number % 29) || ' days')::interval END AS at,
                  2000 + (r.reference_number % 9000) AS commission
           FROM referrals r WHERE r.reference LIKE 'PPM-%'
         ), tx AS (
           INSERT INTO ledger_transactions (kind, source_id, referral_id, currency, occurred_at, memo)
           SELECT 'customer_payment', 'pi_bench_' || reference_number, referral_id, 'USD', at, 'Bench payment' FROM cases
           RETURNING id, referral_id
         ), entries AS (
           INSERT INTO ledger_entries (transaction_id, account_id, amount_minor, currency, memo)
           SELECT tx.id, x.account, x.amount, 'USD', 'Bench'
           FROM tx JOIN cases c ON c.referral_id = tx.referral_id
           JOIN ledger_accounts p ON p.kind = 'partner_commission_payable' AND p.organization_id = c.shop
           CROSS JOIN LATERAL (VALUES ($1::uuid, c.commission), (p.id, -c.commission)) AS x(account, amount)
         )
         INSERT INTO earning_lines (organization_id, payee_kind, kind, referral_id, ledger_transaction_id, currency, amount_minor, base_minor, basis_points, accrued_at)
         SELECT c.shop, 'partner', 'commission', c.referral_id, tx.id, 'USD', c.commission, c.commission * 10, 1000, c.at
         FROM tx JOIN cases c ON c.referral_id = tx.referral_id`,
        [clearing.id, earningsShop],
      );
    });
    await db.query(`ANALYZE`);
    console.log(`settlement: set-up of ${SHOPS} shops with connected accounts and ${LINES + EARNINGS_LINES} commission lines took ${((performance.now() - setupStart) / 1000).toFixed(1)} s`);

    // The settlement, end to end.
    const t0 = performance.now();
    const run = await runSettlement(ctx, { period: PERIOD, trigger: 'manual', organizationIds: settleShops });
    const seconds = (performance.now() - t0) / 1000;
    const transfers = fake.state.store.collections.transfers.size;
    console.log(
      `settlement of ${SHOPS} shops with ${LINES} commission lines: ${seconds.toFixed(1)} s end to end (${run.summary.paid} paid, ${run.summary.failed} failed, ${transfers} transfers at the fake) ${seconds <= 30 ? 'meets ≤ 30 s' : 'MISSES ≤ 30 s'}`,
    );
    const t1 = performance.now();
    const again = await runSettlement(ctx, { period: PERIOD, trigger: 'manual', organizationIds: settleShops });
    console.log(
      `settlement run again: ${((performance.now() - t1) / 1000).toFixed(2)} s, ${again.summary.paid} paid, transfers at the fake still ${fake.state.store.collections.transfers.size}`,
    );

    // A shop's earnings page: 5 000 lines over a year, the months before July 2025 settled.
    await runSettlement(ctx, { period: '2025-06', trigger: 'manual', organizationIds: [earningsShop] });
    for (let i = 0; i < 10; i++) await earningsOf(db.manager, earningsShop); // warm-up
    const samples: number[] = [];
    for (let i = 0; i < 200; i++) {
      const s = performance.now();
      await earningsOf(db.manager, earningsShop, new Date('2025-07-20T12:00:00Z'));
      samples.push(performance.now() - s);
    }
    summarize(`earnings page query, a shop with ${EARNINGS_LINES} lines`, samples, { p95: 50 });
    await db.destroy();
  } finally {
    await fake.stop();
    cluster.stop();
    rmSync(dataDir, { recursive: true, force: true });
  }
}
