import { createHash } from 'node:crypto';
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import Stripe from 'stripe';
import request from 'supertest';
import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import { luhnValid } from '@shared/domain/luhn';
import { customerCaseDto } from '@shared/schemas/customer';
import { labCaseDto } from '@shared/schemas/lab-work';
import { referralDto } from '@shared/schemas/referrals';
import { signatureHeader } from '../../fakes/payments/webhooks';
import { returnWaitingFor } from '../../server/lab-work';
import { Referral } from '../../server/referrals';
import { setupApi } from '../support/api';
import {
  approvedCase,
  auth,
  customerAuth,
  labWorlds,
  linkFromOutbox,
  paidCase,
  payAtFake,
  quotedCase,
  receivedCase,
  STANDARD_TOTAL_MINOR,
  worldZips,
  type LabWorld,
} from '../support/lab-work';
import { startPaymentsFake } from '../support/money-fixtures';

const payments = await startPaymentsFake();
const ctx = await setupApi(payments.env);
const { app, db } = ctx;
const makeWorld = labWorlds(ctx, worldZips.customer);

// The payment webhook is the money component's POST /api/webhooks/payments; the fake posts its events to
// this app through a real listener.
const server: Server = await new Promise((resolve) => {
  const s = app.listen(0, '127.0.0.1', () => resolve(s));
});
const webhookUrl = `http://127.0.0.1:${(server.address() as AddressInfo).port}/api/webhooks/payments`;
afterAll(() => new Promise<void>((resolve) => server.close(() => resolve())));

beforeEach(async () => {
  await payments.fake.webhooksIdle();
  payments.fake.setWebhookUrl(undefined);
});

async function count(sql: string, params: unknown[]): Promise<number> {
  const [row] = await db.query(sql, params);
  return Number((row as { n: string }).n);
}

const statusOf = async (id: string) => ((await db.query(`SELECT status FROM referrals WHERE id = $1`, [id])) as { status: string }[])[0]!.status;
const paymentsPosted = (id: string) => count(`SELECT count(*) AS n FROM ledger_transactions WHERE kind = 'customer_payment' AND referral_id = $1`, [id]);

/** The events the fake emitted about one checkout session and its payment intent, oldest first. */
async function eventsOf(sessionId: string): Promise<Stripe.Event[]> {
  const session = await payments.stripe.checkout.sessions.retrieve(sessionId);
  const events = await payments.stripe.events.list({ limit: 100 });
  return events.data
    .filter((e) => {
      const o = e.data.object as { id?: string; payment_intent?: string };
      return o.id === session.id || o.id === session.payment_intent || o.payment_intent === session.payment_intent;
    })
    .reverse();
}

function deliver(event: Stripe.Event, options: { secret?: string; alter?: (payload: string) => string; signature?: string | null } = {}) {
  const payload = JSON.stringify(event, null, 2);
  const header = options.signature === undefined ? signatureHeader(payload, options.secret ?? payments.env.PAYMENTS_WEBHOOK_SECRET!) : options.signature;
  const req = request(app).post('/api/webhooks/payments').set('Content-Type', 'application/json');
  if (header) req.set('Stripe-Signature', header);
  return req.send(options.alter ? options.alter(payload) : payload);
}

