import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { estimateImagingSeconds, formatBytes, imagingProgress, parseCapacity } from './imaging';

const HOUR = 3600;
const DAY = 24 * HOUR;
const WEEK = 7 * DAY;

describe('parseCapacity', () => {
  // SI prefixes as drive makers label capacity: 1 kB = 10^3 B … 1 TB = 10^12 B (SI brochure, decimal prefixes).
  it.each([
    ['1 B', 1],
    ['1 kB', 1e3],
    ['1 MB', 1e6],
    ['1 GB', 1e9],
    ['2 TB', 2e12],
    ['1 PB', 1e15],
  ])('reads %s as %d bytes (SI decimal prefixes)', (text, bytes) => {
    expect(parseCapacity(text)).toBe(bytes);
  });

  // Binary prefixes: 1 KiB = 2^10 B, 1 MiB = 2^20 B … (IEC 80000-13, from memory).
  it.each([
    ['1 KiB', 2 ** 10],
    ['1 MiB', 2 ** 20],
    ['1 GiB', 2 ** 30],
    ['4 TiB', 4 * 2 ** 40],
  ])('reads %s as %d bytes (IEC 80000-13 binary prefixes, from memory)', (text, bytes) => {
    expect(parseCapacity(text)).toBe(bytes);
  });

  it('accepts no space, decimals, lower-case prefixes and the word bytes with thousands separators', () => {
    expect(parseCapacity('500GB')).toBe(500e9);
    expect(parseCapacity('1.5 TB')).toBe(1.5e12);
    expect(parseCapacity('  250 gb ')).toBe(250e9);
    expect(parseCapacity('1,000,204,886,016 bytes')).toBe(1_000_204_886_016);
    expect(parseCapacity('4096')).toBe(4096);
  });

  it('refuses bits, unknown units and text that is not a capacity, with a message naming the problem', () => {
    expect(() => parseCapacity('2 Tb')).toThrow(/bits/);
    expect(() => parseCapacity('100 Mb')).toThrow(/bits/);
    expect(() => parseCapacity('2 XB')).toThrow(/not a known unit/);
    expect(() => parseCapacity('two terabytes')).toThrow(/not a capacity/);
    expect(() => parseCapacity('-1 TB')).toThrow(/not a capacity/);
    expect(() => parseCapacity('1,00 TB')).toThrow(/not a capacity/);
  });
});

describe('formatBytes', () => {
  it('writes SI units the way drive labels do', () => {
    expect(formatBytes(0)).toBe('0 B');
    expect(formatBytes(999)).toBe('999 B');
    expect(formatBytes(1000)).toBe('1 kB');
    expect(formatBytes(250e9)).toBe('250 GB');
    expect(formatBytes(2e12)).toBe('2 TB');
    expect(formatBytes(1.5e12)).toBe('1.5 TB');
    // smartctl shows a nominal 1 TB drive as 1,000,204,886,016 bytes; it is labelled 1 TB.
    expect(formatBytes(1_000_204_886_016)).toBe('1 TB');
  });

  it('carries a rounded value into the next unit instead of printing 1000 kB', () => {
    expect(formatBytes(999_999)).toBe('1 MB');
  });

  it('writes IEC binary units when asked (IEC 80000-13, from memory)', () => {
    expect(formatBytes(2 ** 30, { binary: true })).toBe('1 GiB');
    // The same nominal 1 TB drive is about 931 GiB, which is why operating systems show "931 GB".
    expect(formatBytes(1_000_204_886_016, { binary: true })).toBe('932 GiB');
    expect(formatBytes(1_000_204_886_016, { binary: true, significantDigits: 4 })).toBe('931.5 GiB');
  });

  it('refuses a negative count', () => {
    expect(() => formatBytes(-1)).toThrow(/non-negative/);
  });

  it('property: parsing what it formats gives back the value within the rounding of three significant digits', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1000, max: 9e15 }), (bytes) => {
        const roundTrip = parseCapacity(formatBytes(bytes));
        expect(Math.abs(roundTrip - bytes) / bytes).toBeLessThanOrEqual(0.005);
      }),
    );
  });
});

