import { describe, expect, it } from 'vitest';
import {
  classifyCertificate,
  classLimit,
  evaluateClass,
  isCertificateCurrent,
  minimumSampleVolumeLitres,
  minimumSamplingLocations,
  retestDueDate,
  retestIntervalMonths,
  tableOneLimit,
  type IsoClass,
  type ParticleCountCertificate,
} from './clean-air';

// ISO 14644-1:2015 Table 1, every cell that carries a number (from memory of the standard;
// class 5 at 0.3 µm and 0.5 µm are also quoted in the product brief).
const tableOne: Array<[IsoClass, number, number]> = [
  [1, 0.1, 10],
  [2, 0.1, 100], [2, 0.2, 24], [2, 0.3, 10],
  [3, 0.1, 1_000], [3, 0.2, 237], [3, 0.3, 102], [3, 0.5, 35],
  [4, 0.1, 10_000], [4, 0.2, 2_370], [4, 0.3, 1_020], [4, 0.5, 352], [4, 1, 83],
  [5, 0.1, 100_000], [5, 0.2, 23_700], [5, 0.3, 10_200], [5, 0.5, 3_520], [5, 1, 832],
  [6, 0.1, 1_000_000], [6, 0.2, 237_000], [6, 0.3, 102_000], [6, 0.5, 35_200], [6, 1, 8_320], [6, 5, 293],
  [7, 0.5, 352_000], [7, 1, 83_200], [7, 5, 2_930],
  [8, 0.5, 3_520_000], [8, 1, 832_000], [8, 5, 29_300],
  [9, 0.5, 35_200_000], [9, 1, 8_320_000], [9, 5, 293_000],
];

function bench(testedOn: string, counts: Record<string, Record<number, number[]>>, areaM2 = 1.2): ParticleCountCertificate {
  return {
    testedOn,
    areaM2,
    samples: Object.entries(counts).flatMap(([location, bySize]) =>
      Object.entries(bySize).flatMap(([size, values]) => values.map((perM3) => ({ location, sizeUm: Number(size), perM3 }))),
    ),
  };
}

describe('classLimit (ISO 14644-1:2015 formula Cn = 10^N × (0.1/D)^2.08, three significant figures)', () => {
  it.each(tableOne)('class %i at %s µm gives the Table 1 value %i', (isoClass, sizeUm, expected) => {
    expect(classLimit(isoClass, sizeUm)).toBe(expected);
    expect(tableOneLimit(isoClass, sizeUm)).toBe(expected);
  });

  it('class 5 at 0.5 µm is 3 520 /m³ and at 0.3 µm 10 200 /m³ (ISO 14644-1:2015 Table 1, as quoted in the brief)', () => {
    expect(classLimit(5, 0.5)).toBe(3_520);
    expect(classLimit(5, 0.3)).toBe(10_200);
  });

  it('leaves the cells Table 1 leaves blank empty: class 5 at 5 µm and class 7 at 0.3 µm (ISO 14644-1:2015, from memory)', () => {
    expect(tableOneLimit(5, 5)).toBeNull();
    expect(tableOneLimit(1, 0.2)).toBeNull();
    expect(tableOneLimit(7, 0.3)).toBeNull();
    // The formula still yields the 1999 edition's figure of 29 for class 5 at 5 µm (from memory).
    expect(classLimit(5, 5)).toBe(29);
  });

  it('accepts intermediate classes in 0.1 steps and rounds to three significant figures', () => {
    // 10^5.5 × 0.2^2.08 = 11 123.6…, three significant figures → 11 100 (computed from the formula).
    expect(classLimit(5.5, 0.5)).toBe(11_100);
  });

  it('rejects a class outside 1–9 or not in 0.1 steps, and sizes outside 0.1–5 µm, with the allowed range in the message', () => {
    expect(() => classLimit(0, 0.5)).toThrow(/between 1 and 9/);
    expect(() => classLimit(5.25, 0.5)).toThrow(/steps of 0.1/);
    expect(() => classLimit(5, 0.05)).toThrow(/0.1 µm and 5 µm/);
    expect(() => classLimit(5, 10)).toThrow(/0.1 µm and 5 µm/);
    expect(() => tableOneLimit(5, 0.7)).toThrow(/Table 1 has the sizes/);
  });
});

