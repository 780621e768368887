import type { EntityManager } from 'typeorm';
import { addBusinessHours, type BusinessCalendar } from '@shared/domain/business-hours';
import { classifyCertificate, retestDueDate, type IsoClass } from '@shared/domain/clean-air';
import {
  cleanAirCertificateInput,
  labProfileInput,
  type CleanAirCertificateDto,
  type LabProfileDto,
  type LabSummaryDto,
} from '@shared/schemas/labs';
import type { LabSkill } from '@shared/vocabulary';
import { recordAudit } from '../audit';
import { AppError } from '../lib/errors';
import type { Actor, ServiceContext } from '../lib/context';
import { parseInput } from '../lib/validate';
import { Organization } from '../organizations';
import { CleanAirCertificate, LabProfile } from './entities';
import { loadLabs, todayIn, toCertificateDto, toLabSummary, type LoadedLab } from './labs';
import { resolvePostalCode } from './places';

// Lab profiles: what a lab offers (skills, media, turnaround), how much it can take, when it works,
// its health-data agreement, its clean-air certificates and its auto-accept rules. A lab manager edits
// the own lab's; the network admin onboards and edits any lab.

function ownLabId(actor: Actor): string {
  if (actor.organizationKind !== 'lab') throw AppError.forbidden('Only a lab has a lab profile; network admins edit labs under /api/network/labs');
  return actor.organizationId;
}

async function certificateHistory(manager: EntityManager, labId: string): Promise<CleanAirCertificate[]> {
  return manager.find(CleanAirCertificate, { where: { organizationId: labId }, order: { testedOn: 'DESC', createdAt: 'DESC' } });
}

function toProfileDto(lab: LoadedLab, history: CleanAirCertificate[], now: Date): LabProfileDto {
  const certificates = history.map((c) => toCertificateDto(c, lab.timeZone, now));
  return {
    labId: lab.id,
    name: lab.name,
    active: lab.active,
    configured: lab.configured,
    address: lab.address,
    location: lab.location,
    timeZone: lab.timeZone,
    businessHours: {
      opensAt: lab.calendar.opensAt ?? '09:00',
      closesAt: lab.calendar.closesAt ?? '17:00',
      workdays: [...(lab.calendar.workdays ?? [1, 2, 3, 4, 5])],
      holidayCountry: lab.calendar.country,
      holidayRegion: lab.calendar.region ?? null,
    },
    mediaTypes: lab.mediaTypes,
    skills: lab.skills,
    weeklyThroughput: lab.weeklyThroughput,
    queueCapacity: lab.queueCapacity,
    openCases: lab.openCases,
    healthDataAgreement: { signed: lab.healthDataAgreementSignedAt !== null, signedAt: lab.healthDataAgreementSignedAt?.toISOString() ?? null },
    acceptingNewCases: lab.configured ? lab.acceptingNewCases : false,
    autoAcceptRules: lab.autoAcceptRules,
    cleanAir: { latest: certificates[0] ?? null, history: certificates },
    updatedAt: lab.profileUpdatedAt?.toISOString() ?? null,
  };
}

async function readProfile(manager: EntityManager, labId: string): Promise<LabProfileDto> {
  const [lab] = await loadLabs(manager, { labId });
  if (!lab) throw AppError.notFound('That lab');
  return toProfileDto(lab, await certificateHistory(manager, labId), new Date());
}

export async function getOwnLabProfile(ctx: ServiceContext, actor: Actor): Promise<LabProfileDto> {
  return readProfile(ctx.db.manager, ownLabId(actor));
}

export async function getLabProfile(ctx: ServiceContext, labId: string): Promise<LabProfileDto> {
  return readProfile(ctx.db.manager, labId);
}

export async function listLabs(ctx: ServiceContext, filter: { skill?: LabSkill }): Promise<LabSummaryDto[]> {
  const now = new Date();
  const labs = await loadLabs(ctx.db.manager);
  return labs.filter((l) => !filter.skill || l.skills.some((s) => s.skill === filter.skill)).map((l) => toLabSummary(l, now));
}

/** The calendar must work with the business-hours module: a bad holiday country or region is a field error. */
function checkCalendar(calendar: BusinessCalendar): void {
  try {
    addBusinessHours(new Date(), 1, calendar);
  } catch (error) {
    const message = (error as Error).message;
    const path = /region/.test(message) ? 'businessHours.holidayRegion' : /country/.test(message) ? 'businessHours.holidayCountry' : 'businessHours';
    throw AppError.validation([{ path, message: message.charAt(0).toUpperCase() + message.slice(1) }]);
  }
}

