// Boxes a shop can pick when it buys a label, with the room each leaves for cushioning.
// Packing rule (common practice in the trade, no published standard): at least 5 cm of cushioning on
// every side of the device, so a box fits a device when each inner dimension is at least the device's
// matching dimension plus 2 × 5 cm. Device sizes are the form factors' nominal sizes, from memory of the
// SFF-8301 (3.5″ drives), SFF-8201 (2.5″ drives) and PCI-SIG M.2 outlines and of the SD card size; phones,
// tablets and NAS units vary, so those are typical sizes of our own choosing.

import type { MediaType } from '../vocabulary';

export const CUSHION_CM = 5;
export const CM_PER_INCH = 2.54;
/** Single-wall corrugated board adds about 1/4 in to each side (from memory, common practice). */
export const WALL_IN = 0.25;

export interface Dimensions {
  lengthIn: number;
  widthIn: number;
  heightIn: number;
}

export interface BoxPreset {
  id: string;
  label: string;
  /** What it is meant for, in the shop's words. */
  description: string;
  inner: Dimensions;
  /** What the carrier measures: the inner size plus the walls. */
  outer: Dimensions;
  /** A typical packed weight, as a hint; the shop weighs the box. */
  typicalPackedWeightLb: number;
}

const box = (id: string, label: string, description: string, inner: Dimensions, typicalPackedWeightLb: number): BoxPreset => ({
  id,
  label,
  description,
  inner,
  outer: { lengthIn: inner.lengthIn + 2 * WALL_IN, widthIn: inner.widthIn + 2 * WALL_IN, heightIn: inner.heightIn + 2 * WALL_IN },
  typicalPackedWeightLb,
});

export const boxPresets = [
  box('small', 'Small box', 'Memory cards, USB sticks, M.2 and 2.5″ drives', { lengthIn: 8, widthIn: 7, heightIn: 5 }, 1.5),
  box('drive', 'Drive box', '3.5″ drives and tape cartridges', { lengthIn: 10, widthIn: 8, heightIn: 6 }, 3),
  box('handheld', 'Phone and tablet box', 'Phones and tablets up to 11 in', { lengthIn: 15, widthIn: 12, heightIn: 5 }, 3),
  box('large', 'Large box', 'A NAS unit or several drives in one case', { lengthIn: 16, widthIn: 14, heightIn: 12 }, 12),
] as const satisfies readonly BoxPreset[];

export type BoxPresetId = (typeof boxPresets)[number]['id'];
export const boxPresetIds = boxPresets.map((b) => b.id) as [BoxPresetId, ...BoxPresetId[]];

export function findBoxPreset(id: string): BoxPreset | undefined {
  return boxPresets.find((b) => b.id === id);
}

const mm = (l: number, w: number, h: number): Dimensions => ({ lengthIn: l / 25.4, widthIn: w / 25.4, heightIn: h / 25.4 });

/** Nominal (or, where marked, typical) outline of each kind of device. */
export const deviceSizes: Record<MediaType, Dimensions> = {
  hdd_3_5: mm(147, 101.6, 26.1), // SFF-8301 (from memory)
  hdd_2_5: mm(100.45, 69.85, 15), // SFF-8201, tallest common height (from memory)
  ssd_sata: mm(100.45, 69.85, 9.5), // SFF-8201 (from memory)
  ssd_m2_nvme: mm(80, 22, 3.5), // M.2 2280 (from memory)
  usb_flash: mm(70, 25, 12), // typical
  memory_card: mm(32, 24, 2.1), // SD card (from memory)
  phone: mm(165, 80, 10), // typical large phone
  tablet: mm(255, 180, 8), // typical 11 in tablet
  raid_nas: mm(230, 170, 110), // typical two-bay NAS
  tape: mm(102, 105.4, 21.5), // LTO cartridge (from memory)
  other: mm(150, 100, 30), // typical
};

const sortedDesc = (d: Dimensions) => [d.lengthIn, d.widthIn, d.heightIn].sort((a, b) => b - a);

/** Whether a device fits the box with at least 5 cm of cushioning on every side (turned any way). */
export function fitsWithCushioning(inner: Dimensions, device: Dimensions, cushionCm = CUSHION_CM): boolean {
  const cushionIn = cushionCm / CM_PER_INCH;
  const room = sortedDesc(inner);
  const need = sortedDesc(device);
  return need.every((d, i) => room[i]! + 1e-9 >= d + 2 * cushionIn);
}

/** The presets that fit a kind of device with its cushioning, smallest first. */
export function presetsFor(mediaType: MediaType): BoxPreset[] {
  const device = deviceSizes[mediaType];
  return boxPresets.filter((b) => fitsWithCushioning(b.inner, device));
}

/** The packing rules shown where the shop packs and where the clerk opens boxes (common practice). */
export const packingRules = [
  'Put the device in an anti-static bag, one device per bag.',
  'Surround it with at least 5 cm (2 in) of firm cushioning on every side, so it cannot move or touch the walls.',
  'Use a sturdy box, never a padded or loose envelope.',
  'Do not open, clean or power the device before it ships.',
] as const;

export const PACKING_RULES_SOURCE = "Common practice in the trade; the carrier's rules and local regulations decide.";
