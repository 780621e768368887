import geographiclib from 'geographiclib-geodesic';

export interface LatLon {
  lat: number;
  lon: number;
}

const wgs84 = geographiclib.Geodesic.WGS84;

export const METRES_PER_MILE = 1609.344; // international mile, exact by definition

/** Geodesic distance on the WGS-84 ellipsoid (Karney's algorithm), in kilometres. */
export function geodesicDistanceKm(a: LatLon, b: LatLon): number {
  const { s12 } = wgs84.Inverse(a.lat, a.lon, b.lat, b.lon);
  return (s12 ?? 0) / 1000;
}

export function kmToMiles(km: number): number {
  return (km * 1000) / METRES_PER_MILE;
}
