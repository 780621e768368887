import { DateTime } from 'luxon';

// Clean-air classification of a lab's work area from its particle-count certificate.
// Class limits: ISO 14644-1:2015, formula (1) and Table 1. Sampling plan: ISO 14644-1:2015 Annex A.
// Re-test interval: ISO 14644-2:2015 (from memory). A certificate is a flat list of samples, the way
// particle counters export them: one row per location, particle size and sample.

export const isoClasses = [1, 2, 3, 4, 5, 6, 7, 8, 9] as const;
export type IsoClass = (typeof isoClasses)[number];

/** The particle sizes (µm) that head the columns of ISO 14644-1:2015 Table 1. */
export const tableOneSizesUm = [0.1, 0.2, 0.3, 0.5, 1, 5] as const;

/** Head swaps and platter work must happen at this class or cleaner (the network's rule, from DESIGN). */
export const MECHANICAL_WORK_MAX_ISO_CLASS: IsoClass = 5;

function roundToThreeSignificant(value: number): number {
  if (value === 0) return 0;
  const digits = Math.floor(Math.log10(Math.abs(value))) + 1;
  const factor = 10 ** (3 - digits);
  return Math.round(value * factor) / factor;
}

function assertIsoClassNumber(isoClass: number): void {
  // The standard allows intermediate classes in steps of 0.1 between 1 and 9.
  const tenths = Math.round(isoClass * 10);
  if (!Number.isFinite(isoClass) || isoClass < 1 || isoClass > 9 || Math.abs(isoClass * 10 - tenths) > 1e-9) {
    throw new RangeError(`ISO class must be between 1 and 9 in steps of 0.1, got ${isoClass}`);
  }
}

function assertParticleSize(sizeUm: number): void {
  if (!Number.isFinite(sizeUm) || sizeUm < 0.1 || sizeUm > 5) {
    throw new RangeError(`particle size must be between 0.1 µm and 5 µm (ISO 14644-1:2015 scope), got ${sizeUm}`);
  }
}

/**
 * Maximum permitted concentration (particles ≥ sizeUm per m³) for an ISO class:
 * Cn = 10^N × (0.1 / D)^2.08, rounded to a whole number with no more than three significant figures,
 * as ISO 14644-1:2015 clause 5.3 prescribes.
 */
export function classLimit(isoClass: number, sizeUm: number): number {
  assertIsoClassNumber(isoClass);
  assertParticleSize(sizeUm);
  const raw = 10 ** isoClass * (0.1 / sizeUm) ** 2.08;
  return Math.round(roundToThreeSignificant(raw));
}

// Cells of ISO 14644-1:2015 Table 1 that carry a number (from memory). The blank cells are those where
// the standard says classification is inappropriate: too few particles to count reliably (clean classes
// at large sizes, and 5 µm below class 6), or too many for counters (dirty classes at small sizes).
const tableOneColumnsByClass: Record<IsoClass, readonly number[]> = {
  1: [0.1],
  2: [0.1, 0.2, 0.3],
  3: [0.1, 0.2, 0.3, 0.5],
  4: [0.1, 0.2, 0.3, 0.5, 1],
  5: [0.1, 0.2, 0.3, 0.5, 1],
  6: [0.1, 0.2, 0.3, 0.5, 1, 5],
  7: [0.5, 1, 5],
  8: [0.5, 1, 5],
  9: [0.5, 1, 5],
};

/** The number printed in ISO 14644-1:2015 Table 1, or null where the cell is blank (not applicable). */
export function tableOneLimit(isoClass: IsoClass, sizeUm: number): number | null {
  if (!isoClasses.includes(isoClass)) throw new RangeError(`Table 1 has whole classes 1 to 9, got ${isoClass}`);
  if (!tableOneSizesUm.includes(sizeUm as (typeof tableOneSizesUm)[number])) {
    throw new RangeError(`Table 1 has the sizes ${tableOneSizesUm.join(', ')} µm, got ${sizeUm}`);
  }
  return tableOneColumnsByClass[isoClass].includes(sizeUm) ? classLimit(isoClass, sizeUm) : null;
}

