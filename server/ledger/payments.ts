import type { EntityManager } from 'typeorm';
import {
  commissionForCase,
  refundReversal,
  splitPayment,
  TIER_WINDOW_DAYS,
  type PaymentSplit,
} from '@shared/domain/commission';
import { normaliseCurrency } from '@shared/domain/money';
import { planFor } from '../commissions';
import { AppError } from '../lib/errors';
import { logger } from '../lib/logger';
import { EarningLine } from './entities';
import { postTransaction, requireMinor, type EntryInput } from './postings';

/*
 * What the payment component calls when a customer pays for a case or is refunded. Both run in the
 * caller's transaction and are idempotent per provider id (payment intent, refund): a webhook delivered
 * twice, or a call retried after a crash, posts nothing the second time.
 *
 * A payment, as one ledger transaction (debit +, credit −; T total, F processor fee, N network fee,
 * C commission, L lab share = T − F − N − C):
 *   processor_clearing          +T   the customer's payment, held at the processor
 *   processor_clearing          −F   the fee the processor withheld
 *   processor_fees              +F   that fee, as a cost
 *   network_revenue             −F   … recovered from the lab's share (the lab bears the card fee)
 *   network_revenue             −N   the network fee
 *   partner_commission_payable  −C   owed to the referring shop (accrued now, paid at settlement)
 *   lab_payable                 −L   owed to the lab (paid at settlement)
 * A refund of R (shares per `refundReversal`: lab, network and shop give back in proportion):
 *   refunds −R, lab_payable +r_lab, network_revenue +r_network, partner_commission_payable +r_partner.
 */

export interface CustomerPaymentInput {
  referralId: string;
  partnerOrganizationId: string;
  labOrganizationId: string;
  currency: string;
  totalMinor: number;
  feeMinor: number;
  /** Recovery service lines only (no shipping, media or tax): the commission base. */
  serviceLinesMinor: number;
  paymentIntentId: string;
  paidAt: Date;
}

export interface CustomerPaymentResult {
  ledgerTransactionId: string;
  /** false when this payment intent was posted before (nothing was written this time). */
  created: boolean;
  currency: string;
  split: PaymentSplit;
  commission: { planId: string | null; basisPoints: number; tierIndex: number | null; paidReferrals: number; amountMinor: number };
}

interface StoredPaymentDetails {
  split: PaymentSplit;
  partnerOrganizationId: string;
  labOrganizationId: string;
  commission: CustomerPaymentResult['commission'];
  serviceLinesMinor: number;
  networkFeeBasisPoints: number;
}

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

function requireId(value: unknown, path: string, pattern?: RegExp): string {
  if (typeof value !== 'string' || !value.trim() || value.length > 255 || (pattern && !pattern.test(value))) {
    throw AppError.validation([{ path, message: 'Missing or not a valid id' }]);
  }
  return value;
}

function requireDate(value: unknown, path: string): Date {
  if (!(value instanceof Date) || Number.isNaN(value.getTime())) throw AppError.validation([{ path, message: 'Must be a valid date' }]);
  return value;
}

function currencyOf(value: unknown): string {
  try {
    return normaliseCurrency(String(value));
  } catch (err) {
    throw AppError.validation([{ path: 'currency', message: (err as Error).message }]);
  }
}

function paymentEntries(input: { partnerOrganizationId: string; labOrganizationId: string }, split: PaymentSplit): EntryInput[] {
  const { totalMinor: T, feeMinor: F, networkFeeMinor: N, commissionMinor: C, labShareMinor: L } = split;
  return [
    { account: { kind: 'processor_clearing' }, amountMinor: T, memo: 'Customer payment' },
    { account: { kind: 'processor_clearing' }, amountMinor: -F, memo: 'Processor fee withheld' },
    { account: { kind: 'processor_fees' }, amountMinor: F, memo: 'Processor fee' },
    { account: { kind: 'network_revenue' }, amountMinor: -F, memo: 'Processor fee recovered from the lab share' },
    { account: { kind: 'network_revenue' }, amountMinor: -N, memo: 'Network fee' },
    { account: { kind: 'partner_commission_payable', organizationId: input.partnerOrganizationId }, amountMinor: -C, memo: 'Partner commission' },
    { account: { kind: 'lab_payable', organizationId: input.labOrganizationId }, amountMinor: -L, memo: 'Lab share' },
  ];
}

