import { z } from 'zod';
import { boxPresetIds } from '../domain/box-presets';
import { batteryConditions, caseStatuses, mediaTypes } from '../vocabulary';
import { cautionSchema } from './referrals';

// Shipping and receiving: prepaid labels for the shop, tracking, the lab's inbound board and check-in,
// returns and lab-to-lab transfers. One vocabulary for the app, the partner API, the services and the tables.

/** A shipment's state. `awaiting_purchase` has rates and no label; the rest follow the carrier. */
export const shipmentStatuses = [
  'awaiting_purchase',
  'label_issued',
  'in_transit',
  'out_for_delivery',
  'delivered',
  'exception',
  'returned',
  'voided',
] as const;
export type ShipmentStatus = (typeof shipmentStatuses)[number];

export const shipmentStatusLabels: Record<ShipmentStatus, string> = {
  awaiting_purchase: 'Choosing a rate',
  label_issued: 'Label issued',
  in_transit: 'In transit',
  out_for_delivery: 'Out for delivery',
  delivered: 'Delivered',
  exception: 'Carrier exception',
  returned: 'Returned to sender',
  voided: 'Label voided',
};

/** inbound: shop → lab; return: lab → shop or customer; transfer: lab → lab. */
export const shipmentKinds = ['inbound', 'return', 'transfer'] as const;
export type ShipmentKind = (typeof shipmentKinds)[number];

export const shipmentKindLabels: Record<ShipmentKind, string> = {
  inbound: 'To the lab',
  return: 'Return',
  transfer: 'Lab-to-lab transfer',
};

export const shippingModes = ['ground', 'air'] as const;
export type ShippingModeCode = (typeof shippingModes)[number];

const dimension = (name: string) =>
  z
    .number({ message: `Give the ${name} in inches` })
    .positive(`The ${name} must be more than 0`)
    .max(108, `The ${name} can be at most 108 in`);

/** The box: a preset (its outer size is used) or the shop's own outer size, and the packed weight. */
export const parcelInput = z
  .object({
    boxPreset: z.enum(boxPresetIds, { message: 'Choose one of the boxes' }).optional(),
    lengthIn: dimension('length').optional(),
    widthIn: dimension('width').optional(),
    heightIn: dimension('height').optional(),
    weightLb: z.number({ message: 'Give the packed weight in pounds' }).positive('The weight must be more than 0').max(150, 'At most 150 lb per box'),
  })
  .superRefine((p, ctx) => {
    if (p.boxPreset) return;
    for (const field of ['lengthIn', 'widthIn', 'heightIn'] as const) {
      if (p[field] === undefined) ctx.addIssue({ code: 'custom', path: [field], message: 'Give the box size, or choose one of the boxes' });
    }
  });
export type ParcelInput = z.input<typeof parcelInput>;

export const createShipmentInput = z.object({ parcel: parcelInput });
export type CreateShipmentInput = z.input<typeof createShipmentInput>;

export const buyShipmentInput = z.object({ rateId: z.string({ message: 'Choose a rate' }).trim().min(1, 'Choose a rate').max(100) });
export type BuyShipmentInput = z.infer<typeof buyShipmentInput>;

const trimmed = (max: number) => z.string().trim().max(max, `Use at most ${max} characters`);

/** A postal address the lab types for a return to the customer. */
export const shippingAddressInput = z.object({
  name: trimmed(120).min(1, 'Enter the name'),
  company: trimmed(120).optional(),
  street1: trimmed(200).min(1, 'Enter the street'),
  street2: trimmed(200).optional(),
  city: trimmed(100).min(1, 'Enter the city'),
  state: trimmed(50).min(2, 'Enter the state'),
  zip: trimmed(10).regex(/^\d{5}(-\d{4})?$/, 'Enter a 5-digit ZIP code'),
  phone: trimmed(40).optional(),
});
export type ShippingAddressInput = z.input<typeof shippingAddressInput>;

