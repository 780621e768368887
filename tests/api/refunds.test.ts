import { randomUUID } from 'node:crypto';
import type Stripe from 'stripe';
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { labCaseDto } from '@shared/schemas/lab-work';
import { signatureHeader } from '../../fakes/payments/webhooks';
import { setupApi } from '../support/api';
import { auth, labWorlds, paidCase, quotedCase, STANDARD_TOTAL_MINOR } from '../support/lab-work';
import { startPaymentsFake } from '../support/money-fixtures';

// The lab manager gives the customer back all or part of a card payment: the provider refunds it,
// the ledger takes back each party's share, and the timeline, the customer and the audit log hear of
// it, once, however often the request or the provider's event arrives.
const payments = await startPaymentsFake();
const ctx = await setupApi(payments.env);
const { app, db } = ctx;
const makeWorld = labWorlds(ctx, ['59201', '59211', '59212', '59213', '59214', '59215', '59217', '59218']);

const refund = (token: string, caseId: string, body: unknown, key: string | null = randomUUID()) => {
  const req = request(app).post(`/api/lab/cases/${caseId}/refunds`).set(auth(token));
  if (key) req.set('Idempotency-Key', key);
  return req.send(body as object);
};

const ledgerRefunds = (referralId: string): Promise<{ source_id: string; details: { amountMinor: number; reversal: Record<string, number> } }[]> =>
  db.query(`SELECT source_id, details FROM ledger_transactions WHERE kind = 'refund' AND referral_id = $1 ORDER BY occurred_at, created_at`, [referralId]);

async function paymentIntentOf(referralId: string): Promise<string> {
  const [row]: { payment_intent_id: string }[] = await db.query(`SELECT payment_intent_id FROM customer_checkouts WHERE referral_id = $1 AND status = 'paid'`, [referralId]);
  return row!.payment_intent_id;
}

