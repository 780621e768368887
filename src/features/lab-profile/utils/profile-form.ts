import { z } from 'zod';
import { cleanAirCertificateInput, labProfileInput, type LabProfileDto } from '@shared/schemas/labs';
import type { LabSkill, MediaType } from '@shared/vocabulary';

// The profile form holds what its inputs hold (strings from checkboxes and time fields, blanks);
// the shared schema reads them after this light clean-up, with the same field paths.

export interface LabProfileFormValues {
  address: { line1: string; city: string; region: string; postalCode: string; country: string };
  timeZone: string;
  businessHours: { opensAt: string; closesAt: string; workdays: string[]; holidayCountry: string; holidayRegion: string };
  mediaTypes: MediaType[];
  skills: { skill: LabSkill; turnaroundDays?: number }[];
  weeklyThroughput?: number;
  queueCapacity?: number;
  healthDataAgreement: { signed: boolean };
  acceptingNewCases: boolean;
  autoAcceptRules: { skills: LabSkill[]; maxDistanceKm?: number }[];
}

export function formValuesFrom(profile: LabProfileDto): LabProfileFormValues {
  return {
    address: {
      line1: profile.address.line1 ?? '',
      city: profile.address.city ?? '',
      region: profile.address.region ?? '',
      postalCode: profile.address.postalCode ?? '',
      country: profile.address.country || 'US',
    },
    timeZone: profile.timeZone,
    businessHours: {
      opensAt: profile.businessHours.opensAt,
      closesAt: profile.businessHours.closesAt,
      workdays: profile.businessHours.workdays.map(String),
      holidayCountry: profile.businessHours.holidayCountry || 'US',
      holidayRegion: profile.businessHours.holidayRegion ?? '',
    },
    mediaTypes: profile.mediaTypes,
    skills: profile.skills.map((s) => ({ skill: s.skill, turnaroundDays: s.turnaroundDays })),
    weeklyThroughput: profile.weeklyThroughput,
    queueCapacity: profile.queueCapacity,
    healthDataAgreement: { signed: profile.healthDataAgreement.signed },
    acceptingNewCases: profile.acceptingNewCases,
    autoAcceptRules: profile.autoAcceptRules.map((r) => ({ skills: r.skills, maxDistanceKm: r.maxDistanceKm })),
  };
}

const arrayOf = (value: unknown): unknown[] => (Array.isArray(value) ? value : []);
const blank = (value: unknown) => (typeof value === 'string' && value.trim() === '' ? undefined : value);

export function cleanProfile(raw: unknown): unknown {
  const v = (raw ?? {}) as Record<string, any>;
  return {
    ...v,
    address: {
      line1: blank(v.address?.line1),
      city: blank(v.address?.city),
      region: blank(v.address?.region),
      postalCode: v.address?.postalCode ?? '',
      country: v.address?.country || 'US',
    },
    businessHours: {
      ...v.businessHours,
      workdays: arrayOf(v.businessHours?.workdays).map(Number),
      holidayRegion: blank(v.businessHours?.holidayRegion),
    },
    mediaTypes: arrayOf(v.mediaTypes),
    skills: arrayOf(v.skills),
    autoAcceptRules: arrayOf(v.autoAcceptRules).map((r) => ({ ...(r as object), skills: arrayOf((r as Record<string, unknown>)?.skills) })),
  };
}

export const profileFormSchema = z.preprocess(cleanProfile, labProfileInput) as unknown as z.ZodType<z.output<typeof labProfileInput>, LabProfileFormValues>;

export interface CertificateFormValues {
  testedOn: string;
  areaName: string;
  areaM2?: number;
  samples: { location: string; sizeUm?: number; perM3?: number; volumeLitres?: number }[];
}

export const emptyCertificate: CertificateFormValues = {
  testedOn: '',
  areaName: '',
  samples: [
    { location: 'L1', sizeUm: 0.3 },
    { location: 'L1', sizeUm: 0.5 },
  ],
};

export const certificateFormSchema = cleanAirCertificateInput as unknown as z.ZodType<z.output<typeof cleanAirCertificateInput>, CertificateFormValues>;

