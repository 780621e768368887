import bwipjs from 'bwip-js/node';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { gs1CheckDigit, isValidSscc, makeSscc, ssccElementString } from './sscc';

// The GS1 General Specifications' example SSCC (from memory): 1 0614141 123456789 7.
const GS1_EXAMPLE = '106141411234567897';

describe('gs1CheckDigit', () => {
  it('gives 7 for 10614141123456789 (GS1 General Specifications example SSCC, from memory)', () => {
    expect(gs1CheckDigit('10614141123456789')).toBe(7);
  });

  it('gives 1 for the EAN-13 body 400638133393, the same algorithm on a 12-digit key (EAN-13 example 4006381333931, from memory; bwip-js accepts it below)', async () => {
    expect(gs1CheckDigit('400638133393')).toBe(1);
    await expect(bwipjs.toBuffer({ bcid: 'ean13', text: '4006381333931' })).resolves.toBeInstanceOf(Buffer);
    await expect(bwipjs.toBuffer({ bcid: 'ean13', text: '4006381333932' })).rejects.toThrow(/check digit/i);
  });

  it('rejects anything but digits', () => {
    expect(() => gs1CheckDigit('12a4')).toThrow(/^digits must be a non-empty string of 0–9/);
    expect(() => gs1CheckDigit('')).toThrow(RangeError);
  });
});

describe('makeSscc', () => {
  it('builds the GS1 example SSCC from its parts (GS1 General Specifications, from memory)', () => {
    expect(makeSscc({ extensionDigit: 1, companyPrefix: '0614141', serialReference: '123456789' })).toBe(GS1_EXAMPLE);
  });

  it('left-pads a numeric serial reference to fill 17 digits', () => {
    const sscc = makeSscc({ extensionDigit: 0, companyPrefix: '0614141', serialReference: 42 });
    expect(sscc).toHaveLength(18);
    expect(sscc.slice(0, 17)).toBe('00614141000000042');
    expect(isValidSscc(sscc)).toBe(true);
  });

  it('rejects a serial reference too long for the company prefix, and bad parts, naming the field', () => {
    expect(() => makeSscc({ extensionDigit: 1, companyPrefix: '0614141', serialReference: '1234567890' })).toThrow(
      /serialReference has 10 digits but a 7-digit company prefix leaves room for 9/,
    );
    expect(() => makeSscc({ extensionDigit: 10, companyPrefix: '0614141', serialReference: 1 })).toThrow(/^extensionDigit/);
    expect(() => makeSscc({ extensionDigit: 1, companyPrefix: '06A4141', serialReference: 1 })).toThrow(/^companyPrefix/);
    expect(() => makeSscc({ extensionDigit: 1, companyPrefix: '0614141', serialReference: -3 })).toThrow(/^serialReference/);
  });
});

describe('isValidSscc', () => {
  it('accepts the GS1 example and rejects it with any other check digit', () => {
    expect(isValidSscc(GS1_EXAMPLE)).toBe(true);
    for (let d = 0; d <= 9; d++) {
      if (d === 7) continue;
      expect(isValidSscc(GS1_EXAMPLE.slice(0, 17) + d)).toBe(false);
    }
  });

  it('rejects wrong lengths and non-digits', () => {
    expect(isValidSscc('10614141123456789')).toBe(false);
    expect(isValidSscc('1061414112345678970')).toBe(false);
    expect(isValidSscc('10614141123456789X')).toBe(false);
    expect(isValidSscc(106141411234567897)).toBe(false);
  });

  it('catches every single-digit substitution (property of the mod-10 weights 3 and 1)', () => {
    fc.assert(
      fc.property(fc.stringMatching(/^\d{16}$/), fc.nat(16), fc.integer({ min: 1, max: 9 }), (serial, position, delta) => {
        const sscc = makeSscc({ extensionDigit: serial[0], companyPrefix: serial.slice(1, 8), serialReference: serial.slice(8) });
        const changed = sscc.slice(0, position) + ((Number(sscc[position]) + delta) % 10) + sscc.slice(position + 1);
        expect(isValidSscc(sscc)).toBe(true);
        expect(isValidSscc(changed)).toBe(false);
      }),
    );
  });
});

describe('SSCC against bwip-js (Barcode Writer in Pure PostScript checks AI 00 check digits)', () => {
  it('draws a GS1-128 barcode for a valid SSCC', async () => {
    const png = await bwipjs.toBuffer({ bcid: 'gs1-128', text: ssccElementString(GS1_EXAMPLE) });
    expect(png.subarray(1, 4).toString('ascii')).toBe('PNG');
  });

  it('refuses to draw one with a wrong check digit', async () => {
    await expect(bwipjs.toBuffer({ bcid: 'gs1-128', text: `(00)${GS1_EXAMPLE.slice(0, 17)}0` })).rejects.toThrow(/checksum/i);
  });

  it('agrees with bwip-js on generated SSCCs', async () => {
    const samples = fc.sample(fc.stringMatching(/^\d{17}$/), { numRuns: 10, seed: 18 });
    for (const body of samples) {
      const sscc = makeSscc({ extensionDigit: body[0], companyPrefix: body.slice(1, 10), serialReference: body.slice(10) });
      await expect(bwipjs.toBuffer({ bcid: 'gs1-128', text: `(00)${sscc}` })).resolves.toBeInstanceOf(Buffer);
    }
  });
});
