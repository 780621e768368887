// Billable weight of a parcel: carriers charge for the greater of its actual weight and its
// dimensional ("volumetric") weight, so a light but bulky box costs what the space it takes costs.

/** Cubic inches per pound for domestic US parcels (from memory, published in carriers' service guides). */
export const DIM_DIVISOR_IN3_PER_LB = 139;
/** Cubic centimetres per kilogram, the usual metric divisor (from memory, carriers' service guides). */
export const DIM_DIVISOR_CM3_PER_KG = 5000;
/**
 * Metric weights are billed in half-kilogram steps by international carriers (from memory, common
 * practice); pass `stepKg: 1` for carriers that bill whole kilograms.
 */
export const DEFAULT_METRIC_STEP_KG = 0.5;

export interface ParcelInches {
  lengthIn: number;
  widthIn: number;
  heightIn: number;
  weightLb: number;
}

export interface ParcelCentimetres {
  lengthCm: number;
  widthCm: number;
  heightCm: number;
  weightKg: number;
}

export type BilledBy = 'actual' | 'dimensional';

export interface BillableWeightLb {
  actualLb: number;
  dimensionalLb: number;
  billableLb: number;
  billedBy: BilledBy;
}

export interface BillableWeightKg {
  actualKg: number;
  dimensionalKg: number;
  billableKg: number;
  billedBy: BilledBy;
}

function requirePositive(field: string, value: unknown, unit: string): number {
  if (typeof value !== 'number' || !Number.isFinite(value) || value <= 0) {
    throw new RangeError(`${field} must be a positive, finite number of ${unit}, got ${String(value)}`);
  }
  return value;
}

/**
 * Round up to the next multiple of `step`. The tiny tolerance keeps float noise
 * (13.9 × 13 × 10 ÷ 139 = 13.000000000000002) from billing a whole extra step.
 */
function roundUp(value: number, step: number): number {
  const steps = Math.ceil(value / step - 1e-9);
  return Math.max(1, steps) * step;
}

export function billableWeightLb(parcel: ParcelInches): BillableWeightLb {
  const length = requirePositive('lengthIn', parcel.lengthIn, 'inches');
  const width = requirePositive('widthIn', parcel.widthIn, 'inches');
  const height = requirePositive('heightIn', parcel.heightIn, 'inches');
  const weight = requirePositive('weightLb', parcel.weightLb, 'pounds');

  // Carriers round each weight up to the next whole pound before comparing.
  const actualLb = roundUp(weight, 1);
  const dimensionalLb = roundUp((length * width * height) / DIM_DIVISOR_IN3_PER_LB, 1);
  const billedBy: BilledBy = dimensionalLb > actualLb ? 'dimensional' : 'actual';
  return { actualLb, dimensionalLb, billableLb: Math.max(actualLb, dimensionalLb), billedBy };
}

export function billableWeightKg(
  parcel: ParcelCentimetres,
  { stepKg = DEFAULT_METRIC_STEP_KG }: { stepKg?: number } = {},
): BillableWeightKg {
  const length = requirePositive('lengthCm', parcel.lengthCm, 'centimetres');
  const width = requirePositive('widthCm', parcel.widthCm, 'centimetres');
  const height = requirePositive('heightCm', parcel.heightCm, 'centimetres');
  const weight = requirePositive('weightKg', parcel.weightKg, 'kilograms');
  requirePositive('stepKg', stepKg, 'kilograms');

  // Round to whole grams after stepping so 0.5-kg steps print as 1.5, not 1.5000000000000002.
  const tidy = (kg: number) => Math.round(kg * 1000) / 1000;
  const actualKg = tidy(roundUp(weight, stepKg));
  const dimensionalKg = tidy(roundUp((length * width * height) / DIM_DIVISOR_CM3_PER_KG, stepKg));
  const billedBy: BilledBy = dimensionalKg > actualKg ? 'dimensional' : 'actual';
  return { actualKg, dimensionalKg, billableKg: Math.max(actualKg, dimensionalKg), billedBy };
}
