import geographiclib from 'geographiclib-geodesic';
import { DateTime } from 'luxon';
import {
  classifyCertificate,
  evaluateClass,
  MECHANICAL_WORK_MAX_ISO_CLASS,
  retestDueDate,
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
// What does not depend on the case (profile checks, skill and media bitmasks, certificate verdicts) is worked
// out once per lab set by prepareRoutingLabs, so routing a case against thousands of labs stays a few
// milliseconds; the server keeps that index and passes fresh open-case counts per request.

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
  /**
   * Current open cases by lab id, overriding each lab's `openCases` (a lab absent from the map has 0), so a
   * cached prepared index can be routed with fresh counts.
   */
  openCases?: ReadonlyMap<string, number>;
  /**
   * Keep only the best `limit` candidates (a whole number ≥ 1): `ranked` is then exactly the first `limit`
   * entries of the full ranking, ranks and tie sentences included; `excluded` and `candidateCount` are unchanged.
   * Candidates that cannot reach the top `limit` get no exact distance or explanation, which is what makes it cheaper.
   */
  limit?: number;
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
  /** How many labs qualified, whether or not `limit` cut `ranked` short. */
  candidateCount: number;
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
  if (options.limit !== undefined && !(Number.isInteger(options.limit) && options.limit >= 1)) {
    throw new RangeError(`options.limit must be a whole number ≥ 1, got ${options.limit}`);
  }
}

// Distances stay geographiclib's (Karney), as in geo.ts; asking for the distance alone skips the azimuths.
const wgs84 = geographiclib.Geodesic.WGS84;
const DISTANCE_ONLY = geographiclib.Geodesic.DISTANCE;

// With a limit, most candidates are placed by a great-circle distance on a sphere with bounds that contain the
// WGS-84 geodesic distance, and only those that might reach the top get geographiclib's exact one.
// Sphere: the IUGG mean Earth radius R1 = 6 371 008.8 m (Moritz 1980, "Geodetic Reference System 1980").
// Bounds: take a path on the sphere to the path with the same latitudes and longitudes on the ellipsoid. Its
// length element changes by a factor between the smallest and largest radius of curvature over R1, i.e.
// a(1 − e²)/R1 = 0.994417 (meridian at the equator) and a/√(1 − e²)/R1 = 1.004487 (at the poles), with WGS-84
// a = 6 378 137 m, f = 1/298.257223563. Both distances are shortest paths, so
// 0.994417 × sphere ≤ geodesic ≤ 1.004487 × sphere for any two points, antipodal ones included. The factors
// used leave slack on both sides, plus a metre for rounding; geographiclib checks them in routing.test.ts.
const MEAN_EARTH_RADIUS_KM = 6371.0088;
const GEODESIC_OVER_SPHERE_LOW = 0.994;
const GEODESIC_OVER_SPHERE_HIGH = 1.005;
const BOUND_SLACK_KM = 0.001;
const DEGREES = Math.PI / 180;

/** Central angle (haversine, atan2 form: well conditioned from coincident to antipodal points) times R1, in km. */
function sphereKm(lat1Rad: number, cosLat1: number, lon1: number, lat2: number, lon2: number): number {
  const lat2Rad = lat2 * DEGREES;
  const sinHalfLat = Math.sin((lat2Rad - lat1Rad) / 2);
  const sinHalfLon = Math.sin(((lon2 - lon1) * DEGREES) / 2);
  const h = Math.min(1, sinHalfLat * sinHalfLat + cosLat1 * Math.cos(lat2Rad) * sinHalfLon * sinHalfLon);
  return 2 * MEAN_EARTH_RADIUS_KM * Math.atan2(Math.sqrt(h), Math.sqrt(1 - h));
}

const lowerKm = (sphere: number) => Math.max(0, sphere * GEODESIC_OVER_SPHERE_LOW - BOUND_SLACK_KM);
const upperKm = (sphere: number) => sphere * GEODESIC_OVER_SPHERE_HIGH + BOUND_SLACK_KM;

/**
 * Bounds in km that contain the WGS-84 geodesic distance between two points, from the spherical distance
 * routing uses to skip exact distances. Exported for its test.
 */
export function geodesicDistanceBoundsKm(from: LatLon, to: LatLon): { lowKm: number; highKm: number } {
  const lat1 = from.lat * DEGREES;
  const sphere = sphereKm(lat1, Math.cos(lat1), from.lon, to.lat, to.lon);
  return { lowKm: lowerKm(sphere), highKm: upperKm(sphere) };
}

