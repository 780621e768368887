import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import Stripe from 'stripe';
import { cardFeeMinor } from '@shared/domain/money';
import { createPaymentsFake, type PaymentsFake } from './payments-fake';

/*
 * Everything here goes through the official `stripe` client pointed at the fake, the way our server uses it;
 * webhooks go to a real loopback receiver and are checked with `stripe.webhooks.constructEvent`.
 */

const SECRET_KEY = 'sk_test_payments_fake_suite';
const WEBHOOK_SECRET = 'whsec_payments_fake_suite';

interface Received {
  raw: string;
  signature: string;
  event: Stripe.Event;
}

let fake: PaymentsFake;
let stripe: Stripe;
let receiver: Server;
let received: Received[] = [];
/** The receiver answers 500 to this many deliveries before accepting again (for the retry test). */
let receiverFailures = 0;

function client(options: Partial<Stripe.StripeConfig> = {}): Stripe {
  return new Stripe(SECRET_KEY, { host: '127.0.0.1', port: fake.port, protocol: 'http', maxNetworkRetries: 0, ...options });
}

async function fakeControl(path: string, body: unknown): Promise<{ status: number; json: any }> {
  const response = await fetch(`${fake.url}/_fake${path}`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify(body),
  });
  return { status: response.status, json: await response.json() };
}

async function createSession(amount: number, extra: Partial<Stripe.Checkout.SessionCreateParams> = {}) {
  return stripe.checkout.sessions.create({
    mode: 'payment',
    line_items: [{ price_data: { currency: 'usd', unit_amount: amount, product_data: { name: 'Data recovery, 2.5" HDD' } }, quantity: 1 }],
    success_url: 'http://127.0.0.1:9/paid?session={CHECKOUT_SESSION_ID}',
    cancel_url: 'http://127.0.0.1:9/cancelled',
    metadata: { caseRef: 'PP-TEST-1' },
    client_reference_id: 'case-1',
    customer_email: 'customer@example.test',
    payment_intent_data: { metadata: { caseRef: 'PP-TEST-1' } },
    ...extra,
  });
}

async function paidSession(amount: number) {
  const session = await createSession(amount);
  const paid = await fakeControl(`/checkout/${session.id}/pay`, { cardNumber: '4242 4242 4242 4242' });
  expect(paid.status).toBe(200);
  return session;
}

async function onboardedAccount(): Promise<Stripe.Account> {
  const account = await stripe.accounts.create({ type: 'express', email: `lab-${Date.now()}@example.test` });
  const done = await fakeControl(`/accounts/${account.id}/onboard`, {});
  expect(done.status).toBe(200);
  return account;
}

/** Webhooks delivered for the object with this id, after every delivery started so far has finished. */
async function webhooksFor(objectId: string): Promise<Received[]> {
  await fake.webhooksIdle();
  return received.filter((r) => (r.event.data.object as { id?: string }).id === objectId);
}

beforeAll(async () => {
  receiver = createServer((req, res) => {
    let raw = '';
    req.setEncoding('utf8');
    req.on('data', (chunk: string) => (raw += chunk));
    req.on('end', () => {
      if (receiverFailures > 0) {
        receiverFailures -= 1;
        res.writeHead(500).end('not now');
        return;
      }
      const signature = String(req.headers['stripe-signature'] ?? '');
      received.push({ raw, signature, event: JSON.parse(raw) as Stripe.Event });
      res.writeHead(200, { 'content-type': 'application/json' }).end('{"received":true}');
    });
  });
  await new Promise<void>((resolve) => receiver.listen(0, '127.0.0.1', resolve));
  const receiverPort = (receiver.address() as AddressInfo).port;

  fake = createPaymentsFake({
    port: 0,
    secretKey: SECRET_KEY,
    webhookSecret: WEBHOOK_SECRET,
    webhookUrl: `http://127.0.0.1:${receiverPort}/webhooks/payments`,
    webhookRetryDelaysMs: [10, 20, 40],
  });
  await fake.start();
  stripe = client();
});

afterAll(async () => {
  await fake?.stop();
  await new Promise<void>((resolve) => receiver?.close(() => resolve()));
});

