import { describe, expect, it } from 'vitest';
import { geodesicDistanceKm, kmToMiles, METRES_PER_MILE } from './geo';

// Reference: geographiclib-geodesic (C. F. F. Karney, "Algorithms for geodesics", J. Geodesy 87, 2013).
describe('geodesicDistanceKm (WGS-84, Karney 2013 via geographiclib-geodesic)', () => {
  it('Wellington (41.32°S, 174.81°E) to Salamanca (40.96°N, 5.50°W) is 19 959 679.267 m (geographiclib-geodesic README example)', () => {
    const km = geodesicDistanceKm({ lat: -41.32, lon: 174.81 }, { lat: 40.96, lon: -5.5 });
    expect(km * 1000).toBeCloseTo(19_959_679.267, 3);
  });

  it('matches the first row of GeodTest shipped with geographiclib-geodesic (s12 = 8 935 244.5604818305 m)', () => {
    const km = geodesicDistanceKm({ lat: 35.60777, lon: -139.44815 }, { lat: -11.17491, lon: -69.95921 });
    expect(km * 1000).toBeCloseTo(8_935_244.5604818305, 6);
  });

  it('is symmetric and zero for the same point', () => {
    const chicago = { lat: 41.8781, lon: -87.6298 };
    const denver = { lat: 39.7392, lon: -104.9903 };
    expect(geodesicDistanceKm(chicago, denver)).toBeCloseTo(geodesicDistanceKm(denver, chicago), 9);
    expect(geodesicDistanceKm(chicago, chicago)).toBe(0);
  });

  it('one degree of latitude at the equator is 110.574 km on WGS-84 (from memory of the meridian arc tables)', () => {
    expect(geodesicDistanceKm({ lat: 0, lon: 0 }, { lat: 1, lon: 0 })).toBeCloseTo(110.574, 3);
  });

  it('rejects coordinates outside the valid ranges, naming the point', () => {
    expect(() => geodesicDistanceKm({ lat: 91, lon: 0 }, { lat: 0, lon: 0 })).toThrow(/from\.lat must be a latitude/);
    expect(() => geodesicDistanceKm({ lat: 0, lon: 0 }, { lat: 0, lon: Number.NaN })).toThrow(/to\.lon must be a longitude/);
  });
});

describe('kmToMiles', () => {
  it('uses the international mile of exactly 1 609.344 m (1959 international yard and pound agreement)', () => {
    expect(METRES_PER_MILE).toBe(1609.344);
    expect(kmToMiles(1.609344)).toBeCloseTo(1, 12);
    expect(kmToMiles(100)).toBeCloseTo(62.137_119, 6);
  });
});