describe('minimumSamplingLocations (ISO 14644-1:2015 Table A.1, from memory)', () => {
  it.each([
    [0.5, 1], [2, 1], [2.01, 2], [4, 2], [10, 5], [24, 6], [36, 9], [52, 10], [76, 15], [104, 16],
    [148, 19], [232, 22], [352, 24], [636, 26], [1000, 27],
  ])('%s m² needs %i locations', (area, expected) => {
    expect(minimumSamplingLocations(area)).toBe(expected);
  });

  it('scales as 27 × A / 1 000 above 1 000 m², rounded up (ISO 14644-1:2015 A.4.2, from memory)', () => {
    expect(minimumSamplingLocations(1500)).toBe(41); // 40.5 → 41
    expect(minimumSamplingLocations(2000)).toBe(54);
  });

  it('rejects a zero or negative area', () => {
    expect(() => minimumSamplingLocations(0)).toThrow(/positive number of m²/);
  });
});

describe('minimumSampleVolumeLitres (ISO 14644-1:2015 A.4.4 Vs = 20 / Cn,m × 1 000, at least 2 L; from memory)', () => {
  it('class 5 with 0.5 µm as the largest size needs 5.68 L per sample', () => {
    expect(minimumSampleVolumeLitres(5, 0.5)).toBeCloseTo(5.682, 3);
  });

  it('never asks for less than 2 L', () => {
    expect(minimumSampleVolumeLitres(7, 0.5)).toBe(2);
  });
});