beforeEach(() => {
  receiverFailures = 0;
});

describe('authentication and errors', () => {
  it('answers a wrong key with 401 in the provider error shape', async () => {
    const wrong = new Stripe('sk_test_wrong_key_123456', { host: '127.0.0.1', port: fake.port, protocol: 'http', maxNetworkRetries: 0 });
    const error = await wrong.accounts.list().catch((e: unknown) => e);
    expect(error).toBeInstanceOf(Stripe.errors.StripeAuthenticationError);
    expect((error as Stripe.errors.StripeError).statusCode).toBe(401);
    expect((error as Stripe.errors.StripeError).message).toMatch(/^Invalid API Key provided: sk_test_\*+3456$/);
  });

  it('answers a missing key with 401 { error: { type, message } }', async () => {
    const response = await fetch(`${fake.url}/v1/accounts`);
    expect(response.status).toBe(401);
    const body = (await response.json()) as { error: { type: string; message: string } };
    expect(body.error.type).toBe('invalid_request_error');
    expect(body.error.message).toMatch(/did not provide an API key/);
  });

  it('accepts basic auth with the key as user name, as the provider does', async () => {
    const response = await fetch(`${fake.url}/v1/events?limit=1`, {
      headers: { authorization: `Basic ${Buffer.from(`${SECRET_KEY}:`).toString('base64')}` },
    });
    expect(response.status).toBe(200);
  });

  it('answers an unknown id with 404 resource_missing naming the id', async () => {
    const error = (await stripe.paymentIntents.retrieve('pi_doesnotexist').catch((e: unknown) => e)) as Stripe.errors.StripeError;
    expect(error).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect(error.statusCode).toBe(404);
    expect(error.code).toBe('resource_missing');
    expect(error.message).toBe("No such payment_intent: 'pi_doesnotexist'");
  });

  it('refuses an unknown parameter with parameter_unknown and its bracketed name', async () => {
    const error = (await stripe.accounts
      .create({ type: 'express', colour: 'teal' } as Stripe.AccountCreateParams)
      .catch((e: unknown) => e)) as Stripe.errors.StripeError;
    expect(error.statusCode).toBe(400);
    expect(error.code).toBe('parameter_unknown');
    expect(error.param).toBe('colour');
  });

  it('refuses the Stripe-Account header rather than silently ignoring it', async () => {
    const error = (await stripe.accounts.list({}, { stripeAccount: 'acct_someone' }).catch((e: unknown) => e)) as Stripe.errors.StripeError;
    expect(error.statusCode).toBe(400);
    expect(error.message).toMatch(/does not act on behalf of connected accounts/);
  });

  it('answers an unknown hosted payment page with a 404 page, not an API error', async () => {
    const page = await fetch(`${fake.url}/pay/cs_test_nope`);
    expect(page.status).toBe(404);
    expect(await page.text()).toContain('This payment link is not valid');
  });
});

