import { luhnValid, normaliseCardNumber } from '@shared/domain/luhn';

/*
 * How the fake answers a card. The numbers and outcomes are the payment provider's published test cards
 * (from memory of its testing docs). As in the provider's test mode, a number that passes Luhn but is not
 * a test card is declined: nobody should type a real card into a test page, and this way they learn so.
 */

export type CardBrand = 'visa' | 'mastercard' | 'amex' | 'discover' | 'diners' | 'jcb' | 'unionpay' | 'unknown';

export interface CardDecline {
  /** Error code on the error object (`card_declined` for most declines). */
  code: string;
  /** More specific reason, present when `code` is `card_declined`. */
  declineCode?: string;
  message: string;
}

const declined = (declineCode: string, message = 'Your card was declined.'): CardDecline => ({
  code: 'card_declined',
  declineCode,
  message,
});

/** Test numbers that are declined, with the outcome the provider documents for each. */
export const DECLINING_TEST_CARDS: Readonly<Record<string, CardDecline>> = {
  '4000000000000002': declined('generic_decline'),
  '4000000000009995': declined('insufficient_funds', 'Your card has insufficient funds.'),
  '4000000000009987': declined('lost_card'),
  '4000000000009979': declined('stolen_card'),
  '4000000000000069': { code: 'expired_card', declineCode: 'expired_card', message: 'Your card has expired.' },
  '4000000000000127': { code: 'incorrect_cvc', declineCode: 'incorrect_cvc', message: "Your card's security code is incorrect." },
  '4000000000000119': {
    code: 'processing_error',
    declineCode: 'processing_error',
    message: 'An error occurred while processing your card. Try again in a little bit.',
  },
};

/** Test numbers that succeed (one or two per brand). */
export const SUCCEEDING_TEST_CARDS: readonly string[] = [
  '4242424242424242', // Visa
  '4000056655665556', // Visa debit
  '5555555555554444', // Mastercard
  '2223003122003222', // Mastercard, 2-series
  '5200828282828210', // Mastercard debit
  '378282246310005', // American Express
  '371449635398431', // American Express
  '6011111111111117', // Discover
  '3056930009020004', // Diners Club
  '3566002020360505', // JCB
  '6200000000000005', // UnionPay
];

const NOT_A_TEST_CARD: CardDecline = declined(
  'test_mode_live_card',
  'Your card was declined. This is a test payment page: use a test card such as 4242 4242 4242 4242.',
);

/** Brand from the issuer identification number prefix (ISO/IEC 7812 IIN ranges, from memory). */
export function cardBrand(number: string): CardBrand {
  const n = normaliseCardNumber(number);
  const p2 = Number(n.slice(0, 2));
  const p4 = Number(n.slice(0, 4));
  if (n.startsWith('4')) return 'visa';
  if ((p2 >= 51 && p2 <= 55) || (p4 >= 2221 && p4 <= 2720)) return 'mastercard';
  if (p2 === 34 || p2 === 37) return 'amex';
  if (n.startsWith('6011') || n.startsWith('65') || (p4 >= 6440 && p4 <= 6499)) return 'discover';
  if (p2 === 36 || p2 === 38 || (p4 >= 3000 && p4 <= 3059)) return 'diners';
  if (p4 >= 3528 && p4 <= 3589) return 'jcb';
  if (p2 === 62) return 'unionpay';
  return 'unknown';
}

export interface CardInput {
  number: string;
  /** 1–12 */
  expMonth: number;
  /** four digits */
  expYear: number;
  cvc: string;
}

/** Problems found before any charge is attempted: the provider's card form refuses these itself. */
export interface CardInputProblem {
  code: 'incorrect_number' | 'invalid_expiry_month' | 'invalid_expiry_year' | 'invalid_cvc';
  param: 'number' | 'exp_month' | 'exp_year' | 'cvc';
  message: string;
}

export type CardOutcome =
  | { kind: 'refused'; problem: CardInputProblem }
  | { kind: 'declined'; decline: CardDecline; brand: CardBrand; last4: string }
  | { kind: 'succeeded'; brand: CardBrand; last4: string };

/** Reads a typed expiry such as "12/34", "12 / 2034" or "1234"; null if it cannot be read. */
export function parseExpiry(text: string): { expMonth: number; expYear: number } | null {
  const match = /^\s*(\d{1,2})\s*\/?\s*(\d{2}|\d{4})\s*$/.exec(text);
  if (!match) return null;
  const expMonth = Number(match[1]);
  const year = Number(match[2]);
  return { expMonth, expYear: match[2].length === 2 ? 2000 + year : year };
}

/** What happens when this card is used at `now`. */
export function assessCard(card: CardInput, now: Date = new Date()): CardOutcome {
  const number = normaliseCardNumber(card.number);
  if (!/^\d{12,19}$/.test(number) || !luhnValid(number)) {
    return {
      kind: 'refused',
      problem: { code: 'incorrect_number', param: 'number', message: 'Your card number is invalid. Check the digits and try again.' },
    };
  }
  if (!Number.isInteger(card.expMonth) || card.expMonth < 1 || card.expMonth > 12) {
    return {
      kind: 'refused',
      problem: { code: 'invalid_expiry_month', param: 'exp_month', message: "Your card's expiration month is invalid." },
    };
  }
  // A card is good through the last day of its expiry month.
  const expiresAt = Date.UTC(card.expYear, card.expMonth, 1);
  if (!Number.isInteger(card.expYear) || expiresAt <= now.getTime()) {
    return {
      kind: 'refused',
      problem: { code: 'invalid_expiry_year', param: 'exp_year', message: "Your card's expiration date is in the past." },
    };
  }
  const brand = cardBrand(number);
  const cvcLength = brand === 'amex' ? 4 : 3;
  if (!new RegExp(`^\\d{${cvcLength}}$`).test(card.cvc.trim())) {
    return {
      kind: 'refused',
      problem: { code: 'invalid_cvc', param: 'cvc', message: `Your card's security code must be ${cvcLength} digits.` },
    };
  }
  const last4 = number.slice(-4);
  const decline = DECLINING_TEST_CARDS[number];
  if (decline) return { kind: 'declined', decline, brand, last4 };
  if (SUCCEEDING_TEST_CARDS.includes(number)) return { kind: 'succeeded', brand, last4 };
  return { kind: 'declined', decline: NOT_A_TEST_CARD, brand, last4 };
}
