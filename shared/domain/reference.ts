import { CrockfordBase32 } from 'crockford-base32';

// Case references: "PP-" + the case number in Crockford's Base 32 + "-" + Crockford's check symbol.
// Spec: Douglas Crockford, "Base 32" (crockford.com/base32.html). A number is written with the 32 symbols
// 0-9 A-Z without I, L, O and U; the check symbol is the number modulo 37 written with those 32 symbols
// followed by * ~ $ = U (values 32 to 36). Readers accept lower case, ignore hyphens and read I and L as
// 1 and O as 0. Numbers come from a database sequence that starts at 32^4, so references have five
// symbols until 33 554 431 cases (then six) and stay unique and short: "PP-10000-~".
//
// The crockford-base32 package does the base-32 arithmetic. Its 'ulid' variant is the positional (number)
// encoding the spec describes; its default variant reads the input as a bit stream of bytes, which is a
// different number, so it is not used here.

export const REFERENCE_PREFIX = 'PP';
export const REFERENCE_BODY_MIN_LENGTH = 5;
/** The first number the database sequence hands out: the smallest five-symbol number. */
export const FIRST_REFERENCE_NUMBER = 32n ** 4n;

export const ENCODING_SYMBOLS = '0123456789ABCDEFGHJKMNPQRSTVWXYZ';
export const CHECK_SYMBOLS = `${ENCODING_SYMBOLS}*~$=U`;

function toBigInt(n: bigint | number): bigint {
  if (typeof n === 'number' && (!Number.isSafeInteger(n) || n < 0)) throw new RangeError(`reference number must be a whole number ≥ 0, got ${n}`);
  const value = BigInt(n);
  if (value < 0n) throw new RangeError(`reference number must be ≥ 0, got ${value}`);
  return value;
}

/** The number in base 32, most significant symbol first, zero-padded to five symbols. */
export function encodeNumber(n: bigint | number): string {
  const value = toBigInt(n);
  const digits = value === 0n ? '0' : CrockfordBase32.encode(value, { variant: 'ulid' }).replace(/^0+/, '');
  return digits.padStart(REFERENCE_BODY_MIN_LENGTH, '0');
}

/** Reads symbols as the spec allows: case-insensitive, hyphens ignored, I/L → 1, O → 0. */
export function normalizeSymbols(text: string): string {
  return text.toUpperCase().replace(/-/g, '').replace(/[IL]/g, '1').replace(/O/g, '0');
}

/** The value of a base-32 body (after normalising); throws RangeError on a symbol outside the alphabet. */
export function decodeBody(body: string): bigint {
  const normalized = normalizeSymbols(body);
  if (normalized.length === 0) throw new RangeError('a reference body needs at least one symbol');
  for (const ch of normalized) {
    if (!ENCODING_SYMBOLS.includes(ch)) throw new RangeError(`"${ch}" is not a Base 32 symbol`);
  }
  return CrockfordBase32.decode(normalized, { variant: 'ulid', asNumber: true });
}

/** Crockford's check symbol: the value modulo 37. Takes the number or its base-32 body. */
export function checkSymbol(body: string | bigint | number): string {
  const value = typeof body === 'string' ? decodeBody(body) : toBigInt(body);
  return CHECK_SYMBOLS[Number(value % 37n)];
}

export function makeReference(n: bigint | number): string {
  const body = encodeNumber(n);
  return `${REFERENCE_PREFIX}-${body}-${checkSymbol(toBigInt(n))}`;
}

export type ParsedReference =
  | { ok: true; reference: string; number: bigint }
  | { ok: false; reason: 'empty' | 'prefix' | 'length' | 'symbol' | 'check'; message: string };

/**
 * Reads a reference a person typed or read out: "pp-10000-~", "PP 1OOOO ~" and "PP10000~" are all
 * "PP-10000-~". Answers why when it is not a reference.
 */
export function parseReference(text: string): ParsedReference {
  const compact = String(text ?? '').toUpperCase().replace(/[\s-]+/g, '');
  if (compact.length === 0) return { ok: false, reason: 'empty', message: 'Enter a case reference.' };
  if (!compact.startsWith(REFERENCE_PREFIX)) {
    return { ok: false, reason: 'prefix', message: `A case reference starts with ${REFERENCE_PREFIX}-, like ${makeReference(FIRST_REFERENCE_NUMBER)}.` };
  }
  const rest = compact.slice(REFERENCE_PREFIX.length);
  if (rest.length < REFERENCE_BODY_MIN_LENGTH + 1) {
    return { ok: false, reason: 'length', message: `A case reference has at least ${REFERENCE_BODY_MIN_LENGTH} symbols and a check symbol after ${REFERENCE_PREFIX}-.` };
  }
  const body = normalizeSymbols(rest.slice(0, -1));
  const check = normalizeSymbols(rest.slice(-1));
  const badBody = [...body].find((ch) => !ENCODING_SYMBOLS.includes(ch));
  if (badBody !== undefined) return { ok: false, reason: 'symbol', message: `"${badBody}" does not appear in case references.` };
  if (!CHECK_SYMBOLS.includes(check)) return { ok: false, reason: 'symbol', message: `"${check}" is not a check symbol.` };
  const number = decodeBody(body);
  if (checkSymbol(number) !== check) {
    return { ok: false, reason: 'check', message: 'The check symbol does not match; a symbol was probably mistyped.' };
  }
  return { ok: true, reference: makeReference(number), number };
}
