import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  commissionForCase,
  formatBasisPoints,
  formatPeriod,
  periodBounds,
  periodOf,
  previousPeriod,
  refundReversal,
  refundWeights,
  selectTier,
  splitPayment,
  statementTotals,
  tierProblems,
  type CommissionTier,
} from './commission';
import { percentOfMinor, roundHalfEven } from './money';

// The plan figures below are invented for the tests; rounding is THE rule in money.ts (half to even).
const tiers: CommissionTier[] = [
  { minPaidReferrals: 0, basisPoints: 1000 },
  { minPaidReferrals: 10, basisPoints: 1250 },
  { minPaidReferrals: 25, basisPoints: 1500 },
];

describe('selectTier', () => {
  it.each([
    [0, 0, 1000],
    [1, 0, 1000],
    [9, 0, 1000],
    [10, 1, 1250],
    [24, 1, 1250],
    [25, 2, 1500],
    [400, 2, 1500],
  ])('puts a shop with %i paid referrals in tier %i (%i bp)', (paid, index, bp) => {
    expect(selectTier(tiers, paid)).toEqual({ index, tier: { minPaidReferrals: tiers[index]!.minPaidReferrals, basisPoints: bp } });
  });

  it('refuses an empty plan and a negative count', () => {
    expect(() => selectTier([], 3)).toThrow(/at least one tier/);
    expect(() => selectTier(tiers, -1)).toThrow(/≥ 0/);
  });

  it('never picks a tier whose threshold the shop has not reached (property)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 1000 }), (paid) => {
        const { index, tier } = selectTier(tiers, paid);
        expect(tier.minPaidReferrals).toBeLessThanOrEqual(paid);
        if (index + 1 < tiers.length) expect(tiers[index + 1]!.minPaidReferrals).toBeGreaterThan(paid);
      }),
    );
  });
});

describe('tierProblems', () => {
  it('accepts increasing thresholds that start at 0', () => {
    expect(tierProblems(tiers)).toEqual([]);
  });

  it('names the tier and field of each problem', () => {
    expect(tierProblems([])).toEqual([{ index: 0, field: null, message: 'A plan needs at least one tier' }]);
    const problems = tierProblems([
      { minPaidReferrals: 5, basisPoints: 1000 },
      { minPaidReferrals: 5, basisPoints: 9000 },
      { minPaidReferrals: 7, basisPoints: 12.5 },
    ]);
    expect(problems.map((p) => [p.index, p.field])).toEqual([
      [0, 'minPaidReferrals'],
      [1, 'basisPoints'],
      [1, 'minPaidReferrals'],
      [2, 'basisPoints'],
    ]);
  });
});

describe('commissionForCase', () => {
  it('takes the tier rate of the service lines, rounded half to even on the line', () => {
    // 12.5 % of $123.45 = 1543.125 cents → 1543 (the .125 is below a half).
    expect(commissionForCase(12_345, tiers, 10)).toEqual({ baseMinor: 12_345, basisPoints: 1250, tierIndex: 1, amountMinor: 1543 });
    // 10 % of 5 cents = 0.5 cent → 0 (half to even); of 15 cents = 1.5 → 2.
    expect(commissionForCase(5, tiers, 0).amountMinor).toBe(0);
    expect(commissionForCase(15, tiers, 0).amountMinor).toBe(2);
  });

  it('refuses fractional or negative bases', () => {
    expect(() => commissionForCase(10.5, tiers, 0)).toThrow(/whole number/);
    expect(() => commissionForCase(-1, tiers, 0)).toThrow(/whole number/);
  });
});

describe('splitPayment', () => {
  it('gives the lab the total less the processor fee, the network fee and the commission', () => {
    // $480 paid: $400 of recovery work, $80 of return media and shipping. Fee 2.9 % + 30¢ = 1422 cents.
    const split = splitPayment({ totalMinor: 48_000, feeMinor: 1422, serviceLinesMinor: 40_000, commissionMinor: 4000, networkFeeBasisPoints: 800 });
    expect(split).toEqual({ totalMinor: 48_000, feeMinor: 1422, networkFeeMinor: 3200, commissionMinor: 4000, labShareMinor: 39_378 });
  });

  it('lets the network absorb a shortfall so the lab never goes below zero', () => {
    const split = splitPayment({ totalMinor: 100, feeMinor: 33, serviceLinesMinor: 100, commissionMinor: 50, networkFeeBasisPoints: 3000 });
    expect(split.labShareMinor).toBe(0);
    expect(split.commissionMinor).toBe(50);
    expect(split.networkFeeMinor).toBe(100 - 33 - 50);
  });

  it('refuses a service base or fee above the total', () => {
    expect(() => splitPayment({ totalMinor: 100, feeMinor: 0, serviceLinesMinor: 101, commissionMinor: 0, networkFeeBasisPoints: 0 })).toThrow(/service lines/);
    expect(() => splitPayment({ totalMinor: 100, feeMinor: 101, serviceLinesMinor: 0, commissionMinor: 0, networkFeeBasisPoints: 0 })).toThrow(/fee/);
  });

  it('accounts for every minor unit of the total (property)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 10_000_000 }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        fc.double({ min: 0, max: 0.2, noNaN: true }),
        fc.integer({ min: 0, max: 5000 }),
        fc.integer({ min: 0, max: 3000 }),
        (total, serviceShare, feeShare, commissionBp, networkBp) => {
          const service = Math.floor(total * serviceShare);
          const fee = Math.floor(total * feeShare);
          const commission = percentOfMinor(service, commissionBp);
          const s = splitPayment({ totalMinor: total, feeMinor: fee, serviceLinesMinor: service, commissionMinor: commission, networkFeeBasisPoints: networkBp });
          expect(s.feeMinor + s.networkFeeMinor + s.commissionMinor + s.labShareMinor).toBe(total);
          expect(s.labShareMinor).toBeGreaterThanOrEqual(0);
          expect(s.commissionMinor).toBe(commission);
        },
      ),
    );
  });
});

