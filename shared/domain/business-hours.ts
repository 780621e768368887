import Holidays from 'date-holidays';
import { DateTime } from 'luxon';

// Business time in a lab's own calendar: its IANA time zone, its working days and hours, and the public
// holidays of its country and state as date-holidays lists them. An offer that the lab has not answered
// within its response window of business hours moves to the next lab.

export interface BusinessCalendar {
  /** IANA time zone of the lab, e.g. "America/Chicago". */
  timeZone: string;
  /** ISO 3166-1 alpha-2 country code for public holidays, e.g. "US". */
  country: string;
  /** State or province code within the country, e.g. "CA"; national holidays only when absent. */
  region?: string;
  /** Local opening time, HH:mm; 09:00 when absent. */
  opensAt?: string;
  /** Local closing time, HH:mm; 17:00 when absent. */
  closesAt?: string;
  /** ISO weekdays the lab works (1 = Monday … 7 = Sunday); Monday to Friday when absent. */
  workdays?: readonly number[];
}

/** The network's own choice: a lab has one working day (8 business hours) to answer an offer. */
export const DEFAULT_OFFER_RESPONSE_BUSINESS_HOURS = 8;

const timePattern = /^([01]\d|2[0-3]):([0-5]\d)$/;

interface ResolvedCalendar {
  timeZone: string;
  opens: number; // minutes after local midnight
  closes: number;
  workdays: ReadonlySet<number>;
  holidays: (year: number) => ReadonlyMap<string, string>;
}

const holidayCache = new Map<string, (year: number) => ReadonlyMap<string, string>>();
let knownCountries: Record<string, string> | undefined;

function minutesOf(value: string, field: string): number {
  const match = timePattern.exec(value);
  if (!match) throw new RangeError(`${field} must be a time HH:mm (00:00–23:59), got "${value}"`);
  return Number(match[1]) * 60 + Number(match[2]);
}

function holidayLookup(country: string, region: string | undefined): (year: number) => ReadonlyMap<string, string> {
  const key = `${country}/${region ?? ''}`;
  const cached = holidayCache.get(key);
  if (cached) return cached;

  knownCountries ??= new Holidays().getCountries() as Record<string, string>;
  if (!(country in knownCountries)) throw new RangeError(`country "${country}" has no public-holiday data; use an ISO 3166-1 alpha-2 code such as "US"`);
  if (region !== undefined) {
    const states = (new Holidays().getStates(country) ?? {}) as Record<string, string>;
    if (!(region in states)) throw new RangeError(`region "${region}" is not a state or province of ${country} in the holiday data`);
  }
  const source = region ? new Holidays(country, region) : new Holidays(country);
  const byYear = new Map<number, ReadonlyMap<string, string>>();
  const lookup = (year: number): ReadonlyMap<string, string> => {
    let days = byYear.get(year);
    if (!days) {
      const map = new Map<string, string>();
      for (const holiday of source.getHolidays(year)) {
        // Public holidays only (observances and optional days are working days); `date` is the local date.
        if (holiday.type === 'public') map.set(holiday.date.slice(0, 10), holiday.name);
      }
      days = map;
      byYear.set(year, days);
    }
    return days;
  };
  holidayCache.set(key, lookup);
  return lookup;
}

function resolve(calendar: BusinessCalendar): ResolvedCalendar {
  if (!DateTime.now().setZone(calendar.timeZone).isValid) {
    throw new RangeError(`timeZone "${calendar.timeZone}" is not an IANA time zone`);
  }
  const opens = minutesOf(calendar.opensAt ?? '09:00', 'opensAt');
  const closes = minutesOf(calendar.closesAt ?? '17:00', 'closesAt');
  if (closes <= opens) throw new RangeError(`closesAt (${calendar.closesAt}) must be later than opensAt (${calendar.opensAt ?? '09:00'})`);
  const workdays = new Set(calendar.workdays ?? [1, 2, 3, 4, 5]);
  if (workdays.size === 0 || [...workdays].some((d) => !Number.isInteger(d) || d < 1 || d > 7)) {
    throw new RangeError('workdays must list ISO weekdays 1 (Monday) to 7 (Sunday), at least one');
  }
  return { timeZone: calendar.timeZone, opens, closes, workdays, holidays: holidayLookup(calendar.country, calendar.region) };
}

