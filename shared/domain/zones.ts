// Carrier-style distance zones. From memory of US parcel carriers' zone charts
// (zone 1 ≤ 50 mi, 2 ≤ 150, 3 ≤ 300, 4 ≤ 600, 5 ≤ 1 000, 6 ≤ 1 400, 7 ≤ 1 800, 8 beyond);
// no carrier publishes these exact limits as a standard.
export const zoneUpperMiles = [50, 150, 300, 600, 1000, 1400, 1800] as const;

export type Zone = 1 | 2 | 3 | 4 | 5 | 6 | 7 | 8;
export type ShippingMode = 'ground' | 'air';

export function distanceZone(miles: number): Zone {
  if (!Number.isFinite(miles) || miles < 0) throw new RangeError(`distance must be a non-negative number of miles, got ${miles}`);
  const index = zoneUpperMiles.findIndex((upper) => miles <= upper);
  return (index === -1 ? 8 : index + 1) as Zone;
}

// Ground business days per zone, the shape of US ground networks (common practice, from memory):
// local next day, coast to coast about five days. Air is next or second day.
const groundDays: Record<Zone, number> = { 1: 1, 2: 1, 3: 2, 4: 3, 5: 3, 6: 4, 7: 4, 8: 5 };
const airDays: Record<Zone, number> = { 1: 1, 2: 1, 3: 1, 4: 1, 5: 2, 6: 2, 7: 2, 8: 2 };

export function transitDaysForZone(zone: Zone, mode: ShippingMode = 'ground'): number {
  return mode === 'air' ? airDays[zone] : groundDays[zone];
}
