import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  cardFeeMinor,
  formatMoney,
  fromMinorUnits,
  minorUnitDigits,
  normaliseCurrency,
  percentOfMinor,
  roundHalfEven,
  splitMinor,
  toMinorUnits,
} from './money';

describe('minorUnitDigits', () => {
  // ISO 4217 minor-unit column (from memory): USD 2, EUR 2, JPY 0, KWD 3, BHD 3.
  it.each([
    ['USD', 2],
    ['EUR', 2],
    ['JPY', 0],
    ['KWD', 3],
    ['BHD', 3],
  ])('gives %s %i decimals, as in ISO 4217 (from memory)', (code, digits) => {
    expect(minorUnitDigits(code)).toBe(digits);
  });

  it('accepts the lower-case codes the payment provider sends', () => {
    expect(minorUnitDigits('usd')).toBe(2);
    expect(normaliseCurrency(' jpy ')).toBe('JPY');
  });

  it('rejects malformed and unknown codes with the code in the message', () => {
    expect(() => minorUnitDigits('US')).toThrow(/three-letter ISO 4217 code.*"US"/);
    expect(() => minorUnitDigits('XYZ')).toThrow(/Unknown currency "XYZ"/);
  });
});

describe('roundHalfEven', () => {
  it('rounds exact halves to the even neighbour and everything else to the nearest', () => {
    expect(roundHalfEven(5, 2)).toBe(2); // 2.5 → 2
    expect(roundHalfEven(7, 2)).toBe(4); // 3.5 → 4
    expect(roundHalfEven(251, 100)).toBe(3); // 2.51 → 3
    expect(roundHalfEven(249, 100)).toBe(2);
    expect(roundHalfEven(12, 4)).toBe(3);
  });

  it('is symmetric for negative values and negative denominators', () => {
    expect(roundHalfEven(-5, 2)).toBe(-2);
    expect(roundHalfEven(-7, 2)).toBe(-4);
    expect(roundHalfEven(7, -2)).toBe(-4);
    expect(roundHalfEven(-251, 100)).toBe(-3);
    expect(Object.is(roundHalfEven(-1, 4), 0)).toBe(true);
  });

  it('takes bigint numerators beyond the float range without losing the half', () => {
    // 10^17 + 50 is not representable as a float; / 100 = 10^15 + 0.5 → even neighbour 10^15.
    expect(roundHalfEven(10n ** 17n + 50n, 100n)).toBe(10 ** 15);
    expect(roundHalfEven(10n ** 17n + 150n, 100n)).toBe(10 ** 15 + 2);
  });

  it('refuses a result that a number cannot hold exactly', () => {
    expect(() => roundHalfEven(10n ** 17n, 1n)).toThrow(/too large to be held exactly/);
  });

  it('refuses division by zero and non-integers', () => {
    expect(() => roundHalfEven(1, 0)).toThrow(/divide by zero/);
    expect(() => roundHalfEven(1.5, 2)).toThrow(/numerator must be an integer/);
  });

  it('property: agrees with the definition (nearest integer, halves to even) on random fractions', () => {
    fc.assert(
      fc.property(fc.integer({ min: -1e9, max: 1e9 }), fc.integer({ min: 1, max: 1e6 }), (n, d) => {
        const r = roundHalfEven(n, d);
        const distance = Math.abs(r * d - n) * 2; // twice |r − n/d|, scaled by d, stays an integer
        expect(distance).toBeLessThanOrEqual(d);
        if (distance === d) expect(Math.abs(r) % 2).toBe(0);
      }),
    );
  });
});

describe('toMinorUnits / fromMinorUnits', () => {
  it('reads decimal strings exactly', () => {
    expect(toMinorUnits('12.34', 'USD')).toBe(1234);
    expect(toMinorUnits('0.1', 'USD')).toBe(10);
    expect(toMinorUnits('19.99', 'USD')).toBe(1999); // 19.99 * 100 in floats is 1998.9999…
    expect(toMinorUnits('-0.05', 'usd')).toBe(-5);
    expect(toMinorUnits('1200', 'JPY')).toBe(1200);
    expect(toMinorUnits('1.234', 'KWD')).toBe(1234);
    expect(Object.is(toMinorUnits('-0.00', 'USD'), 0)).toBe(true);
  });

  it('refuses more decimals than the currency has, naming the limit', () => {
    expect(() => toMinorUnits('1.234', 'USD')).toThrow(/3 decimals but USD allows 2/);
    expect(() => toMinorUnits('5.5', 'JPY')).toThrow(/1 decimals but JPY allows 0/);
  });

  it.each(['', '1,000.00', '1e3', '12.', '.5', '$12', '12 34', 'abc'])('refuses "%s" as not a plain decimal', (text) => {
    expect(() => toMinorUnits(text, 'USD')).toThrow(/not a plain decimal amount/);
  });

  it('refuses amounts beyond what a number holds exactly', () => {
    expect(() => toMinorUnits('90071992547409.92', 'USD')).toThrow(/too large/);
  });

  it('writes the currency’s digits, padding and signing', () => {
    expect(fromMinorUnits(1230, 'USD')).toBe('12.30');
    expect(fromMinorUnits(5, 'USD')).toBe('0.05');
    expect(fromMinorUnits(-5, 'USD')).toBe('-0.05');
    expect(fromMinorUnits(1200, 'JPY')).toBe('1200');
    expect(fromMinorUnits(1, 'KWD')).toBe('0.001');
    expect(() => fromMinorUnits(1.5, 'USD')).toThrow(/whole number of minor units/);
  });

  it('property: toMinorUnits(fromMinorUnits(x)) = x for every safe integer and currency exponent', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: Number.MIN_SAFE_INTEGER, max: Number.MAX_SAFE_INTEGER }),
        fc.constantFrom('USD', 'JPY', 'KWD'),
        (x, currency) => {
          expect(toMinorUnits(fromMinorUnits(x, currency), currency)).toBe(x);
        },
      ),
    );
  });
});