describe('refundReversal', () => {
  const split = splitPayment({ totalMinor: 48_000, feeMinor: 1422, serviceLinesMinor: 40_000, commissionMinor: 4000, networkFeeBasisPoints: 800 });

  it('reverses every share in full on a full refund, leaving the lab with the processor fee to bear', () => {
    expect(refundReversal(split, 0, 48_000)).toEqual({ labMinor: 39_378 + 1422, networkMinor: 3200, partnerMinor: 4000 });
    expect(refundWeights(split)).toEqual([40_800, 3200, 4000]);
  });

  it('shares a partial refund in proportion and refuses more than was paid', () => {
    const half = refundReversal(split, 0, 24_000);
    expect(half).toEqual({ labMinor: 20_400, networkMinor: 1600, partnerMinor: 2000 });
    expect(() => refundReversal(split, 24_000, 24_001)).toThrow(/cannot exceed/);
  });

  it('reverses each share exactly once over any sequence of partial refunds (property)', () => {
    fc.assert(
      fc.property(fc.array(fc.integer({ min: 1, max: 48_000 }), { minLength: 1, maxLength: 8 }), (cuts) => {
        // Cut the payment into refunds that add up to the whole of it.
        const points = [...new Set(cuts.map((c) => Math.min(c, 47_999)))].sort((a, b) => a - b);
        const refunds = [...points, 48_000].map((p, i, all) => p - (i === 0 ? 0 : all[i - 1]!)).filter((r) => r > 0);
        let before = 0;
        const sum = { labMinor: 0, networkMinor: 0, partnerMinor: 0 };
        for (const r of refunds) {
          const rev = refundReversal(split, before, r);
          expect(rev.labMinor + rev.networkMinor + rev.partnerMinor).toBe(r);
          sum.labMinor += rev.labMinor;
          sum.networkMinor += rev.networkMinor;
          sum.partnerMinor += rev.partnerMinor;
          before += r;
        }
        expect(sum).toEqual(refundReversal(split, 0, 48_000));
      }),
    );
  });
});

describe('statementTotals', () => {
  it('pays a positive total and carries a negative one forward', () => {
    expect(statementTotals(0, [1543, 2000, -500])).toEqual({ openingCarryMinor: 0, linesTotalMinor: 3043, totalMinor: 3043, payoutMinor: 3043, carryForwardMinor: 0 });
    expect(statementTotals(-4000, [1500])).toEqual({ openingCarryMinor: -4000, linesTotalMinor: 1500, totalMinor: -2500, payoutMinor: 0, carryForwardMinor: -2500 });
    expect(() => statementTotals(10, [])).toThrow(/≤ 0/);
  });

  it('totals the rounded lines, never a rounding of their sum (property)', () => {
    fc.assert(
      fc.property(fc.array(fc.tuple(fc.integer({ min: 0, max: 500_000 }), fc.integer({ min: 0, max: 5000 })), { maxLength: 60 }), (cases) => {
        const lines = cases.map(([base, bp]) => commissionForCase(base, [{ minPaidReferrals: 0, basisPoints: bp }], 0).amountMinor);
        const totals = statementTotals(0, lines);
        expect(totals.linesTotalMinor).toBe(lines.reduce((s, l) => s + l, 0));
        // Rounding each line moves it by at most half a minor unit, so the two ways differ by at most n/2.
        const exactSum = cases.reduce((s, [base, bp]) => s + BigInt(base) * BigInt(bp), 0n);
        expect(Math.abs(totals.linesTotalMinor - roundHalfEven(exactSum, 10_000))).toBeLessThanOrEqual(Math.ceil(cases.length / 2) + 1);
      }),
    );
  });
});

describe('periods', () => {
  it('bounds a month in UTC and names the month of an instant', () => {
    expect(periodBounds('2025-11')).toEqual({ start: new Date('2025-11-01T00:00:00Z'), end: new Date('2025-12-01T00:00:00Z') });
    expect(periodBounds('2025-12').end).toEqual(new Date('2026-01-01T00:00:00Z'));
    expect(periodOf(new Date('2025-11-30T23:59:59.999Z'))).toBe('2025-11');
    expect(previousPeriod(new Date('2026-01-01T06:00:00Z'))).toBe('2025-12');
    expect(() => periodBounds('2025-13')).toThrow(/YYYY-MM/);
  });

  it('names a period for people', () => {
    expect(formatPeriod('2025-11')).toBe('November 2025');
    expect(formatPeriod('2026-01', 'short')).toBe('Jan');
  });

  it('formats basis points as a percentage', () => {
    expect(formatBasisPoints(1250)).toBe('12.5 %');
    expect(formatBasisPoints(1000)).toBe('10 %');
    expect(formatBasisPoints(1234)).toBe('12.34 %');
    // Rates whose (bp / 10 000) × 100 is not exact in binary floating point.
    expect(formatBasisPoints(1400)).toBe('14 %');
    expect(formatBasisPoints(700)).toBe('7 %');
    expect(formatBasisPoints(1225)).toBe('12.25 %');
    expect(formatBasisPoints(5)).toBe('0.05 %');
  });
});
