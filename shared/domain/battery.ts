// Lithium-ion batteries inside the devices shops send to labs (phones, tablets, laptops).
// Rules from memory of IATA DGR Packing Instruction 967 (lithium ion batteries contained in
// equipment), IATA Special Provision A154 (damaged or defective batteries forbidden by air) and
// US 49 CFR 173.185 (small-battery exceptions in (c), damaged or defective batteries in (f)).
// These are general rules shown where the work happens; the carrier and local regulations decide,
// and every message says so. Lithium metal (non-rechargeable) cells are outside this module.

import { batteryConditions, type BatteryCondition } from '../vocabulary';

/** Per battery contained in equipment, the small lithium-ion battery limit (PI 967 / 49 CFR 173.185(c), from memory). */
export const SMALL_BATTERY_MAX_WH = 100;

/** UN number for lithium ion batteries contained in equipment. */
export const UN_LITHIUM_ION_IN_EQUIPMENT = 'UN3481';

/** Appended to every caution and reason: the rules here are general; the carrier's rules decide. */
export const DEFER_TO_CARRIER = "The carrier's rules and local regulations decide.";

/** Text for the lithium battery mark on a box with a small battery installed in the device. */
export const LITHIUM_BATTERY_MARK_TEXT = `Lithium ion batteries contained in equipment — ${UN_LITHIUM_ION_IN_EQUIPMENT}`;

/** Mark for a damaged or defective battery by ground (49 CFR 173.185(f), from memory). */
export const DAMAGED_BATTERY_MARK_TEXT = `Damaged/defective lithium ion battery — ${UN_LITHIUM_ION_IN_EQUIPMENT}`;

export type CautionSeverity = 'info' | 'warning' | 'danger';

export interface BatteryCaution {
  code: string;
  severity: CautionSeverity;
  message: string;
}

export interface BatteryDeclaration {
  installed: boolean;
  /** Required when a battery is installed. */
  condition?: BatteryCondition;
  /** Rated energy from the battery label; when missing it is worked out from volts and milliamp-hours. */
  wattHours?: number;
  volts?: number;
  milliampHours?: number;
}

export interface BatteryAssessment {
  wattHours: number | null;
  airAllowed: boolean;
  shippable: boolean;
  markText: string | null;
  /** The shop must talk to the lab before the box leaves (damaged battery). */
  contactLabFirst: boolean;
  cautions: BatteryCaution[];
  reasons: string[];
}

function requirePositive(field: string, value: unknown, unit: string): number {
  if (typeof value !== 'number' || !Number.isFinite(value) || value <= 0) {
    throw new RangeError(`${field} must be a positive, finite number of ${unit}, got ${String(value)}`);
  }
  return value;
}

/** Rated energy in watt-hours: nominal volts × amp-hours (1 Ah = 1 000 mAh). */
export function wattHours(volts: number, milliampHours: number): number {
  requirePositive('volts', volts, 'volts');
  requirePositive('milliampHours', milliampHours, 'milliamp-hours');
  return (volts * milliampHours) / 1000;
}

function formatWh(wh: number): string {
  return `${Number(wh.toFixed(1))} Wh`;
}

const deferred = (text: string) => `${text} ${DEFER_TO_CARRIER}`;

const conditionWords: Record<Exclude<BatteryCondition, 'intact'>, string> = {
  swollen: 'A swollen',
  damaged: 'A damaged',
  leaking: 'A leaking',
};

export function assessBattery(declaration: BatteryDeclaration): BatteryAssessment {
  if (typeof declaration?.installed !== 'boolean') {
    throw new TypeError('installed must be true or false');
  }
  if (!declaration.installed) {
    return {
      wattHours: null,
      airAllowed: true,
      shippable: true,
      markText: null,
      contactLabFirst: false,
      cautions: [],
      reasons: [deferred('No battery installed, so the lithium battery rules do not apply to this box.')],
    };
  }

  const { condition } = declaration;
  if (!condition || !(batteryConditions as readonly string[]).includes(condition)) {
    throw new RangeError(`condition must be one of ${batteryConditions.join(', ')}, got ${String(condition)}`);
  }

  let rating: number | null = null;
  if (declaration.wattHours !== undefined) {
    rating = requirePositive('wattHours', declaration.wattHours, 'watt-hours');
  } else if (declaration.volts !== undefined && declaration.milliampHours !== undefined) {
    rating = wattHours(declaration.volts, declaration.milliampHours);
  } else if (declaration.volts !== undefined || declaration.milliampHours !== undefined) {
    // Check the half we have, so a typo still gets a clear error rather than "rating unknown".
    if (declaration.volts !== undefined) requirePositive('volts', declaration.volts, 'volts');
    if (declaration.milliampHours !== undefined) requirePositive('milliampHours', declaration.milliampHours, 'milliamp-hours');
  }

  const cautions: BatteryCaution[] = [];
  const reasons: string[] = [];
  let airAllowed = true;
  let shippable = true;
  let markText: string | null = LITHIUM_BATTERY_MARK_TEXT;
  const damaged = condition !== 'intact';

  if (rating !== null && rating > SMALL_BATTERY_MAX_WH) {
    shippable = false;
    airAllowed = false;
    markText = null;
    const text = `The battery is rated ${formatWh(rating)}, over the ${SMALL_BATTERY_MAX_WH} Wh small-battery limit (IATA PI 967, 49 CFR 173.185(c)): it ships only as fully regulated dangerous goods (Class 9), which our network does not handle. Contact the lab to arrange another way.`;
    reasons.push(deferred(text));
    cautions.push({ code: 'battery_over_limit', severity: 'danger', message: deferred(text) });
  } else if (rating !== null) {
    reasons.push(
      deferred(
        `The battery is rated ${formatWh(rating)}, within the ${SMALL_BATTERY_MAX_WH} Wh limit for a battery contained in equipment (IATA PI 967, 49 CFR 173.185(c)).`,
      ),
    );
  } else {
    // Without a rating we cannot show the box is within the small-battery limit, so no air service.
    airAllowed = false;
    const text =
      'The battery rating is unknown. Read the watt-hours (or volts and mAh) from the battery or the device label; only a battery of 100 Wh or less may ship in the device, and air services need the rating.';
    reasons.push(deferred(text));
    cautions.push({ code: 'battery_rating_unknown', severity: 'warning', message: deferred(text) });
  }

  if (damaged) {
    airAllowed = false;
    const what = conditionWords[condition];
    reasons.push(
      deferred(`${what} lithium battery is forbidden by air (IATA Special Provision A154), so only ground services are offered.`),
    );
    cautions.push({
      code: 'battery_fire_risk',
      severity: 'danger',
      message: deferred(
        `${what} lithium battery can catch fire. Do not charge it or switch the device on, keep it away from heat, isolate it in a non-combustible container, and contact the lab before shipping.`,
      ),
    });
    if (shippable) {
      markText = DAMAGED_BATTERY_MARK_TEXT;
      cautions.push({
        code: 'battery_damaged_ground_packing',
        severity: 'warning',
        message: deferred(
          'By ground, a damaged battery must travel in its own non-metallic inner packaging surrounded by non-combustible, non-conductive cushioning, with the damaged-battery mark (49 CFR 173.185(f)); many carriers refuse it.',
        ),
      });
    }
  }

  if (shippable) {
    cautions.push({
      code: 'battery_switch_off',
      severity: 'info',
      message: deferred(
        'Switch the device off and pack it so it cannot be switched on by accident; put the lithium battery mark on the box.',
      ),
    });
  }

  return { wattHours: rating, airAllowed, shippable, markText, contactLabFirst: damaged, cautions, reasons };
}
