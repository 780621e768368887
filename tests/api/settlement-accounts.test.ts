import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import request from 'supertest';
import { afterAll, describe, expect, it } from 'vitest';
import { payoutAccountDto, payoutOnboardingDto } from '@shared/schemas/money';
import { onPaymentEvent, runSettlement } from '../../server/payouts';
import { setupApi, signIn, unique } from '../support/api';
import { createUser, TEST_PASSWORD } from '../support/factories';
import { paidCase, planForShop, shopAndLab, startPaymentsFake } from '../support/money-fixtures';

// Payout accounts (connected accounts at the payment provider, onboarded on its hosted page) and the
// shared payments webhook: signatures checked with stripe.webhooks.constructEvent, each event handled once.
// The app listens on a port here so the fake's signed events really arrive at POST /api/webhooks/payments.
// Settlement months used here: 2021 (other files use other years).

const payments = await startPaymentsFake();
const { app, db, config } = await setupApi(payments.env);
const server: Server = await new Promise((resolve) => {
  const s = app.listen(0, '127.0.0.1', () => resolve(s));
});
afterAll(() => new Promise<void>((resolve) => server.close(() => resolve())));
payments.fake.setWebhookUrl(`http://127.0.0.1:${(server.address() as AddressInfo).port}/api/webhooks/payments`);
const auth = (token: string) => ({ Authorization: `Bearer ${token}` });
const secret = payments.env.PAYMENTS_WEBHOOK_SECRET!;

function signed(payload: string, options: { timestamp?: number } = {}) {
  return payments.stripe.webhooks.generateTestHeaderString({ payload, secret, ...options });
}

function eventJson(type: string, object: Record<string, unknown>, created = Math.floor(Date.now() / 1000)) {
  return JSON.stringify({ id: unique('evt_'), object: 'event', api_version: '2025-01-01', created, type, data: { object }, livemode: false, pending_webhooks: 1, request: { id: null } });
}

async function postEvent(payload: string, signature = signed(payload)) {
  return request(app).post('/api/webhooks/payments').set('Content-Type', 'application/json').set('Stripe-Signature', signature).send(payload);
}

async function until<T>(read: () => Promise<T>, ok: (v: T) => boolean, timeoutMs = 10_000): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const value = await read();
    if (ok(value) || Date.now() > deadline) return value;
    await new Promise((r) => setTimeout(r, 50));
  }
}

