import { z } from 'zod';
import { assessBattery, type BatteryAssessment, type BatteryDeclaration } from '@shared/domain/battery';
import { cautions as cautionTable, triage, type TriageResult } from '@shared/domain/triage';
import {
  addressSchema,
  batteryDeclarationSchema,
  counterReferralInput,
  deviceSchema,
  type DeviceInterface,
  type RoutingPreviewInput,
} from '@shared/schemas/referrals';
import {
  batteryMediaTypes,
  mediaTypes,
  sensitivityFlags,
  symptoms as symptomCodes,
  type BatteryCondition,
  type MediaType,
  type PriorityCategory,
  type SensitivityFlag,
  type Symptom,
} from '@shared/vocabulary';
import type { CautionItem } from '../components/caution-list';

// The counter form holds what its inputs hold (blank strings, a "ships from" choice, battery
// answers for a device that no longer has one); these pure functions turn that into the shared
// intake schema's input, the live preview's input, and the cautions shown while typing.

export interface IntakeFormValues {
  externalRef?: string;
  customer: { name: string; email: string; phone?: string };
  device: {
    mediaType: MediaType | '';
    capacityGb?: number;
    interface?: DeviceInterface | '';
    make?: string;
    model?: string;
    serial?: string;
    memberCount?: number;
  };
  symptoms: Symptom[];
  description?: string;
  priorities: { category: PriorityCategory; note?: string }[];
  sensitivity: SensitivityFlag[];
  battery?: { installed?: 'yes' | 'no' | boolean; condition?: BatteryCondition | ''; wattHours?: number; volts?: number; milliampHours?: number };
  /** Where the box leaves from: the shop's own address (the default) or another one. */
  shipsFrom: 'shop' | 'elsewhere';
  origin?: { line1?: string; city?: string; region?: string; postalCode?: string; country?: string };
  consent: { accepted: boolean };
}

export const emptyIntake: IntakeFormValues = {
  externalRef: '',
  customer: { name: '', email: '', phone: '' },
  device: { mediaType: '', interface: '', make: '', model: '', serial: '' },
  symptoms: [],
  description: '',
  priorities: [],
  sensitivity: [],
  shipsFrom: 'shop',
  origin: { line1: '', city: '', region: '', postalCode: '', country: 'US' },
  consent: { accepted: false },
};

/** '' → undefined, all the way down; arrays keep their (non-blank) items. */
function withoutBlanks(value: unknown): unknown {
  if (value === '' || value === null) return undefined;
  if (Array.isArray(value)) return value.map(withoutBlanks).filter((item) => item !== undefined);
  if (typeof value === 'object' && value !== undefined && !(value instanceof Date)) {
    const out: Record<string, unknown> = {};
    for (const [key, item] of Object.entries(value as Record<string, unknown>)) {
      const cleaned = withoutBlanks(item);
      if (cleaned !== undefined) out[key] = cleaned;
    }
    return out;
  }
  return value;
}

const asArray = <T>(value: unknown): T[] => (Array.isArray(value) ? (value as T[]) : []);

const isBatteryMedia = (mediaType: unknown): boolean => (batteryMediaTypes as readonly unknown[]).includes(mediaType);

/** The form's values as the shared intake schema expects them. */
export function cleanIntake(raw: unknown): Record<string, unknown> {
  const values = (withoutBlanks(raw) ?? {}) as Record<string, any>;
  const device = { ...(values.device ?? {}) };
  if (device.mediaType !== 'raid_nas') delete device.memberCount;

  const out: Record<string, unknown> = {
    ...values,
    device,
    symptoms: asArray<string>(values.symptoms),
    sensitivity: asArray<string>(values.sensitivity),
    priorities: asArray<Record<string, unknown>>(values.priorities).filter((p) => p && p.category),
  };
  delete out.shipsFrom;

  // Battery answers count only for a device that usually has a battery, and only once asked.
  // The yes/no radios hold strings.
  const battery = values.battery as Record<string, unknown> | undefined;
  const installed = battery?.installed === 'yes' || battery?.installed === true ? true : battery?.installed === 'no' || battery?.installed === false ? false : undefined;
  if (!isBatteryMedia(device.mediaType) || installed === undefined) delete out.battery;
  else if (!installed) out.battery = { installed: false };
  else out.battery = { ...battery, installed: true };

  if (values.shipsFrom !== 'elsewhere') delete out.origin;
  out.consent = { accepted: values.consent?.accepted === true };
  return out;
}

