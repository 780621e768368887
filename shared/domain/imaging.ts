// Imaging (cloning a patient drive sector by sector) progress and time estimates.
// Capacities follow the drive makers' convention: SI decimal prefixes, 1 TB = 10^12 bytes.
// Binary prefixes (KiB, MiB, …) follow IEC 80000-13 and are accepted where written out.

export interface ImagingProgressInput {
  /** Capacity of the source drive, in bytes. */
  totalBytes: number;
  /** Bytes the imager has got through so far: copied data plus unreadable areas it has passed over. */
  bytesRead: number;
  /** Current sustained read rate, in bytes per second; 0 while the imager is stalled or paused. */
  rateBytesPerSec: number;
  /** Sectors inside `bytesRead` that could not be read (yet). */
  unreadableSectors?: number;
  /** Logical sector size used to turn unreadable sectors into bytes; 512 unless the drive reports 4096. */
  sectorSizeBytes?: number;
}

export interface ImagingProgress {
  /** Share of the drive passed over, 0–100. */
  percent: number;
  remainingBytes: number;
  /** Seconds left at the current rate; null when the rate is 0 and bytes remain (no honest estimate). */
  remainingSeconds: number | null;
  unreadableSectors: number;
  unreadableBytes: number;
  /** Bytes actually copied so far (`bytesRead` minus unreadable bytes). */
  copiedBytes: number;
  /** Expected finish time counted from `now`; null when `remainingSeconds` is null. */
  etaFrom(now: Date): Date | null;
}

function requireNonNegative(name: string, value: number): void {
  if (typeof value !== 'number' || !Number.isFinite(value) || value < 0) {
    throw new RangeError(`${name} must be a non-negative finite number, got ${String(value)}`);
  }
}

function requireNonNegativeInteger(name: string, value: number): void {
  if (typeof value !== 'number' || !Number.isSafeInteger(value) || value < 0) {
    throw new RangeError(`${name} must be a non-negative whole number, got ${String(value)}`);
  }
}

export function imagingProgress(input: ImagingProgressInput): ImagingProgress {
  const { totalBytes, bytesRead, rateBytesPerSec, unreadableSectors = 0, sectorSizeBytes = 512 } = input;
  requireNonNegativeInteger('totalBytes', totalBytes);
  if (totalBytes === 0) throw new RangeError('totalBytes must be greater than 0');
  requireNonNegativeInteger('bytesRead', bytesRead);
  if (bytesRead > totalBytes) {
    throw new RangeError(`bytesRead (${bytesRead}) cannot exceed totalBytes (${totalBytes})`);
  }
  requireNonNegative('rateBytesPerSec', rateBytesPerSec);
  requireNonNegativeInteger('unreadableSectors', unreadableSectors);
  requireNonNegativeInteger('sectorSizeBytes', sectorSizeBytes);
  if (sectorSizeBytes === 0) throw new RangeError('sectorSizeBytes must be greater than 0');

  const unreadableBytes = unreadableSectors * sectorSizeBytes;
  if (unreadableBytes > bytesRead) {
    throw new RangeError(
      `unreadableSectors (${unreadableSectors} × ${sectorSizeBytes} B) cannot exceed bytesRead (${bytesRead})`,
    );
  }

  const remainingBytes = totalBytes - bytesRead;
  // A finished image needs no time, whatever the last rate was; otherwise a zero rate has no estimate.
  const remainingSeconds = remainingBytes === 0 ? 0 : rateBytesPerSec > 0 ? remainingBytes / rateBytesPerSec : null;

  return {
    percent: (bytesRead / totalBytes) * 100,
    remainingBytes,
    remainingSeconds,
    unreadableSectors,
    unreadableBytes,
    copiedBytes: bytesRead - unreadableBytes,
    etaFrom(now: Date): Date | null {
      if (!(now instanceof Date) || Number.isNaN(now.getTime())) throw new TypeError('now must be a valid Date');
      return remainingSeconds === null ? null : new Date(now.getTime() + remainingSeconds * 1000);
    },
  };
}

/** Seconds to image a whole drive at a sustained read rate: bytes ÷ rate. */
export function estimateImagingSeconds(totalBytes: number, rateBytesPerSec: number): number {
  requireNonNegative('totalBytes', totalBytes);
  requireNonNegative('rateBytesPerSec', rateBytesPerSec);
  if (rateBytesPerSec === 0) throw new RangeError('rateBytesPerSec must be greater than 0 to estimate a duration');
  return totalBytes / rateBytesPerSec;
}

