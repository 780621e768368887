import type Stripe from 'stripe';
import type { EntityManager } from 'typeorm';
import { formatMoney } from '@shared/domain/money';
import { refundInput, refundReasonLabels, refundReasons, type RefundReason } from '@shared/schemas/lab-work';
import { recordAudit } from '../audit';
import { AppError } from '../lib/errors';
import type { ServiceContext } from '../lib/context';
import { parseInput } from '../lib/validate';
import { postRefund } from '../ledger';
import { enqueueEmail } from '../notifications';
import { Organization } from '../organizations';
import { onPaymentEvent, paymentsClient } from '../payouts';
import { lockReferral, recordTimeline } from '../routing';
import { findLabCase, resolveWorker, type LabPrincipal } from './access';
import { CustomerCheckout } from './entities';
import type { StepMeta } from './evaluation';

// Giving the customer money back: the lab manager asks the payment provider for a refund of the
// case's paid checkout (all of what is left, or part), then the refund is recorded once, in the
// ledger (each party gives back its share), on the timeline and to the customer by e-mail. The
// provider's refund.created event records it too, so a refund made at the provider directly is
// booked the same way; whichever arrives first writes, the other finds it done.

const IDEMPOTENCY_KEY = /^[A-Za-z0-9._:-]{8,100}$/;

/** The provider's own reason codes, for its reports; ours stays in the metadata and on the timeline. */
const providerReason: Record<RefundReason, Stripe.RefundCreateParams.Reason | undefined> = {
  recovery_failed: 'requested_by_customer',
  partial_recovery: 'requested_by_customer',
  customer_request: 'requested_by_customer',
  charged_twice: 'duplicate',
  other: undefined,
};

/** Cents refunded so far on the case, as the ledger has them. */
export async function refundedMinorOf(manager: EntityManager, referralId: string): Promise<number> {
  const [row]: { n: string }[] = await manager.query(
    `SELECT coalesce(sum((details->>'amountMinor')::bigint), 0)::text AS n FROM ledger_transactions WHERE kind = 'refund' AND referral_id = $1`,
    [referralId],
  );
  return Number(row?.n ?? 0);
}

/**
 * Refunds all or part of a paid case for the lab that holds it. The Idempotency-Key makes a retry of
 * the same request (a double click, a dropped answer) refund once: the provider is asked with it.
 */
export async function refundCase(
  ctx: ServiceContext,
  who: LabPrincipal,
  id: string,
  rawInput: unknown,
  meta: StepMeta & { idempotencyKey?: string | undefined },
): Promise<string> {
  const input = parseInput(refundInput, rawInput);
  if (!meta.idempotencyKey || !IDEMPOTENCY_KEY.test(meta.idempotencyKey)) {
    throw AppError.validation([{ path: 'Idempotency-Key', message: 'Send an Idempotency-Key header (8–100 letters, digits, . _ : -) so that a retry refunds only once' }]);
  }
  const manager = ctx.db.manager;
  const worker = await resolveWorker(manager, who);
  const referral = await findLabCase(manager, worker.organizationId, id);
  const paid = await manager.findOneBy(CustomerCheckout, { referralId: referral.id, status: 'paid' });
  if (!paid) throw AppError.conflict('This case has no card payment to refund.');
  const left = paid.amountMinor - (await refundedMinorOf(manager, referral.id));
  const amountMinor = input.amountMinor ?? left;
  if (left <= 0 || amountMinor > left) {
    // A retry of a request that refunded what was left (its answer lost) finds nothing left: it is
    // answered as the first was, not refused, once the provider shows the refund made with its key.
    const earlier = await refundMadeWithKey(ctx, paid.paymentIntentId, referral.id, meta.idempotencyKey);
    if (earlier) {
      if (input.amountMinor !== undefined && input.amountMinor !== earlier.amount) {
        throw AppError.conflict('That Idempotency-Key was already used for a refund of another amount', [{ path: 'Idempotency-Key', message: 'Used before with another amount' }]);
      }
      await ctx.db.transaction((tx) => recordRefund(tx, earlier, refundContext(worker, input, meta)));
      return referral.id;
    }
    if (left <= 0) throw AppError.conflict('Everything the customer paid has been refunded already.');
    throw AppError.validation([{ path: 'amountMinor', message: `At most ${formatMoney(left, paid.currency)} is left to refund` }]);
  }

  let refund: Stripe.Refund;
  try {
    refund = await paymentsClient(ctx.config).refunds.create(
      {
        payment_intent: paid.paymentIntentId,
        amount: amountMinor,
        reason: providerReason[input.reason],
        metadata: { referralId: referral.id, reason: input.reason, requestKey: meta.idempotencyKey },
      },
      { idempotencyKey: `refund:${referral.id}:${meta.idempotencyKey}` },
    );
  } catch (error) {
    if ((error as { type?: string }).type === 'StripeIdempotencyError') {
      throw AppError.conflict('That Idempotency-Key was already used for a refund of another amount or reason', [{ path: 'Idempotency-Key', message: 'Used before with another request' }]);
    }
    if ((error as { type?: string }).type === 'StripeInvalidRequestError') {
      throw AppError.conflict(`The payment service refused the refund: ${(error as Error).message}`);
    }
    throw new AppError('unavailable', 502, 'The payment service did not answer. Nothing was refunded; please try again in a minute.', undefined, { cause: error });
  }
  await ctx.db.transaction((tx) => recordRefund(tx, refund, refundContext(worker, input, meta)));
  return referral.id;
}

