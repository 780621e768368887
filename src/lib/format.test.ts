import { describe, expect, it } from 'vitest';
import { formatCount, formatDate, formatDateTime, formatMoney } from './format';

describe('format', () => {
  it('writes dates in the US style, in the given time zone', () => {
    expect(formatDate('2026-03-04T12:00:00Z', 'UTC')).toBe('Mar 4, 2026');
    // 02:30 UTC is still the previous evening in Chicago.
    expect(formatDate('2026-03-04T02:30:00Z', 'America/Chicago')).toBe('Mar 3, 2026');
  });

  it('writes a date and time with the hour in the given time zone', () => {
    expect(formatDateTime('2026-03-04T19:05:00Z', 'America/New_York')).toMatch(/^Mar 4, 2026, 2:05\sPM$/);
  });

  it('reads amounts as integer minor units, using each currency’s own minor-unit digits (ISO 4217)', () => {
    expect(formatMoney(123456)).toBe('$1,234.56');
    expect(formatMoney(500, 'JPY')).toBe('¥500');
  });

  it('chooses the singular or plural word by the count', () => {
    expect(formatCount(1, 'box', 'boxes')).toBe('1 box');
    expect(formatCount(1200, 'box', 'boxes')).toBe('1,200 boxes');
  });
});