/** A return to the shop or the customer, signed for on delivery, with a declared value (integer cents). */
export const returnShipmentInput = z
  .object({
    destination: z.enum(['shop', 'customer'], { message: 'Ship it back to the shop or to the customer' }),
    address: shippingAddressInput.optional(),
    parcel: parcelInput,
    signatureRequired: z.boolean().default(true),
    declaredValue: z.number().int('Whole cents').min(0).max(5_000_000, 'At most $50,000').optional(),
  })
  .superRefine((r, ctx) => {
    if (r.destination === 'customer' && !r.address) ctx.addIssue({ code: 'custom', path: ['address'], message: 'Enter the customer’s address' });
  });
export type ReturnShipmentInput = z.input<typeof returnShipmentInput>;

export const transferShipmentInput = z.object({
  parcel: parcelInput,
  declaredValue: z.number().int('Whole cents').min(0).max(5_000_000).optional(),
});
export type TransferShipmentInput = z.input<typeof transferShipmentInput>;

export const rateDto = z.object({
  id: z.string(),
  carrier: z.string(),
  service: z.string(),
  mode: z.enum(shippingModes),
  /** Integer minor units (cents). */
  amount: z.number().int(),
  currency: z.string(),
  transitDays: z.number().int(),
  zone: z.number().int().nullable(),
});
export type RateDto = z.infer<typeof rateDto>;

export const addressSummaryDto = z.object({
  name: z.string(),
  lines: z.array(z.string()),
  postalCode: z.string(),
});

export const scanDto = z.object({
  at: z.string(),
  status: z.string(),
  statusDetail: z.string().nullable(),
  message: z.string(),
  location: z.string().nullable(),
});
export type ScanDto = z.infer<typeof scanDto>;

export const batteryShippingDto = z.object({
  airAllowed: z.boolean(),
  shippable: z.boolean(),
  markText: z.string().nullable(),
  contactLabFirst: z.boolean(),
  cautions: z.array(cautionSchema),
  reasons: z.array(z.string()),
});
export type BatteryShippingDto = z.infer<typeof batteryShippingDto>;

export const shipmentDto = z.object({
  id: z.string().uuid(),
  referralId: z.string().uuid(),
  reference: z.string(),
  kind: z.enum(shipmentKinds),
  status: z.enum(shipmentStatuses),
  trackingCode: z.string().nullable(),
  carrier: z.string().nullable(),
  service: z.string().nullable(),
  mode: z.enum(shippingModes).nullable(),
  /** What the network paid, integer minor units; null before purchase. */
  amount: z.number().int().nullable(),
  currency: z.string().nullable(),
  /** Answers the carrier's 4 × 6 in PDF label to the same credentials (session or API key). */
  labelUrl: z.string().nullable(),
  packingSlipUrl: z.string().nullable(),
  publicTrackingUrl: z.string().nullable(),
  rates: z.array(rateDto),
  parcel: z.object({
    boxPreset: z.string().nullable(),
    lengthIn: z.number(),
    widthIn: z.number(),
    heightIn: z.number(),
    weightLb: z.number(),
    billableLb: z.number().int().nullable(),
  }),
  from: addressSummaryDto,
  to: addressSummaryDto,
  estimatedDeliveryAt: z.string().nullable(),
  deliveredAt: z.string().nullable(),
  checkedInAt: z.string().nullable(),
  overdue: z.boolean(),
  lastEvent: scanDto.nullable(),
  signatureRequired: z.boolean(),
  declaredValue: z.number().int().nullable(),
  batteryMarkText: z.string().nullable(),
  sscc: z.string().nullable(),
  /** A label can be voided until the carrier's first scan. */
  voidable: z.boolean(),
  /** Seeded demo history: the carrier holds no label for it. */
  historical: z.boolean(),
  createdAt: z.string(),
  boughtAt: z.string().nullable(),
  scans: z.array(scanDto),
});
export type ShipmentDto = z.infer<typeof shipmentDto>;