/** Transit days by zone (index 1–8), per mode, for the bounds loop. */
const transitByZone = (mode: ShippingMode) => Float64Array.from({ length: 9 }, (_, z) => (z === 0 ? 0 : transitDaysForZone(z as Zone, mode)));
const GROUND_TRANSIT = transitByZone('ground');
const AIR_TRANSIT = transitByZone('air');

const SKILL_COUNT = labSkills.length;
const mediaBit = new Map<unknown, number>(mediaTypes.map((m, i) => [m, 1 << i]));
const CLEAN_AIR_NEEDED = `ISO class ${MECHANICAL_WORK_MAX_ISO_CLASS} or cleaner`;

// Reasons that read the same for every lab and case. Frozen: results share them, so a caller that edited
// one would otherwise change the next result too.
const reason = (code: ExclusionCode, message: string): ExclusionReason => Object.freeze({ code, message });
const INACTIVE = reason('inactive', 'Lab is not active on the network.');
const PREVIOUSLY_OFFERED = reason('previously_offered', 'Lab was already offered this case.');
const NO_HEALTH_AGREEMENT = reason('health_data_agreement', 'Case holds health records and the lab has not signed the health-data agreement.');
const NO_THROUGHPUT = reason('no_throughput', 'Lab reports no weekly throughput, so its queue time cannot be estimated.');
const NO_CERTIFICATE = reason('clean_air_missing', `No clean-air certificate on file; head swaps and platter work need ${CLEAN_AIR_NEEDED}.`);
const MEDIA_REASONS = mediaTypes.map((m) => reason('media_type', `Lab does not take ${mediaTypeLabels[m]} media.`));

// One bit per exclusion; a lab's bits select (and key the sharing of) its list of reasons, in this order.
const R_INACTIVE = 1;
const R_OFFERED = 2;
const R_MEDIA = 4;
const R_MISSING = 8;
const R_HEALTH = 16;
const R_QUEUE = 32;
const R_THROUGHPUT = 64;
const R_NO_CERTIFICATE = 128;
const R_CERTIFICATE = 256; // unusable or not clean enough: the reason belongs to the certificate
const R_EXPIRED = 512;
/** Reasons whose message is the lab's own; a list holding one is made for that lab. */
const R_OWN = R_QUEUE | R_CERTIFICATE | R_EXPIRED;
const MISSING_SHIFT = 1024; // the missing-skill mask sits above the reason bits in a sharing key
const R_INVALID = -1; // a malformed profile: the one reason, whatever else

const CERT_MISSING = 0;
const CERT_REJECTED = 1;
const CERT_OK = 2;

/** A certificate classified once. One shape for both kinds; isoClass, testedOn and currentUntil mean something when ok. */
interface CertificateVerdict {
  kind: typeof CERT_REJECTED | typeof CERT_OK;
  /** Why it cannot be used (rejected), or the "due for re-test" reason for when it has run out (ok). */
  reason: ExclusionReason;
  isoClass: IsoClass;
  testedOn: string;
  currentUntil: string;
}

// Classifying a certificate is the costly part of preparing; labs re-prepared from the same objects
// (callers passing plain arrays) reuse it. Certificates are treated as immutable.
const verdictCache = new WeakMap<object, CertificateVerdict>();

function certificateVerdict(certificate: ParticleCountCertificate): CertificateVerdict {
  let verdict = verdictCache.get(certificate);
  if (!verdict) verdictCache.set(certificate, (verdict = judgeCertificate(certificate)));
  return verdict;
}

function rejected(message: string, code: ExclusionCode): CertificateVerdict {
  return { kind: CERT_REJECTED, reason: reason(code, message), isoClass: MECHANICAL_WORK_MAX_ISO_CLASS, testedOn: '', currentUntil: '' };
}

function judgeCertificate(certificate: ParticleCountCertificate): CertificateVerdict {
  let classification;
  try {
    classification = classifyCertificate(certificate);
  } catch (error) {
    return rejected(`The clean-air certificate cannot be read: ${(error as Error).message}.`, 'clean_air_unusable');
  }
  if (classification.problems.length > 0) {
    return rejected(`The clean-air certificate of ${certificate.testedOn} is unusable: ${classification.problems.join(' ')}`, 'clean_air_unusable');
  }
  const { isoClass } = classification;
  if (isoClass === null || isoClass > MECHANICAL_WORK_MAX_ISO_CLASS) {
    const measured = isoClass === null ? 'demonstrates no ISO class' : `measures ISO class ${isoClass}`;
    const failures = evaluateClass(certificate, MECHANICAL_WORK_MAX_ISO_CLASS).failures.map((f) => f.message).join(' ');
    return rejected(
      `The clean-air certificate of ${certificate.testedOn} ${measured}; head swaps and platter work need ${CLEAN_AIR_NEEDED}. ${failures}`.trim(),
      'clean_air_class',
    );
  }
  const currentUntil = retestDueDate(certificate.testedOn, isoClass);
  return {
    kind: CERT_OK,
    reason: reason(
      'clean_air_expired',
      `The clean-air certificate of ${certificate.testedOn} (ISO class ${isoClass}) was due for re-test by ${currentUntil} (ISO 14644-2 interval).`,
    ),
    isoClass,
    testedOn: certificate.testedOn,
    currentUntil,
  };
}