describe('formatMoney', () => {
  it('formats for people in the locale given (CLDR patterns via Intl)', () => {
    expect(formatMoney(123456, 'USD')).toBe('$1,234.56');
    expect(formatMoney(-5, 'usd')).toBe('-$0.05');
    expect(formatMoney(1200, 'JPY')).toBe('¥1,200');
    // de-DE puts the symbol after the amount with a no-break space.
    expect(formatMoney(123456, 'EUR', 'de-DE')).toBe('1.234,56\u00a0€');
  });

  it('keeps every cent of amounts near the top of the safe range', () => {
    expect(formatMoney(Number.MAX_SAFE_INTEGER, 'USD')).toBe('$90,071,992,547,409.91');
  });
});

describe('percentOfMinor', () => {
  it('takes basis points: 1250 bp of $100.00 is $12.50', () => {
    expect(percentOfMinor(10_000, 1250)).toBe(1250);
  });

  it('rounds half-even: 12.5 % of 4¢ is 0.5¢ → 0¢, of 12¢ is 1.5¢ → 2¢', () => {
    expect(percentOfMinor(4, 1250)).toBe(0);
    expect(percentOfMinor(12, 1250)).toBe(2);
    expect(percentOfMinor(20, 1250)).toBe(2); // 2.5 → 2
  });

  it('refuses fractional or negative basis points', () => {
    expect(() => percentOfMinor(100, 12.5)).toThrow(/Basis points must be a whole number/);
    expect(() => percentOfMinor(100, -1)).toThrow(/Basis points/);
  });

  it('property: monotone in the amount for a fixed rate', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: -1e12, max: 1e12 }),
        fc.integer({ min: -1e12, max: 1e12 }),
        fc.integer({ min: 0, max: 10_000 }),
        (a, b, bp) => {
          const [lo, hi] = a <= b ? [a, b] : [b, a];
          expect(percentOfMinor(lo, bp)).toBeLessThanOrEqual(percentOfMinor(hi, bp));
        },
      ),
    );
  });

  it('property: monotone in the rate for a fixed non-negative amount', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 1e12 }), fc.integer({ min: 0, max: 10_000 }), fc.integer({ min: 0, max: 10_000 }), (amount, x, y) => {
        const [lo, hi] = x <= y ? [x, y] : [y, x];
        expect(percentOfMinor(amount, lo)).toBeLessThanOrEqual(percentOfMinor(amount, hi));
      }),
    );
  });
});

describe('cardFeeMinor', () => {
  // The provider's published US card rate, 2.9 % + 30¢ (from memory of the provider's pricing page).
  it('charges 2.9 % + 30¢: $100.00 → $3.20, $10.00 → $0.59 (from memory of the provider pricing)', () => {
    expect(cardFeeMinor(10_000)).toBe(320);
    expect(cardFeeMinor(1_000)).toBe(59);
  });

  it('rounds the percentage half-even: $0.50 → 1.45¢ → 1¢ + 30¢; $1.50 → 4.35¢ → 4¢ + 30¢', () => {
    expect(cardFeeMinor(50)).toBe(31);
    expect(cardFeeMinor(150)).toBe(34);
  });

  it('rounds an exact half to even: $45.00 × 2.9 % = 130.5¢ → 130¢', () => {
    expect(cardFeeMinor(4500)).toBe(160);
  });

  it('refuses a negative charge', () => {
    expect(() => cardFeeMinor(-1)).toThrow(/cannot be negative/);
  });
});

describe('splitMinor', () => {
  it('splits $100.00 three ways as 33.34 / 33.33 / 33.33, the extra cent to the first', () => {
    expect(splitMinor(10_000, [1, 1, 1])).toEqual([3334, 3333, 3333]);
  });

  it('gives leftover cents to the largest remainders, not simply the first parts', () => {
    // exact shares 1.6, 3.2, 5.2 → floors 1, 3, 5 leave 1 cent, for the 0.6 remainder.
    expect(splitMinor(10, [16, 32, 52])).toEqual([2, 3, 5]);
  });

  it('gives a zero weight nothing and splits a negative total like its magnitude', () => {
    expect(splitMinor(101, [0, 1, 1])).toEqual([0, 51, 50]);
    expect(splitMinor(-101, [1, 1])).toEqual([-51, -50]);
  });

  it('refuses empty, all-zero, negative and fractional weights', () => {
    expect(() => splitMinor(100, [])).toThrow(/at least one weight/);
    expect(() => splitMinor(100, [0, 0])).toThrow(/greater than zero/);
    expect(() => splitMinor(100, [1, -1])).toThrow(/Weight 1 must be a whole number/);
    expect(() => splitMinor(100, [0.5])).toThrow(/Weight 0/);
  });

  it('property: parts always sum exactly to the total and each is within 1 of its exact share', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: -1e12, max: 1e12 }),
        fc.array(fc.integer({ min: 0, max: 1e6 }), { minLength: 1, maxLength: 20 }).filter((w) => w.some((x) => x > 0)),
        (total, weights) => {
          const parts = splitMinor(total, weights);
          expect(parts.reduce((s, p) => s + p, 0)).toBe(total);
          const weightSum = weights.reduce((s, w) => s + w, 0);
          parts.forEach((p, i) => {
            expect(Math.abs(p - (total * weights[i]) / weightSum)).toBeLessThan(1 + 1e-6);
            if (weights[i] === 0) expect(p).toBe(0);
          });
        },
      ),
    );
  });
});