describe('the customer link', () => {
  it('opens one case with a 256-bit token kept only as its SHA-256, and shows that case and nothing else', async () => {
    const world = await makeWorld();
    const c = await quotedCase(ctx, world);
    const other = await quotedCase(ctx, world);

    expect(Buffer.from(c.token, 'base64url')).toHaveLength(32);
    const stored: { token_hash: string }[] = await db.query(`SELECT token_hash FROM customer_links WHERE referral_id = $1`, [c.id]);
    expect(stored.map((s) => s.token_hash)).toContain(createHash('sha256').update(c.token).digest('hex'));
    const [{ n }] = await db.query(`SELECT count(*) AS n FROM customer_links WHERE token_hash = $1 OR token_hash = $2`, [c.token, other.token]);
    expect(Number(n)).toBe(0);

    const res = await request(app).get('/api/customer/case').set(customerAuth(c.token));

    expect(res.status).toBe(200);
    expect(res.headers['cache-control']).toBe('no-store');
    const page = customerCaseDto.parse(res.body);
    expect(page).toMatchObject({ reference: c.reference, status: 'quote_sent', shop: { name: world.shop.name }, lab: { name: world.lab.name } });
    expect(page.actions).toEqual({ respondToQuote: true, pay: false, reviewFiles: false, setReturnAddress: true });
    expect(page.evaluation).toEqual({ recoverability: 'high', plan: expect.stringContaining('hardware imager') });
    // The customer's own words for each step; routing, offers and triage stay inside the network.
    expect(page.timeline.map((e) => e.kind)).toEqual(['opened', 'offer_accepted', 'checked_in', 'evaluation_started', 'evaluation_recorded', 'quote_sent']);
    expect(page.timeline.at(-1)?.summary).toBe('The lab sent a quote of $554.00.');
    expect(JSON.stringify(res.body)).not.toContain(other.reference);
    expect(JSON.stringify(res.body)).not.toMatch(/triage|routing|offered to/i);

    const theirs = await request(app).get('/api/customer/case').set(customerAuth(other.token));
    expect(theirs.body.reference).toBe(other.reference);
  });

  it('answers a missing, malformed, unknown, expired or revoked link with 404 and nothing about any case', async () => {
    const world = await makeWorld();
    const c = await quotedCase(ctx, world);
    const unknown = Buffer.alloc(32, 7).toString('base64url');
    for (const header of [undefined, 'CustomerLink short', `Bearer ${c.token}`, `CustomerLink ${unknown}`]) {
      const req = request(app).get('/api/customer/case');
      if (header) req.set('Authorization', header);
      const res = await req;
      expect(res.status, header).toBe(404);
      expect(JSON.stringify(res.body)).not.toContain(c.reference);
    }

    const other = await quotedCase(ctx, world);
    await db.query(`UPDATE customer_links SET expires_at = now() - interval '1 minute' WHERE referral_id = $1`, [other.id]);
    expect((await request(app).get('/api/customer/case').set(customerAuth(other.token))).status).toBe(404);

    const revoked = await request(app).delete(`/api/referrals/${c.id}/customer-links`).set(auth(world.shopStaff.token));
    expect(revoked.status).toBe(200);
    expect(revoked.body.data.every((l: { revokedAt: string | null }) => l.revokedAt)).toBe(true);
    const after = await request(app).get('/api/customer/case').set(customerAuth(c.token));
    expect(after.status).toBe(404);
    expect(after.body.error.message).toMatch(/switched off/);
    const approve = await request(app).post('/api/customer/case/quote/approve').set(customerAuth(c.token)).send({ quoteId: c.quoteId, fullName: 'Rowan Tillery', acceptTerms: true });
    expect(approve.status).toBe(404);
    expect(await statusOf(c.id)).toBe('quote_sent');
    expect(await count(`SELECT count(*) AS n FROM audit_events WHERE action = 'customer_link.revoked' AND target_id = $1`, [c.id])).toBe(1);
  });

  it('is issued anew by the shop (shown once, e-mailed when asked), listed with its last use, and only for the shop’s own case', async () => {
    const world = await makeWorld();
    const other = await makeWorld();
    const c = await receivedCase(ctx, world);

    const issued = await request(app).post(`/api/referrals/${c.id}/customer-links`).set(auth(world.shopStaff.token)).send({ sendEmail: true });

    expect(issued.status).toBe(201);
    expect(issued.headers['cache-control']).toBe('no-store');
    const token = new URL(issued.body.url as string).pathname.split('/').pop()!;
    expect(issued.body.url).toBe(`http://app.test/c/${token}`);
    expect(await linkFromOutbox(ctx, c.customerEmail, 'customer_case_link')).toBe(token);
    expect((await request(app).get('/api/customer/case').set(customerAuth(token))).body.status).toBe('received');
    const list = await request(app).get(`/api/referrals/${c.id}/customer-links`).set(auth(world.shopStaff.token));
    expect(list.body.data).toEqual([expect.objectContaining({ id: issued.body.link.id, reason: 'shop', issuedBy: world.shopStaff.name, lastUsedAt: expect.any(String), revokedAt: null })]);
    expect(JSON.stringify(list.body)).not.toContain(token);

    expect((await request(app).post(`/api/referrals/${c.id}/customer-links`).set(auth(other.shopStaff.token)).send({})).status).toBe(404);
    expect((await request(app).get(`/api/referrals/${c.id}/customer-links`).set(auth(world.technician.token))).status).toBe(403);
  });
});

