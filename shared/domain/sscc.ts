// GS1 Serial Shipping Container Code (SSCC-18), the identifier on every box we ship:
// extension digit + GS1 Company Prefix + serial reference (17 digits together) + check digit.
// Layout and check digit per the GS1 General Specifications (from memory).

const digitsOnly = /^\d+$/;

/**
 * GS1 mod-10 check digit for any GS1 key: weights 3, 1, 3, … from the rightmost digit,
 * check = (10 − sum mod 10) mod 10.
 */
export function gs1CheckDigit(digits: string): number {
  if (typeof digits !== 'string' || !digitsOnly.test(digits)) {
    throw new RangeError(`digits must be a non-empty string of 0–9, got ${JSON.stringify(digits)}`);
  }
  let sum = 0;
  for (let i = 0; i < digits.length; i++) {
    const digit = digits.charCodeAt(digits.length - 1 - i) - 48;
    sum += i % 2 === 0 ? digit * 3 : digit;
  }
  return (10 - (sum % 10)) % 10;
}

export interface SsccParts {
  /** 0–9, chosen by the company to extend its serial capacity. */
  extensionDigit: number | string;
  /** The GS1 Company Prefix, 4 to 12 digits (from memory of the GS1 General Specifications). */
  companyPrefix: string;
  /** Left-padded with zeros to fill the 16 − prefix length digits left after the prefix. */
  serialReference: string | number | bigint;
}

export const SSCC_LENGTH = 18;

export function makeSscc({ extensionDigit, companyPrefix, serialReference }: SsccParts): string {
  const extension = String(extensionDigit);
  if (!/^\d$/.test(extension)) {
    throw new RangeError(`extensionDigit must be a single digit 0–9, got ${JSON.stringify(extensionDigit)}`);
  }
  if (typeof companyPrefix !== 'string' || !/^\d{4,12}$/.test(companyPrefix)) {
    throw new RangeError(`companyPrefix must be 4 to 12 digits, got ${JSON.stringify(companyPrefix)}`);
  }
  const serialRoom = 16 - companyPrefix.length;
  if (typeof serialReference === 'number' && (!Number.isSafeInteger(serialReference) || serialReference < 0)) {
    throw new RangeError(`serialReference must be a non-negative whole number, got ${serialReference}`);
  }
  const serial = String(serialReference);
  if (!digitsOnly.test(serial)) {
    throw new RangeError(`serialReference must be digits only, got ${JSON.stringify(serial)}`);
  }
  if (serial.length > serialRoom) {
    throw new RangeError(
      `serialReference has ${serial.length} digits but a ${companyPrefix.length}-digit company prefix leaves room for ${serialRoom}`,
    );
  }
  const body = extension + companyPrefix + serial.padStart(serialRoom, '0');
  return body + String(gs1CheckDigit(body));
}

export function isValidSscc(value: unknown): boolean {
  if (typeof value !== 'string' || value.length !== SSCC_LENGTH || !digitsOnly.test(value)) return false;
  return gs1CheckDigit(value.slice(0, 17)) === Number(value[17]);
}

/** The GS1-128 element string with the SSCC's application identifier, as printed under the barcode. */
export function ssccElementString(sscc: string): string {
  if (!isValidSscc(sscc)) throw new RangeError(`not a valid SSCC-18: ${JSON.stringify(sscc)}`);
  return `(00)${sscc}`;
}