/** The wording of a malformed profile's problems, kept for the labs that have any. */
interface ProfileProblemText {
  location?: string;
  openCases?: string;
  queueCapacity?: string;
  weeklyThroughput?: string;
  /** By skill index. */
  turnaround: (string | undefined)[];
}

/** The calendar date in zone `z` at instant `t` (null for a zone that is not an IANA zone), remembered until the zone's next midnight. */
function localDateIn(index: PreparedRoutingLabs, z: number, t: number): string | null {
  const known = index.localDays[z];
  if (known && t >= known.from && t < known.until) return known.date;
  const local = DateTime.fromMillis(t, { zone: index.timeZones[z] });
  const day = local.isValid
    ? { from: local.startOf('day').toMillis(), until: local.endOf('day').toMillis() + 1, date: local.toISODate() as string }
    : { from: -Infinity, until: Infinity, date: null };
  index.localDays[z] = day;
  return day.date;
}

/**
 * Labs packed for routing: everything about a lab that does not depend on the case, worked out once, in
 * typed arrays indexed by the lab's position in the input. Build with prepareRoutingLabs; rebuild when a
 * lab's profile changes (open-case counts can instead come fresh with each call, see RoutingOptions).
 */
class PreparedRoutingLabs {
  /** Number of labs. */
  readonly size: number;
  readonly ids: string[];
  readonly names: string[];
  readonly lat: Float64Array;
  readonly lon: Float64Array;
  /** Index into timeZones; labs share few zones, so "today" is read once per zone and case. */
  readonly zoneOf: Uint32Array;
  readonly timeZones: string[] = [];
  /**
   * Per zone, the local date last read and the instants [from, until) for which it holds: a zone's
   * date changes only at its midnight, and reading it through Intl is the dearest step of a ranking.
   */
  readonly localDays: ({ from: number; until: number; date: string | null } | undefined)[] = [];
  readonly active: Uint8Array;
  readonly healthDataAgreement: Uint8Array;
  readonly mediaMask: Uint32Array;
  /** Bit s set when the lab offers labSkills[s]. */
  readonly skillMask: Uint32Array;
  /** Skills whose turnaround is present but not a positive number: a profile problem when the case needs one. */
  readonly badTurnaroundMask: Uint32Array;
  /** Turnaround days, lab-major: [lab × SKILL_COUNT + skill]. */
  readonly turnaroundDays: Float64Array;
  readonly openCases: Float64Array;
  readonly openCasesInvalid: Uint8Array;
  readonly queueCapacity: Float64Array;
  readonly weeklyThroughput: Float64Array;
  /** Location, queue capacity or weekly throughput is malformed. */
  readonly profileInvalid: Uint8Array;
  readonly problemText: (ProfileProblemText | undefined)[];
  readonly certificateKind: Uint8Array;
  readonly certificate: (CertificateVerdict | null)[];

