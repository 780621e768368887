import geographiclib from 'geographiclib-geodesic';

export interface LatLon {
  lat: number;
  lon: number;
}

const wgs84 = geographiclib.Geodesic.WGS84;

export const METRES_PER_MILE = 1609.344; // international mile, exact by definition

function assertLatLon(point: LatLon, name: string): void {
  if (!Number.isFinite(point?.lat) || point.lat < -90 || point.lat > 90) {
    throw new RangeError(`${name}.lat must be a latitude between -90 and 90 degrees, got ${point?.lat}`);
  }
  if (!Number.isFinite(point.lon) || point.lon < -180 || point.lon > 180) {
    throw new RangeError(`${name}.lon must be a longitude between -180 and 180 degrees, got ${point.lon}`);
  }
}

/** Geodesic distance on the WGS-84 ellipsoid (Karney's algorithm), in kilometres. */
export function geodesicDistanceKm(a: LatLon, b: LatLon): number {
  assertLatLon(a, 'from');
  assertLatLon(b, 'to');
  const { s12 } = wgs84.Inverse(a.lat, a.lon, b.lat, b.lon);
  return (s12 ?? 0) / 1000;
}

export function kmToMiles(km: number): number {
  return (km * 1000) / METRES_PER_MILE;
}
