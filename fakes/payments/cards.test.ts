import { describe, expect, it } from 'vitest';
import { luhnValid } from '@shared/domain/luhn';
import { assessCard, cardBrand, DECLINING_TEST_CARDS, parseExpiry, SUCCEEDING_TEST_CARDS } from './cards';

const now = new Date('2030-06-15T12:00:00Z');
const valid = { expMonth: 12, expYear: 2031, cvc: '123' };

describe('test card table', () => {
  // The table is written from memory of the provider's testing docs; every published test number is
  // Luhn-valid, so a typo in the table would show up here.
  it.each([...SUCCEEDING_TEST_CARDS, ...Object.keys(DECLINING_TEST_CARDS)])('%s passes Luhn (ISO/IEC 7812-1)', (n) => {
    expect(luhnValid(n)).toBe(true);
  });
});

describe('assessCard', () => {
  it('lets 4242 4242 4242 4242 succeed, as the provider documents (from memory)', () => {
    expect(assessCard({ number: '4242 4242 4242 4242', ...valid }, now)).toEqual({ kind: 'succeeded', brand: 'visa', last4: '4242' });
  });

  it('declines 4000 0000 0000 0002 with card_declined / generic_decline, as the provider documents (from memory)', () => {
    const outcome = assessCard({ number: '4000000000000002', ...valid }, now);
    expect(outcome).toMatchObject({
      kind: 'declined',
      decline: { code: 'card_declined', declineCode: 'generic_decline', message: 'Your card was declined.' },
    });
  });

  it('declines 4000 0000 0000 9995 for insufficient funds (from memory of the provider docs)', () => {
    expect(assessCard({ number: '4000000000009995', ...valid }, now)).toMatchObject({
      decline: { code: 'card_declined', declineCode: 'insufficient_funds' },
    });
  });

  it('refuses a number that fails Luhn before any charge, naming the number as the problem', () => {
    expect(assessCard({ number: '4242 4242 4242 4241', ...valid }, now)).toEqual({
      kind: 'refused',
      problem: { code: 'incorrect_number', param: 'number', message: expect.stringMatching(/card number is invalid/) },
    });
  });

  it('refuses too-short numbers even when they pass Luhn', () => {
    expect(luhnValid('4242')).toBe(true); // passes the checksum, but no card number is 4 digits long
    expect(assessCard({ number: '4242', ...valid }, now)).toMatchObject({ kind: 'refused', problem: { code: 'incorrect_number' } });
  });

  it('declines a Luhn-valid number that is not a test card, telling the person to use one', () => {
    // 4111 1111 1111 1111 passes Luhn (widely printed sample number); it is not in our table.
    const outcome = assessCard({ number: '4111 1111 1111 1111', ...valid }, now);
    expect(outcome).toMatchObject({ kind: 'declined', decline: { code: 'card_declined', declineCode: 'test_mode_live_card' } });
    expect(outcome.kind === 'declined' && outcome.decline.message).toMatch(/test card such as 4242/);
  });

  it('accepts a card through the last day of its expiry month and refuses it after', () => {
    expect(assessCard({ number: '4242424242424242', expMonth: 6, expYear: 2030, cvc: '123' }, now).kind).toBe('succeeded');
    expect(assessCard({ number: '4242424242424242', expMonth: 5, expYear: 2030, cvc: '123' }, now)).toMatchObject({
      kind: 'refused',
      problem: { code: 'invalid_expiry_year', param: 'exp_year' },
    });
  });

  it('refuses month 13', () => {
    expect(assessCard({ number: '4242424242424242', expMonth: 13, expYear: 2031, cvc: '123' }, now)).toMatchObject({
      problem: { code: 'invalid_expiry_month' },
    });
  });

  it('wants a 4-digit security code on American Express and 3 digits elsewhere', () => {
    expect(assessCard({ number: '3782 822463 10005', ...valid, cvc: '123' }, now)).toMatchObject({ problem: { code: 'invalid_cvc' } });
    expect(assessCard({ number: '3782 822463 10005', ...valid, cvc: '1234' }, now).kind).toBe('succeeded');
    expect(assessCard({ number: '4242424242424242', ...valid, cvc: '12' }, now)).toMatchObject({ problem: { code: 'invalid_cvc' } });
  });
});

describe('cardBrand', () => {
  it.each([
    ['4242424242424242', 'visa'],
    ['5555555555554444', 'mastercard'],
    ['2223003122003222', 'mastercard'],
    ['378282246310005', 'amex'],
    ['6011111111111117', 'discover'],
    ['3056930009020004', 'diners'],
    ['3566002020360505', 'jcb'],
    ['6200000000000005', 'unionpay'],
    ['9999999999999995', 'unknown'],
  ])('%s is %s (IIN ranges, from memory)', (n, brand) => {
    expect(cardBrand(n)).toBe(brand);
  });
});

describe('parseExpiry', () => {
  it('reads MM/YY, MM / YYYY and MMYY', () => {
    expect(parseExpiry('12/34')).toEqual({ expMonth: 12, expYear: 2034 });
    expect(parseExpiry(' 1 / 2031 ')).toEqual({ expMonth: 1, expYear: 2031 });
    expect(parseExpiry('0931')).toEqual({ expMonth: 9, expYear: 2031 });
  });

  it('gives null for text it cannot read', () => {
    expect(parseExpiry('soon')).toBeNull();
    expect(parseExpiry('12/3')).toBeNull();
  });
});