async function existingPayment(manager: EntityManager, paymentIntentId: string) {
  const rows: { id: string; currency: string; details: StoredPaymentDetails }[] = await manager.query(
    `SELECT id, currency, details FROM ledger_transactions WHERE kind = 'customer_payment' AND source_id = $1`,
    [paymentIntentId],
  );
  return rows[0];
}

/**
 * Records a customer's payment for a case and accrues the shop's commission and the lab's share.
 * Call it in the transaction that marks the case paid.
 */
export async function postCustomerPayment(manager: EntityManager, input: CustomerPaymentInput): Promise<CustomerPaymentResult> {
  const referralId = requireId(input.referralId, 'referralId', UUID);
  const partnerId = requireId(input.partnerOrganizationId, 'partnerOrganizationId', UUID);
  const labId = requireId(input.labOrganizationId, 'labOrganizationId', UUID);
  const paymentIntentId = requireId(input.paymentIntentId, 'paymentIntentId');
  const paidAt = requireDate(input.paidAt, 'paidAt');
  const currency = currencyOf(input.currency);
  const totalMinor = requireMinor(input.totalMinor, 'totalMinor', 1);
  const feeMinor = requireMinor(input.feeMinor, 'feeMinor');
  const serviceLinesMinor = requireMinor(input.serviceLinesMinor, 'serviceLinesMinor');
  if (feeMinor > totalMinor) throw AppError.validation([{ path: 'feeMinor', message: 'The processor fee cannot exceed the total' }]);
  if (serviceLinesMinor > totalMinor) throw AppError.validation([{ path: 'serviceLinesMinor', message: 'The service lines cannot exceed the total' }]);

  // One accrual at a time per shop, so the tier count of each payment is exact; also makes a
  // concurrent second delivery of the same payment wait and then find the first.
  await manager.query(`SELECT pg_advisory_xact_lock(hashtext('commission-accrual'), hashtext($1))`, [partnerId]);
  const before = await existingPayment(manager, paymentIntentId);
  if (before) return resultFrom(before.id, false, before.currency, before.details);

  const [referral]: { partner_organization_id: string; lab_organization_id: string | null }[] = await manager.query(
    `SELECT partner_organization_id, lab_organization_id FROM referrals WHERE id = $1`,
    [referralId],
  );
  if (!referral) throw AppError.notFound('That case');
  if (referral.partner_organization_id !== partnerId) {
    throw AppError.conflict('The case was referred by another shop', [{ path: 'partnerOrganizationId', message: 'Not the shop that referred this case' }]);
  }
  if (referral.lab_organization_id && referral.lab_organization_id !== labId) {
    throw AppError.conflict('Another lab holds this case', [{ path: 'labOrganizationId', message: 'Not the lab that holds this case' }]);
  }

  // Paid referrals of the shop in the 90 days up to this payment, this case included.
  const windowStart = new Date(paidAt.getTime() - TIER_WINDOW_DAYS * 86_400_000);
  const [{ paid }]: { paid: number }[] = await manager.query(
    `SELECT count(DISTINCT referral_id)::int AS paid FROM earning_lines
     WHERE organization_id = $1 AND kind = 'commission' AND accrued_at > $2 AND accrued_at <= $3 AND referral_id <> $4`,
    [partnerId, windowStart, paidAt, referralId],
  );
  const paidReferrals = paid + 1;
  const plan = await planFor(manager, partnerId);
  if (!plan) logger.warn({ partnerOrganizationId: partnerId }, 'no commission plan (no default either): commission and network fee are 0');
  const line = plan ? commissionForCase(serviceLinesMinor, plan.tiers, paidReferrals) : { basisPoints: 0, tierIndex: null, amountMinor: 0 };
  const networkFeeBasisPoints = plan?.networkFeeBasisPoints ?? 0;
  const split = splitPayment({ totalMinor, feeMinor, serviceLinesMinor, commissionMinor: line.amountMinor, networkFeeBasisPoints });
  const commission = { planId: plan?.id ?? null, basisPoints: line.basisPoints, tierIndex: line.tierIndex, paidReferrals, amountMinor: line.amountMinor };
  const details: StoredPaymentDetails = { split, partnerOrganizationId: partnerId, labOrganizationId: labId, commission, serviceLinesMinor, networkFeeBasisPoints };

  const posted = await postTransaction(manager, {
    kind: 'customer_payment',
    sourceId: paymentIntentId,
    referralId,
    currency,
    occurredAt: paidAt,
    memo: 'Customer payment for a recovery',
    details: details as unknown as Record<string, unknown>,
    entries: paymentEntries({ partnerOrganizationId: partnerId, labOrganizationId: labId }, split),
  });
  await manager.insert(EarningLine, [
    {
      organizationId: partnerId,
      payeeKind: 'partner',
      kind: 'commission',
      referralId,
      ledgerTransactionId: posted.id,
      currency,
      amountMinor: split.commissionMinor,
      baseMinor: serviceLinesMinor,
      basisPoints: line.basisPoints,
      planId: plan?.id ?? null,
      tierIndex: line.tierIndex,
      paidReferrals,
      details: { paymentIntentId },
      accruedAt: paidAt,
      statementId: null,
    },
    {
      organizationId: labId,
      payeeKind: 'lab',
      kind: 'lab_share',
      referralId,
      ledgerTransactionId: posted.id,
      currency,
      amountMinor: split.labShareMinor,
      baseMinor: totalMinor,
      basisPoints: null,
      planId: null,
      tierIndex: null,
      paidReferrals: null,
      details: { paymentIntentId, totalMinor, feeMinor, networkFeeMinor: split.networkFeeMinor, commissionMinor: split.commissionMinor },
      accruedAt: paidAt,
      statementId: null,
    },
  ]);
  return resultFrom(posted.id, true, currency, details);
}

