import { describe, expect, it } from 'vitest';
import { billableWeightLb } from './dimensional-weight';
import { boxPresets, deviceSizes, findBoxPreset, fitsWithCushioning, presetsFor, WALL_IN } from './box-presets';

describe('box presets', () => {
  it('fit a 3.5″ drive (SFF-8301, 147 × 101.6 × 26.1 mm, from memory) with 5 cm of cushioning only from the drive box up', () => {
    // 147 mm + 2 × 50 mm = 247 mm = 9.72 in, which the 8 in small box cannot hold.
    expect(presetsFor('hdd_3_5').map((b) => b.id)).toEqual(['drive', 'handheld', 'large']);
    expect(presetsFor('memory_card')[0]!.id).toBe('small');
  });

  it('count cushioning on every side and let the device turn (common practice: 5 cm on every side)', () => {
    const inner = { lengthIn: 10, widthIn: 8, heightIn: 6 };
    expect(fitsWithCushioning(inner, { lengthIn: 1, widthIn: 6, heightIn: 4 })).toBe(true);
    // 6.1 in + 2 × 1.97 in = 10.04 in: a hair too long for 10 in.
    expect(fitsWithCushioning(inner, { lengthIn: 6.1, widthIn: 1, heightIn: 1 })).toBe(false);
  });

  it('give the carrier the outer size: the inner size plus a quarter inch of wall on each side', () => {
    const drive = findBoxPreset('drive')!;
    expect(drive.outer).toEqual({ lengthIn: 10 + 2 * WALL_IN, widthIn: 8 + 2 * WALL_IN, heightIn: 6 + 2 * WALL_IN });
    // Billed at its dimensional weight: 10.5 × 8.5 × 6.5 ÷ 139 = 4.17 → 5 lb (139 in³/lb, from memory).
    expect(billableWeightLb({ ...drive.outer, weightLb: drive.typicalPackedWeightLb }).billableLb).toBe(5);
  });

  it('have one preset that fits every kind of device', () => {
    for (const mediaType of Object.keys(deviceSizes) as (keyof typeof deviceSizes)[]) {
      expect(presetsFor(mediaType).length, mediaType).toBeGreaterThan(0);
    }
    expect(new Set(boxPresets.map((b) => b.id)).size).toBe(boxPresets.length);
  });
});