describe('approving or declining the quote', () => {
  it('records the approval with the typed full name, the terms, the time and the IP address', async () => {
    const world = await makeWorld();
    const c = await quotedCase(ctx, world);

    const res = await request(app)
      .post('/api/customer/case/quote/approve')
      .set(customerAuth(c.token))
      .set('User-Agent', 'Test browser 1.0')
      .send({ quoteId: c.quoteId, fullName: '  Rowan A. Tillery ', acceptTerms: true });

    expect(res.status).toBe(200);
    const page = customerCaseDto.parse(res.body);
    expect(page.status).toBe('approved');
    expect(page.quote?.approval).toEqual({ at: expect.any(String), fullName: 'Rowan A. Tillery' });
    expect(page.actions.pay).toBe(true);
    const [quote] = await db.query(`SELECT approved_name, approved_ip, approved_user_agent, terms_version, approved_at FROM lab_quotes WHERE id = $1`, [c.quoteId]);
    expect(quote).toMatchObject({ approved_name: 'Rowan A. Tillery', approved_user_agent: 'Test browser 1.0', terms_version: page.termsVersion });
    expect(quote.approved_ip).toMatch(/127\.0\.0\.1/);
    const [entry] = await db.query(`SELECT actor_type, actor_name FROM referral_timeline WHERE referral_id = $1 AND kind = 'quote_approved'`, [c.id]);
    expect(entry).toEqual({ actor_type: 'customer', actor_name: 'Rowan A. Tillery' });
    const [audit] = await db.query(`SELECT ip FROM audit_events WHERE action = 'customer.quote_approved' AND target_id = $1`, [c.id]);
    expect(audit.ip).toMatch(/127\.0\.0\.1/);
    // The lab sees the approval on its case.
    const lab = await request(app).get(`/api/lab/cases/${c.id}`).set(auth(world.technician.token));
    expect(labCaseDto.parse(lab.body).quote?.status).toBe('approved');
  });

  it('needs the name and the terms box, and writes nothing without them', async () => {
    const world = await makeWorld();
    const c = await quotedCase(ctx, world);
    const res = await request(app).post('/api/customer/case/quote/approve').set(customerAuth(c.token)).send({ quoteId: c.quoteId, fullName: ' ', acceptTerms: false });
    expect(res.status).toBe(400);
    expect((res.body.error.fields as { path: string }[]).map((f) => f.path).sort()).toEqual(['acceptTerms', 'fullName']);
    expect(await statusOf(c.id)).toBe('quote_sent');
    expect(await count(`SELECT count(*) AS n FROM referral_timeline WHERE referral_id = $1 AND kind = 'quote_approved'`, [c.id])).toBe(0);
  });

  it('declines the quote: quote_declined, with the reason on the timeline, and nothing left to approve', async () => {
    const world = await makeWorld();
    const c = await quotedCase(ctx, world);
    const res = await request(app).post('/api/customer/case/quote/decline').set(customerAuth(c.token)).send({ quoteId: c.quoteId, reason: 'I found a backup' });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ status: 'quote_declined', quote: { status: 'declined', decline: { reason: 'I found a backup' } }, actions: { respondToQuote: false, pay: false } });
    expect(res.body.timeline.at(-1).summary).toBe('You declined the quote.');
    const approve = await request(app).post('/api/customer/case/quote/approve').set(customerAuth(c.token)).send({ quoteId: c.quoteId, fullName: 'Rowan Tillery', acceptTerms: true });
    expect(approve.status).toBe(409);
  });
});

