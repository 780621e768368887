import {
  batteryMediaTypes,
  cleanAirSkills,
  labSkills,
  mediaTypes,
  sensitivityFlags,
  symptoms as symptomCodes,
  type BatteryCondition,
  type LabSkill,
  type MediaType,
  type SensitivityFlag,
  type Symptom,
} from '../vocabulary';
import type { BatteryDeclaration, CautionSeverity } from './battery';

// Triage: media type + symptoms (+ sensitivity, battery) → the skills a lab needs and the cautions the shop
// must see. Every rule is one row below with its reason. The rules are common practice in the data-recovery
// trade; there is no published source for them, and none of them replaces the lab's own evaluation.

export const cautionCodes = [
  'do_not_power_on',
  'do_not_open_drive',
  'do_not_remove_chips',
  'do_not_heat_board',
  'stop_using_device',
  'no_repair_tools',
  'trim_erases_deleted_data',
  'phone_deleted_data',
  'credentials_needed',
  'do_not_dry_with_heat',
  'raid_keep_members',
  'tape_do_not_rewind',
  'chain_of_custody',
  'health_data_agreement',
  'battery_not_declared',
  'other_media_review',
] as const;
export type CautionCode = (typeof cautionCodes)[number];

export type { CautionSeverity };

export interface Caution {
  code: CautionCode;
  severity: CautionSeverity;
  /** What the shop must (not) do, in one line. */
  message: string;
  /** Why, so the counter can explain it to the customer. */
  reason: string;
}

export const cautions: Record<CautionCode, Omit<Caution, 'code'>> = {
  do_not_power_on: {
    severity: 'danger',
    message: 'Do not power the device on again.',
    reason: 'Every power-on of a failing drive can add damage (heads scraping platters, a short spreading on the board) and can turn a recoverable case into a lost one.',
  },
  do_not_open_drive: {
    severity: 'danger',
    message: 'Do not open the drive.',
    reason: 'Heads fly nanometres above the platters; one dust particle from room air scratches them. Drives are opened only on a certified clean-air bench.',
  },
  do_not_remove_chips: {
    severity: 'danger',
    message: 'Do not heat the board or remove memory chips.',
    reason: 'Controllers scramble or encrypt what they write; a chip lifted without the right tools and the controller layout is usually unreadable or broken.',
  },
  do_not_heat_board: {
    severity: 'danger',
    message: 'Do not open, heat or micro-solder the board.',
    reason: 'Phone storage is encrypted with keys held in the main processor; if that processor is damaged the data is gone for good.',
  },
  stop_using_device: {
    severity: 'danger',
    message: 'Stop using the device: do not save, install or copy anything onto it.',
    reason: 'Deleted files stay on the media only until something new is written over them; recovery software installed on the same device overwrites them.',
  },
  no_repair_tools: {
    severity: 'warning',
    message: 'Do not run disk repair or reinstall the operating system.',
    reason: 'Repair tools (chkdsk, fsck, first aid) and reinstalls rewrite file-system structures the lab needs to rebuild the files.',
  },
  trim_erases_deleted_data: {
    severity: 'warning',
    message: 'Deleted data on an SSD is often unrecoverable; unplug it now.',
    reason: 'SSDs with TRIM erase deleted blocks in the background soon after deletion; the longer the drive stays powered, the less remains.',
  },
  phone_deleted_data: {
    severity: 'warning',
    message: 'Deleted files on a modern phone are rarely recoverable; check the customer’s cloud backups first.',
    reason: 'Modern phones encrypt each file with its own key and discard the key on deletion.',
  },
  credentials_needed: {
    severity: 'info',
    message: 'Ask the customer for the password, PIN or recovery key and send it to the lab separately.',
    reason: 'Encrypted data can only be read with its key; without it no lab can recover the files.',
  },
  do_not_dry_with_heat: {
    severity: 'danger',
    message: 'Do not charge it, dry it with heat or put it in rice; bag it as it is.',
    reason: 'Power and heat drive corrosion and short circuits; rice does not dry a board and leaves starch dust.',
  },
  raid_keep_members: {
    severity: 'danger',
    message: 'Do not rebuild, initialise or resync the array; label each member with its slot and send them all.',
    reason: 'A rebuild or resync onto a degraded array overwrites parity and data; the lab needs every member, and the order, to reconstruct it.',
  },
  tape_do_not_rewind: {
    severity: 'warning',
    message: 'Do not rewind, retension or splice the tape; send it in its case.',
    reason: 'A damaged or contaminated tape can snap or shed its coating on the next pass through a drive.',
  },
  chain_of_custody: {
    severity: 'warning',
    message: 'Do not browse or power the device; record who has handled it since it arrived.',
    reason: 'Legal evidence needs an unbroken, documented chain of custody; any access changes timestamps.',
  },
  health_data_agreement: {
    severity: 'info',
    message: 'Only labs that have signed the network’s health-data agreement will be offered this case.',
    reason: 'Health records carry legal duties for everyone who handles them.',
  },
  battery_not_declared: {
    severity: 'info',
    message: 'Record whether a battery is installed and its condition.',
    reason: 'Lithium batteries decide how the device may be shipped.',
  },
  other_media_review: {
    severity: 'info',
    message: 'Network staff will confirm which skills this device needs.',
    reason: 'Rules cover the listed media types only.',
  },
};

