import { DateTime } from 'luxon';
import {
  classifyCertificate,
  evaluateClass,
  MECHANICAL_WORK_MAX_ISO_CLASS,
  retestDueDate,
  isCertificateCurrent,
  type IsoClass,
  type ParticleCountCertificate,
} from './clean-air';
import { geodesicDistanceKm, kmToMiles, type LatLon } from './geo';
import type { TriageResult } from './triage';
import { distanceZone, transitDaysForZone, type ShippingMode, type Zone } from './zones';
import { cleanAirSkills, labSkillLabels, labSkills, mediaTypeLabels, mediaTypes, type LabSkill, type MediaType } from '../vocabulary';

// Routing: which labs may take a case, and in which order to offer it. Candidates are active labs with every
// required skill, that take the media type, meet the sensitivity rules and have room in their queue; head
// swaps and platter work also need a current clean-air certificate of ISO class 5 or cleaner. Candidates are
// ranked by estimated business days until the customer has data:
//   transit (geodesic distance → distance zone → days) + queue (open cases ÷ weekly throughput × 5)
//   + the lab's typical turnaround for the hardest required skill; ties by distance.
// All three terms are business days, so a queue of one week's throughput counts as 5 days.

export const BUSINESS_DAYS_PER_WEEK = 5;

export interface RoutingLab {
  id: string;
  name: string;
  active: boolean;
  location: LatLon;
  /** IANA time zone, used to read "today" for the certificate check. */
  timeZone: string;
  mediaTypes: readonly MediaType[];
  /** Typical turnaround in business days for each skill the lab offers; a skill absent here is a skill it lacks. */
  turnaroundDays: Partial<Record<LabSkill, number>>;
  healthDataAgreement: boolean;
  /** The latest particle-count certificate of the clean-air work area, if any. */
  cleanAirCertificate: ParticleCountCertificate | null;
  openCases: number;
  /** Most open cases the lab will hold at once. */
  queueCapacity: number;
  /** Cases the lab completes in a typical week. */
  weeklyThroughput: number;
}

export type RoutingRequirements = Pick<TriageResult, 'requiredSkills' | 'needsCleanAir' | 'needsHealthDataAgreement'> &
  Partial<Pick<TriageResult, 'batteryHazard'>>;

export interface RoutingCase {
  mediaType: MediaType;
  shopLocation: LatLon;
  requirements: RoutingRequirements;
}

export interface RoutingOptions {
  /** The moment routing runs; "today" is read in each lab's time zone. */
  asOf: Date;
  /** Inbound service; a declared battery hazard forces ground. Defaults to ground. */
  shippingMode?: ShippingMode;
  /** Labs already offered this case (declined or expired); they are excluded with that reason. */
  previouslyOfferedLabIds?: readonly string[];
}

export const exclusionCodes = [
  'invalid_profile',
  'inactive',
  'previously_offered',
  'media_type',
  'missing_skills',
  'health_data_agreement',
  'queue_full',
  'no_throughput',
  'clean_air_missing',
  'clean_air_unusable',
  'clean_air_class',
  'clean_air_expired',
] as const;
export type ExclusionCode = (typeof exclusionCodes)[number];

export interface ExclusionReason {
  code: ExclusionCode;
  message: string;
}

export interface ExcludedLab {
  labId: string;
  labName: string;
  reasons: ExclusionReason[];
}

export interface RankedLab {
  rank: number;
  labId: string;
  labName: string;
  /** Estimated business days until the customer has data, one decimal. */
  estimatedDays: number;
  distanceKm: number;
  distanceMiles: number;
  zone: Zone;
  shippingMode: ShippingMode;
  transitDays: number;
  /** One decimal. */
  queueDays: number;
  hardestSkill: LabSkill;
  turnaroundDays: number;
  /** Present when the case needs clean air. */
  cleanAir?: { isoClass: IsoClass; testedOn: string; currentUntil: string };
  reasons: string[];
}

export interface RoutingResult {
  ranked: RankedLab[];
  excluded: ExcludedLab[];
}

const round1 = (value: number) => Math.round(value * 10) / 10;
const plural = (n: number, word: string) => `${n} ${word}${n === 1 ? '' : 's'}`;