describe('payout account onboarding', () => {
  it('opens one connected account per shop, links to the hosted page, and learns from account.updated that payouts work', async () => {
    const orgs = await shopAndLab(db);
    const shop = await signIn(app, orgs.partnerAdmin.email, TEST_PASSWORD);

    const first = await request(app).post('/api/partner/payout-account').set(auth(shop.accessToken));
    const second = await request(app).post('/api/partner/payout-account').set(auth(shop.accessToken));

    expect(first.status).toBe(201);
    const started = payoutOnboardingDto.parse(first.body);
    expect(started.url).toMatch(new RegExp(`^${payments.fake.url}/onboard/`));
    expect(started.account).toMatchObject({ status: 'onboarding', payoutsEnabled: false, chargesEnabled: false });
    expect(second.body.account.accountId).toBe(started.account.accountId);
    expect(second.body.url).not.toBe(started.url);
    const atProvider = [...payments.fake.state.store.collections.accounts.values()].filter((a) => a.metadata.organizationId === orgs.partnerId);
    expect(atProvider.map((a) => [a.id, a.type, a.metadata.organizationKind])).toEqual([[started.account.accountId, 'express', 'partner']]);

    // The person fills in the hosted page; the provider sends them back and tells us by webhook.
    const page = await fetch(started.url);
    expect(page.status).toBe(200);
    const finish = await fetch(`${payments.fake.url}/onboard/${new URL(second.body.url).pathname.split('/').pop()}`, {
      method: 'POST',
      headers: { 'content-type': 'application/x-www-form-urlencoded' },
      body: 'businessName=Test+Shop',
      redirect: 'manual',
    });
    expect(finish.status).toBe(303);
    expect(finish.headers.get('location')).toBe('http://app.test/partner/earnings?payouts=returned');
    await payments.fake.webhooksIdle();
    const stored = await until(
      () => db.query(`SELECT payouts_enabled FROM payout_accounts WHERE organization_id = $1`, [orgs.partnerId]),
      (rows: { payouts_enabled: boolean }[]) => rows[0]?.payouts_enabled === true,
    );
    expect(stored[0].payouts_enabled).toBe(true);
    const shown = payoutAccountDto.parse((await request(app).get('/api/partner/payout-account').set(auth(shop.accessToken))).body);
    expect(shown).toMatchObject({ status: 'enabled', payoutsEnabled: true, chargesEnabled: true, requirementsDue: [] });
    const [audit] = await db.query(`SELECT action FROM audit_events WHERE organization_id = $1 AND action LIKE 'payout_account.%'`, [orgs.partnerId]);
    expect(audit.action).toBe('payout_account.created');
  });

  it('lets a lab manager onboard the lab, and nobody else onboard anyone', async () => {
    const orgs = await shopAndLab(db);
    const lab = await signIn(app, orgs.labManager.email, TEST_PASSWORD);
    const shop = await signIn(app, orgs.partnerAdmin.email, TEST_PASSWORD);
    const staffUser = await createUser(db, { role: 'partner_staff', organizationId: orgs.partnerId });
    const staff = await signIn(app, staffUser.email, TEST_PASSWORD);

    const labStart = await request(app).post('/api/lab/payout-account').set(auth(lab.accessToken));
    expect(labStart.status).toBe(201);
    const link = [...payments.fake.state.store.accountLinks.values()].find((l) => l.account === labStart.body.account.accountId)!;
    expect(link.return_url).toBe('http://app.test/lab/earnings?payouts=returned');
    expect(link.refresh_url).toBe('http://app.test/lab/earnings?payouts=refresh');

    expect((await request(app).post('/api/lab/payout-account').set(auth(shop.accessToken))).status).toBe(403);
    expect((await request(app).post('/api/partner/payout-account').set(auth(lab.accessToken))).status).toBe(403);
    expect((await request(app).post('/api/partner/payout-account').set(auth(staff.accessToken))).status).toBe(403);
    expect((await request(app).get('/api/partner/earnings').set(auth(staff.accessToken))).status).toBe(403);
  });

  it('opens a new account when the provider no longer knows the stored one', async () => {
    const orgs = await shopAndLab(db);
    const shop = await signIn(app, orgs.partnerAdmin.email, TEST_PASSWORD);
    const first = (await request(app).post('/api/partner/payout-account').set(auth(shop.accessToken))).body;
    payments.fake.state.store.collections.accounts.delete(first.account.accountId);

    const again = await request(app).post('/api/partner/payout-account').set(auth(shop.accessToken));

    expect(again.status).toBe(201);
    expect(again.body.account.accountId).not.toBe(first.account.accountId);
    expect(again.body.account.status).toBe('onboarding');
  });

  it('queues the payouts that were waiting for the account once payouts are enabled', async () => {
    const orgs = await shopAndLab(db);
    await planForShop(db, orgs.partnerId, [{ minPaidReferrals: 0, basisPoints: 1000 }]);
    await paidCase(db, orgs, { totalMinor: 10_000, serviceLinesMinor: 10_000, paidAt: new Date('2021-03-10T12:00:00Z') });
    await runSettlement({ db, config }, { period: '2021-03', trigger: 'manual', organizationIds: [orgs.partnerId] });
    const [waiting] = await db.query(`SELECT id, status FROM statements WHERE organization_id = $1`, [orgs.partnerId]);
    expect(waiting.status).toBe('no_account');
    const shop = await signIn(app, orgs.partnerAdmin.email, TEST_PASSWORD);
    const { account } = (await request(app).post('/api/partner/payout-account').set(auth(shop.accessToken))).body;

    await fetch(`${payments.fake.url}/_fake/accounts/${account.accountId}/onboard`, { method: 'POST' });
    await payments.fake.webhooksIdle();

    const jobs = await until(
      () => db.query(`SELECT queue, data FROM job_outbox WHERE singleton_key = $1`, [waiting.id]),
      (rows: unknown[]) => rows.length > 0,
    );
    expect(jobs).toEqual([{ queue: 'payout-retry', data: expect.objectContaining({ statementId: waiting.id }) }]);
  });
});