function refundContext(worker: Awaited<ReturnType<typeof resolveWorker>>, input: { reason: RefundReason; note?: string | undefined }, meta: StepMeta): RefundContext {
  return { actor: worker.actor, actorUserId: worker.userId, reason: input.reason, note: input.note ?? null, ip: meta.ip ?? null };
}

/** The case's refund the provider made for a request with this Idempotency-Key, if any. */
async function refundMadeWithKey(ctx: ServiceContext, paymentIntentId: string, referralId: string, key: string): Promise<Stripe.Refund | null> {
  try {
    for await (const refund of paymentsClient(ctx.config).refunds.list({ payment_intent: paymentIntentId, limit: 100 })) {
      if (refund.metadata?.requestKey === key && refund.metadata?.referralId === referralId) return refund;
    }
    return null;
  } catch (error) {
    throw new AppError('unavailable', 502, 'The payment service did not answer. Nothing was refunded; please try again in a minute.', undefined, { cause: error });
  }
}

interface RefundContext {
  actor: { type: 'user' | 'api_key' | 'system'; id: string | null; name: string };
  actorUserId: string | null;
  reason: RefundReason | null;
  note: string | null;
  ip: string | null;
}

/** Books a succeeded refund of one of our checkouts, once (by the provider's refund id). */
export async function recordRefund(manager: EntityManager, refund: Stripe.Refund, who: RefundContext): Promise<'recorded' | 'already_recorded' | 'not_ours'> {
  if (refund.status !== 'succeeded' || typeof refund.payment_intent !== 'string') return 'not_ours';
  const checkout = await manager.findOneBy(CustomerCheckout, { paymentIntentId: refund.payment_intent });
  if (!checkout) return 'not_ours';
  const referral = await lockReferral(manager, checkout.referralId);
  if (!referral) return 'not_ours';
  const currency = refund.currency.toUpperCase();
  const refundedAt = new Date(refund.created * 1000);
  const posted = await postRefund(manager, { referralId: referral.id, amountMinor: refund.amount, currency, refundId: refund.id, refundedAt });
  if (!posted.created) return 'already_recorded';

  const amount = formatMoney(refund.amount, currency);
  const reasonLabel = who.reason ? refundReasonLabels[who.reason] : 'A refund made at the payment service';
  const because = [reasonLabel, who.note].filter(Boolean).join(': ');
  await recordTimeline(manager, referral.id, {
    kind: 'refunded',
    summary: `Refunded ${amount} to the customer's card. ${because}.`,
    actor: who.actor,
    details: { refundId: refund.id, amountMinor: refund.amount, currency, reason: who.reason, note: who.note, reversal: posted.reversal },
  });
  const lab = referral.labOrganizationId ? await manager.findOneBy(Organization, { id: referral.labOrganizationId }) : null;
  await enqueueEmail(manager, referral.customerEmail, 'customer_refund_issued', {
    customerName: referral.customerName,
    reference: referral.reference,
    amount,
    labName: lab?.name ?? 'The lab',
    reason: (who.reason ? refundReasonLabels[who.reason] : 'a refund made by the lab').toLowerCase(),
  });
  await recordAudit(manager, {
    action: 'customer.refund_issued',
    actorUserId: who.actorUserId,
    organizationId: referral.labOrganizationId ?? referral.partnerOrganizationId,
    targetType: 'referral',
    targetId: referral.id,
    details: { refundId: refund.id, amountMinor: refund.amount, currency, reason: who.reason, reversal: posted.reversal },
    ip: who.ip,
  });
  return 'recorded';
}

/** A refund made anywhere (our action or the provider's dashboard) is booked from the provider's own record of it. */
export function registerRefundHandlers(): void {
  // A card refund may start pending and succeed later (refund.updated); only a succeeded one is booked.
  const book: Parameters<typeof onPaymentEvent>[1] = async (event, { manager, ctx }) => {
    const refund = await paymentsClient(ctx.config).refunds.retrieve((event.data.object as Stripe.Refund).id);
    const reason = refund.metadata?.reason;
    await recordRefund(manager, refund, {
      actor: { type: 'system', id: null, name: 'Platterpost payments' },
      actorUserId: null,
      reason: reason && (refundReasons as readonly string[]).includes(reason) ? (reason as RefundReason) : null,
      note: null,
      ip: null,
    });
  };
  onPaymentEvent('refund.created', book);
  onPaymentEvent('refund.updated', book);
}