describe('POST /api/lab/cases/:id/refunds', () => {
  it('refunds part and then the rest, books each once with the shares given back, and tells the customer', async () => {
    const world = await makeWorld();
    const c = await paidCase(ctx, world, payments.fake.url);
    const key = randomUUID();

    const first = await refund(world.manager.token, c.id, { amountMinor: 10_000, reason: 'partial_recovery' }, key);
    expect(first.status, JSON.stringify(first.body)).toBe(201);
    const page = labCaseDto.parse(first.body);
    expect(page.payment).toMatchObject({ state: 'paid', amountMinor: STANDARD_TOTAL_MINOR, refundedMinor: 10_000 });
    expect(page.timeline.at(-1)).toMatchObject({ kind: 'refunded', actor: { type: 'user', name: world.manager.name } });
    expect(page.timeline.at(-1)!.summary).toContain('$100.00');

    // The same request again (a retry): the provider is asked with the same key, nothing is booked twice.
    const again = await refund(world.manager.token, c.id, { amountMinor: 10_000, reason: 'partial_recovery' }, key);
    expect(again.status).toBe(201);
    const intent = await paymentIntentOf(c.id);
    expect((await payments.stripe.refunds.list({ payment_intent: intent })).data.map((r) => r.amount)).toEqual([10_000]);
    // The same key with another amount is another request: refused, and nothing more is refunded.
    const otherAmount = await refund(world.manager.token, c.id, { amountMinor: 5_000, reason: 'partial_recovery' }, key);
    expect(otherAmount.status).toBe(409);
    expect(otherAmount.body.error.fields).toEqual([{ path: 'Idempotency-Key', message: 'Used before with another request' }]);
    const booked = await ledgerRefunds(c.id);
    expect(booked).toHaveLength(1);
    const { labMinor, networkMinor, partnerMinor } = booked[0]!.details.reversal;
    expect(labMinor! + networkMinor! + partnerMinor!).toBe(10_000);

    // No amount: everything that is left.
    const restKey = randomUUID();
    const rest = await refund(world.manager.token, c.id, { reason: 'customer_request' }, restKey);
    expect(rest.status, JSON.stringify(rest.body)).toBe(201);
    expect(rest.body.payment.refundedMinor).toBe(STANDARD_TOTAL_MINOR);
    expect((await ledgerRefunds(c.id)).map((r) => r.details.amountMinor)).toEqual([10_000, STANDARD_TOTAL_MINOR - 10_000]);

    // Its retry (the answer was lost) finds nothing left, and is answered as the first was, not refused.
    const restAgain = await refund(world.manager.token, c.id, { reason: 'customer_request' }, restKey);
    expect(restAgain.status, JSON.stringify(restAgain.body)).toBe(201);
    expect(restAgain.body.payment.refundedMinor).toBe(STANDARD_TOTAL_MINOR);
    // The first key, asked for another amount once nothing is left: still another request.
    const firstKeyLater = await refund(world.manager.token, c.id, { amountMinor: 5_000, reason: 'partial_recovery' }, key);
    expect(firstKeyLater.status).toBe(409);
    expect(firstKeyLater.body.error.fields).toEqual([{ path: 'Idempotency-Key', message: 'Used before with another amount' }]);
    expect((await ledgerRefunds(c.id)).map((r) => r.details.amountMinor)).toEqual([10_000, STANDARD_TOTAL_MINOR - 10_000]);

    const more = await refund(world.manager.token, c.id, { amountMinor: 1, reason: 'customer_request' });
    expect(more.status).toBe(409);
    expect(more.body.error.message).toMatch(/refunded already/);

    const [customer]: { customer_email: string }[] = await db.query(`SELECT customer_email FROM referrals WHERE id = $1`, [c.id]);
    const mails: { subject: string }[] = await db.query(`SELECT subject FROM outbox_messages WHERE template = 'customer_refund_issued' AND recipient = $1 ORDER BY created_at`, [customer!.customer_email]);
    expect(mails.map((m) => m.subject)).toEqual([`Refund of $100.00 for case ${c.reference}`, expect.stringMatching(new RegExp(`^Refund of \\$[\\d,.]+ for case ${c.reference}$`))]);
    const audit: { n: string }[] = await db.query(`SELECT count(*) AS n FROM audit_events WHERE action = 'customer.refund_issued' AND target_id = $1`, [c.id]);
    expect(Number(audit[0]!.n)).toBe(2);
  });

  it('says field by field what is wrong, and refunds nothing', async () => {
    const world = await makeWorld();
    const c = await paidCase(ctx, world, payments.fake.url);

    const tooMuch = await refund(world.manager.token, c.id, { amountMinor: STANDARD_TOTAL_MINOR + 1, reason: 'recovery_failed' });
    expect(tooMuch.status).toBe(400);
    expect(tooMuch.body.error.fields).toEqual([{ path: 'amountMinor', message: 'At most $554.00 is left to refund' }]);

    const noKey = await refund(world.manager.token, c.id, { reason: 'recovery_failed' }, null);
    expect(noKey.status).toBe(400);
    expect(noKey.body.error.fields[0].path).toBe('Idempotency-Key');

    const noWhy = await refund(world.manager.token, c.id, { reason: 'other' });
    expect(noWhy.status).toBe(400);
    expect(noWhy.body.error.fields).toEqual([{ path: 'note', message: 'Say why the money goes back' }]);

    const badTypes = await refund(world.manager.token, c.id, { amountMinor: 12.5, reason: 'because' });
    expect(badTypes.status).toBe(400);
    expect(badTypes.body.error.fields.map((f: { path: string }) => f.path).sort()).toEqual(['amountMinor', 'reason']);

    // Only the lab's manager, and only on the lab's own, paid cases.
    expect((await refund(world.technician.token, c.id, { reason: 'recovery_failed' })).status).toBe(403);
    const other = await makeWorld();
    expect((await refund(other.manager.token, c.id, { reason: 'recovery_failed' })).status).toBe(404);
    const unpaid = await quotedCase(ctx, world);
    const notPaid = await refund(world.manager.token, unpaid.id, { reason: 'recovery_failed' });
    expect(notPaid.status).toBe(409);

    expect(await ledgerRefunds(c.id)).toEqual([]);
    expect((await payments.stripe.refunds.list({ payment_intent: await paymentIntentOf(c.id) })).data).toEqual([]);
  });
});

describe('a refund made at the payment provider', () => {
  it('is booked from the provider’s refund.created event, once however often it is delivered', async () => {
    const world = await makeWorld();
    const c = await paidCase(ctx, world, payments.fake.url);
    const intent = await paymentIntentOf(c.id);
    const made = await payments.stripe.refunds.create({ payment_intent: intent, amount: 2_500 });
    const events = await payments.stripe.events.list({ limit: 100 });
    const event = events.data.find((e) => e.type === 'refund.created' && (e.data.object as Stripe.Refund).id === made.id)!;
    expect(event).toBeDefined();

    const deliver = () => {
      const payload = JSON.stringify(event);
      return request(app)
        .post('/api/webhooks/payments')
        .set('Content-Type', 'application/json')
        .set('Stripe-Signature', signatureHeader(payload, payments.env.PAYMENTS_WEBHOOK_SECRET!))
        .send(payload);
    };
    expect((await deliver()).status).toBe(200);
    expect((await deliver()).status).toBe(200);

    expect((await ledgerRefunds(c.id)).map((r) => [r.source_id, r.details.amountMinor])).toEqual([[made.id, 2_500]]);
    const page = await request(app).get(`/api/lab/cases/${c.id}`).set(auth(world.manager.token));
    expect(page.body.payment.refundedMinor).toBe(2_500);
    expect(page.body.timeline.at(-1)).toMatchObject({ kind: 'refunded', actor: { type: 'system', name: 'Platterpost payments' } });
  });
});
