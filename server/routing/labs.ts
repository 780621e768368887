import { DateTime } from 'luxon';
import type { EntityManager } from 'typeorm';
import { isCertificateCurrent, type IsoClass, type ParticleSample } from '@shared/domain/clean-air';
import type { LatLon } from '@shared/domain/geo';
import type { RoutingLab } from '@shared/domain/routing';
import type { BusinessCalendar } from '@shared/domain/business-hours';
import type { AutoAcceptRule, CleanAirCertificateDto, LabSummaryDto } from '@shared/schemas/labs';
import type { CaseStatus, LabSkill, MediaType } from '@shared/vocabulary';
import type { SkillOffer } from './entities';

// Reading labs the way routing and the screens need them: the organisation, its profile, its latest
// clean-air certificate and its open cases, counted from the cases themselves.

/** A lab holds a case from acceptance until the device has gone back (or the case ended). */
export const LAB_OPEN_STATUSES: readonly CaseStatus[] = [
  'accepted',
  'label_issued',
  'in_transit',
  'received',
  'evaluating',
  'quote_sent',
  'quote_declined',
  'approved',
  'recovering',
  'ready_for_review',
  'paid',
  'on_hold',
];

export interface LatestCertificate {
  id: string;
  testedOn: string;
  areaName: string;
  areaM2: number;
  samples: ParticleSample[];
  isoClass: number | null;
  validUntil: string | null;
}

export interface LoadedLab {
  id: string;
  name: string;
  active: boolean;
  configured: boolean;
  acceptingNewCases: boolean;
  location: LatLon | null;
  timeZone: string;
  address: { line1: string | null; city: string | null; region: string | null; postalCode: string | null; country: string };
  mediaTypes: MediaType[];
  skills: SkillOffer[];
  weeklyThroughput: number;
  queueCapacity: number;
  openCases: number;
  calendar: BusinessCalendar;
  healthDataAgreementSignedAt: Date | null;
  autoAcceptRules: AutoAcceptRule[];
  latestCertificate: LatestCertificate | null;
  profileUpdatedAt: Date | null;
}

interface LabRow {
  id: string;
  name: string;
  active: boolean;
  lat: number | null;
  lon: number | null;
  time_zone: string;
  address_line1: string | null;
  city: string | null;
  region: string | null;
  postal_code: string | null;
  country: string;
  configured: boolean;
  media_types: MediaType[] | null;
  skills: SkillOffer[] | null;
  weekly_throughput: number | null;
  queue_capacity: number | null;
  opens_at: string | null;
  closes_at: string | null;
  workdays: number[] | null;
  holiday_country: string | null;
  holiday_region: string | null;
  health_data_agreement_signed_at: Date | null;
  accepting_new_cases: boolean | null;
  auto_accept_rules: AutoAcceptRule[] | null;
  profile_updated_at: Date | null;
  cert_id: string | null;
  cert_tested_on: string | null;
  cert_area_name: string | null;
  cert_area_m2: number | null;
  cert_samples: ParticleSample[] | null;
  cert_iso_class: number | null;
  cert_valid_until: string | null;
  open_cases: number;
  directory_version: string | null;
}

const LAB_SQL = `
  SELECT o.id, o.name, o.active, o.lat, o.lon, o.time_zone, o.address_line1, o.city, o.region, o.postal_code, o.country,
         p.organization_id IS NOT NULL AS configured, p.media_types, p.skills, p.weekly_throughput, p.queue_capacity,
         p.opens_at, p.closes_at, p.workdays, p.holiday_country, p.holiday_region, p.health_data_agreement_signed_at,
         p.accepting_new_cases, p.auto_accept_rules, p.updated_at AS profile_updated_at,
         c.id AS cert_id, c.tested_on::text AS cert_tested_on, c.area_name AS cert_area_name, c.area_m2 AS cert_area_m2,
         c.samples AS cert_samples, c.iso_class AS cert_iso_class, c.valid_until::text AS cert_valid_until,
         (SELECT count(*)::int FROM referrals r WHERE r.lab_organization_id = o.id AND r.status = ANY($1::text[])) AS open_cases,
         (SELECT version::text FROM lab_directory_version) AS directory_version
  FROM organizations o
  LEFT JOIN lab_profiles p ON p.organization_id = o.id
  LEFT JOIN LATERAL (
    SELECT * FROM clean_air_certificates c WHERE c.organization_id = o.id ORDER BY c.tested_on DESC, c.created_at DESC LIMIT 1
  ) c ON true
  WHERE o.kind = 'lab'`;

