import { transitDaysForZone, type ShippingMode, type Zone } from '@shared/domain/zones';

// Invented carriers for the local shipping fake. The names, services and prices are ours
// (demo figures, not any real carrier's tariff).

export interface CarrierService {
  carrier: string;
  /** Service code as the wire protocol spells services: one word, CamelCase. */
  service: string;
  mode: ShippingMode;
  /** Price factor against the base table (1 = table price). */
  priceFactor: number;
  /** Days added to the zone's transit days (an economy service is slower). */
  extraDays: number;
  /** Two upper-case letters that start this carrier's tracking codes. */
  trackingPrefix: string;
}

export const carrierServices: readonly CarrierService[] = [
  { carrier: 'Brambleway', service: 'Ground', mode: 'ground', priceFactor: 1, extraDays: 0, trackingPrefix: 'BW' },
  { carrier: 'Brambleway', service: 'Air', mode: 'air', priceFactor: 1, extraDays: 0, trackingPrefix: 'BW' },
  { carrier: 'Otterline', service: 'Standard', mode: 'ground', priceFactor: 1.04, extraDays: 0, trackingPrefix: 'OL' },
  { carrier: 'Otterline', service: 'PriorityAir', mode: 'air', priceFactor: 0.97, extraDays: 0, trackingPrefix: 'OL' },
  { carrier: 'Quillback', service: 'Economy', mode: 'ground', priceFactor: 0.9, extraDays: 1, trackingPrefix: 'QB' },
];

/** Heaviest billable weight any of the invented carriers takes. */
export const MAX_BILLABLE_LB = 150;

// Base price in cents for the first pound, and per further pound, by zone 1..8 (invented).
// Both grow with the zone, so a price never falls as distance or weight grows.
const baseCents: Record<ShippingMode, readonly number[]> = {
  ground: [790, 860, 940, 1050, 1180, 1290, 1390, 1520],
  air: [1850, 2100, 2450, 2800, 3150, 3400, 3650, 3900],
};
const perPoundCents: Record<ShippingMode, readonly number[]> = {
  ground: [45, 55, 70, 90, 110, 130, 145, 160],
  air: [110, 135, 170, 210, 250, 290, 320, 350],
};

export interface PricedService extends CarrierService {
  cents: number;
  deliveryDays: number;
}

export function priceCents(service: CarrierService, zone: Zone, billableLb: number): number {
  if (!Number.isInteger(billableLb) || billableLb < 1) {
    throw new RangeError(`billableLb must be a whole number of pounds ≥ 1, got ${billableLb}`);
  }
  const table = baseCents[service.mode][zone - 1] + perPoundCents[service.mode][zone - 1] * (billableLb - 1);
  return Math.round(table * service.priceFactor);
}

export function deliveryDays(service: CarrierService, zone: Zone): number {
  return transitDaysForZone(zone, service.mode) + service.extraDays;
}

export function priceServices(zone: Zone, billableLb: number): PricedService[] {
  if (billableLb > MAX_BILLABLE_LB) return [];
  return carrierServices.map((s) => ({ ...s, cents: priceCents(s, zone, billableLb), deliveryDays: deliveryDays(s, zone) }));
}

export function findService(carrier: string, service: string): CarrierService | undefined {
  return carrierServices.find((s) => s.carrier === carrier && s.service === service);
}

export function centsToDollars(cents: number): string {
  return (cents / 100).toFixed(2);
}
