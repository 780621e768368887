import { randomUUID } from 'node:crypto';
import type Stripe from 'stripe';
import { In, MoreThan, Not, type EntityManager } from 'typeorm';
import { formatMoney } from '@shared/domain/money';
import { confirmCheckoutInput } from '@shared/schemas/customer';
import { quoteLineKindLabels } from '@shared/schemas/lab-work';
import { recordAudit } from '../audit';
import { AppError } from '../lib/errors';
import type { ServiceContext } from '../lib/context';
import { logger } from '../lib/logger';
import { parseInput } from '../lib/validate';
import { postCustomerPayment } from '../ledger';
import { enqueueEmail } from '../notifications';
import { Organization } from '../organizations';
import type { Referral } from '../referrals/entities';
import { lockReferral, recordTimeline } from '../routing';
import { moveCase, requireStatus } from './access';
import { CustomerCheckout, LabQuote } from './entities';
import { onPaymentEvent, paymentsClient } from '../payouts';
import { paymentsUnavailable } from './payments-errors';

// Paying an approved quote: a checkout session at the payment provider whose hosted page takes the
// card. The payment is recorded once — by whichever of the provider's events or the customer's return
// to our page arrives first — and always from the provider's own state, never from what an event says.

/** An open session is offered again while it has at least this long to run. */
const REUSE_MARGIN_MS = 15 * 60_000;

export function checkoutReturnUrls(appUrl: string) {
  return {
    success: `${appUrl}/c/checkout/done?session_id={CHECKOUT_SESSION_ID}`,
    cancel: `${appUrl}/c/checkout/cancelled`,
  };
}

/** A hosted payment page for the case's approved quote; the same open page again when there is one. */
export async function startCheckout(ctx: ServiceContext, manager: EntityManager, referral: Referral): Promise<{ url: string }> {
  if (['paid', 'recovering', 'ready_for_review', 'returned', 'closed'].includes(referral.status)) {
    throw AppError.conflict('This case is already paid.');
  }
  requireStatus(referral, ['approved'], 'Paying');
  const quote = await manager.findOneBy(LabQuote, { referralId: referral.id, status: 'approved' });
  if (!quote) throw AppError.conflict('There is no approved quote to pay.');

  const now = Date.now();
  const open = await manager.findOne(CustomerCheckout, {
    where: { referralId: referral.id, quoteId: quote.id, status: 'open', expiresAt: MoreThan(new Date(now + REUSE_MARGIN_MS)) },
    order: { createdAt: 'DESC' },
  });
  if (open?.url) return { url: open.url };

  const checkoutId = randomUUID();
  const urls = checkoutReturnUrls(ctx.config.appUrl);
  let session: Stripe.Checkout.Session;
  try {
    session = await paymentsClient(ctx.config).checkout.sessions.create(
      {
        mode: 'payment',
        line_items: quote.lines
          .filter((line) => line.amountMinor > 0)
          .map((line) => ({
            price_data: {
              currency: quote.currency.toLowerCase(),
              unit_amount: line.amountMinor,
              product_data: { name: `${quoteLineKindLabels[line.kind]}: ${line.description}`.slice(0, 250) },
            },
            quantity: 1,
          })),
        success_url: urls.success,
        cancel_url: urls.cancel,
        client_reference_id: referral.reference,
        customer_email: referral.customerEmail,
        metadata: { referralId: referral.id, quoteId: quote.id, checkoutId },
        payment_intent_data: {
          description: `Data recovery, case ${referral.reference}`,
          metadata: { referralId: referral.id, quoteId: quote.id, checkoutId },
        },
      },
      { idempotencyKey: `platterpost-checkout-${checkoutId}` },
    );
  } catch (error) {
    throw paymentsUnavailable(error);
  }
  if (!session.url || typeof session.payment_intent !== 'string' || session.amount_total !== quote.totalMinor) {
    logger.error({ sessionId: session.id, amountTotal: session.amount_total, quoteTotal: quote.totalMinor }, 'checkout session does not match the quote');
    throw paymentsUnavailable(new Error('checkout session does not match the quote'));
  }
  // Older open pages of this case are no longer offered; should one be paid anyway, it is recorded as a second payment.
  await manager.update(CustomerCheckout, { referralId: referral.id, status: 'open' }, { status: 'expired', updatedAt: new Date() });
  await manager.insert(CustomerCheckout, {
    id: checkoutId,
    referralId: referral.id,
    quoteId: quote.id,
    sessionId: session.id,
    paymentIntentId: session.payment_intent,
    url: session.url,
    amountMinor: quote.totalMinor,
    currency: quote.currency,
    status: 'open',
    expiresAt: new Date(session.expires_at * 1000),
    feeMinor: null,
    paidAt: null,
    lastFailure: null,
    lastFailureChargeId: null,
  });
  return { url: session.url };
}

export type PaymentOutcome = 'recorded' | 'already_recorded' | 'not_ours' | 'not_paid' | 'second_payment';

export interface ProviderPayment {
  paymentIntentId: string;
  amountReceivedMinor: number;
  currency: string;
  feeMinor: number;
  paidAt: Date;
  /** When we learned of it (the demo seed writes the past); otherwise now. */
  recordedAt?: Date;
}

