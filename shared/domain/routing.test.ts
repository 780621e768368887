import fc from 'fast-check';
import geographiclib from 'geographiclib-geodesic';
import { DateTime } from 'luxon';
import { describe, expect, it } from 'vitest';
import { cleanAirSkills, labSkillLabels, labSkills, mediaTypeLabels, mediaTypes, type LabSkill } from '../vocabulary';
import {
  classifyCertificate,
  evaluateClass,
  MECHANICAL_WORK_MAX_ISO_CLASS,
  retestDueDate,
  type IsoClass,
  type ParticleCountCertificate,
} from './clean-air';
import { geodesicDistanceKm, kmToMiles, type LatLon } from './geo';
import {
  BUSINESS_DAYS_PER_WEEK,
  geodesicDistanceBoundsKm,
  prepareRoutingLabs,
  routeCase,
  type ExcludedLab,
  type ExclusionReason,
  type RankedLab,
  type RoutingCase,
  type RoutingLab,
  type RoutingOptions,
  type RoutingResult,
} from './routing';
import { triage } from './triage';
import { distanceZone, transitDaysForZone, zoneUpperMiles, type ShippingMode } from './zones';

// Places are real city centres; labs and their figures are invented test data.
// Distances come from geographiclib (checked in geo.test.ts); zones and transit days from zones.ts
// (carrier-style table, from memory). The ranking formula is the product brief's own rule.
const columbusShop = { lat: 39.9612, lon: -82.9988 };
const places = {
  dayton: { lat: 39.7589, lon: -84.1916 }, // 65 mi from the shop: zone 2, 1 ground day
  cincinnati: { lat: 39.1031, lon: -84.512 }, // 100 mi: zone 2, 1 day
  pittsburgh: { lat: 40.4406, lon: -79.9959 }, // 162 mi: zone 3, 2 days
  chicago: { lat: 41.8781, lon: -87.6298 }, // 276 mi: zone 3, 2 days
  denver: { lat: 39.7392, lon: -104.9903 }, // 1 167 mi: zone 6, 4 days (air 2)
};

const asOf = new Date('2026-03-02T15:00:00Z');

function certificate(testedOn: string, perM3At05um: number): ParticleCountCertificate {
  return { testedOn, areaM2: 1.2, samples: [{ location: 'Bench', sizeUm: 0.5, perM3: perM3At05um }] };
}

function lab(overrides: Partial<RoutingLab> & Pick<RoutingLab, 'id'>): RoutingLab {
  return {
    name: `Lab ${overrides.id}`,
    active: true,
    location: places.cincinnati,
    timeZone: 'America/New_York',
    mediaTypes: ['hdd_3_5', 'hdd_2_5', 'ssd_sata', 'ssd_m2_nvme', 'usb_flash', 'memory_card'],
    turnaroundDays: { logical: 3, hdd_electronics: 5, hdd_firmware: 6, hdd_head_swap: 7, hdd_platter_work: 10, ssd_controller: 8 },
    healthDataAgreement: false,
    cleanAirCertificate: certificate('2026-01-10', 900), // class 5, current until 2026-07-10
    openCases: 6,
    queueCapacity: 40,
    weeklyThroughput: 10,
    ...overrides,
  };
}

function caseFor(input: Parameters<typeof triage>[0], shopLocation = columbusShop): RoutingCase {
  return { mediaType: input.mediaType, shopLocation, requirements: triage(input) };
}

const clickingDrive = caseFor({ mediaType: 'hdd_3_5', symptoms: ['clicking'] });

describe('routeCase: estimate = transit + queue + turnaround (product brief)', () => {
  it('worked example: 100 mi (zone 2, 1 day) + 6 open at 10 a week (3 days) + head swap 7 days = 11 business days', () => {
    const { ranked } = routeCase(clickingDrive, [lab({ id: 'cin' })], { asOf });
    expect(ranked).toHaveLength(1);
    const [first] = ranked;
    expect(first).toMatchObject({
      rank: 1,
      labId: 'cin',
      zone: 2,
      transitDays: 1,
      queueDays: 3,
      hardestSkill: 'hdd_head_swap',
      turnaroundDays: 7,
      estimatedDays: 11,
      shippingMode: 'ground',
      cleanAir: { isoClass: 5, testedOn: '2026-01-10', currentUntil: '2026-07-10' },
    });
    expect(first.distanceMiles).toBeCloseTo(100.2, 1);
    expect(first.reasons).toEqual([
      'About 11 business days until the customer has data.',
      '100 mi from the shop (zone 2): 1 business day ground transit.',
      'Queue: 6 open cases at 10 a week: 3 business days.',
      'Turnaround for Head swap: 7 business days.',
      'Clean air ISO class 5, tested 2026-01-10, current until 2026-07-10.',
    ]);
  });

  it('ranks by estimated days, so a farther lab with a short queue beats a near lab with a long one', () => {
    const near = lab({ id: 'near', location: places.dayton, openCases: 30, weeklyThroughput: 5 }); // 1 + 30 + 7 = 38
    const far = lab({ id: 'far', location: places.denver, openCases: 2, weeklyThroughput: 10 }); // 4 + 1 + 7 = 12
    const { ranked } = routeCase(clickingDrive, [near, far], { asOf });
    expect(ranked.map((r) => [r.labId, r.estimatedDays])).toEqual([
      ['far', 12],
      ['near', 38],
    ]);
  });

  it('breaks ties by distance and says so', () => {
    const cincinnati = lab({ id: 'cin', name: 'A Cincinnati lab' });
    const dayton = lab({ id: 'day', name: 'Z Dayton lab', location: places.dayton });
    const { ranked } = routeCase(clickingDrive, [cincinnati, dayton], { asOf });
    expect(ranked.map((r) => r.labId)).toEqual(['day', 'cin']);
    expect(ranked[0].estimatedDays).toBe(ranked[1].estimatedDays);
    expect(ranked[1].reasons.at(-1)).toBe('Same estimate as the lab ranked above; ties go to the nearer lab.');
  });

  it('uses the turnaround of the slowest required skill at that lab', () => {
    const kase = caseFor({ mediaType: 'hdd_3_5', symptoms: ['not_spinning'] }); // electronics + platter work
    const { ranked } = routeCase(kase, [lab({ id: 'cin', turnaroundDays: { hdd_electronics: 12, hdd_platter_work: 9 } })], { asOf });
    expect(ranked[0].hardestSkill).toBe('hdd_electronics');
    expect(ranked[0].turnaroundDays).toBe(12);
    expect(ranked[0].reasons).toContain('Turnaround for HDD electronics (PCB, TVS, motor driver), the slowest required skill here: 12 business days.');
  });

  it('air shipping shortens far transit; a declared battery hazard keeps it on ground', () => {
    const phoneLab = lab({ id: 'den', location: places.denver, mediaTypes: ['phone'], turnaroundDays: { phone_board: 6 } });
    const intact = caseFor({ mediaType: 'phone', symptoms: ['wont_boot'], battery: { installed: true, condition: 'intact' } });
    const swollen = caseFor({ mediaType: 'phone', symptoms: ['wont_boot'], battery: { installed: true, condition: 'swollen' } });
    expect(routeCase(intact, [phoneLab], { asOf, shippingMode: 'air' }).ranked[0]).toMatchObject({ shippingMode: 'air', transitDays: 2 });
    const ground = routeCase(swollen, [phoneLab], { asOf, shippingMode: 'air' }).ranked[0];
    expect(ground).toMatchObject({ shippingMode: 'ground', transitDays: 4 });
    expect(ground.reasons[1]).toMatch(/ground transit \(ground only: battery hazard\)/);
  });
});

