import { spawn } from 'node:child_process';
import type { AddressInfo } from 'node:net';
import express from 'express';
import request from 'supertest';
import { afterAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD } from '../../server/db/seed/demo-accounts';
import { retryPayout, runSettlement } from '../../server/payouts';
import { setupApi, signIn } from '../support/api';
import { fakeControl, mailsTo, onboardedAccount, paidCase, planForShop, shopAndLab, startPaymentsFake } from '../support/money-fixtures';

// Faults in the monthly settlement: the provider answering 500 on transfers (POST /_fake/fail), a run
// that dies after the provider made a transfer but before we recorded it, and a settlement process
// killed half way through. In every case the payout is retried, reported, and never made twice.
// This file settles months of 2022 only (other files settle other months).

const payments = await startPaymentsFake();
const { app, db, config } = await setupApi(payments.env);
const ctx = { db, config };
const at = (period: string, dayOfMonth = 10) => new Date(`${period}-${String(dayOfMonth).padStart(2, '0')}T15:00:00Z`);

function transfersTo(account: string) {
  return [...payments.fake.state.store.collections.transfers.values()].filter((t) => t.destination === account);
}

async function shopWithAccount() {
  const orgs = await shopAndLab(db);
  await planForShop(db, orgs.partnerId, [{ minPaidReferrals: 0, basisPoints: 1000 }]);
  return { ...orgs, account: await onboardedAccount(db, payments, orgs.partnerId) };
}

async function statementOf(organizationId: string, period: string) {
  const [row] = await db.query(
    `SELECT id, status, attempts, last_error, next_attempt_at, transfer_id, payout_minor::int AS payout FROM statements WHERE organization_id = $1 AND period = $2`,
    [organizationId, period],
  );
  return row as { id: string; status: string; attempts: number; last_error: string | null; next_attempt_at: Date | null; transfer_id: string | null; payout: number };
}

describe('the provider failing transfers', () => {
  it('marks the payout failed, tells the shop, retries it by a job after the back-off, and pays it once', async () => {
    const shop = await shopWithAccount();
    await paidCase(db, shop, { totalMinor: 25_000, serviceLinesMinor: 25_000, paidAt: at('2022-03') });
    await fakeControl(payments.fake, '/fail', { path: '/v1/transfers', method: 'POST', times: 1 });
    const startedAt = new Date();

    const run = await runSettlement(ctx, { period: '2022-03', trigger: 'manual', organizationIds: [shop.partnerId] });

    expect(run.status).toBe('completed_with_failures');
    expect(run.summary).toMatchObject({ paid: 0, failed: 1 });
    const failed = await statementOf(shop.partnerId, '2022-03');
    expect(failed).toMatchObject({ status: 'failed', attempts: 1, transfer_id: null });
    expect(failed.last_error).toMatch(/HTTP 500/);
    // First back-off: one minute.
    expect(failed.next_attempt_at!.getTime() - startedAt.getTime()).toBeGreaterThanOrEqual(60_000);
    expect(failed.next_attempt_at!.getTime() - startedAt.getTime()).toBeLessThan(70_000);
    const [job] = await db.query(`SELECT queue, data, start_after, singleton_key FROM job_outbox WHERE singleton_key = $1`, [failed.id]);
    expect(job).toMatchObject({ queue: 'payout-retry', data: { statementId: failed.id }, singleton_key: failed.id });
    expect(new Date(job.start_after).getTime()).toBe(failed.next_attempt_at!.getTime());
    expect(transfersTo(shop.account)).toEqual([]);
    expect((await mailsTo(db, shop.partnerAdmin.email)).map((m) => m.template)).toEqual(['statement_ready', 'payout_failed']);

    // The retry job runs its handler: nothing before the back-off has passed, the payout after.
    expect(await retryPayout(ctx, failed.id, new Date(failed.next_attempt_at!.getTime() - 1000))).toBeNull();
    const retried = await retryPayout(ctx, failed.id, new Date(failed.next_attempt_at!.getTime() + 1000));

    expect(retried).toMatchObject({ outcome: 'paid', amountMinor: 2500 });
    expect(transfersTo(shop.account).map((t) => t.amount)).toEqual([2500]);
    expect(await statementOf(shop.partnerId, '2022-03')).toMatchObject({ status: 'paid', attempts: 1, last_error: null, next_attempt_at: null });
    const audit = await db.query(`SELECT action FROM audit_events WHERE target_id = $1 ORDER BY at`, [failed.id]);
    expect(audit.map((a: { action: string }) => a.action)).toEqual(['payout.failed', 'payout.sent']);
    // Once paid, neither the job nor a rerun pays again.
    expect(await retryPayout(ctx, failed.id, new Date(Date.now() + 86_400_000))).toBeNull();
    await runSettlement(ctx, { period: '2022-03', trigger: 'manual', organizationIds: [shop.partnerId] });
    expect(transfersTo(shop.account)).toHaveLength(1);
  });

  it('stops retrying after the last attempt, says so, and lets the network admin retry by hand', async () => {
    const shop = await shopWithAccount();
    const fewAttempts = { db, config: { ...config, payoutMaxAttempts: 2 } };
    await paidCase(db, shop, { totalMinor: 8_000, serviceLinesMinor: 8_000, paidAt: at('2022-04') });
    await fakeControl(payments.fake, '/fail', { path: '/v1/transfers', method: 'POST', times: 2 });

    await runSettlement(fewAttempts, { period: '2022-04', trigger: 'schedule', organizationIds: [shop.partnerId] });
    const first = await statementOf(shop.partnerId, '2022-04');
    await retryPayout(fewAttempts, first.id, new Date(first.next_attempt_at!.getTime() + 1000));
    const gaveUp = await statementOf(shop.partnerId, '2022-04');

    expect(gaveUp).toMatchObject({ status: 'failed', attempts: 2, next_attempt_at: null });
    const failures = (await mailsTo(db, shop.partnerAdmin.email)).filter((m) => m.template === 'payout_failed');
    expect(failures).toHaveLength(2);
    expect(failures[1]!.text_body).toMatch(/send it by hand/);
    expect(await retryPayout(fewAttempts, first.id, new Date(Date.now() + 86_400_000))).toBeNull();

    const admin = await signIn(app, 'ines.albright@platterpost.example', DEMO_PASSWORD);
    const byHand = await request(app).post(`/api/network/statements/${first.id}/retry`).set({ Authorization: `Bearer ${admin.accessToken}` });
    expect(byHand.status).toBe(200);
    expect(byHand.body.outcome).toMatchObject({ outcome: 'paid', amountMinor: 800 });
    expect(byHand.body.statement.status).toBe('paid');
    expect(transfersTo(shop.account)).toHaveLength(1);
    const overview = await request(app).get('/api/network/settlements').set({ Authorization: `Bearer ${admin.accessToken}` });
    expect(overview.body.failures.map((s: { id: string }) => s.id)).not.toContain(first.id);
  });
});

