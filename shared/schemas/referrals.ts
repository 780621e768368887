import { z } from 'zod';
import {
  batteryConditions,
  caseStatuses,
  labSkills,
  mediaTypes,
  priorityCategories,
  sensitivityFlags,
  symptoms,
} from '../vocabulary';

// One intake schema for the counter form, the app's route, the partner API and the service.

export const deviceInterfaces = ['sata', 'sas', 'pata', 'nvme', 'usb', 'thunderbolt', 'sd', 'microsd', 'compact_flash', 'lightning', 'usb_c', 'proprietary', 'other'] as const;
export type DeviceInterface = (typeof deviceInterfaces)[number];

const trimmed = (max: number) => z.string().trim().max(max, `Use at most ${max} characters`);
const optionalText = (max: number) => trimmed(max).optional();

export const customerSchema = z.object({
  name: trimmed(120).min(1, 'Enter the customer\u2019s name'),
  email: z.string().trim().toLowerCase().email('Enter a valid e-mail address').max(254),
  phone: trimmed(40).regex(/^[+()0-9 .-]*$/, 'Use digits, spaces and + ( ) - . only').optional(),
});

export const deviceSchema = z
  .object({
    mediaType: z.enum(mediaTypes, { message: `Choose one of: ${mediaTypes.join(', ')}` }),
    capacityGb: z.number({ message: 'Capacity must be a number of gigabytes' }).positive('Capacity must be more than 0').max(10_000_000).optional(),
    interface: z.enum(deviceInterfaces).optional(),
    make: optionalText(80),
    model: optionalText(120),
    serial: optionalText(80),
    memberCount: z.number().int('Whole number of drives').min(2, 'A RAID has at least 2 members').max(64).optional(),
  })
  .superRefine((d, ctx) => {
    if (d.mediaType === 'raid_nas' && d.memberCount === undefined) {
      ctx.addIssue({ code: 'custom', path: ['memberCount'], message: 'Give the number of member drives for a RAID or NAS' });
    }
    if (d.mediaType !== 'raid_nas' && d.memberCount !== undefined) {
      ctx.addIssue({ code: 'custom', path: ['memberCount'], message: 'Member count applies only to RAID / NAS' });
    }
  });

export const prioritySchema = z.object({
  category: z.enum(priorityCategories, { message: `Choose one of: ${priorityCategories.join(', ')}` }),
  note: optionalText(300),
});

export const batteryDeclarationSchema = z
  .object({
    installed: z.boolean({ message: 'Say whether a battery is installed' }),
    condition: z.enum(batteryConditions).optional(),
    wattHours: z.number().positive('Watt-hours must be more than 0').max(10_000).optional(),
    volts: z.number().positive().max(1000).optional(),
    milliampHours: z.number().positive().max(1_000_000).optional(),
  })
  .superRefine((b, ctx) => {
    if (b.installed && !b.condition) ctx.addIssue({ code: 'custom', path: ['condition'], message: 'Say what condition the battery is in' });
    if ((b.volts === undefined) !== (b.milliampHours === undefined)) {
      ctx.addIssue({ code: 'custom', path: [b.volts === undefined ? 'volts' : 'milliampHours'], message: 'Give both volts and mAh, or watt-hours' });
    }
  });

export const addressSchema = z.object({
  line1: optionalText(200),
  city: optionalText(100),
  region: optionalText(100),
  postalCode: trimmed(20).min(3, 'Enter a postal code'),
  country: z.string().trim().toUpperCase().length(2, 'Use the two-letter country code').default('US'),
});

export const referralInput = z
  .object({
    externalRef: optionalText(100),
    customer: customerSchema,
    device: deviceSchema,
    symptoms: z.array(z.enum(symptoms, { message: 'Unknown symptom' })).max(symptoms.length).default([]),
    description: optionalText(4000),
    priorities: z.array(prioritySchema).max(priorityCategories.length).default([]),
    sensitivity: z.array(z.enum(sensitivityFlags, { message: 'Unknown sensitivity flag' })).default([]),
    battery: batteryDeclarationSchema.optional(),
    origin: addressSchema.optional(),
    /** The customer agreed to the network's data-handling terms (the counter form requires it). */
    consent: z.object({ accepted: z.literal(true, { message: 'The customer must agree to the data-handling terms' }) }).optional(),
  })
  .superRefine((r, ctx) => {
    const seen = new Set<string>();
    r.priorities.forEach((p, i) => {
      if (seen.has(p.category)) ctx.addIssue({ code: 'custom', path: ['priorities', i, 'category'], message: 'Each category once' });
      seen.add(p.category);
    });
    if (r.sensitivity.includes('none') && r.sensitivity.length > 1) {
      ctx.addIssue({ code: 'custom', path: ['sensitivity'], message: '"none" cannot be combined with other flags' });
    }
  });