function toLoadedLab(row: LabRow): LoadedLab {
  return {
    id: row.id,
    name: row.name,
    active: row.active,
    configured: row.configured,
    acceptingNewCases: row.accepting_new_cases ?? false,
    location: row.lat != null && row.lon != null ? { lat: row.lat, lon: row.lon } : null,
    timeZone: row.time_zone,
    address: { line1: row.address_line1, city: row.city, region: row.region, postalCode: row.postal_code, country: row.country },
    mediaTypes: row.media_types ?? [],
    skills: row.skills ?? [],
    weeklyThroughput: row.weekly_throughput ?? 0,
    queueCapacity: row.queue_capacity ?? 0,
    openCases: row.open_cases,
    calendar: {
      timeZone: row.time_zone,
      country: row.holiday_country ?? row.country,
      ...(row.holiday_region ? { region: row.holiday_region } : {}),
      opensAt: row.opens_at ?? '09:00',
      closesAt: row.closes_at ?? '17:00',
      workdays: row.workdays ?? [1, 2, 3, 4, 5],
    },
    healthDataAgreementSignedAt: row.health_data_agreement_signed_at,
    autoAcceptRules: row.auto_accept_rules ?? [],
    latestCertificate:
      row.cert_id && row.cert_tested_on && row.cert_samples && row.cert_area_m2 != null
        ? {
            id: row.cert_id,
            testedOn: row.cert_tested_on,
            areaName: row.cert_area_name ?? '',
            areaM2: row.cert_area_m2,
            samples: row.cert_samples,
            isoClass: row.cert_iso_class,
            validUntil: row.cert_valid_until,
          }
        : null,
    profileUpdatedAt: row.profile_updated_at,
  };
}

/** Every lab organisation (or one), ordered by name. */
export async function loadLabs(manager: EntityManager, filter: { labId?: string } = {}): Promise<LoadedLab[]> {
  return (await loadLabsWithVersion(manager, filter)).labs;
}

/** The labs with the directory version they were read at (same statement, so the two agree). */
export async function loadLabsWithVersion(manager: EntityManager, filter: { labId?: string } = {}): Promise<{ labs: LoadedLab[]; version: string | null }> {
  const params: unknown[] = [LAB_OPEN_STATUSES];
  let sql = LAB_SQL;
  if (filter.labId) {
    params.push(filter.labId);
    sql += ` AND o.id = $2`;
  }
  const rows: LabRow[] = await manager.query(`${sql} ORDER BY o.name, o.id`, params);
  return { labs: rows.map(toLoadedLab), version: rows[0]?.directory_version ?? null };
}

export function todayIn(timeZone: string, at: Date = new Date()): string {
  const local = DateTime.fromJSDate(at).setZone(timeZone);
  return (local.isValid ? local : DateTime.fromJSDate(at).toUTC()).toISODate() as string;
}

export function certificateCurrent(cert: { testedOn: string; isoClass: number | null }, timeZone: string, at: Date = new Date()): boolean {
  return cert.isoClass != null && isCertificateCurrent(cert.testedOn, cert.isoClass as IsoClass, todayIn(timeZone, at));
}

/** The lab as the pure routing module reads it; a lab not accepting new cases counts as inactive there. */
export function toRoutingLab(lab: LoadedLab & { location: LatLon }): RoutingLab {
  const turnaroundDays: Partial<Record<LabSkill, number>> = {};
  for (const s of lab.skills) turnaroundDays[s.skill] = s.turnaroundDays;
  return {
    id: lab.id,
    name: lab.name,
    active: lab.active && lab.acceptingNewCases,
    location: lab.location,
    timeZone: lab.timeZone,
    mediaTypes: lab.mediaTypes,
    turnaroundDays,
    healthDataAgreement: lab.healthDataAgreementSignedAt !== null,
    cleanAirCertificate: lab.latestCertificate
      ? { testedOn: lab.latestCertificate.testedOn, areaM2: lab.latestCertificate.areaM2, samples: lab.latestCertificate.samples }
      : null,
    openCases: lab.openCases,
    queueCapacity: lab.queueCapacity,
    weeklyThroughput: lab.weeklyThroughput,
  };
}

export function toLabSummary(lab: LoadedLab, at: Date = new Date()): LabSummaryDto {
  const cert = lab.latestCertificate;
  return {
    id: lab.id,
    name: lab.name,
    active: lab.active,
    configured: lab.configured,
    acceptingNewCases: lab.acceptingNewCases,
    location: lab.location,
    city: lab.address.city,
    region: lab.address.region,
    timeZone: lab.timeZone,
    mediaTypes: lab.mediaTypes,
    skills: lab.skills,
    healthDataAgreement: lab.healthDataAgreementSignedAt !== null,
    cleanAir: cert ? { isoClass: cert.isoClass, testedOn: cert.testedOn, validUntil: cert.validUntil, current: certificateCurrent(cert, lab.timeZone, at) } : null,
    openCases: lab.openCases,
    queueCapacity: lab.queueCapacity,
    weeklyThroughput: lab.weeklyThroughput,
  };
}

export function toCertificateDto(
  cert: { id: string; testedOn: string; areaName: string; areaM2: number; samples: ParticleSample[]; isoClass: number | null; validUntil: string | null; problems?: string[]; createdAt?: Date },
  timeZone: string,
  at: Date = new Date(),
): CleanAirCertificateDto {
  return {
    id: cert.id,
    testedOn: cert.testedOn,
    areaName: cert.areaName,
    areaM2: cert.areaM2,
    samples: cert.samples,
    isoClass: cert.isoClass,
    validUntil: cert.validUntil,
    current: certificateCurrent(cert, timeZone, at),
    problems: cert.problems ?? [],
    recordedAt: (cert.createdAt ?? at).toISOString(),
  };
}