describe('a run that stops half way', () => {
  it('finds the transfer a dead run made but never recorded, and pays nothing more', async () => {
    const shop = await shopAndLab(db);
    await planForShop(db, shop.partnerId, [{ minPaidReferrals: 0, basisPoints: 1000 }]);
    await paidCase(db, shop, { totalMinor: 40_000, serviceLinesMinor: 40_000, paidAt: at('2022-05') });
    // Prepared while the shop had no payout account yet.
    await runSettlement(ctx, { period: '2022-05', trigger: 'manual', organizationIds: [shop.partnerId] });
    const account = await onboardedAccount(db, payments, shop.partnerId);
    const statement = await statementOf(shop.partnerId, '2022-05');
    // What a run does just before it dies: the statement is marked paying, the provider makes the transfer…
    await db.query(`UPDATE statements SET status = 'paying', claimed_at = now() WHERE id = $1`, [statement.id]);
    const made = await payments.stripe.transfers.create(
      {
        amount: 4000,
        currency: 'usd',
        destination: account,
        transfer_group: `settlement:${shop.partnerId}:2022-05`,
        description: 'Platterpost commission for 2022-05',
        metadata: { statementId: statement.id, organizationId: shop.partnerId, period: '2022-05' },
      },
      { idempotencyKey: `settlement:${shop.partnerId}:2022-05` },
    );
    // …and the answer never reaches the database.

    const run = await runSettlement(ctx, { period: '2022-05', trigger: 'manual', organizationIds: [shop.partnerId] });

    expect(run.summary).toMatchObject({ paid: 1, failed: 0 });
    expect(await statementOf(shop.partnerId, '2022-05')).toMatchObject({ status: 'paid', transfer_id: made.id });
    expect(transfersTo(account).map((t) => t.id)).toEqual([made.id]);
  });

  it('survives the settlement process being killed after some transfers: the next run completes and no one is paid twice', async () => {
    const shops: Awaited<ReturnType<typeof shopWithAccount>>[] = [];
    for (let i = 0; i < 6; i++) {
      const shop = await shopWithAccount();
      await paidCase(db, shop, { totalMinor: 10_000 * (i + 1), serviceLinesMinor: 10_000 * (i + 1), paidAt: at('2022-06', i + 1) });
      shops.push(shop);
    }
    const accounts = new Set(shops.map((s) => s.account));
    const ours = () => [...payments.fake.state.store.collections.transfers.values()].filter((t) => accounts.has(t.destination));

    // In front of the fake: transfer answers are held back a while after the transfer is made, which is
    // where a crash hurts most (the provider has paid; we have not recorded it).
    const gate = express();
    gate.use((req, res, next) => {
      if (req.method === 'POST' && req.path === '/v1/transfers') {
        const end = res.end.bind(res) as (...args: unknown[]) => unknown;
        (res as unknown as { end: (...args: unknown[]) => unknown }).end = (...args: unknown[]) => {
          setTimeout(() => end(...args), 400);
          return res;
        };
      }
      next();
    });
    gate.use(payments.fake.app);
    const gateServer = gate.listen(0, '127.0.0.1');
    await new Promise((resolve) => gateServer.once('listening', resolve));
    afterAll(() => new Promise<void>((resolve) => gateServer.close(() => resolve())));

    const child = spawn(
      process.execPath,
      // One process (tsx as a loader, not its CLI, which would run the script in a grandchild that outlives the kill).
      ['--import', 'tsx', 'tests/support/settlement-child.ts', '2022-06', shops.map((s) => s.partnerId).join(',')],
      {
        env: {
          ...process.env,
          ...payments.env,
          NODE_ENV: 'test',
          DATABASE_URL: inject('databaseUrl'),
          PAYMENTS_API_URL: `http://127.0.0.1:${(gateServer.address() as AddressInfo).port}`,
          SETTLEMENT_CONCURRENCY: '1',
          LOG_LEVEL: 'error',
        },
        stdio: ['ignore', 'pipe', 'inherit'],
      },
    );
    let output = '';
    child.stdout.on('data', (d: Buffer) => (output += d.toString()));
    const exited = new Promise<NodeJS.Signals | number | null>((resolve) => child.once('exit', (code, signal) => resolve(signal ?? code)));
    // Killed (no clean-up at all) the moment the provider has made the third transfer.
    await new Promise<void>((resolve, reject) => {
      const timer = setInterval(() => {
        if (ours().length >= 3) {
          clearInterval(timer);
          child.kill('SIGKILL');
          resolve();
        }
      }, 5);
      void exited.then((how) => {
        clearInterval(timer);
        reject(new Error(`the settlement process ended (${how}) before it was killed: ${output}`));
      });
    }).catch((err) => {
      throw err;
    });
    expect(await exited).toBe('SIGKILL');

    const states = async () =>
      (await db.query(`SELECT status, count(*)::int AS n FROM statements WHERE organization_id = ANY($1) GROUP BY status ORDER BY status`, [
        shops.map((s) => s.partnerId),
      ])) as { status: string; n: number }[];
    expect(ours()).toHaveLength(3);
    expect(await states()).toEqual([
      { status: 'paid', n: 2 },
      { status: 'paying', n: 1 },
      { status: 'pending', n: 3 },
    ]);

    // The next run (PostgreSQL drops the dead process's lock when its connection goes).
    let run: Awaited<ReturnType<typeof runSettlement>>;
    for (let attempt = 0; ; attempt++) {
      try {
        run = await runSettlement(ctx, { period: '2022-06', trigger: 'manual', organizationIds: shops.map((s) => s.partnerId) });
        break;
      } catch (err) {
        if ((err as { code?: string }).code !== 'settlement_running' || attempt > 100) throw err;
        await new Promise((r) => setTimeout(r, 100));
      }
    }

    expect(run.summary).toMatchObject({ statementsCreated: 0, paid: 4, failed: 0 });
    expect(await states()).toEqual([{ status: 'paid', n: 6 }]);
    for (const [i, shop] of shops.entries()) expect(transfersTo(shop.account).map((t) => t.amount)).toEqual([1000 * (i + 1)]);
    const runs = await db.query(`SELECT status FROM settlement_runs WHERE period = '2022-06' ORDER BY started_at`);
    expect(runs.map((r: { status: string }) => r.status)).toEqual(['interrupted', 'completed']);
    const [check] = await db.query(
      `SELECT count(DISTINCT t.id)::int AS payouts, sum(e.amount_minor) FILTER (WHERE a.kind = 'transfers_out')::int AS out
       FROM ledger_transactions t JOIN ledger_entries e ON e.transaction_id = t.id JOIN ledger_accounts a ON a.id = e.account_id
       WHERE t.kind = 'payout' AND t.details->>'organizationId' = ANY($1)`,
      [shops.map((s) => s.partnerId)],
    );
    expect(check).toEqual({ payouts: 6, out: -(1000 + 2000 + 3000 + 4000 + 5000 + 6000) });
  });
});