function validateCase(kase: RoutingCase, options: RoutingOptions): void {
  if (!mediaTypes.includes(kase.mediaType)) {
    throw new RangeError(`mediaType must be one of ${mediaTypes.join(', ')}, got "${kase.mediaType}"`);
  }
  // geodesicDistanceKm checks coordinates; check the shop's once here so the error names it.
  geodesicDistanceKm(kase.shopLocation, kase.shopLocation);
  const skills = kase.requirements.requiredSkills;
  if (!Array.isArray(skills) || skills.length === 0) {
    throw new RangeError('requirements.requiredSkills must list at least one skill (run triage first)');
  }
  for (const s of skills) {
    if (!labSkills.includes(s)) throw new RangeError(`unknown lab skill "${s}" in requirements.requiredSkills`);
  }
  if (!(options.asOf instanceof Date) || Number.isNaN(options.asOf.getTime())) {
    throw new RangeError('options.asOf must be a valid Date');
  }
}

// A certificate's class never changes, and labs share a handful of time zones: both are worked out
// once, which keeps ranking thousands of labs within a few milliseconds.
const classificationCache = new WeakMap<object, ReturnType<typeof classifyCertificate> | Error>();
function classifyOnce(certificate: NonNullable<RoutingLab['cleanAirCertificate']>) {
  let cached = classificationCache.get(certificate);
  if (!cached) {
    try {
      cached = classifyCertificate(certificate);
    } catch (error) {
      cached = error as Error;
    }
    classificationCache.set(certificate, cached);
  }
  if (cached instanceof Error) throw cached;
  return cached;
}


const failureTextCache = new WeakMap<object, string>();
const classReasonCache = new WeakMap<object, ExclusionReason>();
function classFailureText(certificate: NonNullable<RoutingLab['cleanAirCertificate']>): string {
  let text = failureTextCache.get(certificate);
  if (text === undefined) {
    text = evaluateClass(certificate, MECHANICAL_WORK_MAX_ISO_CLASS).failures.map((f) => f.message).join(' ');
    failureTextCache.set(certificate, text);
  }
  return text;
}

class ZoneDays {
  private readonly today = new Map<string, string | null>();
  private readonly due = new Map<string, string>();
  dueDate(testedOn: string, isoClass: IsoClass): string {
    const key = `${testedOn}|${isoClass}`;
    let value = this.due.get(key);
    if (value === undefined) this.due.set(key, (value = retestDueDate(testedOn, isoClass)));
    return value;
  }
  constructor(private readonly asOf: Date) {}
  /** The calendar date in a time zone, or null when the zone is not a valid IANA zone. */
  todayIn(timeZone: string): string | null {
    let value = this.today.get(timeZone);
    if (value === undefined) {
      const local = DateTime.fromJSDate(this.asOf).setZone(timeZone);
      value = local.isValid ? (local.toISODate() as string) : null;
      this.today.set(timeZone, value);
    }
    return value;
  }
}

function profileProblems(lab: RoutingLab, zones: ZoneDays, required: readonly LabSkill[]): string[] {
  const problems: string[] = [];
  const { lat, lon } = lab.location ?? ({} as LatLon);
  if (!(typeof lat === 'number' && lat >= -90 && lat <= 90 && typeof lon === 'number' && lon >= -180 && lon <= 180)) {
    problems.push(`location: latitude must be within ±90° and longitude within ±180°, got ${lat}, ${lon}`);
  }
  if (zones.todayIn(lab.timeZone) === null) problems.push(`time zone "${lab.timeZone}" is not an IANA time zone`);
  if (!Number.isInteger(lab.openCases) || lab.openCases < 0) problems.push(`open cases must be a whole number ≥ 0, got ${lab.openCases}`);
  if (!Number.isInteger(lab.queueCapacity) || lab.queueCapacity < 0) problems.push(`queue capacity must be a whole number ≥ 0, got ${lab.queueCapacity}`);
  if (!Number.isFinite(lab.weeklyThroughput) || lab.weeklyThroughput < 0) problems.push(`weekly throughput must be a number ≥ 0, got ${lab.weeklyThroughput}`);
  // Only the skills this case needs are read, so only they are checked (the profile form checks the rest).
  for (const skill of required) {
    const days = lab.turnaroundDays[skill];
    if (days !== undefined && !(Number.isFinite(days) && days > 0)) problems.push(`turnaround for ${skill} must be a positive number of days, got ${days}`);
  }
  return problems;
}