  constructor(labs: readonly RoutingLab[]) {
    const n = labs.length;
    this.size = n;
    this.ids = new Array<string>(n);
    this.names = new Array<string>(n);
    this.lat = new Float64Array(n);
    this.lon = new Float64Array(n);
    this.zoneOf = new Uint32Array(n);
    this.active = new Uint8Array(n);
    this.healthDataAgreement = new Uint8Array(n);
    this.mediaMask = new Uint32Array(n);
    this.skillMask = new Uint32Array(n);
    this.badTurnaroundMask = new Uint32Array(n);
    this.turnaroundDays = new Float64Array(n * SKILL_COUNT);
    this.openCases = new Float64Array(n);
    this.openCasesInvalid = new Uint8Array(n);
    this.queueCapacity = new Float64Array(n);
    this.weeklyThroughput = new Float64Array(n);
    this.profileInvalid = new Uint8Array(n);
    this.problemText = new Array<ProfileProblemText | undefined>(n).fill(undefined);
    this.certificateKind = new Uint8Array(n);
    this.certificate = new Array<CertificateVerdict | null>(n).fill(null);
    const zoneIndex = new Map<string, number>();

    for (let i = 0; i < n; i++) {
      const lab = labs[i];
      // A copy, made here so the labs' ids lie together in memory: each request looks every one up in its
      // open-case map, and reading ids scattered among the lab objects cost a cache miss apiece (bench routing).
      this.ids[i] = (' ' + lab.id).slice(1);
      this.names[i] = lab.name;
      let zone = zoneIndex.get(lab.timeZone);
      if (zone === undefined) {
        zone = this.timeZones.length;
        this.timeZones.push(lab.timeZone);
        zoneIndex.set(lab.timeZone, zone);
      }
      this.zoneOf[i] = zone;

      let text: ProfileProblemText | undefined;
      const { lat, lon } = lab.location ?? ({} as LatLon);
      if (!(typeof lat === 'number' && lat >= -90 && lat <= 90 && typeof lon === 'number' && lon >= -180 && lon <= 180)) {
        text ??= { turnaround: [] };
        text.location = `location: latitude must be within ±90° and longitude within ±180°, got ${lat}, ${lon}`;
        this.profileInvalid[i] = 1;
      } else {
        this.lat[i] = lat;
        this.lon[i] = lon;
      }
      if (!Number.isInteger(lab.openCases) || lab.openCases < 0) {
        text ??= { turnaround: [] };
        text.openCases = `open cases must be a whole number ≥ 0, got ${lab.openCases}`;
        this.openCasesInvalid[i] = 1;
      }
      if (!Number.isInteger(lab.queueCapacity) || lab.queueCapacity < 0) {
        text ??= { turnaround: [] };
        text.queueCapacity = `queue capacity must be a whole number ≥ 0, got ${lab.queueCapacity}`;
        this.profileInvalid[i] = 1;
      }
      if (!Number.isFinite(lab.weeklyThroughput) || lab.weeklyThroughput < 0) {
        text ??= { turnaround: [] };
        text.weeklyThroughput = `weekly throughput must be a number ≥ 0, got ${lab.weeklyThroughput}`;
        this.profileInvalid[i] = 1;
      }
      this.openCases[i] = lab.openCases;
      this.queueCapacity[i] = lab.queueCapacity;
      this.weeklyThroughput[i] = lab.weeklyThroughput;

      let skills = 0;
      let bad = 0;
      const base = i * SKILL_COUNT;
      for (let s = 0; s < SKILL_COUNT; s++) {
        const days = lab.turnaroundDays[labSkills[s]];
        if (days === undefined) continue;
        skills |= 1 << s;
        this.turnaroundDays[base + s] = days;
        if (!(Number.isFinite(days) && days > 0)) {
          bad |= 1 << s;
          text ??= { turnaround: [] };
          text.turnaround[s] = `turnaround for ${labSkills[s]} must be a positive number of days, got ${days}`;
        }
      }
      this.skillMask[i] = skills;
      this.badTurnaroundMask[i] = bad;
      this.problemText[i] = text;

      let media = 0;
      for (const m of lab.mediaTypes) media |= mediaBit.get(m) ?? 0;
      this.mediaMask[i] = media;
      this.active[i] = lab.active ? 1 : 0;
      this.healthDataAgreement[i] = lab.healthDataAgreement ? 1 : 0;

      if (lab.cleanAirCertificate) {
        const verdict = certificateVerdict(lab.cleanAirCertificate);
        this.certificateKind[i] = verdict.kind;
        this.certificate[i] = verdict;
      } else {
        this.certificateKind[i] = CERT_MISSING;
      }
    }
  }
}
export type { PreparedRoutingLabs };

/** Packs labs for routing, once; route any number of cases against the result. Pure. */
export function prepareRoutingLabs(labs: readonly RoutingLab[]): PreparedRoutingLabs {
  return new PreparedRoutingLabs(labs);
}

function invalidProfileReason(
  index: PreparedRoutingLabs,
  i: number,
  today: string | null,
  counts: ReadonlyMap<string, number> | undefined,
  openCases: number,
  requiredIdx: readonly number[],
): ExclusionReason {
  const text = index.problemText[i];
  const problems: string[] = [];
  if (text?.location) problems.push(text.location);
  if (today === null) problems.push(`time zone "${index.timeZones[index.zoneOf[i]]}" is not an IANA time zone`);
  if (counts === undefined) {
    if (text?.openCases) problems.push(text.openCases);
  } else if (!Number.isInteger(openCases) || openCases < 0) {
    problems.push(`open cases must be a whole number ≥ 0, got ${openCases}`);
  }
  if (text?.queueCapacity) problems.push(text.queueCapacity);
  if (text?.weeklyThroughput) problems.push(text.weeklyThroughput);
  for (const s of requiredIdx) {
    const problem = text?.turnaround[s];
    if (problem) problems.push(problem);
  }
  return { code: 'invalid_profile', message: `Lab profile is incomplete: ${problems.join('; ')}.` };
}

