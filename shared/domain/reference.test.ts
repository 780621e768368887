import { describe, expect, it } from 'vitest';
import {
  CHECK_SYMBOLS,
  ENCODING_SYMBOLS,
  FIRST_REFERENCE_NUMBER,
  checkSymbol,
  decodeBody,
  encodeNumber,
  makeReference,
  parseReference,
} from './reference';

// Source: Douglas Crockford, "Base 32", https://www.crockford.com/base32.html — the encoding table
// (values 0–31 and their symbols), the decoding rules (case-insensitive, I and L read as 1, O read as 0,
// hyphens ignored) and the check symbols for the values 32–36 (* ~ $ = U, value = number mod 37).

describe('Crockford Base 32 alphabet (crockford.com/base32.html, encoding table)', () => {
  it('writes the values 0–31 with 0-9 A-Z leaving out I, L, O and U', () => {
    const published = '0123456789ABCDEFGHJKMNPQRSTVWXYZ';
    expect(ENCODING_SYMBOLS).toBe(published);
    for (let value = 0; value < 32; value++) expect(encodeNumber(value)).toBe(`0000${published[value]}`);
    for (const excluded of ['I', 'L', 'O', 'U']) expect(ENCODING_SYMBOLS).not.toContain(excluded);
  });

  it('writes a number positionally, most significant symbol first (32 → "10", 1024 → "100")', () => {
    expect(encodeNumber(32)).toBe('00010');
    expect(encodeNumber(1024)).toBe('00100');
    expect(encodeNumber(32 ** 5 - 1)).toBe('ZZZZZ');
    expect(encodeNumber(32n ** 5n)).toBe('100000');
  });
});

describe('Crockford check symbol (crockford.com/base32.html, check symbol table)', () => {
  it('has the five extra check symbols * ~ $ = U for the values 32–36', () => {
    expect(CHECK_SYMBOLS.slice(32)).toBe('*~$=U');
    expect([32, 33, 34, 35, 36].map((n) => checkSymbol(n))).toEqual(['*', '~', '$', '=', 'U']);
  });

  it('is the number modulo 37, 37 being the smallest prime above 32', () => {
    expect(checkSymbol(37)).toBe('0');
    expect(checkSymbol(38)).toBe('1');
    expect(checkSymbol(31)).toBe('Z');
    // 1 048 576 = 37 × 28 339 + 33 → "~"
    expect(checkSymbol(1_048_576)).toBe('~');
    expect(checkSymbol('10000')).toBe('~');
  });
});

describe('decoding rules (crockford.com/base32.html, decode column)', () => {
  it('reads lower case, I and L as 1, O as 0 and ignores hyphens', () => {
    expect(decodeBody('1P10E')).toBe(decodeBody('IPLOE'));
    expect(decodeBody('iploe')).toBe(decodeBody('1P10E'));
    expect(decodeBody('1-P-1-0-E')).toBe(decodeBody('1P10E'));
    expect(decodeBody('10')).toBe(32n);
  });

  it('refuses U in the body, which the spec keeps out of the encoding alphabet', () => {
    expect(() => decodeBody('1U')).toThrow(RangeError);
  });
});

describe('case references', () => {
  it('look like PP-XXXXX-C and start at the smallest five-symbol number', () => {
    expect(makeReference(FIRST_REFERENCE_NUMBER)).toBe('PP-10000-~');
    // 1 048 576 + k is 33 + k modulo 37 (worked by hand): $ = U, then 0 again.
    expect(makeReference(1_048_577)).toBe('PP-10001-$');
    expect(makeReference(1_048_578)).toBe('PP-10002-=');
    expect(makeReference(1_048_579)).toBe('PP-10003-U');
    expect(makeReference(1_048_580)).toBe('PP-10004-0');
    expect(makeReference(32 ** 5)).toMatch(/^PP-100000-.$/);
  });

  it('parse back from what a person types, to the canonical form', () => {
    const canonical = makeReference(9_876_543);
    const typed = canonical.toLowerCase().replace(/0/g, 'o').replace(/1/g, 'l');
    expect(parseReference(typed)).toEqual({ ok: true, reference: canonical, number: 9_876_543n });
    expect(parseReference(canonical.replace(/-/g, ''))).toMatchObject({ ok: true, reference: canonical });
    expect(parseReference(` ${canonical.replace(/-/g, ' ')} `)).toMatchObject({ ok: true, reference: canonical });
  });

  it('catch a mistyped symbol with the check symbol', () => {
    const good = makeReference(1_500_000);
    const body = good.slice(3, 8);
    const swapped = body[0] === 'A' ? `B${body.slice(1)}` : `A${body.slice(1)}`;
    expect(parseReference(`PP-${swapped}-${good.slice(-1)}`)).toMatchObject({ ok: false, reason: 'check' });
  });

  it('catch every single-symbol substitution in the five-symbol body (the check symbol is mod 37, a prime above 32)', () => {
    const n = 2_000_123;
    const good = makeReference(n);
    const body = good.slice(3, 8);
    for (let position = 0; position < body.length; position++) {
      for (const symbol of ENCODING_SYMBOLS) {
        if (symbol === body[position]) continue;
        const altered = `${body.slice(0, position)}${symbol}${body.slice(position + 1)}`;
        expect(parseReference(`PP-${altered}-${good.slice(-1)}`).ok).toBe(false);
      }
    }
  });

  it('say why a text is not a reference', () => {
    expect(parseReference('')).toMatchObject({ ok: false, reason: 'empty' });
    expect(parseReference('QQ-10000-~')).toMatchObject({ ok: false, reason: 'prefix' });
    expect(parseReference('PP-100')).toMatchObject({ ok: false, reason: 'length' });
    expect(parseReference('PP-1U000-~')).toMatchObject({ ok: false, reason: 'symbol' });
    expect(parseReference('PP-10000-#')).toMatchObject({ ok: false, reason: 'symbol' });
  });

  it('refuse negative and fractional numbers', () => {
    expect(() => makeReference(-1)).toThrow(RangeError);
    expect(() => makeReference(1.5)).toThrow(RangeError);
  });
});