function checkCleanAir(
  lab: RoutingLab,
  zones: ZoneDays,
): { ok: true; isoClass: IsoClass; testedOn: string; currentUntil: string } | { ok: false; reason: ExclusionReason } {
  const certificate = lab.cleanAirCertificate;
  const needed = `ISO class ${MECHANICAL_WORK_MAX_ISO_CLASS} or cleaner`;
  if (!certificate) {
    return { ok: false, reason: { code: 'clean_air_missing', message: `No clean-air certificate on file; head swaps and platter work need ${needed}.` } };
  }
  let classification;
  try {
    classification = classifyOnce(certificate);
  } catch (error) {
    return { ok: false, reason: { code: 'clean_air_unusable', message: `The clean-air certificate cannot be read: ${(error as Error).message}.` } };
  }
  if (classification.problems.length > 0) {
    return { ok: false, reason: { code: 'clean_air_unusable', message: `The clean-air certificate of ${certificate.testedOn} is unusable: ${classification.problems.join(' ')}` } };
  }
  const { isoClass } = classification;
  if (isoClass === null || isoClass > MECHANICAL_WORK_MAX_ISO_CLASS) {
    const measured = isoClass === null ? 'demonstrates no ISO class' : `measures ISO class ${isoClass}`;
    let reason = classReasonCache.get(certificate);
    if (!reason) {
      reason = { code: 'clean_air_class', message: `The clean-air certificate of ${certificate.testedOn} ${measured}; head swaps and platter work need ${needed}. ${classFailureText(certificate)}`.trim() };
      classReasonCache.set(certificate, reason);
    }
    return { ok: false, reason };
  }
  const today = zones.todayIn(lab.timeZone) as string;
  const currentUntil = zones.dueDate(certificate.testedOn, isoClass);
  // ISO calendar dates compare as strings; equivalent to isCertificateCurrent without re-parsing per lab.
  if (!(certificate.testedOn <= today && today <= currentUntil)) {
    const message =
      certificate.testedOn > today
        ? `The clean-air certificate is dated ${certificate.testedOn}, after today (${today}).`
        : `The clean-air certificate of ${certificate.testedOn} (ISO class ${isoClass}) was due for re-test by ${currentUntil} (ISO 14644-2 interval).`;
    return { ok: false, reason: { code: 'clean_air_expired', message } };
  }
  return { ok: true, isoClass, testedOn: certificate.testedOn, currentUntil };
}

/**
 * Ranks the labs that may take a case and explains every exclusion. Pure: the same input gives the same
 * order. Bad case input throws RangeError; a lab with a malformed profile is excluded, not fatal.
 */