describe('connected accounts', () => {
  it('creates an Express account that cannot take charges or payouts before onboarding', async () => {
    const account = await stripe.accounts.create({ type: 'express', email: 'shop@example.test', metadata: { orgId: 'org-1' } });
    expect(account).toMatchObject({
      object: 'account',
      type: 'express',
      email: 'shop@example.test',
      metadata: { orgId: 'org-1' },
      charges_enabled: false,
      payouts_enabled: false,
      details_submitted: false,
    });
    expect(account.id).toMatch(/^acct_/);
    expect((await stripe.accounts.retrieve(account.id)).email).toBe('shop@example.test');
  });

  it('onboards through the hosted page: the account is enabled, account.updated is sent, the browser goes to return_url', async () => {
    const account = await stripe.accounts.create({ type: 'express', email: 'lab@example.test' });
    const link = await stripe.accountLinks.create({
      account: account.id,
      type: 'account_onboarding',
      refresh_url: 'http://127.0.0.1:9/onboarding/refresh',
      return_url: 'http://127.0.0.1:9/onboarding/done',
    });
    expect(link.url.startsWith(`${fake.url}/onboard/`)).toBe(true);

    const page = await fetch(link.url);
    expect(page.status).toBe(200);
    expect(await page.text()).toContain('Set up payouts');

    const submit = await fetch(link.url, {
      method: 'POST',
      headers: { 'content-type': 'application/x-www-form-urlencoded' },
      body: 'businessName=Example+Recovery+Lab',
      redirect: 'manual',
    });
    expect(submit.status).toBe(303);
    expect(submit.headers.get('location')).toBe('http://127.0.0.1:9/onboarding/done');

    const after = await stripe.accounts.retrieve(account.id);
    expect(after).toMatchObject({ charges_enabled: true, payouts_enabled: true, details_submitted: true });
    expect(after.business_profile?.name).toBe('Example Recovery Lab');

    const events = await webhooksFor(account.id);
    expect(events.map((r) => r.event.type)).toContain('account.updated');
    const updated = events.find((r) => r.event.type === 'account.updated')!;
    expect((updated.event.data.object as Stripe.Account).charges_enabled).toBe(true);
    expect(updated.event.data.previous_attributes).toMatchObject({ charges_enabled: false });

    // A used link sends the person to refresh_url for a new one.
    const again = await fetch(link.url, { redirect: 'manual' });
    expect(again.status).toBe(303);
    expect(again.headers.get('location')).toBe('http://127.0.0.1:9/onboarding/refresh');
  });

  it('lists accounts newest first and pages with starting_after', async () => {
    const a = await stripe.accounts.create({ type: 'express' });
    const b = await stripe.accounts.create({ type: 'express' });
    const first = await stripe.accounts.list({ limit: 1 });
    expect(first.data.map((x) => x.id)).toEqual([b.id]);
    expect(first.has_more).toBe(true);
    const second = await stripe.accounts.list({ limit: 1, starting_after: b.id });
    expect(second.data.map((x) => x.id)).toEqual([a.id]);
  });
});

