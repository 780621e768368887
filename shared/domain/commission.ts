import { BASIS_POINTS_PER_WHOLE, percentOfMinor, splitMinor } from './money';

/*
 * How a paid case's money is divided, and how commission lines add up to a statement. Pure: the ledger,
 * the settlement and the screens call these, and the tests check them without a database.
 *
 * The network's rules add nothing to the customer's price. Out of what the customer paid (`total`):
 *   - the payment processor keeps its fee (`fee`, as the processor reported it);
 *   - the network keeps its network fee: a percentage of the recovery service lines;
 *   - the referring shop earns its commission: a percentage of the recovery service lines, by tier;
 *   - the lab receives the rest: total − processor fee − network fee − commission.
 * Shipping, media and tax are in the total (and so in the lab's share) but never in the commission base.
 * Should a tiny payment leave the lab less than nothing, the network gives up as much of its fee as it
 * takes (even going below zero); the lab's share never goes negative and the shop's commission is kept.
 */

export interface CommissionTier {
  /** The tier applies from this many paid referrals in the last 90 days (the first tier starts at 0). */
  minPaidReferrals: number;
  /** Commission on the recovery service lines, in basis points (1 250 = 12.5 %). */
  basisPoints: number;
}

/** Days over which a shop's paid referrals count towards its tier. */
export const TIER_WINDOW_DAYS = 90;

/** The highest commission rate we accept in a plan: half of the service lines. */
export const MAX_COMMISSION_BASIS_POINTS = 5_000;

/** Problems with a tier list, as messages with the index they concern (empty when the tiers are usable). */
export function tierProblems(tiers: readonly CommissionTier[]): { index: number; field: keyof CommissionTier | null; message: string }[] {
  const problems: { index: number; field: keyof CommissionTier | null; message: string }[] = [];
  if (tiers.length === 0) problems.push({ index: 0, field: null, message: 'A plan needs at least one tier' });
  tiers.forEach((tier, index) => {
    if (!Number.isSafeInteger(tier.minPaidReferrals) || tier.minPaidReferrals < 0) {
      problems.push({ index, field: 'minPaidReferrals', message: 'Paid referrals must be a whole number, 0 or more' });
    }
    if (!Number.isSafeInteger(tier.basisPoints) || tier.basisPoints < 0 || tier.basisPoints > MAX_COMMISSION_BASIS_POINTS) {
      problems.push({ index, field: 'basisPoints', message: `The rate must be a whole number of basis points from 0 to ${MAX_COMMISSION_BASIS_POINTS}` });
    }
    if (index === 0 && tier.minPaidReferrals !== 0) {
      problems.push({ index, field: 'minPaidReferrals', message: 'The first tier must start at 0 paid referrals' });
    }
    if (index > 0 && tier.minPaidReferrals <= tiers[index - 1]!.minPaidReferrals) {
      problems.push({ index, field: 'minPaidReferrals', message: 'Each tier must start at more paid referrals than the one before' });
    }
  });
  return problems;
}

/**
 * The tier for a shop with `paidReferrals` paid referrals in the window (the case being paid included):
 * the last tier whose threshold it has reached. Tiers must be valid (see `tierProblems`).
 */
export function selectTier(tiers: readonly CommissionTier[], paidReferrals: number): { index: number; tier: CommissionTier } {
  if (tiers.length === 0) throw new RangeError('A commission plan needs at least one tier.');
  if (!Number.isSafeInteger(paidReferrals) || paidReferrals < 0) {
    throw new RangeError(`Paid referrals must be a whole number ≥ 0; got ${paidReferrals}.`);
  }
  let index = 0;
  for (let i = 1; i < tiers.length; i++) if (tiers[i]!.minPaidReferrals <= paidReferrals) index = i;
  return { index, tier: tiers[index]! };
}

export interface CommissionLineAmount {
  baseMinor: number;
  basisPoints: number;
  tierIndex: number;
  amountMinor: number;
}