function assertDate(value: Date, field: string): void {
  if (!(value instanceof Date) || Number.isNaN(value.getTime())) throw new RangeError(`${field} must be a valid Date`);
}

function holidayOn(local: DateTime, calendar: ResolvedCalendar): string | undefined {
  return calendar.holidays(local.year).get(local.toISODate() as string);
}

function isWorkingDate(local: DateTime, calendar: ResolvedCalendar): boolean {
  return calendar.workdays.has(local.weekday) && holidayOn(local, calendar) === undefined;
}

const atMinutes = (day: DateTime, minutes: number) =>
  day.set({ hour: Math.floor(minutes / 60), minute: minutes % 60, second: 0, millisecond: 0 });

/** The public holiday on a local calendar date (YYYY-MM-DD), by name, or null. */
export function publicHolidayOn(localDate: string, calendar: BusinessCalendar): string | null {
  const day = DateTime.fromISO(localDate, { zone: calendar.timeZone });
  if (!/^\d{4}-\d{2}-\d{2}$/.test(localDate) || !day.isValid) throw new RangeError(`localDate must be YYYY-MM-DD, got "${localDate}"`);
  return holidayOn(day, resolve(calendar)) ?? null;
}

/** Whether the lab is open at this instant. */
export function isWithinBusinessHours(at: Date, calendar: BusinessCalendar): boolean {
  assertDate(at, 'at');
  const resolved = resolve(calendar);
  const local = DateTime.fromJSDate(at).setZone(resolved.timeZone);
  const minutes = local.hour * 60 + local.minute + local.second / 60 + local.millisecond / 60_000;
  return isWorkingDate(local, resolved) && minutes >= resolved.opens && minutes < resolved.closes;
}

/**
 * The instant that lies `hours` business hours after `start` in the lab's calendar. Time outside opening
 * hours, on non-working weekdays and on public holidays does not count. A window that ends exactly at
 * closing time ends then, not the next morning.
 */
export function addBusinessHours(start: Date, hours: number, calendar: BusinessCalendar): Date {
  assertDate(start, 'start');
  if (!Number.isFinite(hours) || hours < 0) throw new RangeError(`hours must be a non-negative number, got ${hours}`);
  const resolved = resolve(calendar);
  let remainingMs = Math.round(hours * 3_600_000);
  let cursor = DateTime.fromJSDate(start).setZone(resolved.timeZone);

  // A lab works at least one day a week, so each loop turn either finishes or moves to the next day;
  // the bound only guards against a holiday table that swallowed whole years.
  for (let guard = 0; guard < 3_700; guard += 1) {
    const opening = atMinutes(cursor.startOf('day'), resolved.opens);
    const closing = atMinutes(cursor.startOf('day'), resolved.closes);
    if (isWorkingDate(cursor, resolved) && cursor < closing) {
      const from = cursor < opening ? opening : cursor;
      const available = closing.toMillis() - from.toMillis();
      if (remainingMs <= available) return from.plus({ milliseconds: remainingMs }).toJSDate();
      remainingMs -= available;
    }
    cursor = cursor.plus({ days: 1 }).startOf('day');
  }
  throw new RangeError('no business hours found within ten years; check the calendar');
}

/** When an offer made at offeredAt expires if the lab has not answered. */
export function offerDeadline(
  offeredAt: Date,
  calendar: BusinessCalendar,
  responseBusinessHours: number = DEFAULT_OFFER_RESPONSE_BUSINESS_HOURS,
): Date {
  if (!(responseBusinessHours > 0)) throw new RangeError(`responseBusinessHours must be positive, got ${responseBusinessHours}`);
  return addBusinessHours(offeredAt, responseBusinessHours, calendar);
}