describe('routeCase: exclusions, each with its reason', () => {
  it('excludes inactive labs, labs without the media type or a skill, full queues and labs already offered the case', () => {
    const labs = [
      lab({ id: 'inactive', active: false }),
      lab({ id: 'no-hdd', mediaTypes: ['phone'] }),
      lab({ id: 'no-head-swap', turnaroundDays: { logical: 3 } }),
      lab({ id: 'full', openCases: 40, queueCapacity: 40 }),
      lab({ id: 'declined' }),
      lab({ id: 'ok', location: places.pittsburgh }),
    ];
    const { ranked, excluded } = routeCase(clickingDrive, labs, { asOf, previouslyOfferedLabIds: ['declined'] });
    expect(ranked.map((r) => r.labId)).toEqual(['ok']);
    expect(Object.fromEntries(excluded.map((e) => [e.labId, e.reasons]))).toEqual({
      inactive: [{ code: 'inactive', message: 'Lab is not active on the network.' }],
      'no-hdd': [{ code: 'media_type', message: 'Lab does not take 3.5″ hard drive media.' }],
      'no-head-swap': [
        { code: 'missing_skills', message: 'Lab lacks Head swap.' },
      ],
      full: [{ code: 'queue_full', message: 'Queue is full (40 open of 40).' }],
      declined: [{ code: 'previously_offered', message: 'Lab was already offered this case.' }],
    });
  });

  it('does not add a clean-air reason for a lab that lacks the mechanical skill anyway', () => {
    const { excluded } = routeCase(clickingDrive, [lab({ id: 'logical-only', turnaroundDays: { logical: 3 }, cleanAirCertificate: null })], { asOf });
    expect(excluded[0].reasons.map((r) => r.code)).toEqual(['missing_skills']);
  });

  it('lists every reason a lab fails, not only the first', () => {
    const { excluded } = routeCase(clickingDrive, [lab({ id: 'x', active: false, mediaTypes: [], cleanAirCertificate: null })], { asOf });
    expect(excluded[0].reasons.map((r) => r.code)).toEqual(['inactive', 'media_type', 'clean_air_missing']);
  });

  it('health records go only to labs that signed the health-data agreement', () => {
    const kase = caseFor({ mediaType: 'ssd_sata', symptoms: ['not_detected'], sensitivity: ['health_records'] });
    const { ranked, excluded } = routeCase(kase, [lab({ id: 'unsigned' }), lab({ id: 'signed', healthDataAgreement: true })], { asOf });
    expect(ranked.map((r) => r.labId)).toEqual(['signed']);
    expect(ranked[0].reasons).toContain('Has signed the health-data agreement.');
    expect(excluded[0].reasons[0].code).toBe('health_data_agreement');
  });

  it('legal evidence needs the forensic custody skill', () => {
    const kase = caseFor({ mediaType: 'hdd_3_5', symptoms: ['clicking'], sensitivity: ['legal_evidence'] });
    const forensic = lab({ id: 'forensic', turnaroundDays: { hdd_head_swap: 7, forensic_custody: 2 } });
    const { ranked, excluded } = routeCase(kase, [lab({ id: 'plain' }), forensic], { asOf });
    expect(ranked.map((r) => r.labId)).toEqual(['forensic']);
    expect(excluded[0].reasons).toEqual([{ code: 'missing_skills', message: 'Lab lacks Forensic chain of custody.' }]);
  });

  it('a lab with no weekly throughput is excluded because its queue time cannot be estimated', () => {
    const { excluded } = routeCase(clickingDrive, [lab({ id: 'idle', weeklyThroughput: 0 })], { asOf });
    expect(excluded[0].reasons.map((r) => r.code)).toEqual(['no_throughput']);
  });

  it('a malformed lab profile excludes that lab with the problem named, and routing carries on', () => {
    const { ranked, excluded } = routeCase(
      clickingDrive,
      [lab({ id: 'bad', timeZone: 'Mars/Olympus', openCases: -2 }), lab({ id: 'good' })],
      { asOf },
    );
    expect(ranked.map((r) => r.labId)).toEqual(['good']);
    expect(excluded[0].reasons).toEqual([
      {
        code: 'invalid_profile',
        message: 'Lab profile is incomplete: time zone "Mars/Olympus" is not an IANA time zone; open cases must be a whole number ≥ 0, got -2.',
      },
    ]);
  });
});

