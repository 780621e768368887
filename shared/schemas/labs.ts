import { z } from 'zod';
import { batteryConditions, labSkills, mediaTypes, priorityCategories, sensitivityFlags, symptoms } from '../vocabulary';
import { addressSchema, candidateDto, excludedDto, latLonSchema, offerStatuses, referralSummaryDto, triageDto } from './referrals';

// Lab profiles (what routing reads about a lab), clean-air certificates, a lab's offers and the
// network's "needs attention" queue. The lab manager's form, the admin screens, the routes and the
// services use these.

const hhmm = z.string().regex(/^([01]\d|2[0-3]):[0-5]\d$/, 'Use a 24-hour time HH:mm, like 09:00');

function isTimeZone(value: string): boolean {
  try {
    new Intl.DateTimeFormat('en-US', { timeZone: value });
    return value.includes('/') || value === 'UTC';
  } catch {
    return false;
  }
}

/** Time zones of the places the network serves (the US and Canada), for the forms to offer. */
export const networkTimeZones = [
  'America/New_York',
  'America/Detroit',
  'America/Indiana/Indianapolis',
  'America/Chicago',
  'America/Denver',
  'America/Boise',
  'America/Phoenix',
  'America/Los_Angeles',
  'America/Anchorage',
  'Pacific/Honolulu',
  'America/Puerto_Rico',
  'America/St_Johns',
  'America/Halifax',
  'America/Toronto',
  'America/Winnipeg',
  'America/Regina',
  'America/Edmonton',
  'America/Vancouver',
] as const;

export const timeZoneSchema = z.string().trim().min(1, 'Choose a time zone').refine(isTimeZone, 'Use an IANA time zone, like America/Chicago');

export const businessHoursSchema = z
  .object({
    opensAt: hhmm,
    closesAt: hhmm,
    /** ISO weekdays, 1 = Monday … 7 = Sunday. */
    workdays: z
      .array(z.number().int().min(1, 'Weekdays run 1 (Monday) to 7 (Sunday)').max(7, 'Weekdays run 1 (Monday) to 7 (Sunday)'))
      .min(1, 'Choose at least one working day')
      .max(7),
    /** Country for public holidays (ISO 3166-1 alpha-2). */
    holidayCountry: z.string().trim().toUpperCase().length(2, 'Use the two-letter country code').default('US'),
    /** State or province for regional holidays, e.g. "AZ". */
    holidayRegion: z.string().trim().toUpperCase().min(1).max(10).optional(),
  })
  .superRefine((h, ctx) => {
    if (h.closesAt <= h.opensAt) ctx.addIssue({ code: 'custom', path: ['closesAt'], message: 'Closing time must be after opening time' });
    if (new Set(h.workdays).size !== h.workdays.length) ctx.addIssue({ code: 'custom', path: ['workdays'], message: 'Each weekday once' });
  });
export type BusinessHours = z.output<typeof businessHoursSchema>;

export const labSkillOfferSchema = z.object({
  skill: z.enum(labSkills, { message: `Choose one of: ${labSkills.join(', ')}` }),
  /** Typical business days from the device's arrival to data ready, for this kind of work. */
  turnaroundDays: z.number({ message: 'Turnaround must be a number of business days' }).positive('Turnaround must be more than 0 days').max(365, 'At most 365 days'),
});

export const autoAcceptRuleSchema = z.object({
  /** An offer is accepted without a person when every skill the case needs is in this list… */
  skills: z.array(z.enum(labSkills, { message: 'Unknown skill' })).min(1, 'Choose at least one skill'),
  /** …and the shop is at most this far away (geodesic distance). */
  maxDistanceKm: z.number({ message: 'Distance must be a number of kilometres' }).positive('Distance must be more than 0 km').max(20_000),
});
export type AutoAcceptRule = z.infer<typeof autoAcceptRuleSchema>;

