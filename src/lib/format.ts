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