/**
 * The one place a payment takes effect: the checkout becomes paid, the case moves to `paid`, the ledger
 * gets the payment, the customer an e-mail — all in one transaction, and only the first time.
 */
export async function applyPayment(manager: EntityManager, payment: ProviderPayment): Promise<PaymentOutcome> {
  const found = await manager.findOneBy(CustomerCheckout, { paymentIntentId: payment.paymentIntentId });
  if (!found) return 'not_ours';
  const referral = await lockReferral(manager, found.referralId);
  if (!referral) return 'not_ours';
  const checkout = await manager.findOne(CustomerCheckout, { where: { id: found.id }, lock: { mode: 'pessimistic_write' } });
  if (!checkout || checkout.status === 'paid') return 'already_recorded';

  const actor = { type: 'customer' as const, id: null, name: referral.customerName };
  const amount = formatMoney(payment.amountReceivedMinor, payment.currency);
  const otherPaid = await manager.findOneBy(CustomerCheckout, { referralId: referral.id, status: 'paid', id: Not(checkout.id) });
  if (otherPaid || payment.amountReceivedMinor !== checkout.amountMinor || payment.currency.toUpperCase() !== checkout.currency) {
    // Never a second charge for one case, and never a payment that does not match its quote: both wait for the network team.
    const why = otherPaid ? 'the case was already paid' : `the amount does not match the quote (${formatMoney(checkout.amountMinor, checkout.currency)})`;
    const already = checkout.lastFailure?.startsWith('Needs the network team');
    if (!already) {
      await manager.update(CustomerCheckout, checkout.id, { lastFailure: `Needs the network team: ${why}`, updatedAt: new Date() });
      await recordTimeline(manager, referral.id, {
        kind: 'payment_needs_attention',
        summary: `A payment of ${amount} arrived but ${why}; the network team will refund or settle it.`,
        actor: { type: 'system', id: null, name: 'Platterpost payments' },
        details: { paymentIntentId: payment.paymentIntentId, checkoutId: checkout.id },
      });
      await recordAudit(manager, {
        action: 'payment.needs_attention',
        organizationId: referral.partnerOrganizationId,
        targetType: 'referral',
        targetId: referral.id,
        details: { paymentIntentId: payment.paymentIntentId, amountMinor: payment.amountReceivedMinor, reason: why },
      });
      logger.error({ referralId: referral.id, paymentIntentId: payment.paymentIntentId, reason: why }, 'payment needs the network team');
    }
    return 'second_payment';
  }

  const quote = await manager.findOneByOrFail(LabQuote, { id: checkout.quoteId });
  await manager.update(CustomerCheckout, checkout.id, { status: 'paid', feeMinor: payment.feeMinor, paidAt: payment.paidAt, lastFailure: null, updatedAt: new Date() });
  await postCustomerPayment(manager, {
    referralId: referral.id,
    partnerOrganizationId: referral.partnerOrganizationId,
    labOrganizationId: referral.labOrganizationId!,
    currency: checkout.currency,
    totalMinor: checkout.amountMinor,
    feeMinor: payment.feeMinor,
    serviceLinesMinor: quote.serviceLinesMinor,
    paymentIntentId: payment.paymentIntentId,
    paidAt: payment.paidAt,
  });
  const entry = {
    kind: 'payment_received',
    summary: `Payment of ${amount} received from the customer.`,
    actor,
    // Written when the payment is recorded; the provider's own time (whole seconds) is kept beside it.
    details: { paymentIntentId: payment.paymentIntentId, amountMinor: checkout.amountMinor, feeMinor: payment.feeMinor, currency: checkout.currency, paidAt: payment.paidAt.toISOString() },
    at: payment.recordedAt,
  };
  if (referral.status === 'approved') await moveCase(manager, referral, 'paid', entry);
  else {
    logger.warn({ referralId: referral.id, status: referral.status }, 'payment recorded for a case that was not waiting for it');
    await recordTimeline(manager, referral.id, entry);
  }
  const lab = await manager.findOneBy(Organization, { id: referral.labOrganizationId! });
  await enqueueEmail(manager, referral.customerEmail, 'customer_payment_received', {
    customerName: referral.customerName,
    reference: referral.reference,
    amount,
    labName: lab?.name ?? 'The lab',
  });
  await recordAudit(manager, {
    action: 'customer.payment_received',
    organizationId: referral.partnerOrganizationId,
    targetType: 'referral',
    targetId: referral.id,
    details: { paymentIntentId: payment.paymentIntentId, checkoutId: checkout.id, amountMinor: checkout.amountMinor, feeMinor: payment.feeMinor },
  });
  return 'recorded';
}

