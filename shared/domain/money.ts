/**
 * Money on Platterpost: every amount is an integer count of the currency's minor unit (cents for USD,
 * yen for JPY) carried together with an ISO 4217 code. Floating-point amounts never enter a computation;
 * decimal strings are only read and written at the edges (forms, statements).
 *
 * THE rounding rule: round half to even ("banker's rounding"), written once in `roundHalfEven` and used by
 * every computation that divides (commissions, card fees, allocations fall back on exact remainders).
 * Why half-even rather than half-up: monthly settlement adds up many rounded commission lines; half-up
 * pushes every exact half cent the same way, so the total drifts in one party's favour, while half-even
 * sends halves up and down equally often and the expected drift is zero. It is also the IEEE 754 default,
 * so a reconciling spreadsheet or database that uses its default rounding gets the same cents.
 */

export type CurrencyCode = string;

const currencyPattern = /^[A-Z]{3}$/;
let knownCurrencies: Set<string> | undefined;

/** Upper-case, validated ISO 4217 code; the payment provider sends lower-case codes, we accept both. */
export function normaliseCurrency(currency: string): CurrencyCode {
  const code = String(currency ?? '').trim().toUpperCase();
  if (!currencyPattern.test(code)) {
    throw new RangeError(`Currency must be a three-letter ISO 4217 code such as "USD"; got "${currency}".`);
  }
  knownCurrencies ??= new Set(Intl.supportedValuesOf('currency'));
  if (!knownCurrencies.has(code)) {
    throw new RangeError(`Unknown currency "${currency}": not an ISO 4217 code this runtime knows.`);
  }
  return code;
}

/**
 * Digits after the decimal point for the currency's minor unit (USD 2, JPY 0, KWD 3).
 * Taken from Intl (CLDR data), which follows ISO 4217 except for a few currencies whose smallest unit is
 * not used in practice (e.g. IQD and HUF: ISO 4217 says 3 and 2, this runtime's CLDR says 0); we follow Intl
 * so that what we compute and what we display never disagree.
 */
export function minorUnitDigits(currency: string): number {
  const code = normaliseCurrency(currency);
  return new Intl.NumberFormat('en-US', { style: 'currency', currency: code }).resolvedOptions()
    .maximumFractionDigits as number;
}

function assertMinor(minor: number, name = 'amount'): void {
  if (!Number.isSafeInteger(minor)) {
    throw new RangeError(`${name} must be a whole number of minor units (a safe integer); got ${minor}.`);
  }
}

function toSafeNumber(value: bigint, what: string): number {
  if (value > BigInt(Number.MAX_SAFE_INTEGER) || value < BigInt(Number.MIN_SAFE_INTEGER)) {
    throw new RangeError(`${what} is too large to be held exactly (beyond ±${Number.MAX_SAFE_INTEGER}).`);
  }
  return Number(value);
}

function toBigInt(value: bigint | number, name: string): bigint {
  if (typeof value === 'bigint') return value;
  if (!Number.isSafeInteger(value)) throw new RangeError(`${name} must be an integer; got ${value}.`);
  return BigInt(value);
}

/**
 * numerator / denominator rounded to the nearest integer, exact halves to the even neighbour.
 * Exact (bigint arithmetic), symmetric for negative values: roundHalfEven(-5, 2) = -2.
 */
export function roundHalfEven(numerator: bigint | number, denominator: bigint | number): number {
  let n = toBigInt(numerator, 'numerator');
  let d = toBigInt(denominator, 'denominator');
  if (d === 0n) throw new RangeError('Cannot divide by zero.');
  if (d < 0n) {
    n = -n;
    d = -d;
  }
  const negative = n < 0n;
  const abs = negative ? -n : n;
  let q = abs / d; // truncates toward zero
  const twiceRemainder = (abs % d) * 2n;
  if (twiceRemainder > d || (twiceRemainder === d && q % 2n === 1n)) q += 1n;
  return toSafeNumber(negative ? -q : q, 'Rounded result');
}

/** Decimal string ("12.34", "-0.5", "1200") → integer minor units; refuses more decimals than the currency has. */
export function toMinorUnits(decimalString: string, currency: string): number {
  const digits = minorUnitDigits(currency);
  const text = String(decimalString ?? '').trim();
  const match = /^([+-])?(\d+)(?:\.(\d+))?$/.exec(text);
  if (!match) {
    throw new RangeError(`"${decimalString}" is not a plain decimal amount such as "12.34".`);
  }
  const [, sign, whole, fraction = ''] = match;
  if (fraction.length > digits) {
    throw new RangeError(
      `"${decimalString}" has ${fraction.length} decimals but ${normaliseCurrency(currency)} allows ${digits}.`,
    );
  }
  const minor = BigInt(whole + fraction.padEnd(digits, '0'));
  return toSafeNumber(sign === '-' ? -minor : minor, `Amount "${decimalString}"`) || 0; // `|| 0` drops -0
}