describe('routeCase: clean air for head swaps and platter work (ISO 14644-1:2015 class limits, ISO 14644-2:2015 interval from memory)', () => {
  it('excludes a lab whose certificate measures class 6, quoting the class 5 limit of 3 520/m³ at 0.5 µm', () => {
    const { excluded } = routeCase(clickingDrive, [lab({ id: 'dusty', cleanAirCertificate: certificate('2026-01-10', 12_000) })], { asOf });
    expect(excluded[0].reasons).toEqual([
      {
        code: 'clean_air_class',
        message:
          'The clean-air certificate of 2026-01-10 measures ISO class 6; head swaps and platter work need ISO class 5 or cleaner. ' +
          'At Bench, ≥0.5 µm averages 12 000/m³; the class 5 limit is 3 520/m³.',
      },
    ]);
  });

  it('excludes a class 5 certificate older than 6 months, and accepts it on its last day in the lab’s time zone', () => {
    const cert = certificate('2025-09-02', 900); // due 2026-03-02
    // 2026-03-03T06:00Z is 23:00 on 2 March in Denver (UTC−7) but 01:00 on 3 March in New York (UTC−5).
    const lastDay = new Date('2026-03-03T06:00:00Z');
    expect(routeCase(clickingDrive, [lab({ id: 'den', timeZone: 'America/Denver', cleanAirCertificate: cert })], { asOf: lastDay }).ranked).toHaveLength(1);
    const { excluded } = routeCase(clickingDrive, [lab({ id: 'ny', timeZone: 'America/New_York', cleanAirCertificate: cert })], { asOf: lastDay });
    expect(excluded[0].reasons).toEqual([
      { code: 'clean_air_expired', message: 'The clean-air certificate of 2025-09-02 (ISO class 5) was due for re-test by 2026-03-02 (ISO 14644-2 interval).' },
    ]);
  });

  it('excludes a lab without a certificate, or with an unusable one', () => {
    const unusable: ParticleCountCertificate = {
      testedOn: '2026-01-10',
      areaM2: 1,
      samples: [
        { location: 'Bench', sizeUm: 0.3, perM3: 100 },
        { location: 'Bench', sizeUm: 0.5, perM3: 400 },
      ],
    };
    const { excluded } = routeCase(clickingDrive, [lab({ id: 'none', cleanAirCertificate: null }), lab({ id: 'odd', cleanAirCertificate: unusable })], { asOf });
    expect(excluded.map((e) => e.reasons[0].code)).toEqual(['clean_air_missing', 'clean_air_unusable']);
    expect(excluded[1].reasons[0].message).toMatch(/cumulative counts cannot rise with size/);
  });

  it('ignores clean air for work that does not open the drive', () => {
    const kase = caseFor({ mediaType: 'hdd_3_5', symptoms: ['burnt_smell'] });
    const { ranked } = routeCase(kase, [lab({ id: 'no-cert', cleanAirCertificate: null })], { asOf });
    expect(ranked.map((r) => r.labId)).toEqual(['no-cert']);
    expect(ranked[0].cleanAir).toBeUndefined();
  });
});

describe('routeCase: bad case input', () => {
  it('names what is wrong', () => {
    expect(() => routeCase({ ...clickingDrive, shopLocation: { lat: 120, lon: 0 } }, [], { asOf })).toThrow(/lat must be a latitude/);
    expect(() => routeCase({ ...clickingDrive, requirements: { ...clickingDrive.requirements, requiredSkills: [] } }, [], { asOf })).toThrow(
      /at least one skill/,
    );
    expect(() => routeCase(clickingDrive, [], { asOf: new Date('not a date') })).toThrow(/asOf must be a valid Date/);
  });
});

describe('routeCase: properties over random labs', () => {
  const skillSubset = fc.subarray([...labSkills], { minLength: 1 });
  const labArb = fc.record({
    id: fc.uuid(),
    active: fc.boolean(),
    place: fc.constantFrom(...Object.values(places)),
    skills: skillSubset,
    turnaround: fc.integer({ min: 1, max: 30 }),
    media: fc.subarray([...mediaTypes]),
    openCases: fc.integer({ min: 0, max: 50 }),
    queueCapacity: fc.integer({ min: 0, max: 60 }),
    weeklyThroughput: fc.integer({ min: 0, max: 20 }),
    agreement: fc.boolean(),
    cleanCount: fc.constantFrom(200, 900, 12_000),
  });

  it('every lab is either ranked or excluded with a reason; ranked labs meet every requirement and are in order', () => {
    fc.assert(
      fc.property(
        fc.array(labArb, { maxLength: 8 }),
        fc.constantFrom(...mediaTypes.filter((m) => m !== 'raid_nas')),
        fc.subarray(['clicking', 'burnt_smell', 'deleted_files', 'not_detected', 'liquid_damage'] as const),
        fc.boolean(),
        (generated, mediaType, symptoms, health) => {
          const labs = generated.map((g) =>
            lab({
              id: g.id,
              active: g.active,
              location: g.place,
              mediaTypes: g.media,
              turnaroundDays: Object.fromEntries(g.skills.map((s) => [s, g.turnaround])) as Partial<Record<LabSkill, number>>,
              openCases: g.openCases,
              queueCapacity: g.queueCapacity,
              weeklyThroughput: g.weeklyThroughput,
              healthDataAgreement: g.agreement,
              cleanAirCertificate: certificate('2026-01-10', g.cleanCount),
            }),
          );
          const kase = caseFor({ mediaType, symptoms, sensitivity: health ? ['health_records'] : [] });
          const { ranked, excluded } = routeCase(kase, labs, { asOf });
          expect(ranked.length + excluded.length).toBe(labs.length);
          expect(new Set([...ranked.map((r) => r.labId), ...excluded.map((e) => e.labId)]).size).toBe(new Set(labs.map((l) => l.id)).size);
          excluded.forEach((e) => expect(e.reasons.length).toBeGreaterThan(0));
          ranked.forEach((r, i) => {
            const source = labs.find((l) => l.id === r.labId) as RoutingLab;
            expect(r.rank).toBe(i + 1);
            expect(source.active).toBe(true);
            expect(source.mediaTypes).toContain(mediaType);
            kase.requirements.requiredSkills.forEach((s) => expect(source.turnaroundDays[s]).toBeDefined());
            expect(source.openCases).toBeLessThan(source.queueCapacity);
            if (health) expect(source.healthDataAgreement).toBe(true);
            if (kase.requirements.needsCleanAir) expect(r.cleanAir?.isoClass).toBeLessThanOrEqual(5);
            if (i > 0) {
              const prev = ranked[i - 1];
              expect(r.estimatedDays).toBeGreaterThanOrEqual(prev.estimatedDays);
              if (r.estimatedDays === prev.estimatedDays) expect(r.distanceKm).toBeGreaterThanOrEqual(prev.distanceKm);
            }
          });
        },
      ),
    );
  });
});