describe('paying through the hosted checkout page', () => {
  it('opens a checkout session for the approved quote through the SDK, with the quote’s lines and total', async () => {
    const world = await makeWorld();
    const c = await approvedCase(ctx, world);

    const res = await request(app).post('/api/customer/case/checkout').set(customerAuth(c.token)).send({});

    expect(res.status).toBe(201);
    expect(res.body.url).toMatch(new RegExp(`^${payments.fake.url}/pay/cs_test_`));
    const sessionId = new URL(res.body.url).pathname.split('/').pop()!;
    const session = await payments.stripe.checkout.sessions.retrieve(sessionId);
    expect(session).toMatchObject({ amount_total: STANDARD_TOTAL_MINOR, currency: 'usd', client_reference_id: c.reference, customer_email: c.customerEmail, metadata: { referralId: c.id } });
    expect(session.success_url).toBe('http://app.test/c/checkout/done?session_id={CHECKOUT_SESSION_ID}');
    const items = await payments.stripe.checkout.sessions.listLineItems(sessionId);
    expect(items.data.map((i) => [i.description, i.amount_total])).toEqual([
      ['Recovery work: Logical recovery of deleted files', 45000],
      ['New media for your data: 1 TB USB 3.2 external drive', 8900],
      ['Return shipping: Ground shipping, signature on delivery', 1500],
    ]);
    // The same open page is offered again rather than a second session.
    const again = await request(app).post('/api/customer/case/checkout').set(customerAuth(c.token)).send({});
    expect(again.body.url).toBe(res.body.url);
    expect(await count(`SELECT count(*) AS n FROM customer_checkouts WHERE referral_id = $1`, [c.id])).toBe(1);

    const early = await quotedCase(ctx, world);
    expect((await request(app).post('/api/customer/case/checkout').set(customerAuth(early.token)).send({})).status).toBe(409);
  });

  it('marks the case paid from the signed webhook and posts the payment to the ledger once, though both events arrive', async () => {
    const world = await makeWorld();
    const c = await approvedCase(ctx, world);
    payments.fake.setWebhookUrl(webhookUrl);

    const { status, sessionId } = await payAtFake(ctx, payments.fake.url, c.token);
    await payments.fake.webhooksIdle();

    expect(status).toBe(200);
    const deliveries = payments.fake.state.webhookDeliveries.filter((d) => ['checkout.session.completed', 'payment_intent.succeeded'].includes(d.eventType));
    expect(deliveries.filter((d) => d.ok).length).toBeGreaterThanOrEqual(2);
    expect(await statusOf(c.id)).toBe('paid');
    expect(await paymentsPosted(c.id)).toBe(1);
    const [posted] = await db.query(`SELECT source_id, details FROM ledger_transactions WHERE kind = 'customer_payment' AND referral_id = $1`, [c.id]);
    const session = await payments.stripe.checkout.sessions.retrieve(sessionId);
    expect(posted.source_id).toBe(session.payment_intent);
    // The fee is the provider's own, from the charge's balance transaction (2.9 % + 30¢ of $554.00 = $16.37, half-even).
    expect(posted.details.split).toMatchObject({ totalMinor: STANDARD_TOTAL_MINOR, feeMinor: 1637 });
    const page = customerCaseDto.parse((await request(app).get('/api/customer/case').set(customerAuth(c.token))).body);
    expect(page.payment).toMatchObject({ state: 'paid', amountMinor: STANDARD_TOTAL_MINOR, currency: 'USD' });
    expect(page.timeline.at(-1)?.summary).toBe('Your payment of $554.00 arrived. Thank you.');
    await linkFromOutbox(ctx, c.customerEmail, 'customer_quote_ready');
    const [mail] = await db.query(`SELECT subject FROM outbox_messages WHERE recipient = $1 AND template = 'customer_payment_received'`, [c.customerEmail]);
    expect(mail.subject).toBe(`Payment received for case ${c.reference}: $554.00`);
    const shop = referralDto.parse((await request(app).get(`/api/referrals/${c.id}`).set(auth(world.shopStaff.token))).body);
    expect(shop.amounts).toMatchObject({ quoteStatus: 'approved', paidMinor: STANDARD_TOTAL_MINOR, paidAt: expect.any(String) });
  });

  it('has one effect when the same event comes twice or the events come in the other order', async () => {
    const world = await makeWorld();
    const c = await approvedCase(ctx, world);
    const { sessionId } = await payAtFake(ctx, payments.fake.url, c.token);
    const events = await eventsOf(sessionId);
    const completed = events.find((e) => e.type === 'checkout.session.completed')!;
    const succeeded = events.find((e) => e.type === 'payment_intent.succeeded')!;
    expect(events.indexOf(succeeded)).toBeLessThan(events.indexOf(completed));

    // The session's event first, then the payment intent's, then the session's again.
    const first = await deliver(completed);
    expect(first.status).toBe(200);
    expect(await statusOf(c.id)).toBe('paid');
    expect((await deliver(succeeded)).status).toBe(200);
    const repeat = await deliver(completed);
    expect(repeat.body).toEqual({ received: true, duplicate: true });

    expect(await paymentsPosted(c.id)).toBe(1);
    expect(await count(`SELECT count(*) AS n FROM referral_timeline WHERE referral_id = $1 AND kind = 'payment_received'`, [c.id])).toBe(1);
    expect(await count(`SELECT count(*) AS n FROM outbox_messages WHERE recipient = $1 AND template = 'customer_payment_received'`, [c.customerEmail])).toBe(1);
    // The customer's return to the page after the events changes nothing either.
    const back = await request(app).post('/api/customer/case/checkout/confirm').set(customerAuth(c.token)).send({ sessionId });
    expect(back.body.status).toBe('paid');
    expect(await paymentsPosted(c.id)).toBe(1);
  });

  it('refuses unsigned, wrongly signed and altered events with 400 and changes nothing', async () => {
    const world = await makeWorld();
    const c = await approvedCase(ctx, world);
    const { sessionId } = await payAtFake(ctx, payments.fake.url, c.token);
    const completed = (await eventsOf(sessionId)).find((e) => e.type === 'checkout.session.completed')!;

    const unsigned = await deliver(completed, { signature: null });
    const wrongSecret = await deliver(completed, { secret: 'whsec_not_the_endpoint_secret' });
    const altered = await deliver(completed, { alter: (payload) => payload.replace(`"amount_total": ${STANDARD_TOTAL_MINOR}`, '"amount_total": 1') });

    for (const res of [unsigned, wrongSecret, altered]) {
      expect(res.status).toBe(400);
      expect(res.body.error.code).toBe('invalid_signature');
    }
    expect(await statusOf(c.id)).toBe('approved');
    expect(await paymentsPosted(c.id)).toBe(0);
    expect(await count(`SELECT count(*) AS n FROM payment_webhook_events WHERE event_id = $1`, [completed.id])).toBe(0);

    // The genuine event still works afterwards.
    expect((await deliver(completed)).status).toBe(200);
    expect(await statusOf(c.id)).toBe('paid');
  });

  it('keeps the case waiting after a declined card, tells the customer, and takes the next good card', async () => {
    const world = await makeWorld();
    const c = await approvedCase(ctx, world);
    payments.fake.setWebhookUrl(webhookUrl);

    // The provider's published test card for a generic decline.
    const declined = await payAtFake(ctx, payments.fake.url, c.token, '4000 0000 0000 0002');
    await payments.fake.webhooksIdle();

    expect(declined.status).toBe(402);
    expect(await statusOf(c.id)).toBe('approved');
    const page = customerCaseDto.parse((await request(app).get('/api/customer/case').set(customerAuth(c.token))).body);
    expect(page.payment).toMatchObject({ state: 'unpaid', lastFailure: expect.stringMatching(/declined/i) });
    expect(page.actions.pay).toBe(true);
    expect(page.timeline.at(-1)?.kind).toBe('payment_failed');

    // A number that fails the Luhn check is refused by the page itself: no charge, no event.
    const before = payments.fake.state.webhookDeliveries.length;
    const typo = await payAtFake(ctx, payments.fake.url, c.token, '4242 4242 4242 4241');
    expect(typo.status).toBe(402);
    await payments.fake.webhooksIdle();
    expect(payments.fake.state.webhookDeliveries.length).toBe(before);

    const good = await payAtFake(ctx, payments.fake.url, c.token);
    await payments.fake.webhooksIdle();
    expect(good.status).toBe(200);
    expect(await statusOf(c.id)).toBe('paid');
    expect(await paymentsPosted(c.id)).toBe(1);
    expect(customerCaseDto.parse((await request(app).get('/api/customer/case').set(customerAuth(c.token))).body).payment.lastFailure).toBeNull();
  });

  // ISO/IEC 7812-1, Annex B (the Luhn formula); the numbers are the payment provider's published test cards.
  it('the published test card numbers pass the Luhn check (ISO/IEC 7812-1) and a one-digit typo does not', () => {
    for (const card of ['4242 4242 4242 4242', '4000 0000 0000 0002', '5555 5555 5555 4444', '3782 822463 10005']) {
      expect(luhnValid(card), card).toBe(true);
    }
    expect(luhnValid('4242 4242 4242 4241')).toBe(false);
    expect(luhnValid('4000 0000 0000 0012')).toBe(false);
  });

  // The official SDK's stripe.webhooks.constructEvent is the reference for the provider's signature scheme.
  it("the SDK's constructEvent accepts the fake's signed events and rejects altered ones", async () => {
    const world = await makeWorld();
    const c = await approvedCase(ctx, world);
    const { sessionId } = await payAtFake(ctx, payments.fake.url, c.token);
    const event = (await eventsOf(sessionId)).find((e) => e.type === 'payment_intent.succeeded')!;
    const payload = JSON.stringify(event, null, 2);
    const header = signatureHeader(payload, payments.env.PAYMENTS_WEBHOOK_SECRET!);
    const sdk = new Stripe('sk_test_unused');

    expect(sdk.webhooks.constructEvent(payload, header, payments.env.PAYMENTS_WEBHOOK_SECRET!).id).toBe(event.id);
    expect(() => sdk.webhooks.constructEvent(payload.replace(event.id, `${event.id}x`), header, payments.env.PAYMENTS_WEBHOOK_SECRET!)).toThrow(
      Stripe.errors.StripeSignatureVerificationError,
    );
  });
});