export const checkInSummaryDto = z.object({
  id: z.string().uuid(),
  at: z.string(),
  by: z.string(),
  labName: z.string(),
  outcome: z.enum(['received', 'on_hold']),
  holdReason: z.string().nullable(),
  boxCondition: z.enum(['intact', 'damaged']),
  sealNumber: z.string().nullable(),
  sealIntact: z.boolean().nullable(),
  contentsMatch: z.boolean(),
  batteryCondition: z.string().nullable(),
  photoCount: z.number().int(),
});
export type CheckInSummaryDto = z.infer<typeof checkInSummaryDto>;

/** Everything the shop's "Ship" section needs for one case. */
export const caseShippingDto = z.object({
  referralId: z.string().uuid(),
  reference: z.string(),
  caseStatus: z.enum(caseStatuses),
  canCreateLabel: z.boolean(),
  /** Why no label can be bought now, in the shop's words. */
  blockedReason: z.string().nullable(),
  battery: batteryShippingDto.nullable(),
  packingRules: z.array(z.string()),
  destination: addressSummaryDto.nullable(),
  suggestedPresets: z.array(z.string()),
  shipments: z.array(shipmentDto),
  checkIn: checkInSummaryDto.nullable(),
});
export type CaseShippingDto = z.infer<typeof caseShippingDto>;

// ---- the lab's inbound board ----------------------------------------------------------------

/** Each expected or arriving box is in exactly one bucket; a delivered box not yet checked in stays visible. */
export const boardBuckets = ['label_issued', 'in_transit', 'out_for_delivery', 'delivered_today', 'exception', 'overdue', 'awaiting_check_in'] as const;
export type BoardBucket = (typeof boardBuckets)[number];

export const boardBucketLabels: Record<BoardBucket, string> = {
  label_issued: 'Label issued',
  in_transit: 'In transit',
  out_for_delivery: 'Out for delivery',
  delivered_today: 'Delivered today',
  exception: 'Exception',
  overdue: 'Overdue',
  awaiting_check_in: 'Delivered earlier, not checked in',
};

export const inboundBoardQuery = z.object({
  bucket: z.enum(boardBuckets).optional(),
  /** A tracking code, a case reference or part of a shop's name. */
  q: z.string().trim().max(100).optional(),
  limit: z.coerce.number().int().min(1).max(200).default(100),
});
export type InboundBoardQuery = z.input<typeof inboundBoardQuery>;

export const boardRowDto = z.object({
  shipmentId: z.string().uuid(),
  referralId: z.string().uuid(),
  reference: z.string(),
  kind: z.enum(shipmentKinds),
  bucket: z.enum(boardBuckets),
  status: z.enum(shipmentStatuses),
  trackingCode: z.string().nullable(),
  carrier: z.string().nullable(),
  service: z.string().nullable(),
  from: z.object({ name: z.string(), city: z.string().nullable(), region: z.string().nullable() }),
  mediaType: z.enum(mediaTypes),
  estimatedDeliveryAt: z.string().nullable(),
  deliveredAt: z.string().nullable(),
  checkedInAt: z.string().nullable(),
  lastEvent: scanDto.nullable(),
  batteryMarkText: z.string().nullable(),
  batteryWarning: z.boolean(),
});
export type BoardRowDto = z.infer<typeof boardRowDto>;

export const inboundBoardDto = z.object({
  asOf: z.string(),
  timeZone: z.string(),
  counts: z.record(z.enum(boardBuckets), z.number().int()),
  data: z.array(boardRowDto),
});
export type InboundBoardDto = z.infer<typeof inboundBoardDto>;

// ---- check-in -------------------------------------------------------------------------------

export const checkInLookupQuery = z.object({ code: z.string().trim().min(1, 'Scan or type a tracking code or case reference').max(60) });

export const batteryConditionsSeen = ['no_battery', ...batteryConditions] as const;
export type BatteryConditionSeen = (typeof batteryConditionsSeen)[number];
export const batteryConditionSeenLabels: Record<BatteryConditionSeen, string> = {
  no_battery: 'No battery in the device',
  intact: 'Intact',
  swollen: 'Swollen',
  damaged: 'Damaged',
  leaking: 'Leaking',
};