describe('estimateImagingSeconds', () => {
  it('is bytes divided by the sustained rate', () => {
    expect(estimateImagingSeconds(1e9, 100e6)).toBe(10);
  });

  // Trade range, common practice (no published source): cloning takes from about half an hour to a couple
  // of weeks, depending on size and damage.
  it('a healthy 250 GB drive at about 120 MB/s images in half an hour to an hour (common practice)', () => {
    const seconds = estimateImagingSeconds(parseCapacity('250 GB'), parseCapacity('120 MB'));
    expect(seconds).toBeGreaterThanOrEqual(0.5 * HOUR);
    expect(seconds).toBeLessThanOrEqual(1 * HOUR);
  });

  it('a damaged 8 TB drive read at about 5 MB/s takes two to three weeks (common practice)', () => {
    const seconds = estimateImagingSeconds(parseCapacity('8 TB'), parseCapacity('5 MB'));
    expect(seconds).toBeGreaterThanOrEqual(2 * WEEK);
    expect(seconds).toBeLessThanOrEqual(3 * WEEK);
  });

  it('refuses a zero or negative rate', () => {
    expect(() => estimateImagingSeconds(1e12, 0)).toThrow(/greater than 0/);
    expect(() => estimateImagingSeconds(1e12, -5)).toThrow(/non-negative/);
  });
});

describe('imagingProgress', () => {
  it('reports percent, remaining bytes and seconds at the current rate', () => {
    const progress = imagingProgress({ totalBytes: 1e12, bytesRead: 250e9, rateBytesPerSec: 100e6 });
    expect(progress.percent).toBe(25);
    expect(progress.remainingBytes).toBe(750e9);
    expect(progress.remainingSeconds).toBe(7500);
  });

  it('gives an ETA counted from the given time', () => {
    const progress = imagingProgress({ totalBytes: 1e9, bytesRead: 0, rateBytesPerSec: 1e6 });
    const now = new Date('2024-03-01T12:00:00.000Z');
    expect(progress.etaFrom(now)?.toISOString()).toBe('2024-03-01T12:16:40.000Z');
  });

  it('has no remaining time and no ETA while the rate is 0 and bytes remain', () => {
    const progress = imagingProgress({ totalBytes: 1e9, bytesRead: 5e8, rateBytesPerSec: 0 });
    expect(progress.remainingSeconds).toBeNull();
    expect(progress.etaFrom(new Date())).toBeNull();
  });

  it('a finished image has 0 seconds left even at rate 0, and its ETA is now', () => {
    const now = new Date('2024-03-01T12:00:00.000Z');
    const progress = imagingProgress({ totalBytes: 1e9, bytesRead: 1e9, rateBytesPerSec: 0 });
    expect(progress.percent).toBe(100);
    expect(progress.remainingSeconds).toBe(0);
    expect(progress.etaFrom(now)?.getTime()).toBe(now.getTime());
  });

  it('counts unreadable sectors as bytes passed over but not copied (512-byte sectors by default)', () => {
    const progress = imagingProgress({ totalBytes: 1e9, bytesRead: 1e6, rateBytesPerSec: 1e6, unreadableSectors: 10 });
    expect(progress.unreadableBytes).toBe(5120);
    expect(progress.copiedBytes).toBe(1e6 - 5120);
    const fourK = imagingProgress({ totalBytes: 1e9, bytesRead: 1e6, rateBytesPerSec: 1e6, unreadableSectors: 10, sectorSizeBytes: 4096 });
    expect(fourK.unreadableBytes).toBe(40960);
  });

  it('refuses impossible input with a message naming the field', () => {
    expect(() => imagingProgress({ totalBytes: 0, bytesRead: 0, rateBytesPerSec: 1 })).toThrow(/totalBytes/);
    expect(() => imagingProgress({ totalBytes: 10, bytesRead: 11, rateBytesPerSec: 1 })).toThrow(/cannot exceed totalBytes/);
    expect(() => imagingProgress({ totalBytes: 10, bytesRead: 5, rateBytesPerSec: -1 })).toThrow(/rateBytesPerSec/);
    expect(() => imagingProgress({ totalBytes: 10, bytesRead: 5, rateBytesPerSec: Number.NaN })).toThrow(/rateBytesPerSec/);
    expect(() => imagingProgress({ totalBytes: 1e6, bytesRead: 512, rateBytesPerSec: 1, unreadableSectors: 2 })).toThrow(
      /unreadableSectors/,
    );
    expect(() => imagingProgress({ totalBytes: 1e6, bytesRead: 512, rateBytesPerSec: 1 }).etaFrom(new Date('x'))).toThrow(
      /valid Date/,
    );
  });
});
