import { describe, expect, it } from 'vitest';
import { legBetween, placeForZip, planScans, trackingHasException } from './route';

const sanFrancisco = placeForZip('94105')!;
const newYork = placeForZip('10001')!;

function codeWith(exception: boolean): string {
  for (let i = 0; ; i++) {
    const code = `BW${String(i).padStart(16, '0')}`;
    if (trackingHasException(code) === exception) return code;
  }
}

describe('placeForZip', () => {
  it('finds ZIP centroids from the zipcodes package, ZIP+4 included', () => {
    expect(placeForZip('10001-2345')).toMatchObject({ city: 'New York', state: 'NY', zip: '10001' });
    expect(placeForZip('00000')).toBeUndefined();
    expect(placeForZip('K1A 0B1')).toBeUndefined();
  });
});

describe('planScans', () => {
  const leg = legBetween(sanFrancisco, newYork);

  it('puts San Francisco → New York in zone 8 (about 2 570 mi in a straight line, from memory; beyond 1 800 mi)', () => {
    expect(leg.distanceMiles).toBeGreaterThan(2500);
    expect(leg.distanceMiles).toBeLessThan(2600);
    expect(leg.zone).toBe(8);
  });

  it('scans at the origin, at hubs on the way and at the destination, then delivers within the transit days', () => {
    const scans = planScans(leg, 5, codeWith(false), 'Brambleway');
    expect(scans[0]).toMatchObject({ status: 'in_transit', statusDetail: 'received_at_origin_facility', place: { city: 'San Francisco' } });
    const hubs = scans.filter((s) => s.statusDetail === 'arrived_at_facility').map((s) => s.place.state);
    expect(hubs.length).toBeGreaterThanOrEqual(2);
    expect(hubs).not.toContain('CA');
    expect(hubs).not.toContain('NY');
    expect(scans.slice(-2).map((s) => s.status)).toEqual(['out_for_delivery', 'delivered']);
    expect(scans.at(-1)!.place.city).toBe('New York');
    const hours = scans.map((s) => s.afterHours);
    expect(hours).toEqual([...hours].sort((a, b) => a - b));
    expect(hours.at(-1)).toBeLessThanOrEqual(5 * 24);
    expect(scans.some((s) => s.statusDetail === 'transit_exception')).toBe(false);
  });

  it('adds a transit exception and one day for the codes picked by the hash', () => {
    const normal = planScans(leg, 5, codeWith(false), 'Brambleway');
    const held = planScans(leg, 5, codeWith(true), 'Brambleway');
    expect(held[1]).toMatchObject({ status: 'in_transit', statusDetail: 'transit_exception' });
    expect(held.at(-1)!.afterHours - normal.at(-1)!.afterHours).toBe(24);
  });

  it('still plans a local next-day delivery with no hubs', () => {
    const local = legBetween(sanFrancisco, placeForZip('94107')!);
    expect(local.zone).toBe(1);
    const scans = planScans(local, 1, codeWith(false), 'Otterline');
    expect(scans.filter((s) => s.statusDetail === 'arrived_at_facility')).toHaveLength(0);
    expect(scans.at(-1)!.afterHours).toBeLessThanOrEqual(24);
  });
});
