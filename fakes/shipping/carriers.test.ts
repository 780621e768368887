import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { Zone } from '@shared/domain/zones';
import { carrierServices, centsToDollars, deliveryDays, MAX_BILLABLE_LB, priceCents, priceServices } from './carriers';

const zone = fc.integer({ min: 1, max: 8 }) as fc.Arbitrary<Zone>;
const pounds = fc.integer({ min: 1, max: MAX_BILLABLE_LB - 1 });

describe('invented carrier price table', () => {
  it('offers ground and air services', () => {
    expect(carrierServices.some((s) => s.mode === 'ground')).toBe(true);
    expect(carrierServices.some((s) => s.mode === 'air')).toBe(true);
  });

  it('prices the first pound at the table base: Brambleway Ground, zone 1, 1 lb = $7.90 (our own table)', () => {
    expect(priceCents(carrierServices[0], 1, 1)).toBe(790);
    expect(centsToDollars(790)).toBe('7.90');
  });

  it('never lowers a price as the zone or the billable weight grows (property)', () => {
    fc.assert(
      fc.property(zone, pounds, (z, lb) => {
        for (const s of carrierServices) {
          expect(priceCents(s, z, lb + 1)).toBeGreaterThan(priceCents(s, z, lb));
          if (z < 8) expect(priceCents(s, (z + 1) as Zone, lb)).toBeGreaterThan(priceCents(s, z, lb));
        }
      }),
    );
  });

  it('makes air cost more and arrive no later than ground from the same carrier', () => {
    for (const z of [1, 2, 3, 4, 5, 6, 7, 8] as Zone[]) {
      const ground = carrierServices.find((s) => s.carrier === 'Brambleway' && s.mode === 'ground')!;
      const air = carrierServices.find((s) => s.carrier === 'Brambleway' && s.mode === 'air')!;
      expect(priceCents(air, z, 5)).toBeGreaterThan(priceCents(ground, z, 5));
      expect(deliveryDays(air, z)).toBeLessThanOrEqual(deliveryDays(ground, z));
    }
  });

  it('offers nothing over the weight limit and rejects a fractional billable weight', () => {
    expect(priceServices(4, MAX_BILLABLE_LB + 1)).toEqual([]);
    expect(priceServices(4, MAX_BILLABLE_LB)).toHaveLength(carrierServices.length);
    expect(() => priceCents(carrierServices[0], 1, 2.5)).toThrow(/billableLb must be a whole number/);
  });
});
