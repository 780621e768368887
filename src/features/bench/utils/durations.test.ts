import { describe, expect, it } from 'vitest';
import { formatRate, formatRemaining } from './durations';

describe('formatRemaining', () => {
  it('speaks in minutes, then hours, then days', () => {
    expect(formatRemaining(0)).toBe('done');
    expect(formatRemaining(20)).toBe('about 1 min');
    expect(formatRemaining(1667)).toBe('about 28 min');
    expect(formatRemaining(3750)).toBe('about 1 h 3 min');
    expect(formatRemaining(7200)).toBe('about 2 h');
    expect(formatRemaining(1_066_667)).toBe('about 12 days 8 h');
  });
});

describe('formatRate', () => {
  it('uses SI prefixes as imagers report rates', () => {
    expect(formatRate(150_000_000)).toBe('150 MB/s');
    expect(formatRate(1_500_000_000)).toBe('1.5 GB/s');
    expect(formatRate(12_500)).toBe('13 kB/s');
    expect(formatRate(0)).toBe('0 B/s');
  });
});
