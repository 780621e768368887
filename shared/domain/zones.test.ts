import { describe, expect, it } from 'vitest';
import { distanceZone, transitDaysForZone } from './zones';

// Zone limits are from memory of US parcel carriers' zone charts (the product brief's table);
// no carrier publishes them as a standard. Transit days per zone are common practice, from memory.
describe('distanceZone (carrier-style zone table, from memory)', () => {
  it.each([
    [0, 1], [50, 1], [50.01, 2], [150, 2], [150.5, 3], [300, 3], [301, 4], [600, 4], [601, 5],
    [1000, 5], [1001, 6], [1400, 6], [1401, 7], [1800, 7], [1800.01, 8], [2900, 8],
  ])('%s miles is zone %i', (miles, zone) => {
    expect(distanceZone(miles)).toBe(zone);
  });

  it('rejects negative or non-numeric distances', () => {
    expect(() => distanceZone(-1)).toThrow(/non-negative number of miles/);
    expect(() => distanceZone(Number.NaN)).toThrow(/non-negative number of miles/);
  });
});

describe('transitDaysForZone (common practice, from memory)', () => {
  it('ground runs from next day locally to five days coast to coast', () => {
    expect([1, 2, 3, 4, 5, 6, 7, 8].map((z) => transitDaysForZone(z as 1))).toEqual([1, 1, 2, 3, 3, 4, 4, 5]);
  });

  it('air is next or second day', () => {
    expect([1, 2, 3, 4, 5, 6, 7, 8].map((z) => transitDaysForZone(z as 1, 'air'))).toEqual([1, 1, 1, 1, 2, 2, 2, 2]);
  });
});