const HDD: readonly MediaType[] = ['hdd_3_5', 'hdd_2_5'];
// A RAID or NAS is almost always built from hard drives, so drive symptoms apply to its members.
const HDD_AND_ARRAYS: readonly MediaType[] = [...HDD, 'raid_nas'];
const SSD: readonly MediaType[] = ['ssd_sata', 'ssd_m2_nvme'];
const MOBILE: readonly MediaType[] = ['phone', 'tablet'];

export interface TriageRule {
  id: string;
  media: readonly MediaType[];
  /** The rule applies when any of these symptoms is reported; absent means it applies to the media type alone. */
  symptoms?: readonly Symptom[];
  /** Alternatively the rule applies to a sensitivity flag. */
  sensitivity?: SensitivityFlag;
  skills: readonly LabSkill[];
  cautions: readonly CautionCode[];
  reason: string;
}

// Common practice in the trade, no published source.
export const triageRules: readonly TriageRule[] = [
  // Always, by media type.
  { id: 'hdd-never-open', media: HDD_AND_ARRAYS, skills: [], cautions: ['do_not_open_drive'], reason: 'Hard drives are opened only in clean air.' },
  { id: 'ssd-flash-chips', media: [...SSD, 'usb_flash', 'memory_card'], skills: [], cautions: ['do_not_remove_chips'], reason: 'Flash media is read by the lab with controller-specific tools.' },
  { id: 'mobile-board', media: MOBILE, skills: [], cautions: ['do_not_heat_board'], reason: 'Phone and tablet data depends on the main board staying intact.' },
  { id: 'raid-array', media: ['raid_nas'], skills: ['raid_rebuild'], cautions: ['raid_keep_members'], reason: 'Any array case needs the layout (order, stripe size, parity) reconstructed from the members.' },
  { id: 'tape-media', media: ['tape'], skills: ['tape'], cautions: ['tape_do_not_rewind'], reason: 'Tape needs drives and software for the tape format.' },
  { id: 'other-media', media: ['other'], skills: ['logical'], cautions: ['other_media_review'], reason: 'No rules for other media; start from logical recovery and let the network confirm.' },

  // Hard drives, and the hard drives in an array.
  { id: 'hdd-clicking', media: HDD_AND_ARRAYS, symptoms: ['clicking'], skills: ['hdd_head_swap'], cautions: ['do_not_power_on'], reason: 'Repeated clicking is the usual sign of failed read/write heads; it needs a head swap from a matching donor in clean air.' },
  { id: 'hdd-beeping', media: HDD_AND_ARRAYS, symptoms: ['beeping'], skills: ['hdd_platter_work', 'hdd_head_swap'], cautions: ['do_not_power_on'], reason: 'Beeping or buzzing usually means heads stuck to the platters or a seized spindle; freeing them is platter work and the heads are usually replaced.' },
  { id: 'hdd-not-spinning', media: HDD_AND_ARRAYS, symptoms: ['not_spinning'], skills: ['hdd_electronics', 'hdd_platter_work'], cautions: ['do_not_power_on'], reason: 'A drive that does not spin has a failed board or motor driver, or a seized spindle that needs a platter transplant.' },
  { id: 'hdd-burnt', media: HDD_AND_ARRAYS, symptoms: ['burnt_smell'], skills: ['hdd_electronics'], cautions: ['do_not_power_on'], reason: 'A burnt smell points to a shorted protection diode or motor-driver chip; a board swap also needs the drive’s adaptive data moved across.' },
  { id: 'hdd-no-power', media: HDD_AND_ARRAYS, symptoms: ['no_power'], skills: ['hdd_electronics'], cautions: ['do_not_power_on'], reason: 'No sign of power is a board or power-circuit fault (or the enclosure’s bridge board on external drives).' },
  { id: 'hdd-not-detected', media: HDD_AND_ARRAYS, symptoms: ['not_detected'], skills: ['hdd_firmware'], cautions: ['do_not_power_on'], reason: 'A drive that spins up but is not detected usually has a firmware or service-area fault.' },
  { id: 'hdd-slow', media: HDD_AND_ARRAYS, symptoms: ['slow_or_freezing'], skills: ['hdd_firmware'], cautions: ['do_not_power_on'], reason: 'Slow reads and freezes mean weak heads or growing bad sectors; imaging needs hardware with head maps and read-retry control, and every hour of use wears the heads further.' },
  { id: 'hdd-dropped', media: HDD_AND_ARRAYS, symptoms: ['dropped'], skills: ['hdd_head_swap'], cautions: ['do_not_power_on'], reason: 'A drop commonly damages the heads, and powering a drive with damaged heads scratches the platters.' },
  { id: 'hdd-broken', media: HDD_AND_ARRAYS, symptoms: ['physically_broken'], skills: ['hdd_platter_work', 'hdd_electronics'], cautions: ['do_not_power_on'], reason: 'A broken case or bent frame means the platters must be moved to a donor and the board checked.' },
  { id: 'hdd-liquid', media: HDD_AND_ARRAYS, symptoms: ['liquid_damage'], skills: ['liquid_remediation', 'hdd_platter_work'], cautions: ['do_not_power_on', 'do_not_dry_with_heat'], reason: 'Liquid enters through the breather hole; the board must be cleaned and the platters cleaned in clean air before any read.' },
  { id: 'hdd-fire', media: HDD_AND_ARRAYS, symptoms: ['fire_damage'], skills: ['hdd_electronics', 'hdd_platter_work'], cautions: ['do_not_power_on'], reason: 'Heat ruins the board and soot or melted parts get inside; platters go to a donor.' },
  { id: 'hdd-wont-boot', media: HDD_AND_ARRAYS, symptoms: ['wont_boot'], skills: ['logical'], cautions: ['no_repair_tools'], reason: 'A drive that sounds normal but will not boot is most often a file-system or operating-system fault.' },

  // SSDs: the controller owns the data layout and usually encrypts it, so nearly every fault is controller work.
  { id: 'ssd-controller', media: SSD, symptoms: ['not_detected', 'no_power', 'slow_or_freezing', 'burnt_smell', 'physically_broken', 'dropped', 'fire_damage'], skills: ['ssd_controller'], cautions: ['do_not_power_on'], reason: 'An SSD that is missing, dead, slow or damaged needs its controller or firmware repaired; its chips cannot be read on their own.' },
  { id: 'ssd-liquid', media: SSD, symptoms: ['liquid_damage'], skills: ['liquid_remediation', 'ssd_controller'], cautions: ['do_not_power_on', 'do_not_dry_with_heat'], reason: 'The board must be cleaned before the controller can be brought up.' },
  { id: 'ssd-wont-boot', media: SSD, symptoms: ['wont_boot'], skills: ['logical'], cautions: ['no_repair_tools'], reason: 'A detected SSD that will not boot is most often a file-system or operating-system fault.' },
  { id: 'ssd-trim', media: SSD, symptoms: ['deleted_files', 'formatted'], skills: [], cautions: ['trim_erases_deleted_data'], reason: 'TRIM lets the SSD erase deleted blocks soon after deletion.' },

  // USB sticks and memory cards.
  { id: 'usb-chip-off', media: ['usb_flash'], symptoms: ['physically_broken', 'not_detected', 'no_power', 'burnt_smell', 'dropped', 'fire_damage', 'liquid_damage', 'slow_or_freezing'], skills: ['flash_chip_off'], cautions: ['do_not_power_on'], reason: 'A snapped or dead stick is read by removing the NAND chip and undoing the controller’s scrambling (some small sticks are monolithic; the lab checks).' },
  { id: 'card-monolith', media: ['memory_card'], symptoms: ['physically_broken', 'not_detected', 'no_power', 'burnt_smell', 'dropped', 'fire_damage', 'liquid_damage', 'slow_or_freezing'], skills: ['monolith_flash'], cautions: ['do_not_power_on'], reason: 'Most microSD and many SD cards are monolithic (controller and NAND in one package) and are read through test pads under the coating.' },
  { id: 'flash-liquid', media: ['usb_flash', 'memory_card'], symptoms: ['liquid_damage'], skills: ['liquid_remediation'], cautions: ['do_not_dry_with_heat'], reason: 'Contacts and pads must be cleaned of corrosion before reading.' },

  // Phones and tablets.
  { id: 'mobile-board-repair', media: MOBILE, symptoms: ['wont_boot', 'no_power', 'dropped', 'physically_broken', 'not_detected', 'burnt_smell', 'fire_damage', 'slow_or_freezing'], skills: ['phone_board'], cautions: ['do_not_power_on'], reason: 'Phone storage is encrypted with keys in the processor, so data comes back only by repairing the board until the phone boots.' },
  { id: 'mobile-liquid', media: MOBILE, symptoms: ['liquid_damage'], skills: ['liquid_remediation', 'phone_board'], cautions: ['do_not_power_on', 'do_not_dry_with_heat'], reason: 'Corrosion must be removed from the board before repair and a first boot.' },
  { id: 'mobile-deleted', media: MOBILE, symptoms: ['deleted_files', 'formatted'], skills: [], cautions: ['phone_deleted_data'], reason: 'File-based encryption destroys a deleted file’s key.' },

  // Tape and other media with damage.
  { id: 'tape-liquid', media: ['tape'], symptoms: ['liquid_damage'], skills: ['liquid_remediation'], cautions: ['do_not_dry_with_heat'], reason: 'Wet tape must be cleaned and dried under control before it is read.' },
  { id: 'other-liquid', media: ['other'], symptoms: ['liquid_damage'], skills: ['liquid_remediation'], cautions: ['do_not_power_on', 'do_not_dry_with_heat'], reason: 'Wet electronics must be cleaned before any power is applied.' },

  // Any media.
  { id: 'deleted-or-formatted', media: mediaTypes, symptoms: ['deleted_files', 'formatted'], skills: ['logical'], cautions: ['stop_using_device', 'no_repair_tools'], reason: 'Deleted or formatted data is recovered from file-system remains, which any new write can overwrite.' },
  { id: 'encrypted', media: mediaTypes, symptoms: ['encrypted'], skills: ['encrypted_volumes'], cautions: ['credentials_needed'], reason: 'Encrypted volumes need the key and tools for the encryption scheme.' },

  // Sensitivity.
  { id: 'legal-evidence', media: mediaTypes, sensitivity: 'legal_evidence', skills: ['forensic_custody'], cautions: ['chain_of_custody'], reason: 'Evidence needs a lab that keeps a forensic chain of custody.' },
  { id: 'health-records', media: mediaTypes, sensitivity: 'health_records', skills: [], cautions: ['health_data_agreement'], reason: 'Health records go only to labs that signed the network’s health-data agreement.' },
];