/** PUT /api/lab/profile and PUT /api/network/labs/:id: the whole profile. */
export const labProfileInput = z
  .object({
    address: addressSchema,
    timeZone: timeZoneSchema,
    businessHours: businessHoursSchema,
    mediaTypes: z.array(z.enum(mediaTypes, { message: `Choose one of: ${mediaTypes.join(', ')}` })).min(1, 'Choose at least one media type'),
    skills: z.array(labSkillOfferSchema).min(1, 'Offer at least one skill'),
    weeklyThroughput: z.number({ message: 'Throughput must be a number of cases' }).min(0, 'Throughput cannot be negative').max(10_000),
    queueCapacity: z
      .number({ message: 'Capacity must be a whole number of cases' })
      .int('Capacity must be a whole number of cases')
      .min(0, 'Capacity cannot be negative')
      .max(100_000),
    healthDataAgreement: z.object({ signed: z.boolean({ message: 'Say whether the agreement is signed' }) }),
    acceptingNewCases: z.boolean({ message: 'Say whether the lab accepts new cases' }),
    autoAcceptRules: z.array(autoAcceptRuleSchema).max(20).default([]),
  })
  .superRefine((p, ctx) => {
    const seenMedia = new Set<string>();
    p.mediaTypes.forEach((m, i) => {
      if (seenMedia.has(m)) ctx.addIssue({ code: 'custom', path: ['mediaTypes', i], message: 'Each media type once' });
      seenMedia.add(m);
    });
    const offered = new Set<string>();
    p.skills.forEach((s, i) => {
      if (offered.has(s.skill)) ctx.addIssue({ code: 'custom', path: ['skills', i, 'skill'], message: 'Each skill once' });
      offered.add(s.skill);
    });
    p.autoAcceptRules.forEach((rule, i) => {
      rule.skills.forEach((skill, j) => {
        if (!offered.has(skill)) ctx.addIssue({ code: 'custom', path: ['autoAcceptRules', i, 'skills', j], message: 'Only skills the lab offers can be accepted automatically' });
      });
    });
  });
export type LabProfileInput = z.input<typeof labProfileInput>;
export type LabProfileInputParsed = z.output<typeof labProfileInput>;

export const particleSampleSchema = z.object({
  location: z.string().trim().min(1, 'Name the sampling location').max(60),
  sizeUm: z.number({ message: 'Particle size must be a number of µm' }).min(0.1, 'ISO 14644-1 covers 0.1 µm to 5 µm').max(5, 'ISO 14644-1 covers 0.1 µm to 5 µm'),
  perM3: z.number({ message: 'Concentration must be a number' }).min(0, 'A concentration cannot be negative'),
  volumeLitres: z.number().positive('Sample volume must be more than 0 litres').max(100_000).optional(),
});

/** POST /api/lab/profile/certificates: the particle counts of the latest test. */
export const cleanAirCertificateInput = z.object({
  testedOn: z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'Use a date YYYY-MM-DD'),
  /** The clean zone the test covers, as the lab names it ("Bench 1", "Clean room A"). */
  areaName: z.string().trim().min(1, 'Name the clean area').max(100),
  /** Floor area in m²; for a clean bench, the cross-section of its airflow. */
  areaM2: z.number({ message: 'Area must be a number of m²' }).positive('Area must be more than 0 m²').max(10_000),
  samples: z.array(particleSampleSchema).min(1, 'Enter at least one particle count').max(2000),
});
export type CleanAirCertificateInput = z.input<typeof cleanAirCertificateInput>;

export const cleanAirCertificateDto = z.object({
  id: z.string().uuid(),
  testedOn: z.string(),
  areaName: z.string(),
  areaM2: z.number(),
  samples: z.array(particleSampleSchema),
  /** Cleanest ISO 14644-1 class the counts demonstrate; null when none. */
  isoClass: z.number().int().nullable(),
  /** Last day before re-test is due (ISO 14644-2 interval); null without a class. */
  validUntil: z.string().nullable(),
  /** Within its re-test interval today, in the lab's time zone. */
  current: z.boolean(),
  problems: z.array(z.string()),
  recordedAt: z.string(),
});
export type CleanAirCertificateDto = z.infer<typeof cleanAirCertificateDto>;

export const labProfileDto = z.object({
  labId: z.string().uuid(),
  name: z.string(),
  active: z.boolean(),
  /** False until the first profile is saved. */
  configured: z.boolean(),
  address: z.object({ line1: z.string().nullable(), city: z.string().nullable(), region: z.string().nullable(), postalCode: z.string().nullable(), country: z.string() }),
  location: latLonSchema.nullable(),
  timeZone: z.string(),
  businessHours: z.object({
    opensAt: z.string(),
    closesAt: z.string(),
    workdays: z.array(z.number().int()),
    holidayCountry: z.string(),
    holidayRegion: z.string().nullable(),
  }),
  mediaTypes: z.array(z.enum(mediaTypes)),
  skills: z.array(labSkillOfferSchema),
  weeklyThroughput: z.number(),
  queueCapacity: z.number().int(),
  /** Cases the lab holds now (accepted and not yet returned), counted from the cases. */
  openCases: z.number().int(),
  healthDataAgreement: z.object({ signed: z.boolean(), signedAt: z.string().nullable() }),
  acceptingNewCases: z.boolean(),
  autoAcceptRules: z.array(autoAcceptRuleSchema),
  cleanAir: z.object({ latest: cleanAirCertificateDto.nullable(), history: z.array(cleanAirCertificateDto) }),
  updatedAt: z.string().nullable(),
});
export type LabProfileDto = z.infer<typeof labProfileDto>;