/** Reads the payment from the provider and, when it succeeded, applies it (once), in the caller's transaction. */
export async function recordPayment(ctx: ServiceContext, manager: EntityManager, paymentIntentId: string): Promise<PaymentOutcome> {
  const known = await manager.findOneBy(CustomerCheckout, { paymentIntentId });
  if (!known) return 'not_ours';
  if (known.status === 'paid') return 'already_recorded';
  let intent: Stripe.PaymentIntent;
  try {
    intent = await paymentsClient(ctx.config).paymentIntents.retrieve(paymentIntentId, { expand: ['latest_charge.balance_transaction'] });
  } catch (error) {
    throw paymentsUnavailable(error);
  }
  if (intent.status !== 'succeeded') return 'not_paid';
  const charge = intent.latest_charge as Stripe.Charge | null;
  const txn = charge?.balance_transaction as Stripe.BalanceTransaction | null | undefined;
  const outcome = await applyPayment(manager, {
    paymentIntentId,
    amountReceivedMinor: intent.amount_received,
    currency: intent.currency.toUpperCase(),
    feeMinor: txn?.fee ?? 0,
    paidAt: new Date((charge?.created ?? intent.created) * 1000),
  });
  if (outcome === 'recorded') await expireOtherSessions(ctx, manager, known.referralId, known.sessionId);
  return outcome;
}

/** Once paid, no other page of the case may take a card. Best effort: a failure here is only logged. */
async function expireOtherSessions(ctx: ServiceContext, manager: EntityManager, referralId: string, paidSessionId: string): Promise<void> {
  const others = await manager.find(CustomerCheckout, { where: { referralId, status: In(['open', 'expired']), sessionId: Not(paidSessionId) } });
  for (const other of others) {
    try {
      const session = await paymentsClient(ctx.config).checkout.sessions.retrieve(other.sessionId);
      if (session.status === 'open') await paymentsClient(ctx.config).checkout.sessions.expire(other.sessionId);
      if (other.status === 'open') await manager.update(CustomerCheckout, other.id, { status: 'expired', updatedAt: new Date() });
    } catch (error) {
      logger.warn({ err: error, sessionId: other.sessionId }, 'could not expire another checkout session of a paid case');
    }
  }
}

/** A declined card: remembered for the customer's page, once per failed charge; nothing else changes. */
export async function recordPaymentFailure(manager: EntityManager, intent: Pick<Stripe.PaymentIntent, 'id' | 'last_payment_error'>): Promise<void> {
  const chargeId = intent.last_payment_error?.charge ?? null;
  const message = intent.last_payment_error?.message ?? 'The card was declined.';
  const found = await manager.findOneBy(CustomerCheckout, { paymentIntentId: intent.id });
  if (!found) return;
  const referral = await lockReferral(manager, found.referralId);
  const checkout = await manager.findOne(CustomerCheckout, { where: { id: found.id }, lock: { mode: 'pessimistic_write' } });
  if (!referral || !checkout || checkout.status === 'paid') return;
  if (chargeId && checkout.lastFailureChargeId === chargeId) return;
  await manager.update(CustomerCheckout, checkout.id, { lastFailure: message, lastFailureChargeId: chargeId, updatedAt: new Date() });
  await recordTimeline(manager, referral.id, {
    kind: 'payment_failed',
    summary: `A card payment did not go through: ${message}`,
    actor: { type: 'customer', id: null, name: referral.customerName },
    details: { paymentIntentId: intent.id, chargeId },
  });
  await recordAudit(manager, {
    action: 'customer.payment_failed',
    organizationId: referral.partnerOrganizationId,
    targetType: 'referral',
    targetId: referral.id,
    details: { paymentIntentId: intent.id, chargeId, message },
  });
}

/** The customer came back from the hosted page: check that session with the provider straight away. */
export async function confirmCheckoutReturn(ctx: ServiceContext, referralId: string, rawInput: unknown): Promise<PaymentOutcome> {
  const input = parseInput(confirmCheckoutInput, rawInput);
  const checkout = await ctx.db.getRepository(CustomerCheckout).findOneBy({ referralId, sessionId: input.sessionId });
  if (!checkout) throw AppError.notFound('That payment');
  return ctx.db.transaction((manager) => recordPayment(ctx, manager, checkout.paymentIntentId));
}

/**
 * This component's handlers on the payment webhook's dispatcher (server/payouts): each runs in the
 * webhook's transaction, which also records the event id, so an event delivered twice does nothing the
 * second time; the payment's own state makes the order of the events irrelevant.
 */
export function registerPaymentHandlers(): void {
  onPaymentEvent('checkout.session.completed', async (event, { manager, ctx }) => {
    const session = event.data.object as Stripe.Checkout.Session;
    if (typeof session.payment_intent === 'string') await recordPayment(ctx, manager, session.payment_intent);
  });
  onPaymentEvent('payment_intent.succeeded', async (event, { manager, ctx }) => {
    await recordPayment(ctx, manager, (event.data.object as Stripe.PaymentIntent).id);
  });
  onPaymentEvent('payment_intent.payment_failed', async (event, { manager }) => {
    await recordPaymentFailure(manager, event.data.object as Stripe.PaymentIntent);
  });
  onPaymentEvent('checkout.session.expired', async (event, { manager }) => {
    const session = event.data.object as Stripe.Checkout.Session;
    await manager.update(CustomerCheckout, { sessionId: session.id, status: 'open' }, { status: 'expired', updatedAt: new Date() });
  });
}