export function routeCase(kase: RoutingCase, labs: readonly RoutingLab[], options: RoutingOptions): RoutingResult {
  validateCase(kase, options);
  const required = labSkills.filter((s) => kase.requirements.requiredSkills.includes(s));
  const previouslyOffered = new Set(options.previouslyOfferedLabIds ?? []);
  const batteryHazard = kase.requirements.batteryHazard === true;
  const mode: ShippingMode = batteryHazard ? 'ground' : (options.shippingMode ?? 'ground');
  const mechanicalSkills = required.filter((s) => cleanAirSkills.includes(s));
  const needsCleanAir = kase.requirements.needsCleanAir || mechanicalSkills.length > 0;

  const excluded: ExcludedLab[] = [];
  const candidates: Array<Omit<RankedLab, 'rank'> & { sortKey: number }> = [];

  const zones = new ZoneDays(options.asOf);
  const inactiveReason: ExclusionReason = { code: 'inactive', message: 'Lab is not active on the network.' };
  const previouslyOfferedReason: ExclusionReason = { code: 'previously_offered', message: 'Lab was already offered this case.' };
  const mediaReason: ExclusionReason = { code: 'media_type', message: `Lab does not take ${mediaTypeLabels[kase.mediaType]} media.` };
  const healthReason: ExclusionReason = { code: 'health_data_agreement', message: 'Case holds health records and the lab has not signed the health-data agreement.' };
  const throughputReason: ExclusionReason = { code: 'no_throughput', message: 'Lab reports no weekly throughput, so its queue time cannot be estimated.' };
  const missingReasons = new Map<string, ExclusionReason>();
  for (const lab of labs) {
    const problems = profileProblems(lab, zones, required);
    if (problems.length > 0) {
      excluded.push({ labId: lab.id, labName: lab.name, reasons: [{ code: 'invalid_profile', message: `Lab profile is incomplete: ${problems.join('; ')}.` }] });
      continue;
    }
    // Reasons are built from strings made once per case; most labs are excluded, so this loop stays lean.
    // (No closure per lab: the TypeScript runner wraps every function it creates, which is slow in a hot loop.)
    let reasons: ExclusionReason[] | null = null;
    if (!lab.active) (reasons ??= []).push(inactiveReason);
    if (previouslyOffered.has(lab.id)) (reasons ??= []).push(previouslyOfferedReason);
    if (!lab.mediaTypes.includes(kase.mediaType)) (reasons ??= []).push(mediaReason);
    let missingKey = '';
    for (const s of required) if (lab.turnaroundDays[s] === undefined) missingKey += missingKey ? `,${s}` : s;
    if (missingKey) {
      let reason = missingReasons.get(missingKey);
      if (!reason) {
        reason = { code: 'missing_skills', message: `Lab lacks ${missingKey.split(',').map((k) => labSkillLabels[k as LabSkill]).join(', ')}.` };
        missingReasons.set(missingKey, reason);
      }
      (reasons ??= []).push(reason);
    }
    if (kase.requirements.needsHealthDataAgreement && !lab.healthDataAgreement) (reasons ??= []).push(healthReason);
    if (lab.openCases >= lab.queueCapacity) {
      (reasons ??= []).push({ code: 'queue_full', message: `Queue is full (${lab.openCases} open of ${lab.queueCapacity}).` });
    }
    if (lab.weeklyThroughput === 0) (reasons ??= []).push(throughputReason);
    let cleanAir: RankedLab['cleanAir'];
    // Only check clean air when the lab offers the mechanical work at all; otherwise the missing skill says it.
    let offersMechanical = true;
    for (const s of mechanicalSkills) if (lab.turnaroundDays[s] === undefined) offersMechanical = false;
    if (needsCleanAir && offersMechanical) {
      const check = checkCleanAir(lab, zones);
      if (check.ok) cleanAir = { isoClass: check.isoClass, testedOn: check.testedOn, currentUntil: check.currentUntil };
      else (reasons ??= []).push(check.reason);
    }
    if (reasons) {
      excluded.push({ labId: lab.id, labName: lab.name, reasons });
      continue;
    }

    const distanceKm = geodesicDistanceKm(kase.shopLocation, lab.location);
    const distanceMiles = kmToMiles(distanceKm);
    const zone = distanceZone(distanceMiles);
    const transitDays = transitDaysForZone(zone, mode);
    const queueRaw = (lab.openCases / lab.weeklyThroughput) * BUSINESS_DAYS_PER_WEEK;
    // The slowest required step bounds the case; "hardest" is the skill with the lab's longest turnaround,
    // the first in vocabulary order on a tie.
    let hardestSkill = required[0]!;
    for (const s of required) if ((lab.turnaroundDays[s] as number) > (lab.turnaroundDays[hardestSkill] as number)) hardestSkill = s;
    const turnaroundDays = lab.turnaroundDays[hardestSkill] as number;
    const estimatedDays = round1(transitDays + queueRaw + turnaroundDays);
    const queueDays = round1(queueRaw);

    const explanation = [
      `${Math.round(distanceMiles)} mi from the shop (zone ${zone}): ${plural(transitDays, 'business day')} ${mode} transit${batteryHazard && options.shippingMode === 'air' ? ' (ground only: battery hazard)' : ''}.`,
      `Queue: ${plural(lab.openCases, 'open case')} at ${lab.weeklyThroughput} a week: ${queueDays} business days.`,
      required.length > 1
        ? `Turnaround for ${labSkillLabels[hardestSkill]}, the slowest required skill here: ${plural(turnaroundDays, 'business day')}.`
        : `Turnaround for ${labSkillLabels[hardestSkill]}: ${plural(turnaroundDays, 'business day')}.`,
    ];
    if (cleanAir) {
      explanation.push(`Clean air ISO class ${cleanAir.isoClass}, tested ${cleanAir.testedOn}, current until ${cleanAir.currentUntil}.`);
    }
    if (kase.requirements.needsHealthDataAgreement) explanation.push('Has signed the health-data agreement.');
    explanation.unshift(`About ${estimatedDays} business days until the customer has data.`);

    candidates.push({
      labId: lab.id,
      labName: lab.name,
      estimatedDays,
      distanceKm,
      distanceMiles,
      zone,
      shippingMode: mode,
      transitDays,
      queueDays,
      hardestSkill,
      turnaroundDays,
      ...(cleanAir ? { cleanAir } : {}),
      reasons: explanation,
      sortKey: Math.round(estimatedDays * 10),
    });
  }

  candidates.sort(
    (a, b) => a.sortKey - b.sortKey || a.distanceKm - b.distanceKm || a.labName.localeCompare(b.labName) || a.labId.localeCompare(b.labId),
  );
  const ranked: RankedLab[] = candidates.map(({ sortKey, ...lab }, index) => {
    const tied = index > 0 && candidates[index - 1].sortKey === sortKey;
    const reasons = tied ? [...lab.reasons, 'Same estimate as the lab ranked above; ties go to the nearer lab.'] : lab.reasons;
    return { rank: index + 1, ...lab, reasons };
  });
  return { ranked, excluded };
}
