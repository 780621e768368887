import { describe, expect, it } from 'vitest';
import {
  addBusinessHours,
  DEFAULT_OFFER_RESPONSE_BUSINESS_HOURS,
  isWithinBusinessHours,
  offerDeadline,
  publicHolidayOn,
  type BusinessCalendar,
} from './business-hours';

// Public holidays come from the date-holidays package (the reference the product brief names). Dates cross-
// checked from memory: Thanksgiving is the fourth Thursday of November and Independence Day falling on a
// Saturday is observed on the Friday before (5 U.S.C. 6103 and the federal in-lieu-of rule); US daylight saving
// time starts on the second Sunday of March (Energy Policy Act of 2005). 09:00–17:00 Monday–Friday is the default.
const chicago: BusinessCalendar = { timeZone: 'America/Chicago', country: 'US', region: 'IL' };
const austin: BusinessCalendar = { timeZone: 'America/Chicago', country: 'US', region: 'TX' };
const denver: BusinessCalendar = { timeZone: 'America/Denver', country: 'US', region: 'CO' };
const newYork: BusinessCalendar = { timeZone: 'America/New_York', country: 'US', region: 'NY' };

describe('publicHolidayOn (date-holidays)', () => {
  it('Thanksgiving 2026 is Thursday 26 November; Texas also closes the day after, Illinois does not', () => {
    expect(publicHolidayOn('2026-11-26', chicago)).toBe('Thanksgiving Day');
    expect(publicHolidayOn('2026-11-27', chicago)).toBeNull();
    expect(publicHolidayOn('2026-11-27', austin)).toBe('Day after Thanksgiving');
  });

  it('4 July 2026 is a Saturday, so Friday 3 July is the observed holiday', () => {
    expect(publicHolidayOn('2026-07-03', denver)).toBe('Independence Day (substitute day)');
  });

  it('observances are working days (Valentine’s Day is not a public holiday)', () => {
    expect(publicHolidayOn('2026-02-14', newYork)).toBeNull();
  });
});

describe('offerDeadline / addBusinessHours', () => {
  it('a lab has one working day (8 business hours) by default', () => {
    expect(DEFAULT_OFFER_RESPONSE_BUSINESS_HOURS).toBe(8);
  });

  it('skips Thanksgiving: Wed 15:00 in Chicago + 8 h = Fri 15:00 (2 h Wednesday, 6 h Friday)', () => {
    const offered = new Date('2026-11-25T21:00:00Z'); // 15:00 CST
    expect(offerDeadline(offered, chicago).toISOString()).toBe('2026-11-27T21:00:00.000Z');
  });

  it('in Texas the day after Thanksgiving is off too, so the same offer runs to Monday 15:00', () => {
    expect(offerDeadline(new Date('2026-11-25T21:00:00Z'), austin).toISOString()).toBe('2026-11-30T21:00:00.000Z');
  });

  it('skips the observed Independence Day and the weekend: Thu 13:00 in Denver + 8 h = Mon 13:00', () => {
    const offered = new Date('2026-07-02T19:00:00Z'); // 13:00 MDT
    expect(offerDeadline(offered, denver).toISOString()).toBe('2026-07-06T19:00:00.000Z');
  });

  it('follows the lab’s wall clock across the start of daylight saving time (8 March 2026)', () => {
    const offered = new Date('2026-03-06T21:00:00Z'); // Friday 16:00 EST
    // 1 h on Friday, 7 h on Monday from 09:00 EDT → 16:00 EDT, which is 20:00Z, not 21:00Z.
    expect(offerDeadline(offered, newYork).toISOString()).toBe('2026-03-09T20:00:00.000Z');
  });

  it('an offer made at the weekend starts counting at Monday opening', () => {
    const saturday = new Date('2026-03-14T15:00:00Z');
    expect(addBusinessHours(saturday, 2, newYork).toISOString()).toBe('2026-03-16T15:00:00.000Z'); // Mon 11:00 EDT
  });

  it('a window that ends exactly at closing time ends then, not the next morning', () => {
    const mondayOpening = new Date('2026-03-16T13:00:00Z'); // 09:00 EDT
    expect(addBusinessHours(mondayOpening, 8, newYork).toISOString()).toBe('2026-03-16T21:00:00.000Z'); // 17:00 EDT
  });

  it('uses the lab’s own hours and working days', () => {
    const saturdayLab: BusinessCalendar = { ...newYork, opensAt: '10:00', closesAt: '14:00', workdays: [2, 3, 4, 5, 6] };
    const mondayNoon = new Date('2026-03-16T16:00:00Z'); // Monday: closed
    // Tue 10:00–14:00 (4 h), Wed 10:00–12:00 (2 h) → Wed 12:00 EDT.
    expect(addBusinessHours(mondayNoon, 6, saturdayLab).toISOString()).toBe('2026-03-18T16:00:00.000Z');
  });
});

describe('isWithinBusinessHours', () => {
  it('is open 09:00 to before 17:00 on working days, closed on holidays', () => {
    expect(isWithinBusinessHours(new Date('2026-03-16T13:00:00Z'), newYork)).toBe(true); // Mon 09:00 EDT
    expect(isWithinBusinessHours(new Date('2026-03-16T21:00:00Z'), newYork)).toBe(false); // Mon 17:00 EDT
    expect(isWithinBusinessHours(new Date('2026-11-26T16:00:00Z'), chicago)).toBe(false); // Thanksgiving 10:00 CST
  });
});

describe('business calendar: bad input', () => {
  it('names the bad field', () => {
    const at = new Date('2026-03-16T13:00:00Z');
    expect(() => offerDeadline(at, { ...newYork, timeZone: 'Eastern' })).toThrow(/timeZone "Eastern" is not an IANA time zone/);
    expect(() => offerDeadline(at, { ...newYork, country: 'XX' })).toThrow(/country "XX" has no public-holiday data/);
    expect(() => offerDeadline(at, { ...newYork, region: 'ZZ' })).toThrow(/region "ZZ" is not a state/);
    expect(() => offerDeadline(at, { ...newYork, opensAt: '9am' })).toThrow(/opensAt must be a time HH:mm/);
    expect(() => offerDeadline(at, { ...newYork, opensAt: '17:00', closesAt: '09:00' })).toThrow(/must be later than opensAt/);
    expect(() => offerDeadline(at, { ...newYork, workdays: [] })).toThrow(/workdays must list ISO weekdays/);
    expect(() => offerDeadline(at, newYork, 0)).toThrow(/responseBusinessHours must be positive/);
    expect(() => addBusinessHours(new Date('x'), 1, newYork)).toThrow(/start must be a valid Date/);
  });
});