/** One case's commission: its service lines × the tier's rate, rounded half-even once, on this line. */
export function commissionForCase(serviceLinesMinor: number, tiers: readonly CommissionTier[], paidReferrals: number): CommissionLineAmount {
  if (!Number.isSafeInteger(serviceLinesMinor) || serviceLinesMinor < 0) {
    throw new RangeError(`Service lines must be a whole number of minor units ≥ 0; got ${serviceLinesMinor}.`);
  }
  const { index, tier } = selectTier(tiers, paidReferrals);
  return { baseMinor: serviceLinesMinor, basisPoints: tier.basisPoints, tierIndex: index, amountMinor: percentOfMinor(serviceLinesMinor, tier.basisPoints) };
}

export interface PaymentSplitInput {
  totalMinor: number;
  feeMinor: number;
  serviceLinesMinor: number;
  commissionMinor: number;
  networkFeeBasisPoints: number;
}

export interface PaymentSplit {
  totalMinor: number;
  feeMinor: number;
  networkFeeMinor: number;
  commissionMinor: number;
  labShareMinor: number;
}

function assertWhole(value: number, name: string, min = 0) {
  if (!Number.isSafeInteger(value) || value < min) throw new RangeError(`${name} must be a whole number of minor units ≥ ${min}; got ${value}.`);
}

/** Divides a customer's payment between processor, network, shop and lab (rules at the top of this file). */
export function splitPayment(input: PaymentSplitInput): PaymentSplit {
  const { totalMinor, feeMinor, serviceLinesMinor, commissionMinor, networkFeeBasisPoints } = input;
  assertWhole(totalMinor, 'The total', 1);
  assertWhole(feeMinor, 'The processor fee');
  assertWhole(serviceLinesMinor, 'The service lines');
  assertWhole(commissionMinor, 'The commission');
  if (feeMinor > totalMinor) throw new RangeError(`The processor fee (${feeMinor}) cannot exceed the total (${totalMinor}).`);
  if (serviceLinesMinor > totalMinor) throw new RangeError(`The service lines (${serviceLinesMinor}) cannot exceed the total (${totalMinor}).`);
  if (commissionMinor > serviceLinesMinor) throw new RangeError('The commission cannot exceed the service lines it is a share of.');
  let networkFeeMinor = percentOfMinor(serviceLinesMinor, networkFeeBasisPoints);
  let labShareMinor = totalMinor - feeMinor - networkFeeMinor - commissionMinor;
  if (labShareMinor < 0) {
    networkFeeMinor += labShareMinor;
    labShareMinor = 0;
  }
  return { totalMinor, feeMinor, networkFeeMinor, commissionMinor, labShareMinor };
}

/**
 * Who gives back what when the customer is refunded. The processor keeps its fee (from memory: the
 * provider does not return the fee on a refund), and the fee stays the lab's cost, so a refund is shared
 * in proportion to what each party was credited: the lab its share plus the fee it bore, the network its
 * fee, the shop its commission. A full refund therefore leaves the lab owing the processor fee.
 */
export function refundWeights(split: PaymentSplit): [lab: number, network: number, partner: number] {
  const network = Math.max(split.networkFeeMinor, 0);
  return [split.totalMinor - split.commissionMinor - network, network, split.commissionMinor];
}

export interface RefundReversal {
  labMinor: number;
  networkMinor: number;
  partnerMinor: number;
}

/**
 * The reversal for one refund, given what was refunded before it. Computed on the running total and
 * differenced, so that any number of partial refunds that add up to the whole payment reverse exactly
 * every share, to the cent (largest-remainder split, `splitMinor`).
 */
