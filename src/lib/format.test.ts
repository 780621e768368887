import { describe, expect, it } from 'vitest';
import { formatBusinessDays, formatCount, formatDate, formatDateTime, formatDays, formatDistance, formatFileSize, formatMoney, formatTimeLeft } from './format';

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

  it('writes distances in miles first, converting with the international mile of 1.609344 km (1959 agreement)', () => {
    expect(formatDistance(1609.344)).toBe('1,000 mi (1,609 km)');
  });

  it('writes days with at most one decimal, and the singular for exactly one', () => {
    expect(formatDays(1)).toBe('1 day');
    expect(formatDays(6.54)).toBe('6.5 days');
    expect(formatBusinessDays(1)).toBe('1 business day');
    expect(formatBusinessDays(6)).toBe('6 business days');
  });

  it('writes file sizes in 1 024s as file managers show them', () => {
    expect(formatFileSize(10 * 1024 * 1024)).toBe('10 MB');
    expect(formatFileSize(512)).toBe('512 bytes');
  });

  it('says how long is left before a deadline in days, hours and minutes', () => {
    expect(formatTimeLeft((26 * 60 + 5) * 60_000)).toBe('1 day 2 h left');
    expect(formatTimeLeft((2 * 60 + 5) * 60_000)).toBe('2 h 5 min left');
    expect(formatTimeLeft(30_000)).toBe('Less than a minute left');
    expect(formatTimeLeft(-1)).toBe('Deadline passed');
  });
});