// ISO 14644-1:2015 Table A.1 (from memory): minimum sampling locations by cleanroom area,
// "area less than or equal to (m²)" → locations. Above 1 000 m² the standard scales linearly.
const locationsByArea: ReadonlyArray<readonly [number, number]> = [
  [2, 1], [4, 2], [6, 3], [8, 4], [10, 5], [24, 6], [28, 7], [32, 8], [36, 9], [52, 10],
  [56, 11], [64, 12], [68, 13], [72, 14], [76, 15], [104, 16], [108, 17], [116, 18], [148, 19],
  [156, 20], [192, 21], [232, 22], [276, 23], [352, 24], [436, 25], [636, 26], [1000, 27],
];

/**
 * Minimum number of sampling locations for a clean area (ISO 14644-1:2015 Table A.1).
 * For unidirectional airflow (a clean bench) the area may be taken as the cross-section of the
 * moving air perpendicular to the flow, which is why a bench usually needs a single location.
 */
export function minimumSamplingLocations(areaM2: number): number {
  if (!Number.isFinite(areaM2) || areaM2 <= 0) throw new RangeError(`area must be a positive number of m², got ${areaM2}`);
  const row = locationsByArea.find(([upTo]) => areaM2 <= upTo);
  return row ? row[1] : Math.ceil(27 * (areaM2 / 1000));
}

/**
 * Minimum single-sample volume in litres (ISO 14644-1:2015 A.4.4, from memory):
 * Vs = 20 / Cn,m × 1000, where Cn,m is the class limit at the largest considered size; at least 2 litres.
 * (The standard also asks for at least one minute of sampling; certificates here do not carry durations.)
 */
export function minimumSampleVolumeLitres(isoClass: number, largestSizeUm: number): number {
  return Math.max(2, (20 / classLimit(isoClass, largestSizeUm)) * 1000);
}

export interface ParticleSample {
  /** Sampling location as labelled on the certificate ("L1", "bench left"). */
  location: string;
  /** Particle size threshold in µm; the concentration counts particles of this size or larger. */
  sizeUm: number;
  /** Cumulative concentration, particles ≥ sizeUm per cubic metre of air. */
  perM3: number;
  /** Air volume of this sample in litres, when the certificate reports it. */
  volumeLitres?: number;
}

export interface ParticleCountCertificate {
  /** Calendar date of the test, YYYY-MM-DD. */
  testedOn: string;
  /** Area of the clean zone in m² (for a clean bench, the cross-section of its airflow). */
  areaM2: number;
  samples: readonly ParticleSample[];
}

export interface LocationMean {
  location: string;
  sizeUm: number;
  meanPerM3: number;
  samples: number;
}

export interface ClassFailure {
  kind: 'over_limit' | 'too_few_locations' | 'sample_volume' | 'no_applicable_size' | 'unusable_data';
  message: string;
  location?: string;
  sizeUm?: number;
  meanPerM3?: number;
  limitPerM3?: number;
}

export interface ClassEvaluation {
  isoClass: IsoClass;
  met: boolean;
  failures: ClassFailure[];
}

export interface CleanAirClassification {
  /** Cleanest whole ISO class the certificate demonstrates, or null if it demonstrates none (or is unusable). */
  isoClass: IsoClass | null;
  testedOn: string;
  /** Per-location means by size, the figures the classification rests on. */
  means: LocationMean[];
  /** Why the next cleaner class was not met (empty when class 1 is met or the data is unusable). */
  cleanerClassFailures: ClassFailure[];
  /** Data errors that make the certificate unusable; when present isoClass is null. */
  problems: string[];
  /** Remarks that do not change the result (sizes outside Table 1, for example). */
  notes: string[];
}

const isoDatePattern = /^\d{4}-\d{2}-\d{2}$/;

export function parseCalendarDate(value: string, what: string): DateTime {
  const parsed = isoDatePattern.test(value) ? DateTime.fromISO(value, { zone: 'UTC' }) : null;
  if (!parsed?.isValid) throw new RangeError(`${what} must be a calendar date YYYY-MM-DD, got "${value}"`);
  return parsed;
}

function formatCount(value: number): string {
  return Math.round(value).toString().replace(/\B(?=(\d{3})+(?!\d))/g, ' ');
}

interface PreparedCertificate {
  means: LocationMean[];
  locations: string[];
  problems: string[];
  notes: string[];
}

