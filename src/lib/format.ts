// Display formatting in one place so every screen writes dates and amounts the same way.
// The network operates in the United States, hence en-US.
const LOCALE = 'en-US';

type DateInput = string | number | Date;

function toDate(value: DateInput): Date {
  return value instanceof Date ? value : new Date(value);
}

/** "Mar 4, 2026" */
export function formatDate(value: DateInput, timeZone?: string): string {
  return new Intl.DateTimeFormat(LOCALE, { dateStyle: 'medium', timeZone }).format(toDate(value));
}

/** "Mar 4, 2026, 2:05 PM" — pass the lab's time zone where the time matters to it. */
export function formatDateTime(value: DateInput, timeZone?: string): string {
  return new Intl.DateTimeFormat(LOCALE, { dateStyle: 'medium', timeStyle: 'short', timeZone }).format(toDate(value));
}

/** Amounts are integer minor units; Intl knows each currency's minor-unit digits (ISO 4217). */
export function formatMoney(minorUnits: number, currency = 'USD'): string {
  const format = new Intl.NumberFormat(LOCALE, { style: 'currency', currency });
  const digits = format.resolvedOptions().maximumFractionDigits ?? 2;
  return format.format(minorUnits / 10 ** digits);
}

/** "3 boxes", "1 box" */
export function formatCount(count: number, singular: string, plural = `${singular}s`): string {
  return `${new Intl.NumberFormat(LOCALE).format(count)} ${count === 1 ? singular : plural}`;
}

/** The international mile, exactly (1959 agreement). */
const KM_PER_MILE = 1.609344;

/** "646 mi" — shops in the network think in miles; routing works in kilometres. */
export function formatMiles(km: number): string {
  return `${new Intl.NumberFormat(LOCALE, { maximumFractionDigits: 0 }).format(km / KM_PER_MILE)} mi`;
}

/** "646 mi (1,040 km)" */
export function formatDistance(km: number): string {
  return `${formatMiles(km)} (${new Intl.NumberFormat(LOCALE, { maximumFractionDigits: 0 }).format(km)} km)`;
}

/** "1 day", "6.5 days" (at most one decimal). */
export function formatDays(days: number): string {
  const rounded = Math.round(days * 10) / 10;
  return `${new Intl.NumberFormat(LOCALE, { maximumFractionDigits: 1 }).format(rounded)} ${rounded === 1 ? 'day' : 'days'}`;
}

/**
 * "2.4 MB" for a file on the clerk's computer, counted in 1 024s as file managers show it
 * (drive capacities, counted in 1 000s by their makers, are written by the callers in GB).
 */
export function formatFileSize(bytes: number): string {
  const units = ['bytes', 'KB', 'MB', 'GB', 'TB'];
  let value = bytes;
  let unit = 0;
  while (value >= 1024 && unit < units.length - 1) {
    value /= 1024;
    unit += 1;
  }
  return `${new Intl.NumberFormat(LOCALE, { maximumFractionDigits: unit === 0 ? 0 : 1 }).format(value)} ${units[unit]}`;
}

/** Time left until a deadline in words: "1 day 3 h left", "2 h 5 min left", "4 min left". */
export function formatTimeLeft(milliseconds: number): string {
  if (milliseconds <= 0) return 'Deadline passed';
  const minutes = Math.floor(milliseconds / 60_000);
  if (minutes < 1) return 'Less than a minute left';
  const days = Math.floor(minutes / 1440);
  const hours = Math.floor((minutes % 1440) / 60);
  const mins = minutes % 60;
  if (days > 0) return `${days} ${days === 1 ? 'day' : 'days'}${hours ? ` ${hours} h` : ''} left`;
  if (hours > 0) return `${hours} h${mins ? ` ${mins} min` : ''} left`;
  return `${mins} min left`;
}

/** "6 business days", "1 business day": routing's estimates count the lab's working days. */
export function formatBusinessDays(days: number): string {
  return formatDays(days).replace(/days?$/, (word) => `business ${word}`);
}
