import { describe, expect, it } from 'vitest';
import Stripe from 'stripe';
import { signatureHeader } from './webhooks';

const stripe = new Stripe('sk_test_unused');

describe('signatureHeader', () => {
  it('equals the header the official stripe SDK generates for the same payload, secret and time (reference: stripe-node)', () => {
    const payload = JSON.stringify({ id: 'evt_1', object: 'event' }, null, 2);
    const secret = 'whsec_reference';
    const timestamp = 1_900_000_000;
    expect(signatureHeader(payload, secret, timestamp)).toBe(
      stripe.webhooks.generateTestHeaderString({ payload, secret, timestamp }),
    );
  });

  it('is accepted by stripe.webhooks.constructEvent and refused once a byte of the body changes', () => {
    const payload = JSON.stringify({ id: 'evt_2', object: 'event', type: 'charge.succeeded' });
    const header = signatureHeader(payload, 'whsec_x');
    expect(stripe.webhooks.constructEvent(payload, header, 'whsec_x').id).toBe('evt_2');
    expect(() => stripe.webhooks.constructEvent(payload.replace('evt_2', 'evt_3'), header, 'whsec_x')).toThrow(
      Stripe.errors.StripeSignatureVerificationError,
    );
  });
});