/** A lab's reasons in the fixed order; `own` is the certificate's or the expiry reason, `queue` the queue's. */
function reasonList(
  codes: number,
  media: ExclusionReason,
  missing: ExclusionReason | undefined,
  queue: ExclusionReason | undefined,
  own: ExclusionReason | undefined,
): ExclusionReason[] {
  const reasons: ExclusionReason[] = [];
  if (codes & R_INACTIVE) reasons.push(INACTIVE);
  if (codes & R_OFFERED) reasons.push(PREVIOUSLY_OFFERED);
  if (codes & R_MEDIA) reasons.push(media);
  if (codes & R_MISSING) reasons.push(missing as ExclusionReason);
  if (codes & R_HEALTH) reasons.push(NO_HEALTH_AGREEMENT);
  if (codes & R_QUEUE) reasons.push(queue as ExclusionReason);
  if (codes & R_THROUGHPUT) reasons.push(NO_THROUGHPUT);
  if (codes & R_NO_CERTIFICATE) reasons.push(NO_CERTIFICATE);
  if (codes & (R_CERTIFICATE | R_EXPIRED)) reasons.push(own as ExclusionReason);
  return reasons;
}

function missingSkillsReason(missing: number): ExclusionReason {
  const labels: string[] = [];
  for (let s = 0; s < SKILL_COUNT; s++) if (missing & (1 << s)) labels.push(labSkillLabels[labSkills[s]]);
  return { code: 'missing_skills', message: `Lab lacks ${labels.join(', ')}.` };
}

/** The estimate, one decimal, as RankedLab.estimatedDays; the same expression everywhere so bounds match it. */
const estimateOf = (transitDays: number, queueRaw: number, turnaround: number) => round1(transitDays + queueRaw + turnaround);

/** The required skill with the lab's longest turnaround, the first in vocabulary order on a tie. */
function hardestSkillIndex(turnaroundDays: Float64Array, base: number, requiredIdx: readonly number[]): number {
  let hardest = requiredIdx[0];
  for (const s of requiredIdx) if (turnaroundDays[base + s] > turnaroundDays[base + hardest]) hardest = s;
  return hardest;
}

const SAME_ESTIMATE = 'Same estimate as the lab ranked above; ties go to the nearer lab.';

/** A candidate's entry with its explanation (rank 0 until sorted). */
function rankedLab(
  index: PreparedRoutingLabs,
  i: number,
  distanceKm: number,
  openCount: number,
  requiredIdx: readonly number[],
  mode: ShippingMode,
  transitWords: string,
  needsCleanAir: boolean,
  needsHealth: boolean,
): RankedLab {
  const { turnaroundDays, weeklyThroughput, certificate } = index;
  const distanceMiles = kmToMiles(distanceKm);
  const zone = distanceZone(distanceMiles);
  const transitDays = transitDaysForZone(zone, mode);
  const queueRaw = (openCount / weeklyThroughput[i]) * BUSINESS_DAYS_PER_WEEK;
  // The slowest required step bounds the case.
  const base = i * SKILL_COUNT;
  const hardest = hardestSkillIndex(turnaroundDays, base, requiredIdx);
  const turnaround = turnaroundDays[base + hardest];
  const hardestSkill = labSkills[hardest];
  const estimatedDays = estimateOf(transitDays, queueRaw, turnaround);
  const queueDays = round1(queueRaw);
  const reasons = [
    `About ${estimatedDays} business days until the customer has data.`,
    `${Math.round(distanceMiles)} mi from the shop (zone ${zone}): ${plural(transitDays, 'business day')} ${transitWords}`,
    `Queue: ${plural(openCount, 'open case')} at ${weeklyThroughput[i]} a week: ${queueDays} business days.`,
    requiredIdx.length > 1
      ? `Turnaround for ${labSkillLabels[hardestSkill]}, the slowest required skill here: ${plural(turnaround, 'business day')}.`
      : `Turnaround for ${labSkillLabels[hardestSkill]}: ${plural(turnaround, 'business day')}.`,
  ];
  const v = needsCleanAir ? certificate[i] : null;
  if (v) reasons.push(`Clean air ISO class ${v.isoClass}, tested ${v.testedOn}, current until ${v.currentUntil}.`);
  if (needsHealth) reasons.push('Has signed the health-data agreement.');
  // Written out twice rather than spread: object spread costs more than the rest of this function.
  return v
    ? {
        rank: 0,
        labId: index.ids[i],
        labName: index.names[i],
        estimatedDays,
        distanceKm,
        distanceMiles,
        zone,
        shippingMode: mode,
        transitDays,
        queueDays,
        hardestSkill,
        turnaroundDays: turnaround,
        cleanAir: { isoClass: v.isoClass, testedOn: v.testedOn, currentUntil: v.currentUntil },
        reasons,
      }
    : {
        rank: 0,
        labId: index.ids[i],
        labName: index.names[i],
        estimatedDays,
        distanceKm,
        distanceMiles,
        zone,
        shippingMode: mode,
        transitDays,
        queueDays,
        hardestSkill,
        turnaroundDays: turnaround,
        reasons,
      };
}