export type ReferralInput = z.input<typeof referralInput>;
export type ReferralInputParsed = z.output<typeof referralInput>;

/** The counter form: the same intake, with the customer's consent required. */
export const counterReferralInput = referralInput.and(
  z.object({ consent: z.object({ accepted: z.literal(true, { message: 'The customer must agree to the data-handling terms' }) }) }),
);

/** POST /api/v1/routing/preview and the form's live preview: everything routing reads, nothing stored. */
export const routingPreviewInput = z.object({
  device: deviceSchema,
  symptoms: z.array(z.enum(symptoms)).default([]),
  sensitivity: z.array(z.enum(sensitivityFlags)).default([]),
  battery: batteryDeclarationSchema.optional(),
  origin: addressSchema.optional(),
});
export type RoutingPreviewInput = z.input<typeof routingPreviewInput>;

export const latLonSchema = z.object({ lat: z.number(), lon: z.number() });

export const cautionSchema = z.object({
  code: z.string(),
  severity: z.enum(['info', 'warning', 'danger']),
  message: z.string(),
  reason: z.string().optional(),
});

export const triageDto = z.object({
  requiredSkills: z.array(z.enum(labSkills)),
  needsCleanAir: z.boolean(),
  needsHealthDataAgreement: z.boolean(),
  cautions: z.array(cautionSchema),
});
export type TriageDto = z.infer<typeof triageDto>;

export const candidateDto = z.object({
  labId: z.string().uuid(),
  labName: z.string(),
  location: latLonSchema,
  distanceKm: z.number(),
  zone: z.number().int(),
  transitDays: z.number(),
  queueDays: z.number(),
  turnaroundDays: z.number(),
  estimatedDays: z.number(),
  reasons: z.array(z.string()),
});
export type CandidateDto = z.infer<typeof candidateDto>;

export const excludedDto = z.object({
  labId: z.string().uuid(),
  labName: z.string(),
  location: latLonSchema.nullable(),
  reasons: z.array(z.object({ code: z.string(), message: z.string() })),
});
export type ExcludedDto = z.infer<typeof excludedDto>;

export const routingDto = z.object({
  origin: latLonSchema,
  candidates: z.array(candidateDto),
  excluded: z.array(excludedDto),
  /** The lab the case is offered to now (or accepted by), null when it waits for the network. */
  offeredTo: z.object({ labId: z.string().uuid(), labName: z.string() }).nullable(),
});
export type RoutingDto = z.infer<typeof routingDto>;

export const offerStatuses = ['pending', 'accepted', 'declined', 'expired', 'withdrawn'] as const;
export const offerDto = z.object({
  id: z.string().uuid(),
  labId: z.string().uuid(),
  labName: z.string(),
  status: z.enum(offerStatuses),
  offeredAt: z.string(),
  deadline: z.string(),
  respondedAt: z.string().nullable(),
  autoAccepted: z.boolean(),
  declineReason: z.string().nullable(),
  declineNote: z.string().nullable(),
});
export type OfferDto = z.infer<typeof offerDto>;

export const timelineEntryDto = z.object({
  id: z.string().uuid(),
  at: z.string(),
  kind: z.string(),
  /** Plain words for people: "Offered to Quillmark Recovery Lab until 3 Dec, 11:00 MST". */
  summary: z.string(),
  actor: z.object({ type: z.enum(['user', 'api_key', 'system', 'customer', 'carrier']), name: z.string() }),
  details: z.record(z.string(), z.unknown()).optional(),
});
export type TimelineEntryDto = z.infer<typeof timelineEntryDto>;

/** What the customer was quoted and has paid; null until the lab has sent a quote. Integer minor units. */
export const caseAmountsDto = z.object({
  currency: z.string(),
  quoteStatus: z.enum(['sent', 'approved', 'declined']),
  /** The whole quote: what the customer pays; the network adds nothing on top. */
  quotedTotalMinor: z.number().int(),
  /** The lab's service lines (and any expedite line), without target media and return shipping. */
  serviceLinesMinor: z.number().int(),
  paidMinor: z.number().int().nullable(),
  paidAt: z.string().nullable(),
});
export type CaseAmountsDto = z.infer<typeof caseAmountsDto>;