const siPrefixes = ['', 'k', 'M', 'G', 'T', 'P', 'E'] as const;
const iecPrefixes = ['', 'Ki', 'Mi', 'Gi', 'Ti', 'Pi', 'Ei'] as const;

/** Multiplier for each unit, keyed by the unit in lower case (prefix case is not meaningful for bytes here). */
const unitMultipliers = new Map<string, number>();
siPrefixes.forEach((prefix, power) => unitMultipliers.set(`${prefix}B`.toLowerCase(), 1000 ** power));
iecPrefixes.forEach((prefix, power) => unitMultipliers.set(`${prefix}B`.toLowerCase(), 1024 ** power));
unitMultipliers.set('byte', 1);
unitMultipliers.set('bytes', 1);

/**
 * Parses a capacity such as "2 TB", "500GB", "1.5 TB", "4 TiB" or "1,000,204,886,016 bytes" into bytes.
 * Bit notation ("2 Tb") is refused rather than guessed.
 */
export function parseCapacity(text: string): number {
  if (typeof text !== 'string') throw new TypeError('capacity must be a string such as "2 TB"');
  const match = /^\s*(\d{1,3}(?:,\d{3})+|\d+(?:\.\d+)?|\.\d+)\s*([A-Za-z]+)?\s*$/.exec(text);
  if (!match) throw new RangeError(`"${text}" is not a capacity; write a number and a unit, such as "2 TB"`);
  const [, numberText, unitText = 'B'] = match;
  const value = Number(numberText.replace(/,/g, ''));

  // "Tb", "Gb", "Mb" (upper-case prefix, lower-case b) is the bit notation of line rates; all lower-case
  // "500gb" is how people type bytes, so only the mixed form is refused.
  const isBytesWord = /^bytes?$/i.test(unitText);
  if (!isBytesWord && unitText.endsWith('b') && unitText !== unitText.toLowerCase()) {
    throw new RangeError(`"${text}" is in bits ("${unitText}"); capacities are in bytes, e.g. "${numberText} ${unitText.slice(0, -1)}B"`);
  }
  const multiplier = unitMultipliers.get(unitText.toLowerCase());
  if (multiplier === undefined) {
    throw new RangeError(`"${unitText}" is not a known unit; use B, kB, MB, GB, TB, PB or KiB, MiB, GiB, TiB, PiB`);
  }
  const bytes = Math.round(value * multiplier);
  if (!Number.isSafeInteger(bytes)) throw new RangeError(`"${text}" is too large to represent exactly in bytes`);
  return bytes;
}

export interface FormatBytesOptions {
  /** Use IEC binary prefixes (KiB, MiB…, powers of 1024) instead of SI (kB, MB…, powers of 1000). */
  binary?: boolean;
  /** Significant digits kept for values of 1 kB and above; trailing zeros are dropped. Default 3. */
  significantDigits?: number;
}

/** Formats a byte count the way drive labels do: "2 TB", "250 GB", "1.5 TB", "999 B". */
export function formatBytes(bytes: number, options: FormatBytesOptions = {}): string {
  requireNonNegative('bytes', bytes);
  const { binary = false, significantDigits = 3 } = options;
  if (!Number.isInteger(significantDigits) || significantDigits < 1 || significantDigits > 21) {
    throw new RangeError(`significantDigits must be a whole number from 1 to 21, got ${significantDigits}`);
  }
  const base = binary ? 1024 : 1000;
  const prefixes = binary ? iecPrefixes : siPrefixes;
  if (bytes < base) return `${Math.round(bytes)} B`;

  // Counted by comparison, not by logarithm, so exact powers (10^12) never land one unit low.
  let power = 0;
  while (power < prefixes.length - 1 && bytes >= base ** (power + 1)) power += 1;
  let scaled = Number((bytes / base ** power).toPrecision(significantDigits));
  // Rounding can carry into the next unit (999 999 B → "1000 kB"); show it as "1 MB" instead.
  if (scaled >= base && power < prefixes.length - 1) {
    power += 1;
    scaled = Number((bytes / base ** power).toPrecision(significantDigits));
  }
  return `${scaled} ${prefixes[power]}B`;
}