/** Integer minor units → decimal string with exactly the currency's minor-unit digits ("12.30", "-0.05", "1200"). */
export function fromMinorUnits(minor: number, currency: string): string {
  assertMinor(minor);
  const digits = minorUnitDigits(currency);
  const negative = minor < 0;
  const abs = String(Math.abs(minor)).padStart(digits + 1, '0');
  const body = digits === 0 ? abs : `${abs.slice(0, -digits)}.${abs.slice(-digits)}`;
  return negative ? `-${body}` : body;
}

/** Display form for people, e.g. formatMoney(123456, 'USD') → "$1,234.56". */
export function formatMoney(minor: number, currency: string, locale = 'en-US'): string {
  const code = normaliseCurrency(currency);
  // Intl formats a decimal string exactly, so no float ever stands between the cents and the text.
  return new Intl.NumberFormat(locale, { style: 'currency', currency: code }).format(
    fromMinorUnits(minor, code) as Intl.StringNumericLiteral,
  );
}

/** Basis points in one whole: 10 000 bp = 100 %. */
export const BASIS_POINTS_PER_WHOLE = 10_000;

/** amountMinor × basisPoints / 10 000, rounded half-even (commissions: 1250 bp = 12.5 %). */
export function percentOfMinor(amountMinor: number, basisPoints: number): number {
  assertMinor(amountMinor);
  if (!Number.isSafeInteger(basisPoints) || basisPoints < 0) {
    throw new RangeError(`Basis points must be a whole number ≥ 0 (1250 = 12.5 %); got ${basisPoints}.`);
  }
  return roundHalfEven(BigInt(amountMinor) * BigInt(basisPoints), BASIS_POINTS_PER_WHOLE);
}

/**
 * The payment provider's published standard rate for US cards (from memory): 2.9 % + 30¢ per successful
 * charge. Amounts are USD cents; the fixed part has no meaning in another currency.
 */
export const CARD_FEE_BASIS_POINTS = 290;
export const CARD_FEE_FIXED_MINOR = 30;

/** Processing fee on a successful USD card charge of `amountMinor` cents: 2.9 % (half-even) + 30¢. */
export function cardFeeMinor(amountMinor: number): number {
  assertMinor(amountMinor);
  if (amountMinor < 0) throw new RangeError(`A card charge cannot be negative; got ${amountMinor}.`);
  return percentOfMinor(amountMinor, CARD_FEE_BASIS_POINTS) + CARD_FEE_FIXED_MINOR;
}

/**
 * Allocates `total` minor units in proportion to `weights` so that the parts add up to exactly `total`
 * (largest-remainder method): every part gets the floor of its exact share, then the units left over go
 * one each to the parts with the largest remainders, ties to the earlier part so the result is stable.
 * Weights are whole numbers ≥ 0 (cents, basis points, quantities) so the shares are exact.
 * A negative total (a refund) is split like its magnitude and negated.
 */
export function splitMinor(total: number, weights: readonly number[]): number[] {
  assertMinor(total, 'total');
  if (weights.length === 0) throw new RangeError('splitMinor needs at least one weight.');
  weights.forEach((w, i) => {
    if (!Number.isSafeInteger(w) || w < 0) {
      throw new RangeError(`Weight ${i} must be a whole number ≥ 0; got ${w}.`);
    }
  });
  const weightSum = weights.reduce((s, w) => s + BigInt(w), 0n);
  if (weightSum === 0n) throw new RangeError('At least one weight must be greater than zero.');

  const sign = total < 0 ? -1 : 1;
  const magnitude = BigInt(Math.abs(total));
  const parts = weights.map((w) => (magnitude * BigInt(w)) / weightSum);
  const remainders = weights.map((w, index) => ({ index, remainder: (magnitude * BigInt(w)) % weightSum }));
  let leftover = magnitude - parts.reduce((s, p) => s + p, 0n);
  remainders.sort((a, b) => (a.remainder === b.remainder ? a.index - b.index : a.remainder > b.remainder ? -1 : 1));
  // leftover < number of weights with a non-zero remainder, so this never reaches a zero-weight part.
  for (const { index } of remainders) {
    if (leftover === 0n) break;
    parts[index] += 1n;
    leftover -= 1n;
  }
  return parts.map((p) => (Number(p) * sign) || 0);
}