export const referralDto = z.object({
  id: z.string().uuid(),
  reference: z.string(),
  externalRef: z.string().nullable(),
  status: z.enum(caseStatuses),
  createdAt: z.string(),
  updatedAt: z.string(),
  partner: z.object({ id: z.string().uuid(), name: z.string() }),
  customer: z.object({ name: z.string(), email: z.string(), phone: z.string().nullable() }),
  device: z.object({
    mediaType: z.enum(mediaTypes),
    capacityGb: z.number().nullable(),
    interface: z.string().nullable(),
    make: z.string().nullable(),
    model: z.string().nullable(),
    serial: z.string().nullable(),
    memberCount: z.number().nullable(),
  }),
  symptoms: z.array(z.enum(symptoms)),
  description: z.string().nullable(),
  priorities: z.array(z.object({ category: z.enum(priorityCategories), note: z.string().nullable() })),
  sensitivity: z.array(z.enum(sensitivityFlags)),
  battery: z
    .object({ installed: z.boolean(), condition: z.enum(batteryConditions).nullable(), wattHours: z.number().nullable() })
    .nullable(),
  origin: addressSchema.extend({ location: latLonSchema }),
  consent: z.object({ recordedAt: z.string(), recordedBy: z.string() }).nullable(),
  triage: triageDto,
  routing: routingDto,
  /** The current or last offer. */
  offer: offerDto.nullable(),
  /** The lab that accepted the case. */
  lab: z.object({ id: z.string().uuid(), name: z.string() }).nullable(),
  /** Why the case waits for the network admin, when it does. */
  attentionReason: z.string().nullable(),
  photos: z.array(z.object({ id: z.string().uuid(), url: z.string(), contentType: z.string(), sizeBytes: z.number() })),
  timeline: z.array(timelineEntryDto),
  shipments: z.array(z.object({ id: z.string(), trackingCode: z.string().nullable(), status: z.string() })),
  amounts: caseAmountsDto.nullable(),
});
export type ReferralDto = z.infer<typeof referralDto>;

/** A row of the partner's case table and of the API's list. */
export const referralSummaryDto = referralDto.pick({
  id: true,
  reference: true,
  externalRef: true,
  status: true,
  createdAt: true,
  updatedAt: true,
  customer: true,
  lab: true,
}).extend({ mediaType: z.enum(mediaTypes) });
export type ReferralSummaryDto = z.infer<typeof referralSummaryDto>;

export const referralListQuery = z.object({
  status: z.enum(caseStatuses).optional(),
  /** Reference, external reference or customer name / e-mail. */
  q: z.string().trim().max(100).optional(),
  updatedSince: z.string().datetime({ offset: true, message: 'Use an ISO 8601 date-time' }).optional(),
  limit: z.coerce.number().int().min(1).max(100).default(25),
  cursor: z.string().max(200).optional(),
});
export type ReferralListQuery = z.input<typeof referralListQuery>;

export const referralListDto = z.object({ data: z.array(referralSummaryDto), nextCursor: z.string().nullable() });

export const declineReasons = ['no_capacity', 'missing_skill_or_parts', 'outside_service_area', 'sensitivity_requirements', 'device_out_of_scope', 'other'] as const;
export const declineReasonLabels: Record<(typeof declineReasons)[number], string> = {
  no_capacity: 'No capacity right now',
  missing_skill_or_parts: 'Missing the skill, tools or donor parts',
  outside_service_area: 'Outside our service area',
  sensitivity_requirements: 'Cannot meet the data-sensitivity requirements',
  device_out_of_scope: 'Device or damage is out of scope',
  other: 'Other',
};
export const declineOfferInput = z
  .object({ reason: z.enum(declineReasons, { message: 'Choose a reason' }), note: optionalText(1000) })
  .superRefine((d, ctx) => {
    if (d.reason === 'other' && !d.note) ctx.addIssue({ code: 'custom', path: ['note'], message: 'Say why, in a few words' });
  });
export type DeclineOfferInput = z.infer<typeof declineOfferInput>;

export const assignLabInput = z.object({ labId: z.string().uuid('Choose a lab'), note: optionalText(1000) });

/** The answer to a routing preview: triage and the ranking as they would be now; nothing is stored. */
export const routingPreviewDto = z.object({ triage: triageDto, routing: routingDto });
export type RoutingPreviewDto = z.infer<typeof routingPreviewDto>;