const exactKm = (shopLat: number, shopLon: number, lat: number, lon: number) =>
  (wgs84.Inverse(shopLat, shopLon, lat, lon, DISTANCE_ONLY).s12 ?? 0) / 1000;

/**
 * The best `limit` of the candidates (fewer than there are), in rank order, ranks and tie sentences set: exactly
 * the first `limit` of the full ranking. Each candidate's sort key (the estimate in tenths) is bounded from the
 * spherical distance bounds: zones step up with distance, so the zones of the two bounds bracket its zone, and
 * the key does not fall as transit days rise (IEEE sums and Math.round are monotone). The limit-th smallest upper
 * bound T is at least the limit-th smallest true key, so a candidate whose lower bound exceeds T sorts after at
 * least `limit` others; everyone else gets the exact distance and key and is sorted as the full ranking sorts.
 */
function bestCandidates(
  index: PreparedRoutingLabs,
  candidateLabs: readonly number[],
  limit: number,
  shopLat: number,
  shopLon: number,
  open: Float64Array,
  requiredIdx: readonly number[],
  mode: ShippingMode,
  transitWords: string,
  needsCleanAir: boolean,
  needsHealth: boolean,
): RankedLab[] {
  const { lat, lon, turnaroundDays, weeklyThroughput, ids, names } = index;
  const m = candidateLabs.length;
  const transit = mode === 'air' ? AIR_TRANSIT : GROUND_TRANSIT;
  const lat1 = shopLat * DEGREES;
  const cosLat1 = Math.cos(lat1);
  const keyLow = new Float64Array(m);
  const keyHigh = new Float64Array(m);
  for (let k = 0; k < m; k++) {
    const i = candidateLabs[k];
    const sphere = sphereKm(lat1, cosLat1, shopLon, lat[i], lon[i]);
    const zoneLow = distanceZone(kmToMiles(lowerKm(sphere)));
    const zoneHigh = distanceZone(kmToMiles(upperKm(sphere)));
    // Smallest and largest transit over the zones between, so the bound needs no assumption about the table.
    let fewest = transit[zoneLow];
    let most = fewest;
    for (let z = zoneLow + 1; z <= zoneHigh; z++) {
      if (transit[z] < fewest) fewest = transit[z];
      if (transit[z] > most) most = transit[z];
    }
    const queueRaw = (open[i] / weeklyThroughput[i]) * BUSINESS_DAYS_PER_WEEK;
    const base = i * SKILL_COUNT;
    const turnaround = turnaroundDays[base + hardestSkillIndex(turnaroundDays, base, requiredIdx)];
    keyLow[k] = Math.round(estimateOf(fewest, queueRaw, turnaround) * 10);
    keyHigh[k] = Math.round(estimateOf(most, queueRaw, turnaround) * 10);
  }
  const threshold = keyHigh.slice().sort()[limit - 1];

  // Positions (into candidateLabs, so input order) of the candidates that may rank in the top `limit`.
  const maybe: number[] = [];
  const distance = new Float64Array(m);
  const key = new Float64Array(m);
  for (let k = 0; k < m; k++) {
    if (keyLow[k] > threshold) continue;
    const i = candidateLabs[k];
    const km = exactKm(shopLat, shopLon, lat[i], lon[i]);
    const queueRaw = (open[i] / weeklyThroughput[i]) * BUSINESS_DAYS_PER_WEEK;
    const base = i * SKILL_COUNT;
    const turnaround = turnaroundDays[base + hardestSkillIndex(turnaroundDays, base, requiredIdx)];
    distance[k] = km;
    key[k] = Math.round(estimateOf(transitDaysForZone(distanceZone(kmToMiles(km)), mode), queueRaw, turnaround) * 10);
    maybe.push(k);
  }
  // compareRanked on these figures; the sort is stable and `maybe` is in input order, as the full ranking's is.
  maybe.sort(
    (a, b) =>
      key[a] - key[b] ||
      distance[a] - distance[b] ||
      names[candidateLabs[a]].localeCompare(names[candidateLabs[b]]) ||
      ids[candidateLabs[a]].localeCompare(ids[candidateLabs[b]]),
  );

  const ranked = new Array<RankedLab>(limit);
  for (let r = 0; r < limit; r++) {
    const k = maybe[r];
    const i = candidateLabs[k];
    const entry = rankedLab(index, i, distance[k], open[i], requiredIdx, mode, transitWords, needsCleanAir, needsHealth);
    entry.rank = r + 1;
    if (r > 0 && key[maybe[r - 1]] === key[k]) entry.reasons.push(SAME_ESTIMATE);
    ranked[r] = entry;
  }
  return ranked;
}

