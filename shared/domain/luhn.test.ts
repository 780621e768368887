import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { luhnValid, normaliseCardNumber } from './luhn';

// The payment provider's published test card numbers (from memory of the provider's testing docs).
const providerTestCards = [
  '4242 4242 4242 4242', // Visa, succeeds
  '4000 0000 0000 0002', // Visa, declined
  '5555 5555 5555 4444', // Mastercard
  '3782 822463 10005', // American Express (15 digits, 4-6-5 grouping)
];

describe('luhnValid', () => {
  it.each(providerTestCards)('accepts the provider test card %s (from memory of the provider docs)', (card) => {
    expect(luhnValid(card)).toBe(true);
  });

  it('accepts the commonly cited worked example 79927398713 and rejects its neighbour (from memory)', () => {
    expect(luhnValid('79927398713')).toBe(true);
    expect(luhnValid('79927398710')).toBe(false);
  });

  it('ignores dashes as well as spaces', () => {
    expect(luhnValid('4242-4242-4242-4242')).toBe(true);
  });

  it.each(providerTestCards)('rejects %s when any single digit is changed', (card) => {
    const digits = normaliseCardNumber(card);
    for (let pos = 0; pos < digits.length; pos++) {
      for (let delta = 1; delta <= 9; delta++) {
        const changed = (Number(digits[pos]) + delta) % 10;
        const altered = digits.slice(0, pos) + String(changed) + digits.slice(pos + 1);
        // Luhn detects every single-digit error, so none of these may pass.
        expect(luhnValid(altered), `${altered} (position ${pos})`).toBe(false);
      }
    }
  });

  it('rejects letters, empty input and a lone digit', () => {
    expect(luhnValid('4242 4242 4242 424a')).toBe(false);
    expect(luhnValid('')).toBe(false);
    expect(luhnValid('   ')).toBe(false);
    expect(luhnValid('0')).toBe(false);
  });

  it('property: appending the right check digit always makes a valid number, and only that digit does', () => {
    fc.assert(
      fc.property(fc.stringMatching(/^\d{1,18}$/), (payload) => {
        const valid = [...'0123456789'].filter((d) => luhnValid(payload + d));
        expect(valid).toHaveLength(1);
      }),
    );
  });
});