export const hazardousBatteryConditions: readonly BatteryCondition[] = ['swollen', 'damaged', 'leaking'];

export interface TriageInput {
  mediaType: MediaType;
  symptoms: readonly Symptom[];
  /** Empty or ['none'] when nothing sensitive; 'none' cannot be combined with other flags. */
  sensitivity?: readonly SensitivityFlag[];
  /** Number of member drives; required for raid_nas and only for it. */
  raidMemberCount?: number;
  battery?: BatteryDeclaration;
}

export interface MatchedRule {
  ruleId: string;
  /** The reported symptom or flag that triggered the rule; absent for media-type rules. */
  trigger?: Symptom | SensitivityFlag;
  skills: LabSkill[];
  reason: string;
}

export interface TriageResult {
  /** Every skill the lab must have, in vocabulary order. */
  requiredSkills: LabSkill[];
  /** Head swap or platter work is required, so the lab needs a current clean-air certificate. */
  needsCleanAir: boolean;
  needsHealthDataAgreement: boolean;
  /** Cautions for the shop, most severe first, each once. */
  cautions: Caution[];
  matchedRules: MatchedRule[];
  /** Reported symptoms no rule uses for this media type; the lab's evaluation covers them. */
  unmatchedSymptoms: Symptom[];
  /**
   * A swollen, damaged or leaking battery was declared: ground only, contact the lab first. The battery's own
   * cautions and shipping rules come from assessBattery() in battery.ts, so triage does not repeat them.
   */
  batteryHazard: boolean;
  /** The network should confirm the result by hand (other media). */
  needsReview: boolean;
}

