import { createHash } from 'node:crypto';
import geographiclib from 'geographiclib-geodesic';
import zipcodes from 'zipcodes';
import { geodesicDistanceKm, kmToMiles, type LatLon } from '@shared/domain/geo';
import { distanceZone, type Zone } from '@shared/domain/zones';

export interface Place extends LatLon {
  zip: string;
  city: string;
  state: string;
  country: string;
}

/** ZIP centroid for a US ZIP or ZIP+4, or undefined when the ZIP is unknown. */
export function placeForZip(zip: string | null | undefined): Place | undefined {
  const five = /^\s*(\d{5})(?:-\d{4})?\s*$/.exec(String(zip ?? ''))?.[1];
  if (!five) return undefined;
  const found = zipcodes.lookup(five);
  if (!found || found.country !== 'US') return undefined;
  return { zip: found.zip, city: found.city, state: found.state, country: 'US', lat: found.latitude, lon: found.longitude };
}

export interface Leg {
  from: Place;
  to: Place;
  distanceMiles: number;
  zone: Zone;
}

export function legBetween(from: Place, to: Place): Leg {
  const distanceMiles = kmToMiles(geodesicDistanceKm(from, to));
  return { from, to, distanceMiles, zone: distanceZone(distanceMiles) };
}

// Sorting hubs of the invented carriers: real cities, looked up by a ZIP in each.
const hubZips = [
  '98108', '97218', '94621', '90058', '92101', '85043', '89119', '84104', '83705', '99202',
  '80239', '87106', '79925', '59102', '82001', '57104', '58102', '68110', '64120', '73108',
  '75261', '77032', '78219', '70123', '55111', '60638', '63134', '38118', '37207', '40209',
  '46241', '43217', '48242', '15231', '14225', '13211', '30320', '28208', '32218', '32809',
  '33126', '23250', '21240', '19153', '07114', '02128',
];
const hubs: Place[] = hubZips.map(placeForZip).filter((p): p is Place => p !== undefined);

/** Hubs nearest to evenly spaced points on the geodesic between two places, in route order. */
export function hubsAlong(from: Place, to: Place, count: number): Place[] {
  if (count <= 0) return [];
  const line = geographiclib.Geodesic.WGS84.InverseLine(from.lat, from.lon, to.lat, to.lon);
  const chosen: Place[] = [];
  const nearEnd = (p: Place) => geodesicDistanceKm(p, from) < 40 || geodesicDistanceKm(p, to) < 40;
  for (let i = 1; i <= count; i++) {
    const point = line.Position((line.s13 * i) / (count + 1));
    const here = { lat: point.lat2 ?? from.lat, lon: point.lon2 ?? from.lon };
    let best: Place | undefined;
    let bestKm = Infinity;
    for (const hub of hubs) {
      const km = geodesicDistanceKm(here, hub);
      if (km < bestKm) {
        bestKm = km;
        best = hub;
      }
    }
    if (best && !nearEnd(best) && !chosen.some((c) => c.zip === best.zip)) chosen.push(best);
  }
  return chosen;
}

/** 1 tracking code in 20 (by its SHA-256) meets an exception on the way, so fault paths show up in demos. */
export function trackingHasException(trackingCode: string): boolean {
  return createHash('sha256').update(trackingCode).digest().readUInt32BE(0) % 20 === 0;
}

export type PlannedStatus = 'in_transit' | 'out_for_delivery' | 'delivered';

export interface PlannedScan {
  /** Hours after the label was bought. */
  afterHours: number;
  status: PlannedStatus;
  statusDetail: string;
  message: string;
  place: Place;
}

const HOURS_PER_DAY = 24;
const FIRST_SCAN_AFTER_HOURS = 4;

/**
 * The scans a parcel gets after its label is bought: an origin scan, hub scans in cities along
 * the way, arrival at the destination, out for delivery, delivered. Transit days are counted as
 * calendar days on the simulated clock (the fake has no weekends).
 */
export function planScans(leg: Leg, transitDays: number, trackingCode: string, carrier: string): PlannedScan[] {
  const totalHours = Math.max(1, transitDays) * HOURS_PER_DAY;
  const outForDeliveryAt = totalHours - 6;
  const hubCount = Math.min(3, Math.floor(leg.zone / 2));
  const via = hubsAlong(leg.from, leg.to, hubCount);

  const transit: Omit<PlannedScan, 'afterHours'>[] = [
    { status: 'in_transit', statusDetail: 'received_at_origin_facility', message: `Received at ${carrier} origin facility`, place: leg.from },
    ...via.flatMap((hub) => [
      { status: 'in_transit' as const, statusDetail: 'arrived_at_facility', message: `Arrived at ${carrier} hub`, place: hub },
      { status: 'in_transit' as const, statusDetail: 'departed_facility', message: `Departed ${carrier} hub`, place: hub },
    ]),
    { status: 'in_transit', statusDetail: 'arrived_at_destination', message: 'Arrived at destination facility', place: leg.to },
  ];
  // Spread the transit scans evenly between the first scan and out-for-delivery.
  const step = (outForDeliveryAt - FIRST_SCAN_AFTER_HOURS) / transit.length;
  const scans: PlannedScan[] = transit.map((scan, i) => ({ ...scan, afterHours: FIRST_SCAN_AFTER_HOURS + step * i }));

  let delay = 0;
  if (trackingHasException(trackingCode)) {
    // The exception comes after the origin scan and holds the parcel one extra day.
    const at = scans[0].afterHours + step / 2;
    scans.splice(1, 0, {
      afterHours: at,
      status: 'in_transit',
      statusDetail: 'transit_exception',
      message: 'Exception: parcel held at facility, delivery delayed one day',
      place: leg.from,
    });
    delay = HOURS_PER_DAY;
    for (let i = 2; i < scans.length; i++) scans[i].afterHours += delay;
  }

  scans.push(
    { afterHours: outForDeliveryAt + delay, status: 'out_for_delivery', statusDetail: 'out_for_delivery', message: 'Out for delivery', place: leg.to },
    { afterHours: totalHours - 2 + delay, status: 'delivered', statusDetail: 'arrived_at_destination', message: 'Delivered', place: leg.to },
  );
  return scans;
}