function prepare(certificate: ParticleCountCertificate): PreparedCertificate {
  parseCalendarDate(certificate.testedOn, 'testedOn');
  if (!Number.isFinite(certificate.areaM2) || certificate.areaM2 <= 0) {
    throw new RangeError(`areaM2 must be a positive number, got ${certificate.areaM2}`);
  }
  const problems: string[] = [];
  const notes: string[] = [];
  if (certificate.samples.length === 0) problems.push('The certificate has no particle counts.');

  const groups = new Map<string, { location: string; sizeUm: number; values: number[] }>();
  certificate.samples.forEach((sample, index) => {
    if (typeof sample.location !== 'string' || sample.location.trim() === '') {
      throw new RangeError(`samples[${index}].location must be a non-empty label`);
    }
    if (!Number.isFinite(sample.perM3) || sample.perM3 < 0) {
      throw new RangeError(`samples[${index}].perM3 must be a non-negative concentration, got ${sample.perM3}`);
    }
    if (sample.volumeLitres !== undefined && (!Number.isFinite(sample.volumeLitres) || sample.volumeLitres <= 0)) {
      throw new RangeError(`samples[${index}].volumeLitres must be a positive number of litres, got ${sample.volumeLitres}`);
    }
    assertParticleSize(sample.sizeUm);
    const key = `${sample.location}\u0000${sample.sizeUm}`;
    const group = groups.get(key) ?? { location: sample.location, sizeUm: sample.sizeUm, values: [] };
    group.values.push(sample.perM3);
    groups.set(key, group);
  });

  const means: LocationMean[] = [...groups.values()]
    .map((g) => ({
      location: g.location,
      sizeUm: g.sizeUm,
      meanPerM3: g.values.reduce((sum, v) => sum + v, 0) / g.values.length,
      samples: g.values.length,
    }))
    .sort((a, b) => a.location.localeCompare(b.location) || a.sizeUm - b.sizeUm);
  const locations = [...new Set(means.map((m) => m.location))];

  // Counts are cumulative (≥ D), so a larger size can never hold more particles than a smaller one.
  for (const location of locations) {
    const atLocation = means.filter((m) => m.location === location);
    for (let i = 1; i < atLocation.length; i += 1) {
      const smaller = atLocation[i - 1];
      const larger = atLocation[i];
      if (larger.meanPerM3 > smaller.meanPerM3) {
        problems.push(
          `At ${location}, ≥${larger.sizeUm} µm averages ${formatCount(larger.meanPerM3)}/m³, more than ` +
            `≥${smaller.sizeUm} µm (${formatCount(smaller.meanPerM3)}/m³); cumulative counts cannot rise with size.`,
        );
      }
    }
  }

  const offTable = [...new Set(means.map((m) => m.sizeUm))].filter(
    (size) => !tableOneSizesUm.includes(size as (typeof tableOneSizesUm)[number]),
  );
  if (offTable.length > 0) {
    notes.push(`Sizes ${offTable.join(', ')} µm are not Table 1 columns and were not used for classification.`);
  }
  return { means, locations, problems, notes };
}