describe('checkout', () => {
  it('creates an open, unpaid session with a hosted page URL and its payment intent', async () => {
    const session = await createSession(12_345);
    expect(session).toMatchObject({
      object: 'checkout.session',
      mode: 'payment',
      status: 'open',
      payment_status: 'unpaid',
      amount_total: 12_345,
      currency: 'usd',
      client_reference_id: 'case-1',
      metadata: { caseRef: 'PP-TEST-1' },
    });
    expect(session.id).toMatch(/^cs_test_/);
    expect(session.url).toBe(`${fake.url}/pay/${session.id}`);
    const pi = await stripe.paymentIntents.retrieve(session.payment_intent as string);
    expect(pi).toMatchObject({ status: 'requires_payment_method', amount: 12_345, metadata: { caseRef: 'PP-TEST-1' } });

    const page = await fetch(session.url!);
    const html = await page.text();
    expect(html).toContain('$123.45');
    expect(html).toContain('Data recovery, 2.5&quot; HDD');
  });

  it('paid on the hosted page with 4242 4242 4242 4242: session paid, fee 2.9 % + 30¢, webhooks sent, redirect to success_url', async () => {
    const session = await createSession(12_345);
    const submit = await fetch(session.url!, {
      method: 'POST',
      headers: { 'content-type': 'application/x-www-form-urlencoded' },
      body: new URLSearchParams({ cardNumber: '4242 4242 4242 4242', expiry: '12/39', cvc: '123' }).toString(),
      redirect: 'manual',
    });
    expect(submit.status).toBe(303);
    expect(submit.headers.get('location')).toBe(`http://127.0.0.1:9/paid?session=${session.id}`);

    const after = await stripe.checkout.sessions.retrieve(session.id);
    expect(after).toMatchObject({ status: 'complete', payment_status: 'paid' });

    const pi = await stripe.paymentIntents.retrieve(session.payment_intent as string, {
      expand: ['latest_charge.balance_transaction'],
    });
    expect(pi.status).toBe('succeeded');
    expect(pi.amount_received).toBe(12_345);
    const charge = pi.latest_charge as Stripe.Charge;
    expect(charge).toMatchObject({ status: 'succeeded', paid: true, amount: 12_345 });
    expect(charge.payment_method_details?.card).toMatchObject({ brand: 'visa', last4: '4242' });
    const txn = charge.balance_transaction as Stripe.BalanceTransaction;
    // 2.9 % of $123.45 is 358.005¢ → 358¢ (half-even), plus 30¢ = 388¢ (rate from memory of the provider's US pricing).
    expect(txn.fee).toBe(388);
    expect(txn.fee).toBe(cardFeeMinor(12_345));
    expect(txn.net).toBe(12_345 - 388);
    expect(txn).toMatchObject({ type: 'charge', source: charge.id, amount: 12_345 });
    expect((await stripe.balanceTransactions.retrieve(txn.id)).fee).toBe(388);

    const sessionEvents = await webhooksFor(session.id);
    expect(sessionEvents.map((r) => r.event.type)).toEqual(['checkout.session.completed']);
    const completed = sessionEvents[0].event.data.object as Stripe.Checkout.Session;
    expect(completed).toMatchObject({ payment_status: 'paid', metadata: { caseRef: 'PP-TEST-1' } });
    expect((await webhooksFor(pi.id)).map((r) => r.event.type)).toContain('payment_intent.succeeded');

    // Paying again is refused: the page says it is complete.
    const again = await fakeControl(`/checkout/${session.id}/pay`, { cardNumber: '4242424242424242' });
    expect(again.status).toBe(400);
    expect(again.json.error.code).toBe('checkout_session_complete');
  });

  it('declines 4000 0000 0000 0002 with card_declined, leaves the session open and sends payment_intent.payment_failed', async () => {
    const session = await createSession(5_000);
    const result = await fakeControl(`/checkout/${session.id}/pay`, { cardNumber: '4000 0000 0000 0002' });
    expect(result.status).toBe(402);
    expect(result.json.error).toMatchObject({
      type: 'card_error',
      code: 'card_declined',
      decline_code: 'generic_decline',
      message: 'Your card was declined.',
    });

    expect(await stripe.checkout.sessions.retrieve(session.id)).toMatchObject({ status: 'open', payment_status: 'unpaid' });
    const pi = await stripe.paymentIntents.retrieve(session.payment_intent as string);
    expect(pi.status).toBe('requires_payment_method');
    expect(pi.last_payment_error).toMatchObject({ code: 'card_declined', decline_code: 'generic_decline' });
    const failed = (await webhooksFor(pi.id)).filter((r) => r.event.type === 'payment_intent.payment_failed');
    expect(failed).toHaveLength(1);

    // The hosted page shows the decline and lets the person try again.
    const page = await fetch(session.url!, {
      method: 'POST',
      headers: { 'content-type': 'application/x-www-form-urlencoded' },
      body: 'cardNumber=4000000000000002&expiry=12%2F39&cvc=123',
      redirect: 'manual',
    });
    expect(page.status).toBe(402);
    expect(await page.text()).toContain('Your card was declined.');
  });

  it('refuses a card number that fails Luhn with a clear message and no charge attempt', async () => {
    const session = await createSession(5_000);
    const result = await fakeControl(`/checkout/${session.id}/pay`, { cardNumber: '4242 4242 4242 4241' });
    expect(result.status).toBe(402);
    expect(result.json.error).toMatchObject({ code: 'incorrect_number', param: 'number' });
    expect(result.json.error.message).toMatch(/card number is invalid/i);

    const pi = await stripe.paymentIntents.retrieve(session.payment_intent as string);
    expect(pi.latest_charge).toBeNull();
    expect(await webhooksFor(pi.id)).toHaveLength(0);

    const page = await fetch(session.url!, {
      method: 'POST',
      headers: { 'content-type': 'application/x-www-form-urlencoded' },
      body: 'cardNumber=1234+5678+9012+3456&expiry=12%2F39&cvc=123',
    });
    expect(page.status).toBe(402);
    expect(await page.text()).toMatch(/card number is invalid/i);
  });

  it('refuses a total under the $0.50 minimum, a missing success_url and a non-usd currency', async () => {
    const small = (await createSession(49).catch((e: unknown) => e)) as Stripe.errors.StripeError;
    expect(small.code).toBe('amount_too_small');

    const missing = (await stripe.checkout.sessions
      .create({ mode: 'payment', line_items: [{ price_data: { currency: 'usd', unit_amount: 100, product_data: { name: 'x' } }, quantity: 1 }] })
      .catch((e: unknown) => e)) as Stripe.errors.StripeError;
    expect(missing).toMatchObject({ code: 'parameter_missing', param: 'success_url' });

    const eur = (await createSession(1000, {
      line_items: [{ price_data: { currency: 'eur', unit_amount: 1000, product_data: { name: 'x' } }, quantity: 1 }],
    }).catch((e: unknown) => e)) as Stripe.errors.StripeError;
    expect(eur.statusCode).toBe(400);
    expect(eur.message).toMatch(/usd only/);
  });

  it('expires an open session; paying it afterwards is refused', async () => {
    const session = await createSession(1_000);
    const expired = await stripe.checkout.sessions.expire(session.id);
    expect(expired.status).toBe('expired');
    const result = await fakeControl(`/checkout/${session.id}/pay`, { cardNumber: '4242424242424242' });
    expect(result.json.error.code).toBe('checkout_session_expired');
    expect((await webhooksFor(session.id)).map((r) => r.event.type)).toEqual(['checkout.session.expired']);
  });

  it('lists the line items of a session', async () => {
    const session = await createSession(2_500);
    const items = await stripe.checkout.sessions.listLineItems(session.id);
    expect(items.data).toHaveLength(1);
    expect(items.data[0]).toMatchObject({ amount_total: 2_500, quantity: 1, description: 'Data recovery, 2.5" HDD' });
  });
});