// Ranked labs are sorted before their rank is known; the estimate's tenths order them, then distance.
function compareRanked(a: RankedLab, b: RankedLab): number {
  return (
    Math.round(a.estimatedDays * 10) - Math.round(b.estimatedDays * 10) ||
    a.distanceKm - b.distanceKm ||
    a.labName.localeCompare(b.labName) ||
    a.labId.localeCompare(b.labId)
  );
}

/**
 * Ranks the labs that may take a case and explains every exclusion. Pure: the same input gives the same
 * order. Bad case input throws RangeError; a lab with a malformed profile is excluded, not fatal.
 * Takes the labs as they are (prepared on the way) or prepared once with prepareRoutingLabs. Excluded labs
 * with the same reasons share one reasons array, and reason objects are shared: read them, do not edit them.
 */
export function routeCase(kase: RoutingCase, labs: readonly RoutingLab[] | PreparedRoutingLabs, options: RoutingOptions): RoutingResult {
  validateCase(kase, options);
  const index = labs instanceof PreparedRoutingLabs ? labs : prepareRoutingLabs(labs);
  const requiredIdx: number[] = [];
  let required = 0;
  let mechanical = 0;
  for (let s = 0; s < SKILL_COUNT; s++) {
    if (!kase.requirements.requiredSkills.includes(labSkills[s])) continue;
    requiredIdx.push(s);
    required |= 1 << s;
    if (cleanAirSkills.includes(labSkills[s])) mechanical |= 1 << s;
  }
  const offered = options.previouslyOfferedLabIds?.length ? new Set(options.previouslyOfferedLabIds) : null;
  const batteryHazard = kase.requirements.batteryHazard === true;
  const mode: ShippingMode = batteryHazard ? 'ground' : (options.shippingMode ?? 'ground');
  const transitWords = `${mode} transit${batteryHazard && options.shippingMode === 'air' ? ' (ground only: battery hazard)' : ''}.`;
  const needsCleanAir = kase.requirements.needsCleanAir || mechanical !== 0;
  const needsHealth = kase.requirements.needsHealthDataAgreement;
  const mediaBitOfCase = mediaBit.get(kase.mediaType) as number;
  const mediaReason = MEDIA_REASONS[mediaTypes.indexOf(kase.mediaType)];
  const counts = options.openCases;
  const shopLat = kase.shopLocation.lat;
  const shopLon = kase.shopLocation.lon;

  const asOf = options.asOf.getTime();
  const todayByZone: (string | null)[] = index.timeZones.map((_zone, z) => localDateIn(index, z, asOf));

  const { ids, names, zoneOf, active, healthDataAgreement, mediaMask, skillMask, badTurnaroundMask } = index;
  const { openCases, openCasesInvalid, queueCapacity, weeklyThroughput, profileInvalid, certificateKind, certificate } = index;
  const n = index.size;
  // Three passes, so that the geodesic calls (which make much short-lived garbage) run before the
  // exclusion list exists: a collection during them has less live data to move.
  // 1. Each lab's reason bits (0: a candidate).
  const verdicts = new Int32Array(n);
  const open = counts === undefined ? openCases : new Float64Array(n);
  const invalidReasons: ExclusionReason[] = [];
  const candidateLabs: number[] = [];
  for (let i = 0; i < n; i++) {
    const today = todayByZone[zoneOf[i]];
    let given = 0;
    let openInvalid: boolean;
    if (counts === undefined) openInvalid = openCasesInvalid[i] === 1;
    else {
      given = counts.get(ids[i]) ?? 0;
      openInvalid = !(Number.isInteger(given) && given >= 0);
      open[i] = given;
    }
    if (profileInvalid[i] === 1 || today === null || openInvalid || (badTurnaroundMask[i] & required) !== 0) {
      invalidReasons.push(invalidProfileReason(index, i, today, counts, given, requiredIdx));
      verdicts[i] = R_INVALID;
      continue;
    }

    const skills = skillMask[i];
    let codes = 0;
    if (active[i] === 0) codes |= R_INACTIVE;
    if (offered !== null && offered.has(ids[i])) codes |= R_OFFERED;
    if ((mediaMask[i] & mediaBitOfCase) === 0) codes |= R_MEDIA;
    if ((required & ~skills) !== 0) codes |= R_MISSING;
    if (needsHealth && healthDataAgreement[i] === 0) codes |= R_HEALTH;
    if (open[i] >= queueCapacity[i]) codes |= R_QUEUE;
    if (weeklyThroughput[i] === 0) codes |= R_THROUGHPUT;
    // Only check clean air when the lab offers the mechanical work at all; otherwise the missing skill says it.
    if (needsCleanAir && (skills & mechanical) === mechanical) {
      const kind = certificateKind[i];
      if (kind === CERT_MISSING) codes |= R_NO_CERTIFICATE;
      else if (kind === CERT_REJECTED) codes |= R_CERTIFICATE;
      else {
        const verdict = certificate[i] as CertificateVerdict;
        // ISO calendar dates compare as strings.
        if (!(verdict.testedOn <= today && today <= verdict.currentUntil)) codes |= R_EXPIRED;
      }
    }
    verdicts[i] = codes;
    if (codes === 0) candidateLabs.push(i);
  }

  // 2. The candidates, with their estimates and explanations (written for candidates only: most labs are
  // excluded; with a limit, only for the best). Without a limit the rank is set once they are sorted.
  const candidateCount = candidateLabs.length;
  const limited = options.limit !== undefined && options.limit < candidateCount;
  let ranked: RankedLab[];
  if (limited) {
    ranked = bestCandidates(index, candidateLabs, options.limit as number, shopLat, shopLon, open, requiredIdx, mode, transitWords, needsCleanAir, needsHealth);
  } else {
    ranked = new Array<RankedLab>(candidateCount);
    for (let k = 0; k < candidateCount; k++) {
      const i = candidateLabs[k];
      ranked[k] = rankedLab(index, i, exactKm(shopLat, shopLon, index.lat[i], index.lon[i]), open[i], requiredIdx, mode, transitWords, needsCleanAir, needsHealth);
    }
  }

  // 3. The exclusions, in input order. Labs with the same reasons share one list unless a message is the lab's own.
  const excluded: ExcludedLab[] = new Array<ExcludedLab>(n - candidateCount);
  let e = 0;
  const sharedLists = new Map<number, ExclusionReason[]>();
  const missingReasons = new Map<number, ExclusionReason>();
  let nextInvalid = 0;
  for (let i = 0; i < n; i++) {
    const codes = verdicts[i];
    if (codes === 0) continue;
    if (codes === R_INVALID) {
      excluded[e++] = { labId: ids[i], labName: names[i], reasons: [invalidReasons[nextInvalid++]] };
      continue;
    }
    const missing = required & ~skillMask[i];
    let missingReason: ExclusionReason | undefined;
    if (missing !== 0) {
      missingReason = missingReasons.get(missing);
      if (!missingReason) missingReasons.set(missing, (missingReason = missingSkillsReason(missing)));
    }
    let reasons: ExclusionReason[] | undefined;
    if ((codes & R_OWN) === 0) {
      const key = codes + missing * MISSING_SHIFT;
      reasons = sharedLists.get(key);
      if (!reasons) sharedLists.set(key, (reasons = reasonList(codes, mediaReason, missingReason, undefined, undefined)));
    } else {
      const queue = codes & R_QUEUE ? ({ code: 'queue_full', message: `Queue is full (${open[i]} open of ${queueCapacity[i]}).` } as const) : undefined;
      let own: ExclusionReason | undefined;
      if (codes & R_CERTIFICATE) own = (certificate[i] as CertificateVerdict).reason;
      else if (codes & R_EXPIRED) {
        const verdict = certificate[i] as CertificateVerdict;
        const today = todayByZone[zoneOf[i]] as string;
        own =
          verdict.testedOn > today
            ? { code: 'clean_air_expired', message: `The clean-air certificate is dated ${verdict.testedOn}, after today (${today}).` }
            : verdict.reason;
      }
      reasons = reasonList(codes, mediaReason, missingReason, queue, own);
    }
    excluded[e++] = { labId: ids[i], labName: names[i], reasons };
  }

  if (!limited) {
    // Stable, and the labs are in input order, so equal labs keep that order.
    ranked.sort(compareRanked);
    for (let k = 0; k < ranked.length; k++) {
      ranked[k].rank = k + 1;
      if (k > 0 && Math.round(ranked[k - 1].estimatedDays * 10) === Math.round(ranked[k].estimatedDays * 10)) {
        ranked[k].reasons.push(SAME_ESTIMATE);
      }
    }
  }
  return { ranked, excluded, candidateCount };
}
