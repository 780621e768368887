import { describe, expect, it } from 'vitest';
import { makeReference } from '@shared/domain/reference';
import { makeSscc } from '@shared/domain/sscc';
import { checkScannedCode } from './scan';

describe('checkScannedCode', () => {
  it('accepts a case reference as scanned or typed, and catches a wrong check symbol (Crockford Base 32, mod 37) before any look-up', () => {
    const reference = makeReference(1_048_600n);
    expect(checkScannedCode(` ${reference.toLowerCase()} `)).toEqual({ ok: true, code: reference });
    const symbols = '0123456789ABCDEFGHJKMNPQRSTVWXYZ*~$=U';
    const last = reference.slice(-1);
    const wrong = reference.slice(0, -1) + symbols[(symbols.indexOf(last) + 1) % symbols.length];
    expect(checkScannedCode(wrong)).toEqual({ ok: false, message: expect.stringContaining('check symbol') });
  });

  it('checks an SSCC-18’s GS1 mod-10 check digit (GS1 General Specifications, from memory)', () => {
    const sscc = makeSscc({ extensionDigit: 0, companyPrefix: '0614141', serialReference: 42 });
    expect(checkScannedCode(`(00)${sscc}`)).toEqual({ ok: true, code: sscc });
    expect(checkScannedCode(sscc.slice(0, 17) + ((Number(sscc[17]) + 1) % 10)).ok).toBe(false);
  });

  it('passes tracking codes on without hyphens or spaces', () => {
    expect(checkScannedCode('bw 1234-5678-9012')).toEqual({ ok: true, code: 'BW123456789012' });
    expect(checkScannedCode('!!').ok).toBe(false);
  });
});