// ---------------------------------------------------------------------------------------------------------
// routeCase as it stood at commit 6d0d984 (one pass over plain lab objects), kept verbatim as the oracle:
// the packed lab index must give exactly the same ranking, reasons and exclusions. (Only its declared result
// type changed: it predates candidateCount, which the comparison checks against its ranked list.)
// ---------------------------------------------------------------------------------------------------------

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

function referenceRouteCase(kase: RoutingCase, labs: readonly RoutingLab[], options: RoutingOptions): Omit<RoutingResult, 'candidateCount'> {
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

// Random labs, some with malformed profiles, and random cases. Small pools of ids, names and places make
// duplicate ids, equal estimates and equal distances (the tie-breaks) common.
const labIdPool = ['a', 'b', 'c', 'd', 'e', 'f', 'g', 'h', 'i', 'j', 'k', 'l'];
const anyPoint = fc.record({ lat: fc.double({ min: -90, max: 90, noNaN: true }), lon: fc.double({ min: -180, max: 180, noNaN: true }) });
const usPoint = fc.record({ lat: fc.double({ min: 25, max: 49, noNaN: true }), lon: fc.double({ min: -124, max: -67, noNaN: true }) });
const badPoint = fc.constantFrom<LatLon>(
  { lat: 91, lon: 0 },
  { lat: 0, lon: -181 },
  { lat: Number.NaN, lon: 10 },
  { lat: 40, lon: Number.POSITIVE_INFINITY },
  null as unknown as LatLon,
);
const labPlace = fc.oneof(
  { weight: 5, arbitrary: fc.constantFrom(...Object.values(places)) },
  { weight: 3, arbitrary: usPoint },
  { weight: 1, arbitrary: fc.oneof(anyPoint, fc.constantFrom({ lat: 90, lon: 180 }, { lat: -90, lon: -180 })) },
);
const goodTurnaround = fc.oneof({ weight: 6, arbitrary: fc.integer({ min: 1, max: 15 }) }, { weight: 1, arbitrary: fc.constantFrom(2.5, 0.5) });
const allSkills = fc.tuple(...labSkills.map(() => goodTurnaround)).map((days) => Object.fromEntries(labSkills.map((s, i) => [s, days[i]])));
const someSkills = fc.record(Object.fromEntries(labSkills.map((s) => [s, goodTurnaround])) as Record<LabSkill, fc.Arbitrary<number>>, {
  requiredKeys: [],
});
// Shared objects on purpose: several labs holding the same certificate object is how caches go wrong.
const risingCounts: ParticleCountCertificate = {
  testedOn: '2026-01-10',
  areaM2: 1,
  samples: [
    { location: 'Bench', sizeUm: 0.3, perM3: 100 },
    { location: 'Bench', sizeUm: 0.5, perM3: 400 },
  ],
};
const unreadableDate: ParticleCountCertificate = { testedOn: '10 Jan 2026', areaM2: 1, samples: [{ location: 'Bench', sizeUm: 0.5, perM3: 900 }] };
const noCounts: ParticleCountCertificate = { testedOn: '2026-01-10', areaM2: 1, samples: [] };
const tooFewLocations: ParticleCountCertificate = { testedOn: '2026-01-10', areaM2: 30, samples: [{ location: 'Bench', sizeUm: 0.5, perM3: 900 }] };
const sharedClean = certificate('2025-09-02', 900);
const certificateArb = fc.oneof(
  { weight: 1, arbitrary: fc.constant(null) },
  {
    weight: 5,
    arbitrary: fc
      .record({
        testedOn: fc.constantFrom('2025-03-01', '2025-09-02', '2025-12-31', '2026-01-10', '2026-02-28', '2026-03-02', '2026-03-03', '2026-09-01', '2027-01-15'),
        perM3: fc.constantFrom(200, 900, 3520, 3521, 12_000, 40_000_000),
      })
      .map(({ testedOn, perM3 }) => certificate(testedOn, perM3)),
  },
  { weight: 2, arbitrary: fc.constantFrom(risingCounts, unreadableDate, noCounts, tooFewLocations, sharedClean) },
);
const wellFormedLab: fc.Arbitrary<RoutingLab> = fc.record({
  id: fc.constantFrom(...labIdPool),
  name: fc.constantFrom('Alpha', 'alpha', 'Beta', 'Gamma'),
  active: fc.oneof({ weight: 8, arbitrary: fc.constant(true) }, { weight: 1, arbitrary: fc.constant(false) }),
  location: labPlace,
  timeZone: fc.constantFrom('America/New_York', 'America/Denver', 'America/Los_Angeles', 'Pacific/Honolulu', 'Asia/Tokyo', 'Pacific/Kiritimati', 'UTC'),
  mediaTypes: fc.oneof({ weight: 3, arbitrary: fc.constant([...mediaTypes]) }, { weight: 1, arbitrary: fc.subarray([...mediaTypes]) }),
  turnaroundDays: fc.oneof({ weight: 2, arbitrary: allSkills }, { weight: 1, arbitrary: someSkills }),
  healthDataAgreement: fc.oneof({ weight: 3, arbitrary: fc.constant(true) }, { weight: 1, arbitrary: fc.constant(false) }),
  cleanAirCertificate: certificateArb,
  openCases: fc.integer({ min: 0, max: 30 }),
  queueCapacity: fc.oneof({ weight: 4, arbitrary: fc.integer({ min: 31, max: 60 }) }, { weight: 1, arbitrary: fc.integer({ min: 0, max: 30 }) }),
  weeklyThroughput: fc.oneof({ weight: 8, arbitrary: fc.integer({ min: 1, max: 25 }) }, { weight: 1, arbitrary: fc.constant(0) }),
});
// One or two fields broken the ways a profile can be: out-of-range place, unknown zone, negative or
// fractional counts, non-positive or non-finite turnaround.
const corruption = fc.oneof(
  badPoint.map((location) => ({ location })),
  fc.constantFrom('Mars/Olympus', '', 'America/Nowhere').map((timeZone) => ({ timeZone })),
  fc.constantFrom(-2, 1.5, Number.NaN).map((openCases) => ({ openCases })),
  fc.constantFrom(-1, 2.5, Number.POSITIVE_INFINITY).map((queueCapacity) => ({ queueCapacity })),
  fc.constantFrom(-1, Number.NaN, Number.POSITIVE_INFINITY).map((weeklyThroughput) => ({ weeklyThroughput })),
  fc
    .record({ skill: fc.constantFrom(...labSkills), days: fc.constantFrom(0, -0, -3, Number.NaN, Number.POSITIVE_INFINITY) })
    .map(({ skill, days }) => ({ turnaround: { [skill]: days } })),
);
const malformedLab: fc.Arbitrary<RoutingLab> = fc
  .tuple(wellFormedLab, fc.array(corruption, { minLength: 1, maxLength: 2 }))
  .map(([lab, faults]) => {
    const broken: RoutingLab = { ...lab, turnaroundDays: { ...lab.turnaroundDays } };
    for (const { turnaround, ...fields } of faults as Array<Partial<RoutingLab> & { turnaround?: Partial<Record<LabSkill, number>> }>) {
      Object.assign(broken, fields);
      Object.assign(broken.turnaroundDays, turnaround);
    }
    return broken;
  });
// Labs that pass every check, with few distinct places and figures, so equal estimates and distances occur.
const eligibleLab: fc.Arbitrary<RoutingLab> = fc.record({
  id: fc.constantFrom(...labIdPool),
  name: fc.constantFrom('Alpha', 'alpha', 'Beta'),
  active: fc.constant(true),
  location: fc.constantFrom(...Object.values(places)),
  timeZone: fc.constantFrom('America/New_York', 'America/Chicago'),
  mediaTypes: fc.constant([...mediaTypes]),
  turnaroundDays: fc.integer({ min: 3, max: 5 }).map((days) => Object.fromEntries(labSkills.map((s, i) => [s, days + (i % 2)]))),
  healthDataAgreement: fc.constant(true),
  cleanAirCertificate: fc.constant(certificate('2026-01-10', 900)),
  openCases: fc.integer({ min: 0, max: 4 }),
  queueCapacity: fc.constant(40),
  weeklyThroughput: fc.constantFrom(5, 10),
});
const randomLab = fc.oneof({ weight: 4, arbitrary: wellFormedLab }, { weight: 1, arbitrary: malformedLab }, { weight: 3, arbitrary: eligibleLab });
const randomCase: fc.Arbitrary<RoutingCase> = fc.record({
  mediaType: fc.constantFrom(...mediaTypes),
  shopLocation: fc.oneof(fc.constantFrom(columbusShop, ...Object.values(places)), usPoint, anyPoint),
  requirements: fc.record({
    requiredSkills: fc.oneof(
      fc.constantFrom<LabSkill[]>(['hdd_head_swap'], ['hdd_electronics', 'hdd_platter_work'], ['logical'], ['hdd_platter_work', 'hdd_head_swap']),
      fc.shuffledSubarray([...labSkills], { minLength: 1, maxLength: 4 }),
    ),
    needsCleanAir: fc.boolean(),
    needsHealthDataAgreement: fc.oneof({ weight: 2, arbitrary: fc.constant(false) }, { weight: 1, arbitrary: fc.constant(true) }),
    batteryHazard: fc.option(fc.boolean(), { nil: undefined }),
  }),
});
const randomOptions: fc.Arbitrary<RoutingOptions> = fc.record(
  {
    // Mostly around the certificates' dates (first and last current days in different zones), sometimes anywhere.
    asOf: fc.oneof(
      {
        weight: 3,
        arbitrary: fc.constantFrom(asOf, new Date('2026-03-03T06:00:00Z'), new Date('2026-03-02T23:30:00Z'), new Date('2026-07-10T23:59:59Z'), new Date('2026-01-10T00:30:00Z')),
      },
      { weight: 1, arbitrary: fc.date({ min: new Date('2025-06-01T00:00:00Z'), max: new Date('2027-06-01T00:00:00Z'), noInvalidDate: true }) },
    ),
    shippingMode: fc.constantFrom<ShippingMode>('ground', 'air'),
    previouslyOfferedLabIds: fc.subarray(labIdPool, { maxLength: 2 }),
  },
  { requiredKeys: ['asOf'] },
);

// Same values, same key order (what the API serialises), same absent-versus-undefined fields. A result from the
// frozen reference has no candidateCount: every lab it ranks is a candidate, so it is its ranked list's length.
function expectSameResult(actual: RoutingResult, expected: RoutingResult | Omit<RoutingResult, 'candidateCount'>) {
  const whole: RoutingResult = 'candidateCount' in expected ? expected : { ...expected, candidateCount: expected.ranked.length };
  expect(actual).toStrictEqual(whole);
  expect(JSON.stringify(actual)).toBe(JSON.stringify(whole));
}

const countsArb = fc
  .array(
    fc.tuple(
      fc.constantFrom(...labIdPool),
      fc.oneof({ weight: 8, arbitrary: fc.integer({ min: 0, max: 60 }) }, { weight: 1, arbitrary: fc.constantFrom(-1, 2.5, Number.NaN) }),
    ),
    { maxLength: 8 },
  )
  .map((entries) => new Map(entries));

describe('routeCase matches its earlier implementation exactly', () => {
  it('over random labs, including malformed profiles, and random cases', () => {
    fc.assert(
      fc.property(fc.array(randomLab, { maxLength: 14 }), randomCase, randomOptions, (labs, kase, options) => {
        expectSameResult(routeCase(kase, labs, options), referenceRouteCase(kase, labs, options));
      }),
      { numRuns: 400 },
    );
  });

  it('with the labs prepared once and several cases routed against them, with and without fresh open-case counts', () => {
    fc.assert(
      fc.property(
        fc.array(randomLab, { maxLength: 14 }),
        fc.array(fc.tuple(randomCase, randomOptions, fc.option(countsArb, { nil: undefined })), { minLength: 1, maxLength: 3 }),
        (labs, runs) => {
          const prepared = prepareRoutingLabs(labs);
          for (const [kase, options, counts] of runs) {
            // The oracle knows no count map: give it the labs with the counts the map stands for.
            const asGiven = counts ? labs.map((l) => ({ ...l, openCases: counts.get(l.id) ?? 0 })) : labs;
            const expected = referenceRouteCase(kase, asGiven, options);
            expectSameResult(routeCase(kase, prepared, counts ? { ...options, openCases: counts } : options), expected);
            if (counts) expectSameResult(routeCase(kase, labs, { ...options, openCases: counts }), expected);
          }
        },
      ),
      { numRuns: 300 },
    );
  });
});

describe('routeCase: prepared labs and fresh open-case counts', () => {
  it('routes a prepared index like the plain list, and again for a second case', () => {
    const labs = [lab({ id: 'cin' }), lab({ id: 'day', location: places.dayton }), lab({ id: 'idle', weeklyThroughput: 0 })];
    const prepared = prepareRoutingLabs(labs);
    expect(routeCase(clickingDrive, prepared, { asOf })).toEqual(routeCase(clickingDrive, labs, { asOf }));
    const burnt = caseFor({ mediaType: 'hdd_3_5', symptoms: ['burnt_smell'] });
    expect(routeCase(burnt, prepared, { asOf })).toEqual(routeCase(burnt, labs, { asOf }));
  });

  it('takes open cases from the map, a lab absent from it having none', () => {
    // The profile says 40 of 40 (full); the map says 6 open: 6 ÷ 10 a week × 5 = 3 queue days, 1 + 3 + 7 = 11.
    const prepared = prepareRoutingLabs([lab({ id: 'cin', openCases: 40 }), lab({ id: 'day', location: places.dayton, openCases: 40 })]);
    expect(routeCase(clickingDrive, prepared, { asOf }).ranked).toEqual([]);
    const { ranked, excluded } = routeCase(clickingDrive, prepared, { asOf, openCases: new Map([['cin', 6]]) });
    expect(excluded).toEqual([]);
    expect(ranked.map((r) => [r.labId, r.queueDays, r.estimatedDays])).toEqual([
      ['day', 0, 8], // 65 mi: 1 day + 0 queue + 7
      ['cin', 3, 11],
    ]);
    expect(ranked[1].reasons).toContain('Queue: 6 open cases at 10 a week: 3 business days.');
    const full = routeCase(clickingDrive, prepared, { asOf, openCases: new Map([['cin', 40]]) });
    expect(full.excluded).toEqual([{ labId: 'cin', labName: 'Lab cin', reasons: [{ code: 'queue_full', message: 'Queue is full (40 open of 40).' }] }]);
  });

  it('one prepared index reads each lab’s date afresh across its midnight, back and forth, and on a DST change', () => {
    const cert = certificate('2025-09-02', 900); // due for re-test by 2026-03-02
    const prepared = prepareRoutingLabs([lab({ id: 'den', timeZone: 'America/Denver', cleanAirCertificate: cert })]);
    const at = (iso: string) => routeCase(clickingDrive, prepared, { asOf: new Date(iso) });
    // Denver is UTC−7 in March before the change: 2 March ends at 2026-03-03T07:00Z.
    expect(at('2026-03-03T06:59:59.999Z').ranked).toHaveLength(1);
    expect(at('2026-03-03T07:00:00.000Z').excluded[0].reasons[0].code).toBe('clean_air_expired');
    expect(at('2026-03-02T12:00:00Z').ranked).toHaveLength(1); // an earlier instant after a later one
    // 8 March 2026 is the US change to daylight time (a 23-hour day); a certificate due 2026-03-08 ends at
    // 2026-03-09T06:00Z, i.e. midnight MDT (UTC−6).
    const dst = prepareRoutingLabs([lab({ id: 'den', timeZone: 'America/Denver', cleanAirCertificate: certificate('2025-09-08', 900) })]);
    const onDst = (iso: string) => routeCase(clickingDrive, dst, { asOf: new Date(iso) });
    expect(onDst('2026-03-08T12:00:00Z').ranked).toHaveLength(1);
    expect(onDst('2026-03-09T05:59:59Z').ranked).toHaveLength(1);
    expect(onDst('2026-03-09T06:00:00Z').excluded[0].reasons[0].code).toBe('clean_air_expired');
  });

  it('a malformed count in the map makes that lab’s profile incomplete for this case only', () => {
    const prepared = prepareRoutingLabs([lab({ id: 'cin' })]);
    expect(routeCase(clickingDrive, prepared, { asOf, openCases: new Map([['cin', -1]]) }).excluded[0].reasons).toEqual([
      { code: 'invalid_profile', message: 'Lab profile is incomplete: open cases must be a whole number ≥ 0, got -1.' },
    ]);
    expect(routeCase(clickingDrive, prepared, { asOf }).ranked).toHaveLength(1);
  });
});

describe('geographiclib: the distance-only Inverse the prepared routing calls', () => {
  // geographiclib computes s12 the same way whatever else is asked for; this pins that for the version in use.
  const wgs84 = geographiclib.Geodesic.WGS84;
  const lat = fc.double({ min: -90, max: 90, noNaN: true });
  const lon = fc.double({ min: -180, max: 180, noNaN: true });
  it('gives the same distance as the full solution, including equatorial, meridional and near-antipodal lines', () => {
    const special: Array<[number, number, number, number]> = [
      [0, 0, 0, 179.5], // equatorial
      [-30, 20, 60, 20], // meridional
      [0, 0, 0.5, 179.7], // near antipodal
      [40, -100, -40, 80], // antipodal
      [10, 10, 10, 10], // same point
      [90, 0, -90, 0], // pole to pole
    ];
    const randomPairs = fc.sample(fc.tuple(lat, lon, lat, lon), { numRuns: 2000, seed: 42 });
    for (const [lat1, lon1, lat2, lon2] of [...special, ...randomPairs]) {
      expect(wgs84.Inverse(lat1, lon1, lat2, lon2, geographiclib.Geodesic.DISTANCE).s12).toBe(wgs84.Inverse(lat1, lon1, lat2, lon2).s12);
    }
  });
});

describe('routeCase: options.limit keeps the first entries of the full ranking', () => {
  it('worked example: the best two of three, the tie sentence kept, every exclusion still listed', () => {
    const labs = [
      lab({ id: 'cin', name: 'A Cincinnati lab' }), // 1 + 3 + 7 = 11
      lab({ id: 'den', location: places.denver }), // 4 + 3 + 7 = 14
      lab({ id: 'day', name: 'Z Dayton lab', location: places.dayton }), // 1 + 3 + 7 = 11, nearer
      lab({ id: 'idle', weeklyThroughput: 0 }),
    ];
    const full = routeCase(clickingDrive, labs, { asOf });
    const best = routeCase(clickingDrive, labs, { asOf, limit: 2 });
    expect(best.ranked.map((r) => [r.rank, r.labId, r.estimatedDays])).toEqual([
      [1, 'day', 11],
      [2, 'cin', 11],
    ]);
    expect(best.ranked[1].reasons.at(-1)).toBe('Same estimate as the lab ranked above; ties go to the nearer lab.');
    expect(best).toStrictEqual({ ranked: full.ranked.slice(0, 2), excluded: full.excluded, candidateCount: 3 });
    expect(full.candidateCount).toBe(3);
    expect(routeCase(clickingDrive, labs, { asOf, limit: 5 })).toStrictEqual(full);
  });

  it('a limit that is not a whole number ≥ 1 is a RangeError', () => {
    for (const limit of [0, -1, 2.5, Number.NaN, Number.POSITIVE_INFINITY]) {
      expect(() => routeCase(clickingDrive, [lab({ id: 'cin' })], { asOf, limit })).toThrow(/options.limit must be a whole number ≥ 1/);
    }
  });

  // Labs placed by geographiclib's Direct problem a few hundredths of a mile to a couple of miles either side of a
  // zone limit (zones.ts) from the shop, where the spherical bounds straddle two zones.
  const wgs84 = geographiclib.Geodesic.WGS84;
  const nearZoneLimit = fc.record({
    upperMiles: fc.constantFrom(...zoneUpperMiles),
    offsetMiles: fc.constantFrom(-2, -0.3, -0.01, 0, 0.01, 0.3, 2),
    azimuth: fc.double({ min: -180, max: 180, noNaN: true }),
  });
  const placedLab = fc.tuple(
    fc.oneof({ weight: 2, arbitrary: eligibleLab }, { weight: 1, arbitrary: randomLab }),
    fc.option(nearZoneLimit, { nil: undefined, freq: 2 }),
  );
  function placeNearShop(kase: RoutingCase, placed: ReadonlyArray<[RoutingLab, { upperMiles: number; offsetMiles: number; azimuth: number } | undefined]>) {
    return placed.map(([l, edge]) => {
      if (!edge) return l;
      const { lat2, lon2 } = wgs84.Direct(kase.shopLocation.lat, kase.shopLocation.lon, edge.azimuth, (edge.upperMiles + edge.offsetMiles) * 1609.344);
      return { ...l, location: { lat: lat2 as number, lon: lon2 as number } };
    });
  }

  it('over random labs (ties, zone limits, malformed profiles), cases, counts and limits: the full result cut to the limit', () => {
    fc.assert(
      fc.property(
        fc.array(placedLab, { maxLength: 24 }),
        randomCase,
        randomOptions,
        fc.option(countsArb, { nil: undefined }),
        fc.nat({ max: 1000 }),
        (placed, kase, options, counts, pick) => {
          const labs = placeNearShop(kase, placed);
          const limit = 1 + (pick % (labs.length + 2));
          const prepared = prepareRoutingLabs(labs);
          const withCounts = counts ? { ...options, openCases: counts } : options;
          const full = routeCase(kase, prepared, withCounts);
          // The full result against the frozen reference, given the counts the map stands for.
          const asGiven = counts ? labs.map((l) => ({ ...l, openCases: counts.get(l.id) ?? 0 })) : labs;
          expectSameResult(full, referenceRouteCase(kase, asGiven, options));
          const expected = { ranked: full.ranked.slice(0, limit), excluded: full.excluded, candidateCount: full.ranked.length };
          expectSameResult(routeCase(kase, prepared, { ...withCounts, limit }), expected);
          expectSameResult(routeCase(kase, labs, { ...withCounts, limit }), expected);
        },
      ),
      { numRuns: 400 },
    );
  });

  it('over hundreds of candidates spread across the US, where most are left out before their exact distance', () => {
    const usLab = eligibleLab.chain((l) =>
      fc.record({
        location: fc.oneof({ weight: 4, arbitrary: usPoint }, { weight: 1, arbitrary: fc.constantFrom(...Object.values(places)) }),
        openCases: fc.integer({ min: 0, max: 30 }),
        weeklyThroughput: fc.integer({ min: 5, max: 25 }),
        turnaroundDays: fc.integer({ min: 2, max: 13 }).map((days) => Object.fromEntries(labSkills.map((s) => [s, days]))),
      }).map((figures) => ({ ...l, ...figures })),
    );
    fc.assert(
      fc.property(
        fc.array(usLab, { minLength: 200, maxLength: 500 }),
        fc.oneof(usPoint, fc.constantFrom(columbusShop, ...Object.values(places))),
        fc.constantFrom<ShippingMode>('ground', 'air'),
        fc.constantFrom(1, 2, 10, 25, 60, 199),
        (labs, shopLocation, shippingMode, limit) => {
          const kase: RoutingCase = { ...clickingDrive, shopLocation };
          const prepared = prepareRoutingLabs(labs);
          const full = routeCase(kase, prepared, { asOf, shippingMode });
          expect(full.candidateCount).toBe(labs.length);
          expectSameResult(routeCase(kase, prepared, { asOf, shippingMode, limit }), {
            ranked: full.ranked.slice(0, limit),
            excluded: full.excluded,
            candidateCount: full.ranked.length,
          });
        },
      ),
      { numRuns: 40 },
    );
  });
});

describe('geodesicDistanceBoundsKm contains the WGS-84 geodesic distance (reference: geographiclib, Karney 2013)', () => {
  const wgs84 = geographiclib.Geodesic.WGS84;
  const lat = fc.double({ min: -90, max: 90, noNaN: true });
  const lon = fc.double({ min: -180, max: 180, noNaN: true });
  function check(lat1: number, lon1: number, lat2: number, lon2: number) {
    const km = (wgs84.Inverse(lat1, lon1, lat2, lon2, geographiclib.Geodesic.DISTANCE).s12 as number) / 1000;
    const { lowKm, highKm } = geodesicDistanceBoundsKm({ lat: lat1, lon: lon1 }, { lat: lat2, lon: lon2 });
    expect(lowKm).toBeLessThanOrEqual(km);
    expect(highKm).toBeGreaterThanOrEqual(km);
    // Tight enough to be worth having: about 1.1 % wide, plus the two metres of slack.
    expect(highKm - lowKm).toBeLessThanOrEqual(0.0111 * km + 0.002);
  }

  it('across the contiguous US and worldwide', () => {
    const us = fc.tuple(fc.double({ min: 24, max: 49.5, noNaN: true }), fc.double({ min: -125, max: -66, noNaN: true }));
    for (const [[lat1, lon1], [lat2, lon2]] of fc.sample(fc.tuple(us, us), { numRuns: 5000, seed: 7 })) check(lat1, lon1, lat2, lon2);
    for (const [lat1, lon1, lat2, lon2] of fc.sample(fc.tuple(lat, lon, lat, lon), { numRuns: 5000, seed: 8 })) check(lat1, lon1, lat2, lon2);
  });

  it('for short, meridional, equatorial, polar and near-antipodal pairs, where sphere and ellipsoid differ most', () => {
    const special: Array<[number, number, number, number]> = [
      [0, 0, 0, 179.5], // equatorial
      [0, 0, 0, 180], // antipodal on the equator
      [0, 0, 0.5, 179.7], // near antipodal
      [40, -100, -40, 80], // antipodal
      [90, 0, -90, 0], // pole to pole
      [-30, 20, 60, 20], // meridional
      [0, 10, 0.01, 10], // short meridional arc at the equator: the smallest radius of curvature
      [89.99, 0, 90, 0], // at the pole: the largest
      [10, 10, 10, 10], // same point
      [45, 0, 45, 0.000001], // a tenth of a metre
    ];
    for (const [lat1, lon1, lat2, lon2] of special) check(lat1, lon1, lat2, lon2);
    // Around the antipode of random points, within a couple of degrees.
    const offset = fc.double({ min: -2, max: 2, noNaN: true });
    for (const [lat1, lon1, dLat, dLon] of fc.sample(fc.tuple(lat, lon, offset, offset), { numRuns: 3000, seed: 9 })) {
      const lat2 = Math.max(-90, Math.min(90, -lat1 + dLat));
      const lon2 = ((lon1 + 180 + dLon + 540) % 360) - 180;
      check(lat1, lon1, lat2, lon2);
    }
    // Short lines everywhere, north–south and east–west.
    const small = fc.double({ min: -0.05, max: 0.05, noNaN: true });
    for (const [lat1, lon1, dLat, dLon] of fc.sample(fc.tuple(fc.double({ min: -89.9, max: 89.9, noNaN: true }), fc.double({ min: -179.9, max: 179.9, noNaN: true }), small, small), { numRuns: 3000, seed: 10 })) {
      check(lat1, lon1, lat1 + dLat, lon1 + dLon);
    }
  });
});