describe('webhooks', () => {
  it('signs every delivery so stripe.webhooks.constructEvent accepts it, and rejects an altered body', async () => {
    const session = await paidSession(7_500);
    const [delivery] = await webhooksFor(session.id);
    expect(delivery.signature).toMatch(/^t=\d+,v1=[0-9a-f]{64}$/);

    const event = stripe.webhooks.constructEvent(delivery.raw, delivery.signature, WEBHOOK_SECRET);
    expect(event.type).toBe('checkout.session.completed');

    const altered = delivery.raw.replace('"amount_total": 7500', '"amount_total": 1');
    expect(altered).not.toBe(delivery.raw);
    expect(() => stripe.webhooks.constructEvent(altered, delivery.signature, WEBHOOK_SECRET)).toThrow(
      Stripe.errors.StripeSignatureVerificationError,
    );
    expect(() => stripe.webhooks.constructEvent(delivery.raw, delivery.signature, 'whsec_someone_else')).toThrow(
      Stripe.errors.StripeSignatureVerificationError,
    );
  });

  it('retries a delivery the receiver refused, until it is accepted', async () => {
    receiverFailures = 2;
    const account = await onboardedAccount();
    const deliveries = await webhooksFor(account.id);
    expect(deliveries.map((d) => d.event.type)).toEqual(['account.updated']);
    const attempts = fake.state.webhookDeliveries.filter((d) => d.eventId === deliveries[0].event.id);
    expect(attempts.map((a) => [a.attempt, a.status])).toEqual([
      [1, 500],
      [2, 500],
      [3, 200],
    ]);
  });

  it('keeps every event readable through the events API', async () => {
    const session = await paidSession(3_000);
    const [delivery] = await webhooksFor(session.id);
    const event = await stripe.events.retrieve(delivery.event.id);
    expect(event.type).toBe('checkout.session.completed');
    const listed = await stripe.events.list({ type: 'checkout.session.completed', limit: 100 });
    expect(listed.data.map((e) => e.id)).toContain(event.id);
    expect(listed.data.every((e) => e.type === 'checkout.session.completed')).toBe(true);
  });
});

