import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { labSkills, mediaTypes, type LabSkill } from '../vocabulary';
import type { ParticleCountCertificate } from './clean-air';
import { routeCase, type RoutingCase, type RoutingLab } from './routing';
import { triage } from './triage';

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
