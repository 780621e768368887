import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { billableWeightKg, billableWeightLb } from './dimensional-weight';

describe('billableWeightLb', () => {
  // Worked example (from memory, the shape of carriers' service-guide examples):
  // 12 × 10 × 8 in = 960 in³; 960 ÷ 139 = 6.9 → 7 lb.
  it('bills a 12 × 10 × 8 in box of 3 lb at its dimensional weight of 7 lb (worked example, from memory)', () => {
    expect(billableWeightLb({ lengthIn: 12, widthIn: 10, heightIn: 8, weightLb: 3 })).toEqual({
      actualLb: 3,
      dimensionalLb: 7,
      billableLb: 7,
      billedBy: 'dimensional',
    });
  });

  it('bills a small heavy box at its actual weight, rounded up to the next whole pound', () => {
    // 6 × 4 × 3 in = 72 in³ → 0.52 → 1 lb dimensional; 2.1 lb actual → 3 lb.
    expect(billableWeightLb({ lengthIn: 6, widthIn: 4, heightIn: 3, weightLb: 2.1 })).toEqual({
      actualLb: 3,
      dimensionalLb: 1,
      billableLb: 3,
      billedBy: 'actual',
    });
  });

  it('does not round up a weight that is already a whole pound, despite float noise', () => {
    // 13.9 × 13 × 10 = 1 807 in³ = exactly 13 × 139, though in floating point the quotient is 13.000000000000002.
    expect((13.9 * 13 * 10) / 139).toBeGreaterThan(13);
    expect(billableWeightLb({ lengthIn: 13.9, widthIn: 13, heightIn: 10, weightLb: 5 })).toMatchObject({
      actualLb: 5,
      dimensionalLb: 13,
    });
  });

  it.each([
    ['lengthIn', { lengthIn: 0, widthIn: 1, heightIn: 1, weightLb: 1 }],
    ['widthIn', { lengthIn: 1, widthIn: -2, heightIn: 1, weightLb: 1 }],
    ['heightIn', { lengthIn: 1, widthIn: 1, heightIn: Number.NaN, weightLb: 1 }],
    ['weightLb', { lengthIn: 1, widthIn: 1, heightIn: 1, weightLb: Number.POSITIVE_INFINITY }],
  ])('rejects a bad %s with a RangeError naming the field', (field, parcel) => {
    expect(() => billableWeightLb(parcel)).toThrow(RangeError);
    expect(() => billableWeightLb(parcel)).toThrow(new RegExp(`^${field} must be a positive`));
  });

  it('always bills a whole number of pounds no less than either weight (property)', () => {
    const size = fc.double({ min: 0.1, max: 120, noNaN: true });
    fc.assert(
      fc.property(size, size, size, fc.double({ min: 0.01, max: 150, noNaN: true }), (l, w, h, lb) => {
        const r = billableWeightLb({ lengthIn: l, widthIn: w, heightIn: h, weightLb: lb });
        expect(Number.isInteger(r.billableLb)).toBe(true);
        expect(r.billableLb).toBe(Math.max(r.actualLb, r.dimensionalLb));
        expect(r.actualLb).toBeGreaterThanOrEqual(lb - 1e-9);
        expect(r.actualLb - lb).toBeLessThan(1);
        expect(r.dimensionalLb).toBeGreaterThanOrEqual((l * w * h) / 139 - 1e-6);
      }),
    );
  });
});

describe('billableWeightKg', () => {
  it('divides by 5 000 cm³/kg and rounds up to the next half kilogram (from memory, carriers\' guides)', () => {
    // 40 × 30 × 20 cm = 24 000 cm³ ÷ 5 000 = 4.8 → 5 kg; actual 2.2 kg → 2.5 kg.
    expect(billableWeightKg({ lengthCm: 40, widthCm: 30, heightCm: 20, weightKg: 2.2 })).toEqual({
      actualKg: 2.5,
      dimensionalKg: 5,
      billableKg: 5,
      billedBy: 'dimensional',
    });
  });

  it('rounds to whole kilograms when asked', () => {
    expect(billableWeightKg({ lengthCm: 20, widthCm: 15, heightCm: 10, weightKg: 1.2 }, { stepKg: 1 })).toEqual({
      actualKg: 2,
      dimensionalKg: 1,
      billableKg: 2,
      billedBy: 'actual',
    });
  });

  it('rejects a non-positive centimetre dimension with a RangeError naming the field', () => {
    expect(() => billableWeightKg({ lengthCm: 10, widthCm: 10, heightCm: -1, weightKg: 1 })).toThrow(
      /^heightCm must be a positive, finite number of centimetres, got -1$/,
    );
  });
});
