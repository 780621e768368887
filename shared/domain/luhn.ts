/**
 * Luhn check (ISO/IEC 7812-1, Annex B), used on payment card numbers.
 * Spaces and dashes are ignored so that "4242 4242 4242 4242" and "4242-4242-…" are accepted as typed.
 * Anything else that is not a digit makes the number invalid rather than being skipped silently.
 */
export function luhnValid(digits: string): boolean {
  const cleaned = digits.replace(/[\s-]/g, '');
  // A single digit is only ever a check digit with nothing to check.
  if (!/^\d{2,}$/.test(cleaned)) return false;

  let sum = 0;
  // Walk from the rightmost (check) digit; every second digit from it is doubled.
  for (let i = cleaned.length - 1, double = false; i >= 0; i--, double = !double) {
    let d = cleaned.charCodeAt(i) - 48;
    if (double) {
      d *= 2;
      if (d > 9) d -= 9;
    }
    sum += d;
  }
  return sum % 10 === 0;
}

/** The digits of a card number as typed, without spaces and dashes. */
export function normaliseCardNumber(input: string): string {
  return input.replace(/[\s-]/g, '');
}