function evaluatePrepared(
  certificate: ParticleCountCertificate,
  prepared: PreparedCertificate,
  isoClass: IsoClass,
): ClassEvaluation {
  const failures: ClassFailure[] = [];
  const applicable = prepared.means.filter(
    (m) => tableOneSizesUm.includes(m.sizeUm as (typeof tableOneSizesUm)[number]) && tableOneLimit(isoClass, m.sizeUm) !== null,
  );
  if (applicable.length === 0) {
    failures.push({
      kind: 'no_applicable_size',
      message: `No reported particle size has a class ${isoClass} limit in ISO 14644-1:2015 Table 1.`,
    });
    return { isoClass, met: false, failures };
  }

  const required = minimumSamplingLocations(certificate.areaM2);
  const locationsWithData = new Set(applicable.map((m) => m.location));
  if (locationsWithData.size < required) {
    failures.push({
      kind: 'too_few_locations',
      message: `${certificate.areaM2} m² needs at least ${required} sampling locations (ISO 14644-1:2015 Table A.1); the certificate has ${locationsWithData.size}.`,
    });
  }

  for (const mean of applicable) {
    const limit = tableOneLimit(isoClass, mean.sizeUm) as number;
    if (mean.meanPerM3 > limit) {
      failures.push({
        kind: 'over_limit',
        message: `At ${mean.location}, ≥${mean.sizeUm} µm averages ${formatCount(mean.meanPerM3)}/m³; the class ${isoClass} limit is ${formatCount(limit)}/m³.`,
        location: mean.location,
        sizeUm: mean.sizeUm,
        meanPerM3: mean.meanPerM3,
        limitPerM3: limit,
      });
    }
  }

  const largestSize = Math.max(...applicable.map((m) => m.sizeUm));
  const minimumVolume = minimumSampleVolumeLitres(isoClass, largestSize);
  const applicableSizes = new Set(applicable.map((m) => m.sizeUm));
  const tooSmall = certificate.samples.filter(
    (s) => applicableSizes.has(s.sizeUm) && s.volumeLitres !== undefined && s.volumeLitres < minimumVolume,
  );
  if (tooSmall.length > 0) {
    failures.push({
      kind: 'sample_volume',
      message: `${tooSmall.length} sample(s) drew less than the ${minimumVolume.toFixed(1)} L that class ${isoClass} at ${largestSize} µm needs (ISO 14644-1:2015 A.4.4).`,
    });
  }
  return { isoClass, met: failures.length === 0, failures };
}

/** Whether a certificate demonstrates one whole ISO class, and every reason it does not. */
export function evaluateClass(certificate: ParticleCountCertificate, isoClass: IsoClass): ClassEvaluation {
  const prepared = prepare(certificate);
  if (prepared.problems.length > 0) {
    return {
      isoClass,
      met: false,
      failures: prepared.problems.map((message) => ({ kind: 'unusable_data' as const, message })),
    };
  }
  return evaluatePrepared(certificate, prepared, isoClass);
}

/**
 * The cleanest whole ISO class a certificate demonstrates: every location's mean concentration at every
 * reported Table 1 size that has a limit for the class is within that limit (ISO 14644-1:2015 A.6; the 2015
 * edition dropped the 95 % upper confidence limit), with enough locations and large enough samples.
 */
export function classifyCertificate(certificate: ParticleCountCertificate): CleanAirClassification {
  const prepared = prepare(certificate);
  const base = { testedOn: certificate.testedOn, means: prepared.means, problems: prepared.problems, notes: prepared.notes };
  if (prepared.problems.length > 0) return { ...base, isoClass: null, cleanerClassFailures: [] };

  let previousFailures: ClassFailure[] = [];
  for (const isoClass of isoClasses) {
    const evaluation = evaluatePrepared(certificate, prepared, isoClass);
    if (evaluation.met) return { ...base, isoClass, cleanerClassFailures: previousFailures };
    previousFailures = evaluation.failures;
  }
  return { ...base, isoClass: null, cleanerClassFailures: previousFailures };
}

/**
 * Maximum time between particle-count tests (ISO 14644-2:2015 Table 1, from memory):
 * 6 months for ISO class 5 and cleaner, 12 months for classes above 5.
 */
export function retestIntervalMonths(isoClass: IsoClass): 6 | 12 {
  if (!isoClasses.includes(isoClass)) throw new RangeError(`ISO class must be a whole class 1 to 9, got ${isoClass}`);
  return isoClass <= 5 ? 6 : 12;
}

/** Last day the certificate counts as current (YYYY-MM-DD); month ends clamp (31 Aug + 6 months = 28/29 Feb). */
export function retestDueDate(testedOn: string, isoClass: IsoClass): string {
  return parseCalendarDate(testedOn, 'testedOn').plus({ months: retestIntervalMonths(isoClass) }).toISODate() as string;
}

/** Whether a test on testedOn is still within its re-test interval on the calendar date onDate (both YYYY-MM-DD). */
export function isCertificateCurrent(testedOn: string, isoClass: IsoClass, onDate: string): boolean {
  const on = parseCalendarDate(onDate, 'onDate');
  const tested = parseCalendarDate(testedOn, 'testedOn');
  if (on < tested) return false; // a test dated in the future is a data error, not a current certificate
  return on <= parseCalendarDate(retestDueDate(testedOn, isoClass), 'due date');
}
