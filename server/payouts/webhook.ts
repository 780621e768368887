import express, { Router } from 'express';
import type Stripe from 'stripe';
import type { EntityManager } from 'typeorm';
import type { ServiceContext } from '../lib/context';
import { AppError } from '../lib/errors';
import { logger } from '../lib/logger';
import { paymentsClient } from './client';

/*
 * POST /api/webhooks/payments: the payment provider's events, shared by every component that cares
 * (payouts here: `account.updated`; the payment component: checkout and refunds).
 *
 *   - The raw body is verified with `stripe.webhooks.constructEvent` and PAYMENTS_WEBHOOK_SECRET;
 *     unsigned, badly signed, stale or altered bodies get 400 and change nothing.
 *   - Each event id is handled once: the id is inserted in `payment_webhook_events` in the same database
 *     transaction as the handlers' writes; a second delivery finds it and answers 200 at once.
 *   - A handler that throws rolls everything back and the route answers 500, so the provider delivers
 *     the event again later.
 *
 * To react to an event type, register a handler once at start-up (e.g. from your component's index.ts):
 *   onPaymentEvent('checkout.session.completed', async (event, { manager, ctx }) => { … });
 * Handlers get the verified event and the transaction's manager; they must not call `res` or commit.
 */

export type PaymentEventHandler = (event: Stripe.Event, scope: { manager: EntityManager; ctx: ServiceContext }) => Promise<void>;

const handlers = new Map<string, PaymentEventHandler[]>();

/** Registers a handler for one event type; returns a function that removes it again. */
export function onPaymentEvent(type: string, handler: PaymentEventHandler): () => void {
  const list = handlers.get(type) ?? [];
  if (!list.includes(handler)) list.push(handler);
  handlers.set(type, list);
  return () => {
    const current = handlers.get(type) ?? [];
    handlers.set(
      type,
      current.filter((h) => h !== handler),
    );
  };
}

/** Handles one verified event once, in one transaction. Exported for tests and replays. */
export async function dispatchPaymentEvent(ctx: ServiceContext, event: Stripe.Event): Promise<{ duplicate: boolean; handled: number }> {
  return ctx.db.transaction(async (manager) => {
    const inserted: unknown[] = await manager.query(
      `INSERT INTO payment_webhook_events (event_id, type, provider_created_at) VALUES ($1, $2, to_timestamp($3))
       ON CONFLICT (event_id) DO NOTHING RETURNING event_id`,
      [event.id, event.type, event.created],
    );
    if (inserted.length === 0) return { duplicate: true, handled: 0 };
    const list = handlers.get(event.type) ?? [];
    for (const handler of list) await handler(event, { manager, ctx });
    return { duplicate: false, handled: list.length };
  });
}

export function paymentWebhookRoutes(ctx: ServiceContext): Router {
  const router = Router();
  // Mounted before the app's JSON parser: the signature covers the exact bytes.
  router.post('/webhooks/payments', express.raw({ type: () => true, limit: '1mb' }), async (req, res) => {
    const signature = req.header('stripe-signature');
    const body = Buffer.isBuffer(req.body) ? req.body : Buffer.alloc(0);
    if (!signature) throw new AppError('invalid_signature', 400, 'The Stripe-Signature header is missing');
    let event: Stripe.Event;
    try {
      event = paymentsClient(ctx.config).webhooks.constructEvent(body, signature, ctx.config.payments.webhookSecret);
    } catch (err) {
      logger.warn({ err: (err as Error).message }, 'payment webhook refused: signature does not verify');
      throw new AppError('invalid_signature', 400, 'The signature does not match this body');
    }
    const result = await dispatchPaymentEvent(ctx, event);
    res.json({ received: true, duplicate: result.duplicate });
  });
  return router;
}