/** A row of the network's lab list and a marker on its map. */
export const labSummaryDto = z.object({
  id: z.string().uuid(),
  name: z.string(),
  active: z.boolean(),
  configured: z.boolean(),
  acceptingNewCases: z.boolean(),
  location: latLonSchema.nullable(),
  city: z.string().nullable(),
  region: z.string().nullable(),
  timeZone: z.string(),
  mediaTypes: z.array(z.enum(mediaTypes)),
  skills: z.array(labSkillOfferSchema),
  healthDataAgreement: z.boolean(),
  cleanAir: z.object({ isoClass: z.number().int().nullable(), testedOn: z.string(), validUntil: z.string().nullable(), current: z.boolean() }).nullable(),
  openCases: z.number().int(),
  queueCapacity: z.number().int(),
  weeklyThroughput: z.number(),
});
export type LabSummaryDto = z.infer<typeof labSummaryDto>;

export const labListQuery = z.object({ skill: z.enum(labSkills, { message: 'Unknown skill' }).optional() });

/** What a lab sees of a case it was offered: enough to decide, no customer contact details. */
export const labOfferDto = z.object({
  id: z.string().uuid(),
  status: z.enum(offerStatuses),
  offeredAt: z.string(),
  deadline: z.string(),
  respondedAt: z.string().nullable(),
  respondedBy: z.string().nullable(),
  autoAccepted: z.boolean(),
  declineReason: z.string().nullable(),
  declineNote: z.string().nullable(),
  rank: z.number().int().nullable(),
  distanceKm: z.number().nullable(),
  estimatedDays: z.number().nullable(),
  case: z.object({
    id: z.string().uuid(),
    reference: z.string(),
    shop: z.object({ name: z.string(), city: z.string().nullable(), region: z.string().nullable() }),
    device: z.object({
      mediaType: z.enum(mediaTypes),
      capacityGb: z.number().nullable(),
      interface: z.string().nullable(),
      make: z.string().nullable(),
      model: z.string().nullable(),
      memberCount: z.number().nullable(),
    }),
    symptoms: z.array(z.enum(symptoms)),
    description: z.string().nullable(),
    priorities: z.array(z.object({ category: z.enum(priorityCategories), note: z.string().nullable() })),
    sensitivity: z.array(z.enum(sensitivityFlags)),
    battery: z.object({ installed: z.boolean(), condition: z.enum(batteryConditions).nullable(), wattHours: z.number().nullable() }).nullable(),
    triage: triageDto,
    photos: z.array(z.object({ id: z.string().uuid(), url: z.string(), contentType: z.string(), sizeBytes: z.number() })),
  }),
});
export type LabOfferDto = z.infer<typeof labOfferDto>;

export const labOfferListQuery = z.object({ status: z.enum(offerStatuses, { message: `Choose one of: ${offerStatuses.join(', ')}` }).optional() });
export const labOfferListDto = z.object({ data: z.array(labOfferDto) });

/** The network's queue of cases no lab has taken, each with the ranking as it stands now. */
export const attentionItemDto = z.object({
  referral: referralSummaryDto,
  attentionReason: z.string().nullable(),
  since: z.string(),
  requiredSkills: z.array(z.enum(labSkills)),
  /** Labs already offered this case, with how each offer ended. */
  previousOffers: z.array(z.object({ labId: z.string().uuid(), labName: z.string(), status: z.enum(offerStatuses), declineReason: z.string().nullable() })),
  ranking: z.object({ candidates: z.array(candidateDto), excluded: z.array(excludedDto) }),
});
export type AttentionItemDto = z.infer<typeof attentionItemDto>;
export const attentionListDto = z.object({ data: z.array(attentionItemDto) });