const severityOrder: Record<CautionSeverity, number> = { danger: 0, warning: 1, info: 2 };
// A case with symptoms but no skill-giving rule still needs a lab that can image and read it.
const defaultSkill: LabSkill = 'logical';

function validate(input: TriageInput): { symptoms: Symptom[]; sensitivity: SensitivityFlag[] } {
  if (!mediaTypes.includes(input.mediaType)) {
    throw new RangeError(`mediaType must be one of ${mediaTypes.join(', ')}, got "${input.mediaType}"`);
  }
  if (!Array.isArray(input.symptoms)) throw new TypeError('symptoms must be an array of symptom codes');
  for (const s of input.symptoms) {
    if (!symptomCodes.includes(s)) throw new RangeError(`unknown symptom "${s}"; expected one of ${symptomCodes.join(', ')}`);
  }
  const sensitivity = [...new Set(input.sensitivity ?? [])];
  for (const f of sensitivity) {
    if (!sensitivityFlags.includes(f)) throw new RangeError(`unknown sensitivity flag "${f}"; expected one of ${sensitivityFlags.join(', ')}`);
  }
  if (sensitivity.includes('none') && sensitivity.length > 1) {
    throw new RangeError('sensitivity "none" cannot be combined with other flags');
  }
  if (input.mediaType === 'raid_nas') {
    const n = input.raidMemberCount;
    if (n === undefined || !Number.isInteger(n) || n < 2 || n > 64) {
      throw new RangeError(`raidMemberCount must be a whole number from 2 to 64 for raid_nas, got ${n}`);
    }
  } else if (input.raidMemberCount !== undefined) {
    throw new RangeError(`raidMemberCount applies only to raid_nas, not to ${input.mediaType}`);
  }
  if (input.battery?.installed && input.battery.condition === undefined) {
    throw new RangeError('battery.condition is required when a battery is installed');
  }
  return { symptoms: [...new Set(input.symptoms)], sensitivity: sensitivity.filter((f) => f !== 'none') };
}