async function saveProfile(manager: EntityManager, labId: string, rawInput: unknown, actor: Actor): Promise<void> {
  const input = parseInput(labProfileInput, rawInput);
  const org = await manager.findOne(Organization, { where: { id: labId, kind: 'lab' }, lock: { mode: 'pessimistic_write' } });
  if (!org) throw AppError.notFound('That lab');
  const place = resolvePostalCode(input.address, 'address');
  const calendar: BusinessCalendar = {
    timeZone: input.timeZone,
    country: input.businessHours.holidayCountry,
    ...(input.businessHours.holidayRegion ? { region: input.businessHours.holidayRegion } : {}),
    opensAt: input.businessHours.opensAt,
    closesAt: input.businessHours.closesAt,
    workdays: input.businessHours.workdays,
  };
  checkCalendar(calendar);

  const existing = await manager.findOneBy(LabProfile, { organizationId: labId });
  const signedAt = input.healthDataAgreement.signed ? (existing?.healthDataAgreementSignedAt ?? new Date()) : null;

  await manager.update(Organization, org.id, {
    addressLine1: input.address.line1 ?? null,
    city: input.address.city ?? place.city,
    region: input.address.region ?? place.region,
    postalCode: place.postalCode,
    country: place.country,
    lat: place.lat,
    lon: place.lon,
    timeZone: input.timeZone,
  });
  const values = {
    organizationId: labId,
    mediaTypes: input.mediaTypes,
    skills: input.skills,
    weeklyThroughput: input.weeklyThroughput,
    queueCapacity: input.queueCapacity,
    opensAt: input.businessHours.opensAt,
    closesAt: input.businessHours.closesAt,
    workdays: input.businessHours.workdays,
    holidayCountry: input.businessHours.holidayCountry,
    holidayRegion: input.businessHours.holidayRegion ?? null,
    healthDataAgreementSignedAt: signedAt,
    acceptingNewCases: input.acceptingNewCases,
    autoAcceptRules: input.autoAcceptRules,
    updatedById: actor.userId,
  };
  if (existing) await manager.update(LabProfile, labId, values);
  else await manager.insert(LabProfile, values);

  // Who changed what the network relies on: the agreement, automatic acceptance, taking cases at all.
  await recordAudit(manager, {
    action: existing ? 'lab_profile.updated' : 'lab_profile.created',
    actorUserId: actor.userId,
    organizationId: labId,
    targetType: 'organization',
    targetId: labId,
    details: {
      byNetwork: actor.organizationKind === 'network',
      healthDataAgreement: input.healthDataAgreement.signed,
      healthDataAgreementChanged: (existing?.healthDataAgreementSignedAt != null) !== input.healthDataAgreement.signed,
      acceptingNewCases: input.acceptingNewCases,
      autoAcceptRules: input.autoAcceptRules,
    },
  });
}

export async function updateOwnLabProfile(ctx: ServiceContext, actor: Actor, input: unknown): Promise<LabProfileDto> {
  const labId = ownLabId(actor);
  await ctx.db.transaction((manager) => saveProfile(manager, labId, input, actor));
  return readProfile(ctx.db.manager, labId);
}

export async function updateLabProfile(ctx: ServiceContext, actor: Actor, labId: string, input: unknown): Promise<LabProfileDto> {
  await ctx.db.transaction((manager) => saveProfile(manager, labId, input, actor));
  return readProfile(ctx.db.manager, labId);
}

async function recordCertificate(manager: EntityManager, labId: string, rawInput: unknown, actor: Actor): Promise<CleanAirCertificateDto> {
  const input = parseInput(cleanAirCertificateInput, rawInput);
  const org = await manager.findOneBy(Organization, { id: labId, kind: 'lab' });
  if (!org) throw AppError.notFound('That lab');
  const today = todayIn(org.timeZone);
  let classification;
  try {
    classification = classifyCertificate({ testedOn: input.testedOn, areaM2: input.areaM2, samples: input.samples });
  } catch (error) {
    const message = (error as Error).message;
    throw AppError.validation([{ path: /testedOn/.test(message) ? 'testedOn' : 'samples', message }]);
  }
  if (input.testedOn > today) throw AppError.validation([{ path: 'testedOn', message: `The test date is after today (${today})` }]);
  const isoClass = classification.isoClass;
  const validUntil = isoClass === null ? null : retestDueDate(input.testedOn, isoClass as IsoClass);
  const saved = await manager.save(
    manager.create(CleanAirCertificate, {
      organizationId: labId,
      testedOn: input.testedOn,
      areaName: input.areaName,
      areaM2: input.areaM2,
      samples: input.samples,
      isoClass,
      validUntil,
      // Data errors, or, when the counts meet no class at all, why not.
      problems: (classification.problems.length > 0 || isoClass !== null
        ? classification.problems
        : classification.cleanerClassFailures.map((f) => f.message)
      ).slice(0, 20),
      recordedById: actor.userId,
    }),
  );
  await recordAudit(manager, {
    action: 'lab_profile.certificate_recorded',
    actorUserId: actor.userId,
    organizationId: labId,
    targetType: 'clean_air_certificate',
    targetId: saved.id,
    details: { testedOn: input.testedOn, isoClass, validUntil },
  });
  return toCertificateDto(saved, org.timeZone);
}

export async function addOwnCertificate(ctx: ServiceContext, actor: Actor, input: unknown): Promise<CleanAirCertificateDto> {
  const labId = ownLabId(actor);
  return ctx.db.transaction((manager) => recordCertificate(manager, labId, input, actor));
}

export async function addLabCertificate(ctx: ServiceContext, actor: Actor, labId: string, input: unknown): Promise<CleanAirCertificateDto> {
  return ctx.db.transaction((manager) => recordCertificate(manager, labId, input, actor));
}