function resultFrom(id: string, created: boolean, currency: string, details: StoredPaymentDetails): CustomerPaymentResult {
  return { ledgerTransactionId: id, created, currency, split: details.split, commission: details.commission };
}

export interface RefundInput {
  referralId: string;
  amountMinor: number;
  currency: string;
  refundId: string;
  refundedAt: Date;
}

export interface RefundResult {
  ledgerTransactionId: string;
  created: boolean;
  paymentTransactionId: string;
  reversal: { labMinor: number; networkMinor: number; partnerMinor: number };
}

/**
 * Records a refund to the customer: the lab, the network and the shop give back their shares in
 * proportion. The shop's part is a negative commission line dated the refund: on this month's statement
 * if the case's commission is not settled yet, else on the next one (a claw-back).
 */
export async function postRefund(manager: EntityManager, input: RefundInput): Promise<RefundResult> {
  const referralId = requireId(input.referralId, 'referralId', UUID);
  const refundId = requireId(input.refundId, 'refundId');
  const refundedAt = requireDate(input.refundedAt, 'refundedAt');
  const currency = currencyOf(input.currency);
  const amountMinor = requireMinor(input.amountMinor, 'amountMinor', 1);

  await manager.query(`SELECT pg_advisory_xact_lock(hashtext('ledger-refund'), hashtext($1))`, [referralId]);
  const [earlier]: { id: string; details: { paymentTransactionId: string; reversal: RefundResult['reversal'] } }[] = await manager.query(
    `SELECT id, details FROM ledger_transactions WHERE kind = 'refund' AND source_id = $1`,
    [refundId],
  );
  if (earlier) {
    return { ledgerTransactionId: earlier.id, created: false, paymentTransactionId: earlier.details.paymentTransactionId, reversal: earlier.details.reversal };
  }

  // The case's payments in this currency, newest first, with what was refunded of each so far.
  const payments: { id: string; details: StoredPaymentDetails; refunded: string }[] = await manager.query(
    `SELECT p.id, p.details,
            coalesce((SELECT sum((r.details->>'amountMinor')::bigint) FROM ledger_transactions r
                      WHERE r.kind = 'refund' AND r.details->>'paymentTransactionId' = p.id::text), 0)::text AS refunded
     FROM ledger_transactions p
     WHERE p.kind = 'customer_payment' AND p.referral_id = $1 AND p.currency = $2
     ORDER BY p.occurred_at DESC, p.created_at DESC`,
    [referralId, currency],
  );
  if (payments.length === 0) {
    throw new AppError('refund_without_payment', 409, 'No payment in that currency is recorded for this case, so there is nothing to refund yet');
  }
  const payment = payments.find((p) => p.details.split.totalMinor - Number(p.refunded) >= amountMinor);
  if (!payment) {
    throw new AppError('refund_exceeds_payment', 409, 'The refund is larger than what remains of the case’s payment', [
      { path: 'amountMinor', message: 'More than the unrefunded amount' },
    ]);
  }
  const { split, partnerOrganizationId, labOrganizationId } = payment.details;
  const reversal = refundReversal(split, Number(payment.refunded), amountMinor);

  const posted = await postTransaction(manager, {
    kind: 'refund',
    sourceId: refundId,
    referralId,
    currency,
    occurredAt: refundedAt,
    memo: 'Refund to the customer',
    details: { paymentTransactionId: payment.id, amountMinor, reversal },
    entries: [
      { account: { kind: 'refunds' }, amountMinor: -amountMinor, memo: 'Refund to the customer' },
      { account: { kind: 'lab_payable', organizationId: labOrganizationId }, amountMinor: reversal.labMinor, memo: 'Lab share given back' },
      { account: { kind: 'network_revenue' }, amountMinor: reversal.networkMinor, memo: 'Network fee given back' },
      {
        account: { kind: 'partner_commission_payable', organizationId: partnerOrganizationId },
        amountMinor: reversal.partnerMinor,
        memo: 'Partner commission clawed back',
      },
    ],
  });
  const lines = [];
  if (reversal.partnerMinor !== 0) {
    lines.push({
      organizationId: partnerOrganizationId,
      payeeKind: 'partner' as const,
      kind: 'commission_clawback' as const,
      referralId,
      ledgerTransactionId: posted.id,
      currency,
      amountMinor: -reversal.partnerMinor,
      baseMinor: null,
      basisPoints: null,
      planId: payment.details.commission.planId,
      tierIndex: null,
      paidReferrals: null,
      details: { refundId, refundMinor: amountMinor },
      accruedAt: refundedAt,
      statementId: null,
    });
  }
  if (reversal.labMinor !== 0) {
    lines.push({
      organizationId: labOrganizationId,
      payeeKind: 'lab' as const,
      kind: 'lab_share_reversal' as const,
      referralId,
      ledgerTransactionId: posted.id,
      currency,
      amountMinor: -reversal.labMinor,
      baseMinor: null,
      basisPoints: null,
      planId: null,
      tierIndex: null,
      paidReferrals: null,
      details: { refundId, refundMinor: amountMinor },
      accruedAt: refundedAt,
      statementId: null,
    });
  }
  if (lines.length) await manager.insert(EarningLine, lines);
  return { ledgerTransactionId: posted.id, created: true, paymentTransactionId: payment.id, reversal };
}