export const checkInLookupDto = z.object({
  matchedBy: z.enum(['tracking_code', 'reference', 'sscc']),
  referral: z.object({
    id: z.string().uuid(),
    reference: z.string(),
    status: z.enum(caseStatuses),
    shopName: z.string(),
    mediaType: z.enum(mediaTypes),
    device: z.string(),
    serial: z.string().nullable(),
    symptoms: z.array(z.string()),
    priorities: z.array(z.string()),
    battery: z.object({ installed: z.boolean(), condition: z.enum(batteryConditions).nullable(), wattHours: z.number().nullable() }).nullable(),
    askBattery: z.boolean(),
    cautions: z.array(cautionSchema),
  }),
  shipment: shipmentDto.nullable(),
  checkIn: checkInSummaryDto.nullable(),
  /** False when the case is not (or no longer) waiting for this lab to check it in. */
  canCheckIn: z.boolean(),
  blockedReason: z.string().nullable(),
});
export type CheckInLookupDto = z.infer<typeof checkInLookupDto>;

export const checkInInput = z
  .object({
    referralId: z.string().uuid('Look the box up first'),
    shipmentId: z.string().uuid().optional(),
    boxCondition: z.enum(['intact', 'damaged'], { message: 'Say whether the box is intact or damaged' }),
    seal: z.object({
      present: z.boolean({ message: 'Say whether the box has a seal' }),
      number: trimmed(40).optional(),
      intact: z.boolean().optional(),
    }),
    contentsMatch: z.boolean({ message: 'Say whether the contents match the intake' }),
    contentsNote: trimmed(1000).optional(),
    batteryCondition: z.enum(batteryConditionsSeen).optional(),
    note: trimmed(2000).optional(),
  })
  .superRefine((c, ctx) => {
    if (c.seal.present && !c.seal.number) ctx.addIssue({ code: 'custom', path: ['seal', 'number'], message: 'Enter the seal number' });
    if (c.seal.present && c.seal.intact === undefined) ctx.addIssue({ code: 'custom', path: ['seal', 'intact'], message: 'Say whether the seal is intact' });
    if (!c.contentsMatch && !c.contentsNote) ctx.addIssue({ code: 'custom', path: ['contentsNote'], message: 'Say what differs from the intake' });
  });
export type CheckInInput = z.input<typeof checkInInput>;

export const checkInResultDto = z.object({
  checkIn: checkInSummaryDto,
  caseStatus: z.enum(caseStatuses),
});
export type CheckInResultDto = z.infer<typeof checkInResultDto>;

// ---- outbound: returns and transfers ---------------------------------------------------------

export const declineAfterArrivalInput = z.object({
  reason: z.enum(['no_capacity', 'missing_skill_or_parts', 'device_out_of_scope', 'sensitivity_requirements', 'other'], { message: 'Choose a reason' }),
  note: trimmed(1000).optional(),
});
export type DeclineAfterArrivalInput = z.input<typeof declineAfterArrivalInput>;

/** The lab's manager releases a case it put on hold at check-in, saying what settled it. */
export const releaseHoldInput = z.object({
  note: z
    .string({ message: 'Say what settled the hold, for the shop' })
    .trim()
    .min(1, 'Say what settled the hold, for the shop')
    .max(1000, 'Use at most 1000 characters'),
});
export type ReleaseHoldInput = z.input<typeof releaseHoldInput>;

export const outboundItemDto = z.object({
  referralId: z.string().uuid(),
  reference: z.string(),
  caseStatus: z.enum(caseStatuses),
  mediaType: z.enum(mediaTypes),
  shopName: z.string(),
  /** return: the device goes back; transfer: to the lab that took the case over. */
  purpose: z.enum(['return', 'transfer']),
  /** transfer only: the lab it goes to, once one accepted. */
  toLabName: z.string().nullable(),
  ready: z.boolean(),
  waitingFor: z.string().nullable(),
  shipment: shipmentDto.nullable(),
  checkedInAt: z.string(),
});
export type OutboundItemDto = z.infer<typeof outboundItemDto>;

export const outboundListDto = z.object({ data: z.array(outboundItemDto) });