export function refundReversal(split: PaymentSplit, refundedBeforeMinor: number, refundMinor: number): RefundReversal {
  assertWhole(refundedBeforeMinor, 'The amount refunded before');
  assertWhole(refundMinor, 'The refund', 1);
  if (refundedBeforeMinor + refundMinor > split.totalMinor) {
    throw new RangeError(`Refunds (${refundedBeforeMinor + refundMinor}) cannot exceed the payment (${split.totalMinor}).`);
  }
  const weights = refundWeights(split);
  const before = refundedBeforeMinor === 0 ? [0, 0, 0] : splitMinor(refundedBeforeMinor, weights);
  const after = splitMinor(refundedBeforeMinor + refundMinor, weights);
  return { labMinor: after[0]! - before[0]!, networkMinor: after[1]! - before[1]!, partnerMinor: after[2]! - before[2]! };
}

export interface StatementTotals {
  openingCarryMinor: number;
  linesTotalMinor: number;
  totalMinor: number;
  payoutMinor: number;
  carryForwardMinor: number;
}

/**
 * A statement's totals from its already-rounded lines: the lines are added as they are (never re-rounded
 * as a sum), a negative balance carried from earlier statements is added, and a negative result pays
 * nothing and carries forward to the next statement.
 */
export function statementTotals(openingCarryMinor: number, lineAmountsMinor: readonly number[]): StatementTotals {
  if (!Number.isSafeInteger(openingCarryMinor) || openingCarryMinor > 0) {
    throw new RangeError(`A carried balance is a whole number ≤ 0; got ${openingCarryMinor}.`);
  }
  let linesTotalMinor = 0;
  for (const amount of lineAmountsMinor) {
    if (!Number.isSafeInteger(amount)) throw new RangeError(`Line amounts must be whole minor units; got ${amount}.`);
    linesTotalMinor += amount;
  }
  const totalMinor = openingCarryMinor + linesTotalMinor;
  return {
    openingCarryMinor,
    linesTotalMinor,
    totalMinor,
    payoutMinor: Math.max(totalMinor, 0),
    carryForwardMinor: Math.min(totalMinor, 0),
  };
}

/** "2025-11" → the month's first instant and the next month's, in UTC (settlement periods are UTC months). */
export function periodBounds(period: string): { start: Date; end: Date } {
  const match = /^(\d{4})-(0[1-9]|1[0-2])$/.exec(period);
  if (!match) throw new RangeError(`A period is a month written YYYY-MM, like 2025-11; got "${period}".`);
  const year = Number(match[1]);
  const month = Number(match[2]) - 1;
  return { start: new Date(Date.UTC(year, month, 1)), end: new Date(Date.UTC(year, month + 1, 1)) };
}

/** The UTC month an instant falls in, as YYYY-MM. */
export function periodOf(at: Date): string {
  return `${at.getUTCFullYear()}-${String(at.getUTCMonth() + 1).padStart(2, '0')}`;
}

/** The month before the one `at` falls in (what the scheduled settlement on the 1st settles). */
export function previousPeriod(at: Date): string {
  return periodOf(new Date(Date.UTC(at.getUTCFullYear(), at.getUTCMonth() - 1, 1)));
}

/** Basis points as a percentage for people: 1250 → "12.5 %". */
export function formatBasisPoints(basisPoints: number): string {
  // Divided once, by 100: (bp / 10 000) × 100 leaves float noise (1400 → 14.000000000000002).
  const percent = basisPoints / (BASIS_POINTS_PER_WHOLE / 100);
  return `${Number.isInteger(percent) ? percent : percent.toFixed(2).replace(/\.?0+$/, '')} %`;
}

/** A period for people: "2025-11" → "November 2025" (long) or "Nov" (short, for chart labels). */
export function formatPeriod(period: string, style: 'long' | 'short' = 'long'): string {
  const { start } = periodBounds(period);
  return new Intl.DateTimeFormat('en-US', style === 'long' ? { month: 'long', year: 'numeric', timeZone: 'UTC' } : { month: 'short', timeZone: 'UTC' }).format(start);
}