describe('classifyCertificate', () => {
  it('a clean bench well under the class 4 limits but over class 3 at 0.5 µm is class 4, and says why not class 3', () => {
    const result = classifyCertificate(bench('2026-03-02', { L1: { 0.3: [800, 900], 0.5: [300, 340], 1: [40] } }));
    expect(result.isoClass).toBe(4);
    expect(result.problems).toEqual([]);
    expect(result.cleanerClassFailures.map((f) => [f.kind, f.sizeUm])).toEqual([
      ['over_limit', 0.3],
      ['over_limit', 0.5],
    ]);
    expect(result.cleanerClassFailures[1].message).toBe('At L1, ≥0.5 µm averages 320/m³; the class 3 limit is 35/m³.');
  });

  it('judges each location by the mean of its samples (ISO 14644-1:2015 A.5), not by its worst sample', () => {
    // One sample of 3 600 is above the class 5 limit of 3 520, but the location's mean of 3 300 is within it.
    const result = classifyCertificate(bench('2026-03-02', { L1: { 0.5: [3_600, 3_000] } }));
    expect(result.isoClass).toBe(5);
    expect(result.means).toEqual([{ location: 'L1', sizeUm: 0.5, meanPerM3: 3_300, samples: 2 }]);
  });

  it('the worst location decides the class: one location at class 6 makes the area class 6', () => {
    const result = classifyCertificate(
      bench('2026-03-02', { L1: { 0.5: [2_000] }, L2: { 0.5: [12_000] } }, 4),
    );
    expect(result.isoClass).toBe(6);
    expect(result.cleanerClassFailures).toEqual([
      expect.objectContaining({ kind: 'over_limit', location: 'L2', sizeUm: 0.5, meanPerM3: 12_000, limitPerM3: 3_520 }),
    ]);
  });

  it('a room with too few sampling locations for its area does not demonstrate any class', () => {
    // 30 m² needs 8 locations (Table A.1); two locations with excellent counts are not enough evidence.
    const result = classifyCertificate(bench('2026-03-02', { L1: { 0.5: [10] }, L2: { 0.5: [12] } }, 30));
    expect(result.isoClass).toBeNull();
    expect(result.cleanerClassFailures[0].message).toMatch(/needs at least 8 sampling locations/);
  });

  it('ignores 5 µm counts for classes where Table 1 has no 5 µm limit (class 5 and cleaner)', () => {
    const result = classifyCertificate(bench('2026-03-02', { L1: { 0.5: [1_500], 5: [40] } }));
    // 40/m³ at 5 µm would break the 1999 edition's class 5 limit of 29; the 2015 edition does not apply it.
    expect(result.isoClass).toBe(5);
  });

  it('samples smaller than the minimum volume do not count as evidence for that class', () => {
    const certificate: ParticleCountCertificate = {
      testedOn: '2026-03-02',
      areaM2: 1,
      samples: [{ location: 'L1', sizeUm: 0.5, perM3: 30, volumeLitres: 2.83 }],
    };
    // Class 3 at 0.5 µm needs 20/35 × 1 000 = 571 L; class 5 needs 5.68 L; class 6 needs 2 L.
    const result = classifyCertificate(certificate);
    expect(result.isoClass).toBe(6);
    expect(evaluateClass(certificate, 5).failures.map((f) => f.kind)).toEqual(['sample_volume']);
  });

  it('flags cumulative counts that rise with particle size as a data error and gives no class', () => {
    const result = classifyCertificate(bench('2026-03-02', { L1: { 0.3: [500], 0.5: [900] } }));
    expect(result.isoClass).toBeNull();
    expect(result.problems[0]).toMatch(/cumulative counts cannot rise with size/);
  });

  it('notes sizes that are not Table 1 columns and classifies on the others', () => {
    const result = classifyCertificate(bench('2026-03-02', { L1: { 0.5: [1_000], 0.7: [600] } }));
    expect(result.isoClass).toBe(5);
    expect(result.notes).toEqual(['Sizes 0.7 µm are not Table 1 columns and were not used for classification.']);
  });

  it('gives no class when even class 9 is exceeded', () => {
    const result = classifyCertificate(bench('2026-03-02', { L1: { 0.5: [40_000_000] } }));
    expect(result.isoClass).toBeNull();
    expect(result.cleanerClassFailures[0].kind).toBe('over_limit');
  });

  it('reports an empty certificate as unusable', () => {
    expect(classifyCertificate({ testedOn: '2026-03-02', areaM2: 1, samples: [] }).problems).toEqual([
      'The certificate has no particle counts.',
    ]);
  });

  it('rejects malformed input with the field named', () => {
    expect(() => classifyCertificate({ testedOn: '2026-3-2', areaM2: 1, samples: [] })).toThrow(/testedOn must be a calendar date/);
    expect(() =>
      classifyCertificate({ testedOn: '2026-03-02', areaM2: 1, samples: [{ location: 'L1', sizeUm: 0.5, perM3: -1 }] }),
    ).toThrow(/samples\[0\]\.perM3/);
    expect(() =>
      classifyCertificate({ testedOn: '2026-03-02', areaM2: 1, samples: [{ location: '', sizeUm: 0.5, perM3: 1 }] }),
    ).toThrow(/samples\[0\]\.location/);
  });
});

describe('re-test interval (ISO 14644-2:2015, from memory: 6 months for class 5 and cleaner, 12 months above)', () => {
  it('is 6 months for classes 1–5 and 12 months for classes 6–9', () => {
    expect([1, 2, 3, 4, 5].map((c) => retestIntervalMonths(c as IsoClass))).toEqual([6, 6, 6, 6, 6]);
    expect([6, 7, 8, 9].map((c) => retestIntervalMonths(c as IsoClass))).toEqual([12, 12, 12, 12]);
  });

  it('adds calendar months and clamps month ends', () => {
    expect(retestDueDate('2026-01-15', 5)).toBe('2026-07-15');
    expect(retestDueDate('2025-08-31', 5)).toBe('2026-02-28');
    expect(retestDueDate('2026-01-15', 7)).toBe('2027-01-15');
  });

  it('a class 5 certificate is current through its due date and lapses the day after', () => {
    expect(isCertificateCurrent('2026-01-15', 5, '2026-07-15')).toBe(true);
    expect(isCertificateCurrent('2026-01-15', 5, '2026-07-16')).toBe(false);
  });

  it('a test dated after the day asked about is not current', () => {
    expect(isCertificateCurrent('2026-05-01', 5, '2026-04-30')).toBe(false);
  });
});