describe('idempotency', () => {
  it('replays the saved first response for the same key and parameters, with Idempotent-Replayed: true', async () => {
    const destination = await onboardedAccount();
    const key = `transfer-${destination.id}`;
    const params = { amount: 1_250, currency: 'usd', destination: destination.id, transfer_group: `grp-${destination.id}` };
    const first = await stripe.transfers.create(params, { idempotencyKey: key });
    const second = await stripe.transfers.create(params, { idempotencyKey: key });
    expect(second.id).toBe(first.id);
    expect(second).toEqual(first);
    expect(second.lastResponse.headers['idempotent-replayed']).toBe('true');
    expect(first.lastResponse.headers['idempotent-replayed']).toBeUndefined();
    const listed = await stripe.transfers.list({ transfer_group: params.transfer_group });
    expect(listed.data).toHaveLength(1);
  });

  it('refuses the same key with different parameters with 400 idempotency_error', async () => {
    const destination = await onboardedAccount();
    const key = `transfer-diff-${destination.id}`;
    await stripe.transfers.create({ amount: 100, currency: 'usd', destination: destination.id }, { idempotencyKey: key });
    const error = (await stripe.transfers
      .create({ amount: 200, currency: 'usd', destination: destination.id }, { idempotencyKey: key })
      .catch((e: unknown) => e)) as Stripe.errors.StripeError;
    expect(error).toBeInstanceOf(Stripe.errors.StripeIdempotencyError);
    expect(error.statusCode).toBe(400);
    expect(error.rawType).toBe('idempotency_error');
    expect(error.message).toContain(key);
  });
});

describe('failure injection', () => {
  it('answers 500 to the next `times` calls to the path, then succeeds', async () => {
    const destination = await onboardedAccount();
    const set = await fakeControl('/fail', { path: '/v1/transfers', times: 2 });
    expect(set.status).toBe(200);
    const params = { amount: 300, currency: 'usd', destination: destination.id };
    for (let i = 0; i < 2; i++) {
      const error = (await stripe.transfers.create(params).catch((e: unknown) => e)) as Stripe.errors.StripeError;
      expect(error).toBeInstanceOf(Stripe.errors.StripeAPIError);
      expect(error.statusCode).toBe(500);
    }
    const transfer = await stripe.transfers.create(params);
    expect(transfer.destination).toBe(destination.id);
  });

  it('lets the client’s own retries (same Idempotency-Key) get through, creating the transfer once', async () => {
    const destination = await onboardedAccount();
    await fakeControl('/fail', { path: '/v1/transfers', times: 2 });
    const retrying = client({ maxNetworkRetries: 2 });
    const group = `retry-${destination.id}`;
    const transfer = await retrying.transfers.create({ amount: 400, currency: 'usd', destination: destination.id, transfer_group: group });
    expect(transfer.amount).toBe(400);
    expect((await stripe.transfers.list({ transfer_group: group })).data).toHaveLength(1);
  }, 15_000); // the client waits about half a second to a second between its retries
});

describe('transfers', () => {
  it('refuses a transfer to an account that has not finished onboarding', async () => {
    const account = await stripe.accounts.create({ type: 'express' });
    const error = (await stripe.transfers
      .create({ amount: 500, currency: 'usd', destination: account.id })
      .catch((e: unknown) => e)) as Stripe.errors.StripeError;
    expect(error.statusCode).toBe(400);
    expect(error).toMatchObject({ code: 'insufficient_capabilities_for_transfer', param: 'destination' });
    expect(error.message).toMatch(/not finished onboarding/);
  });

  it('refuses a transfer to an account that does not exist', async () => {
    const error = (await stripe.transfers
      .create({ amount: 500, currency: 'usd', destination: 'acct_missing' })
      .catch((e: unknown) => e)) as Stripe.errors.StripeError;
    expect(error).toMatchObject({ code: 'resource_missing', param: 'destination' });
  });

  it('creates, retrieves and lists transfers by transfer_group, each with its balance transaction', async () => {
    const destination = await onboardedAccount();
    const group = `settlement-2030-05-${destination.id}`;
    const t1 = await stripe.transfers.create({ amount: 1_000, currency: 'usd', destination: destination.id, transfer_group: group, metadata: { line: '1' } });
    const t2 = await stripe.transfers.create({ amount: 2_000, currency: 'usd', destination: destination.id, transfer_group: group });
    await stripe.transfers.create({ amount: 3_000, currency: 'usd', destination: destination.id, transfer_group: `${group}-other` });

    expect((await stripe.transfers.retrieve(t1.id)).metadata).toEqual({ line: '1' });
    const listed = await stripe.transfers.list({ transfer_group: group });
    expect(listed.data.map((t) => t.id)).toEqual([t2.id, t1.id]);
    const txn = await stripe.balanceTransactions.retrieve(t1.balance_transaction as string);
    expect(txn).toMatchObject({ type: 'transfer', amount: -1_000, fee: 0, net: -1_000, source: t1.id });
    const all = await stripe.transfers.list({ destination: destination.id }).autoPagingToArray({ limit: 100 });
    expect(all).toHaveLength(3);
  });

  it('pays a destination charge on to the connected account, less the application fee', async () => {
    const lab = await onboardedAccount();
    const session = await createSession(10_000, {
      payment_intent_data: { application_fee_amount: 1_250, transfer_data: { destination: lab.id }, transfer_group: `case-${lab.id}` },
    });
    await fakeControl(`/checkout/${session.id}/pay`, { cardNumber: '4242424242424242' });
    const [transfer] = (await stripe.transfers.list({ destination: lab.id })).data;
    expect(transfer).toMatchObject({ amount: 8_750, transfer_group: `case-${lab.id}` });
  });
});