/**
 * The shared counter schema, reading the form's raw values, and asking for the battery
 * declaration that the counter must record for phones, tablets and other devices.
 */
export const intakeSchema = z.preprocess(
  cleanIntake,
  counterReferralInput.superRefine((input, ctx) => {
    if (isBatteryMedia(input.device.mediaType) && !input.battery) {
      ctx.addIssue({ code: 'custom', path: ['battery', 'installed'], message: 'Say whether a battery is installed' });
    }
  }),
) as unknown as z.ZodType<z.output<typeof counterReferralInput>, IntakeFormValues>;

/** The live ranking's input, or null while the device is not described well enough to rank labs. */
export function previewInputFrom(raw: unknown): RoutingPreviewInput | null {
  const values = cleanIntake(raw) as Record<string, any>;
  const device = deviceSchema.safeParse(values.device);
  if (!device.success) return null;
  const input: RoutingPreviewInput = {
    device: device.data,
    symptoms: asArray<Symptom>(values.symptoms).filter((s) => symptomCodes.includes(s)),
    sensitivity: asArray<SensitivityFlag>(values.sensitivity).filter((f) => f !== 'none' && sensitivityFlags.includes(f)),
  };
  const battery = batteryDeclarationSchema.safeParse(values.battery);
  if (values.battery && battery.success) input.battery = battery.data;
  const origin = addressSchema.safeParse(values.origin);
  if (values.origin && origin.success) input.origin = origin.data;
  return input;
}

export interface LiveCautions {
  /** Null until a media type is chosen. */
  triage: TriageResult | null;
  /** Null unless a battery is declared installed with its condition. */
  battery: BatteryAssessment | null;
  cautions: CautionItem[];
}

function batteryDeclarationFrom(values: Record<string, any>): BatteryDeclaration | undefined {
  const battery = values.battery as Record<string, unknown> | undefined;
  if (!battery) return undefined;
  if (battery.installed === false) return { installed: false };
  if (battery.installed !== true || !battery.condition) return undefined;
  const positive = (n: unknown) => (typeof n === 'number' && Number.isFinite(n) && n > 0 ? n : undefined);
  const declaration: BatteryDeclaration = { installed: true, condition: battery.condition as BatteryCondition };
  const wh = positive(battery.wattHours);
  const volts = positive(battery.volts);
  const mah = positive(battery.milliampHours);
  if (wh !== undefined) declaration.wattHours = wh;
  else if (volts !== undefined && mah !== undefined) {
    declaration.volts = volts;
    declaration.milliampHours = mah;
  }
  return declaration;
}

/** Triage and battery cautions computed in the browser as the clerk types: no server round trip. */
export function liveCautions(raw: unknown): LiveCautions {
  const values = cleanIntake(raw) as Record<string, any>;
  const mediaType = values.device?.mediaType as MediaType | undefined;
  if (!mediaType || !mediaTypes.includes(mediaType)) return { triage: null, battery: null, cautions: [] };

  const symptoms = asArray<Symptom>(values.symptoms).filter((s) => symptomCodes.includes(s));
  const sensitivity = asArray<SensitivityFlag>(values.sensitivity).filter((f) => f !== 'none' && sensitivityFlags.includes(f));
  const declaration = batteryDeclarationFrom(values);
  const memberCount = values.device?.memberCount as number | undefined;
  const validMembers = Number.isInteger(memberCount) && memberCount! >= 2 && memberCount! <= 64;

  const result = triage({
    mediaType,
    symptoms,
    sensitivity,
    // Until the clerk gives a valid member count, the array's caution is shown without it.
    raidMemberCount: mediaType === 'raid_nas' ? (validMembers ? memberCount : 2) : undefined,
    battery: declaration,
  });
  const cautions: CautionItem[] = result.cautions.map((c) =>
    c.code === 'raid_keep_members' && !validMembers ? { ...c, message: cautionTable.raid_keep_members.message } : c,
  );

  let battery: BatteryAssessment | null = null;
  if (declaration?.installed) {
    try {
      battery = assessBattery(declaration);
      cautions.push(...battery.cautions);
    } catch {
      // A half-typed rating; the field's own validation says what is wrong.
    }
  }
  return { triage: result, battery, cautions };
}