describe('POST /api/webhooks/payments', () => {
  it('refuses unsigned, altered and stale deliveries with 400 and records nothing', async () => {
    const payload = eventJson('platterpost.test_ping', { id: 'obj_1' });
    const unsigned = await request(app).post('/api/webhooks/payments').set('Content-Type', 'application/json').send(payload);
    const altered = await postEvent(payload.replace('obj_1', 'obj_2'), signed(payload));
    const wrongSecret = await postEvent(payload, payments.stripe.webhooks.generateTestHeaderString({ payload, secret: 'whsec_someone_else' }));
    // The SDK's default tolerance is 300 s (from its documentation); ten minutes old is refused.
    const stale = await postEvent(payload, signed(payload, { timestamp: Math.floor(Date.now() / 1000) - 600 }));

    for (const res of [unsigned, altered, wrongSecret, stale]) {
      expect(res.status).toBe(400);
      expect(res.body.error.code).toBe('invalid_signature');
    }
    const [{ n }] = await db.query(`SELECT count(*)::int AS n FROM payment_webhook_events WHERE event_id = $1`, [JSON.parse(payload).id]);
    expect(n).toBe(0);
  });

  it('hands each event to its handlers once, however often it is delivered', async () => {
    let calls = 0;
    const off = onPaymentEvent('platterpost.test_once', async () => {
      calls += 1;
    });
    const payload = eventJson('platterpost.test_once', { id: 'obj_once' });

    const first = await postEvent(payload);
    const second = await postEvent(payload);
    off();

    expect(first.body).toEqual({ received: true, duplicate: false });
    expect(second.body).toEqual({ received: true, duplicate: true });
    expect(calls).toBe(1);
  });

  it('answers 500 when a handler fails, keeps nothing of it, and handles the redelivery', async () => {
    let fail = true;
    let handled = 0;
    const off = onPaymentEvent('platterpost.test_retry', async (_event, { manager }) => {
      await manager.query(`SELECT 1`);
      if (fail) throw new Error('handler not ready');
      handled += 1;
    });
    const payload = eventJson('platterpost.test_retry', { id: 'obj_retry' });

    const failed = await postEvent(payload);
    fail = false;
    const redelivered = await postEvent(payload);
    off();

    expect(failed.status).toBe(500);
    expect(redelivered.body).toEqual({ received: true, duplicate: false });
    expect(handled).toBe(1);
  });

  it('ignores an older account.updated that arrives after a newer one', async () => {
    const orgs = await shopAndLab(db);
    const shop = await signIn(app, orgs.partnerAdmin.email, TEST_PASSWORD);
    const { account } = (await request(app).post('/api/partner/payout-account').set(auth(shop.accessToken))).body;
    const now = Math.floor(Date.now() / 1000) + 5;
    const state = (enabled: boolean) => ({
      id: account.accountId,
      object: 'account',
      charges_enabled: enabled,
      payouts_enabled: enabled,
      details_submitted: enabled,
      requirements: { currently_due: enabled ? [] : ['external_account'] },
    });

    expect((await postEvent(eventJson('account.updated', state(true), now))).status).toBe(200);
    expect((await postEvent(eventJson('account.updated', state(false), now - 60))).status).toBe(200);

    const [row] = await db.query(`SELECT payouts_enabled, requirements_due FROM payout_accounts WHERE organization_id = $1`, [orgs.partnerId]);
    expect(row).toEqual({ payouts_enabled: true, requirements_due: [] });
  });
});