function cautionFor(code: CautionCode, input: TriageInput): Caution {
  const caution = { code, ...cautions[code] };
  if (code === 'raid_keep_members' && input.raidMemberCount !== undefined) {
    return { ...caution, message: `${caution.message} This array has ${input.raidMemberCount} members: send all ${input.raidMemberCount}.` };
  }
  return caution;
}

/** Works out the skills a case needs and the cautions the shop must see. Pure; throws RangeError on bad input. */
export function triage(input: TriageInput): TriageResult {
  const { symptoms, sensitivity } = validate(input);
  const matchedRules: MatchedRule[] = [];
  const cautionSet = new Set<CautionCode>();
  const usedSymptoms = new Set<Symptom>();

  for (const rule of triageRules) {
    if (!rule.media.includes(input.mediaType)) continue;
    let trigger: Symptom | SensitivityFlag | undefined;
    if (rule.symptoms) {
      trigger = symptoms.find((s) => rule.symptoms?.includes(s));
      if (trigger === undefined) continue;
      for (const s of symptoms) if (rule.symptoms.includes(s)) usedSymptoms.add(s);
    } else if (rule.sensitivity) {
      if (!sensitivity.includes(rule.sensitivity)) continue;
      trigger = rule.sensitivity;
    }
    matchedRules.push({ ruleId: rule.id, ...(trigger ? { trigger } : {}), skills: [...rule.skills], reason: rule.reason });
    rule.cautions.forEach((c) => cautionSet.add(c));
  }

  const skillSet = new Set<LabSkill>(matchedRules.flatMap((r) => r.skills));
  if (skillSet.size === 0 || [...skillSet].every((s) => s === 'forensic_custody')) {
    skillSet.add(defaultSkill);
    matchedRules.push({
      ruleId: 'default-logical',
      skills: [defaultSkill],
      reason: 'No symptom calls for hardware work, so the case needs imaging and logical recovery.',
    });
  }

  const condition = input.battery?.installed ? input.battery.condition : undefined;
  const batteryHazard = condition !== undefined && hazardousBatteryConditions.includes(condition);
  if (batteryMediaTypes.includes(input.mediaType) && input.battery === undefined) cautionSet.add('battery_not_declared');

  const requiredSkills = labSkills.filter((s) => skillSet.has(s));
  const orderedCautions = cautionCodes
    .filter((c) => cautionSet.has(c))
    .map((c) => cautionFor(c, input))
    .sort((a, b) => severityOrder[a.severity] - severityOrder[b.severity]);

  return {
    requiredSkills,
    needsCleanAir: requiredSkills.some((s) => cleanAirSkills.includes(s)),
    needsHealthDataAgreement: sensitivity.includes('health_records'),
    cautions: orderedCautions,
    matchedRules,
    unmatchedSymptoms: symptoms.filter((s) => !usedSymptoms.has(s)),
    batteryHazard,
    needsReview: input.mediaType === 'other',
  };
}