describe('refunds', () => {
  it('refunds part, then the rest, and refuses to go beyond the charge', async () => {
    const session = await paidSession(10_000);
    const paymentIntent = session.payment_intent as string;

    const partial = await stripe.refunds.create({ payment_intent: paymentIntent, amount: 3_000 });
    expect(partial).toMatchObject({ object: 'refund', amount: 3_000, status: 'succeeded', payment_intent: paymentIntent });
    let charge = await stripe.charges.retrieve(partial.charge as string);
    expect(charge).toMatchObject({ amount_refunded: 3_000, refunded: false });

    const tooMuch = (await stripe.refunds.create({ payment_intent: paymentIntent, amount: 7_001 }).catch((e: unknown) => e)) as Stripe.errors.StripeError;
    expect(tooMuch.statusCode).toBe(400);
    expect(tooMuch).toMatchObject({ code: 'amount_too_large', param: 'amount' });
    expect(tooMuch.message).toMatch(/greater than the unrefunded amount/);

    const rest = await stripe.refunds.create({ payment_intent: paymentIntent });
    expect(rest.amount).toBe(7_000);
    charge = await stripe.charges.retrieve(rest.charge as string);
    expect(charge).toMatchObject({ amount_refunded: 10_000, refunded: true });

    const again = (await stripe.refunds.create({ payment_intent: paymentIntent }).catch((e: unknown) => e)) as Stripe.errors.StripeError;
    expect(again.code).toBe('charge_already_refunded');

    const txn = await stripe.balanceTransactions.retrieve(partial.balance_transaction as string);
    expect(txn).toMatchObject({ type: 'refund', amount: -3_000, net: -3_000 });
    const refunds = await stripe.refunds.list({ payment_intent: paymentIntent });
    expect(refunds.data.map((r) => r.amount)).toEqual([7_000, 3_000]);

    const chargeEvents = (await webhooksFor(charge.id)).map((r) => r.event.type);
    expect(chargeEvents.filter((t) => t === 'charge.refunded')).toHaveLength(2);
    expect((await webhooksFor(partial.id)).map((r) => r.event.type)).toEqual(['refund.created']);
  });

  it('refuses to refund a payment that was never paid', async () => {
    const session = await createSession(1_000);
    const error = (await stripe.refunds
      .create({ payment_intent: session.payment_intent as string })
      .catch((e: unknown) => e)) as Stripe.errors.StripeError;
    expect(error.statusCode).toBe(400);
    expect(error.message).toMatch(/no successful charge/);
  });
});

describe('balance transactions', () => {
  it('lists by type and source', async () => {
    const session = await paidSession(4_000);
    const pi = await stripe.paymentIntents.retrieve(session.payment_intent as string);
    const listed = await stripe.balanceTransactions.list({ type: 'charge', source: pi.latest_charge as string });
    expect(listed.data).toHaveLength(1);
    expect(listed.data[0].fee).toBe(cardFeeMinor(4_000));
  });
});