describe('reviewing the recovered files', () => {
  const manifest = ['path,size,state', 'Photos/2020/beach.jpg,3100000,intact', 'Photos/2020/IMG_0001.NEF,24000000,partial', 'Documents/Taxes/2022.pdf,120000,intact'].join('\n');

  async function readyCase(world: LabWorld) {
    const c = await paidCase(ctx, world, payments.fake.url);
    await request(app).post(`/api/lab/cases/${c.id}/imaging`).set(auth(world.technician.token)).send({ bytesRead: 500_000_000_000, rateBytesPerSec: 0 });
    const res = await request(app).post(`/api/lab/cases/${c.id}/manifest`).set(auth(world.technician.token)).attach('manifest', Buffer.from(manifest), { filename: 'recovered.csv' });
    expect(res.status).toBe(201);
    return { ...c, manifestId: res.body.manifest.id as string, filesToken: await linkFromOutbox(ctx, c.customerEmail, 'customer_files_ready') };
  }

  it('shows the customer, per priority, how many files came back and in what state, with a few names to recognise', async () => {
    const world = await makeWorld();
    const c = await readyCase(world);

    const page = customerCaseDto.parse((await request(app).get('/api/customer/case').set(customerAuth(c.filesToken))).body);

    expect(page.status).toBe('ready_for_review');
    expect(page.actions.reviewFiles).toBe(true);
    expect(page.files?.categories.map((x) => [x.category, x.note, x.files, x.intact, x.partial, x.unreadable])).toEqual([
      ['photos', '2019–2023 family photos', 2, 1, 1, 0],
      ['documents', 'Tax returns', 1, 1, 0, 0],
    ]);
    expect(page.files?.categories[0]?.examples).toEqual([
      { path: 'Photos/2020/beach.jpg', state: 'intact' },
      { path: 'Photos/2020/IMG_0001.NEF', state: 'partial' },
    ]);
    // The shop sees the counts, not the customer's file names.
    const shop = await request(app).get(`/api/referrals/${c.id}/lab-work`).set(auth(world.shopStaff.token));
    expect(shop.body.manifest.categories[0]).not.toHaveProperty('examples');
    expect(JSON.stringify(shop.body)).not.toContain('beach.jpg');
  });

  it('disputes with a note, gets the lab’s new list, then confirms it once', async () => {
    const world = await makeWorld();
    const c = await readyCase(world);

    const short = await request(app).post('/api/customer/case/files/dispute').set(customerAuth(c.token)).send({ manifestId: c.manifestId, note: 'no' });
    expect(short.status).toBe(400);
    const disputed = await request(app)
      .post('/api/customer/case/files/dispute')
      .set(customerAuth(c.token))
      .send({ manifestId: c.manifestId, note: 'The 2021 folder of the wedding photos is missing.' });
    expect(disputed.status).toBe(200);
    expect(disputed.body.files.review).toMatchObject({ status: 'disputed', note: 'The 2021 folder of the wedding photos is missing.' });
    const bench = await request(app).get('/api/lab/bench').set(auth(world.technician.token));
    expect(bench.body.data.find((r: { id: string }) => r.id === c.id).reviewStatus).toBe('disputed');

    const updated = await request(app)
      .post(`/api/lab/cases/${c.id}/manifest`)
      .set(auth(world.technician.token))
      .attach('manifest', Buffer.from(`${manifest}\nPhotos/2021/Wedding/DSC_0100.JPG,5100000,intact`), { filename: 'recovered-2.csv' });
    expect(updated.body.manifest).toMatchObject({ version: 2, review: { status: 'pending' } });
    const stale = await request(app).post('/api/customer/case/files/confirm').set(customerAuth(c.token)).send({ manifestId: c.manifestId });
    expect(stale.status).toBe(409);

    const confirmed = await request(app).post('/api/customer/case/files/confirm').set(customerAuth(c.token)).send({ manifestId: updated.body.manifest.id });
    expect(confirmed.status).toBe(200);
    expect(confirmed.body).toMatchObject({ status: 'ready_for_review', files: { version: 2, review: { status: 'confirmed' } }, actions: { reviewFiles: false } });
    expect(confirmed.body.timeline.at(-1).summary).toBe('You confirmed the recovered files.');
    expect((await request(app).post('/api/customer/case/files/confirm').set(customerAuth(c.token)).send({ manifestId: updated.body.manifest.id })).status).toBe(409);
    const replace = await request(app).post(`/api/lab/cases/${c.id}/manifest`).set(auth(world.technician.token)).attach('manifest', Buffer.from(manifest), { filename: 'x.csv' });
    expect(replace.status).toBe(409);
    expect(await count(`SELECT count(*) AS n FROM audit_events WHERE action IN ('customer.files_disputed', 'customer.files_confirmed') AND target_id = $1`, [c.id])).toBe(2);
  });

  it('takes the return address for the data, checks it, and shows it to the lab', async () => {
    const world = await makeWorld();
    const c = await approvedCase(ctx, world);
    const bad = await request(app).put('/api/customer/case/return-address').set(customerAuth(c.token)).send({ name: '', line1: '1 Elm St', city: 'Ames', region: 'IA', postalCode: 'ABC' });
    expect(bad.status).toBe(400);
    expect((bad.body.error.fields as { path: string }[]).map((f) => f.path).sort()).toEqual(['name', 'postalCode']);

    const res = await request(app)
      .put('/api/customer/case/return-address')
      .set(customerAuth(c.token))
      .send({ name: 'Rowan Tillery', line1: '18 Larch Lane', city: 'Ames', region: 'IA', postalCode: '50010', phone: '+1 515 555 0144' });
    expect(res.status).toBe(200);
    expect(res.body.returnAddress).toMatchObject({ name: 'Rowan Tillery', line1: '18 Larch Lane', line2: null, postalCode: '50010', country: 'US' });
    const lab = await request(app).get(`/api/lab/cases/${c.id}`).set(auth(world.technician.token));
    expect(lab.body.returnAddress).toMatchObject({ city: 'Ames', region: 'IA' });
  });
});

describe('returning the data', () => {
  it('lets the data ship back only once the customer has paid and confirmed the files', async () => {
    const world = await makeWorld();
    const c = await paidCase(ctx, world, payments.fake.url);
    const waiting = async () => returnWaitingFor(db.manager, (await db.getRepository(Referral).findOneByOrFail({ id: c.id })));
    expect(await waiting()).toMatch(/not finished/);
    await request(app).post(`/api/lab/cases/${c.id}/imaging`).set(auth(world.technician.token)).send({ bytesRead: 500_000_000_000, rateBytesPerSec: 0 });
    const upload = await request(app)
      .post(`/api/lab/cases/${c.id}/manifest`)
      .set(auth(world.technician.token))
      .attach('manifest', Buffer.from('path,size,state\nPhotos/a.jpg,10,intact'), { filename: 'recovered.csv' });
    expect(await waiting()).toBe('Waiting for the customer to confirm the recovered files.');
    await request(app).post('/api/customer/case/files/confirm').set(customerAuth(c.token)).send({ manifestId: upload.body.manifest.id });
    expect(await waiting()).toBeNull();
  });
});
