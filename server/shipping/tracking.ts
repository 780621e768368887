import type { IncomingHttpHeaders } from 'node:http';
import { In, IsNull, LessThan, Not, type EntityManager } from 'typeorm';
import type { ShipmentStatus } from '@shared/schemas/shipping';
import { AppError } from '../lib/errors';
import type { ServiceContext } from '../lib/context';
import { logger } from '../lib/logger';
import { enqueueEmailToUser } from '../notifications';
import { addTimelineEntry, lockReferral, Referral, type TimelineActor } from '../referrals';
import { appendCustody } from '../custody';
import { carrierClient, classifyCarrierError, type ProviderTracker, type ProviderTrackingDetail } from './carrier';
import { statusRank } from './dto';
import { Shipment, ShipmentScan, ShippingWebhookEvent, type WebhookOutcome } from './entities';
import { settlePurchase } from './service';

// Tracking: signed webhook events from the shipping service, and a reconcile job that reads the trackers
// of boxes on their way for whatever a webhook never delivered. Events are handled once per event id and
// in any order: a status never moves backwards (see statusRank), and at the same rank the later scan wins.

interface WebhookEvent {
  id: string;
  description: string;
  result?: ProviderTracker & { object?: string };
}

/** The carrier's tracker status (and detail) in our words; null for states that say nothing new. */
export function mapTrackerStatus(status: string, detail: string | null): ShipmentStatus | null {
  switch (status) {
    case 'pre_transit':
      return 'label_issued';
    case 'in_transit':
      // The status list has no "exception": carriers flag one in the detail and keep the status.
      return detail === 'transit_exception' ? 'exception' : 'in_transit';
    case 'out_for_delivery':
    case 'available_for_pickup':
      return 'out_for_delivery';
    case 'delivered':
      return 'delivered';
    case 'return_to_sender':
      return 'returned';
    case 'failure':
    case 'error':
      return 'exception';
    default:
      return null; // unknown, cancelled (we void labels ourselves)
  }
}

const carrierActor = (carrier: string | null): TimelineActor => ({ type: 'carrier', id: null, name: carrier ?? 'Carrier' });

function placeOf(d: ProviderTrackingDetail): string | null {
  const loc = d.tracking_location;
  if (!loc || (!loc.city && !loc.state)) return null;
  return [loc.city, loc.state].filter(Boolean).join(', ');
}

/** Verifies an incoming event with the SDK's own check; an unsigned or altered body changes nothing. */
export function verifyWebhook(ctx: ServiceContext, rawBody: Buffer | undefined, headers: IncomingHttpHeaders): WebhookEvent {
  if (!rawBody || rawBody.length === 0) throw new AppError('unauthenticated', 401, 'Empty webhook body');
  let event: unknown;
  try {
    event = carrierClient(ctx.config.shipping).Utils.validateWebhook(rawBody, headers as Record<string, string>, ctx.config.shipping.webhookSecret);
  } catch {
    throw new AppError('unauthenticated', 401, 'The webhook signature is missing or does not match');
  }
  const e = event as Partial<WebhookEvent>;
  if (!e || typeof e.id !== 'string' || typeof e.description !== 'string') throw AppError.validation([{ path: '(body)', message: 'Not a shipping event' }]);
  return e as WebhookEvent;
}

export async function handleShippingWebhook(ctx: ServiceContext, rawBody: Buffer | undefined, headers: IncomingHttpHeaders): Promise<{ outcome: WebhookOutcome | 'duplicate' }> {
  const event = verifyWebhook(ctx, rawBody, headers);
  return ctx.db.transaction(async (manager) => {
    const inserted: { event_id: string }[] = await manager.query(
      `INSERT INTO shipping_webhook_events (event_id, description, outcome) VALUES ($1, $2, 'ignored') ON CONFLICT (event_id) DO NOTHING RETURNING event_id`,
      [event.id, event.description],
    );
    if (inserted.length === 0) return { outcome: 'duplicate' as const };
    const tracker = event.result;
    if (!event.description.startsWith('tracker.') || !tracker || typeof tracker.tracking_code !== 'string') return { outcome: 'ignored' as const };
    const shipment = await findByTracker(manager, tracker);
    if (!shipment) {
      await manager.update(ShippingWebhookEvent, event.id, { outcome: 'unknown_tracker' });
      return { outcome: 'unknown_tracker' as const };
    }
    const outcome = (await applyTracker(ctx, manager, shipment.id, tracker)) ? 'applied' : 'stale';
    await manager.update(ShippingWebhookEvent, event.id, { outcome, shipmentId: shipment.id });
    return { outcome };
  });
}

async function findByTracker(manager: EntityManager, tracker: ProviderTracker): Promise<Shipment | null> {
  return manager.findOne(Shipment, { where: [{ providerTrackerId: tracker.id }, { trackingCode: tracker.tracking_code }] });
}

/**
 * Applies what a tracker says to its shipment, in the caller's transaction (locks the case, then the
 * shipment). Returns whether the shipment's status changed.
 */
export async function applyTracker(ctx: ServiceContext, manager: EntityManager, shipmentId: string, tracker: ProviderTracker): Promise<boolean> {
  const first = await manager.findOneByOrFail(Shipment, { id: shipmentId });
  const referral = (await lockReferral(manager, first.referralId))!;
  const shipment = await manager.findOneOrFail(Shipment, { where: { id: shipmentId }, lock: { mode: 'pessimistic_write' } });

  // Every scan the tracker carries, so that history is complete whatever order events came in.
  const details = Array.isArray(tracker.tracking_details) ? tracker.tracking_details : [];
  for (const d of details) {
    if (!d.datetime || !d.status) continue;
    await manager.query(
      `INSERT INTO shipment_scans (shipment_id, occurred_at, status, status_detail, message, location) VALUES ($1, $2, $3, $4, $5, $6)
       ON CONFLICT (shipment_id, occurred_at, status, message) DO NOTHING`,
      [shipment.id, new Date(d.datetime), d.status, d.status_detail ?? null, d.message ?? d.status, placeOf(d)],
    );
  }
  if (shipment.status === 'voided' || shipment.status === 'awaiting_purchase') return false;

  const next = mapTrackerStatus(tracker.status, tracker.status_detail);
  if (!next) return false;
  const latest = [...details].sort((a, b) => Date.parse(b.datetime) - Date.parse(a.datetime))[0];
  const eventAt = new Date(latest?.datetime ?? tracker.updated_at ?? Date.now());
  const rank = statusRank[next];
  const newer = !shipment.lastEventAt || eventAt.getTime() > shipment.lastEventAt.getTime();
  const moves = rank > shipment.statusRank || (rank === shipment.statusRank && next !== shipment.status && newer);
  const sameStatusNewer = next === shipment.status && newer;
  if (!moves && !sameStatusNewer) return false;

  const previous = shipment.status;
  await manager.update(Shipment, shipment.id, {
    ...(moves ? { status: next, statusRank: rank } : {}),
    lastEventAt: eventAt,
    lastStatusDetail: latest?.status_detail ?? tracker.status_detail,
    lastMessage: latest?.message ?? tracker.status,
    lastLocation: latest ? placeOf(latest) : null,
    ...(tracker.est_delivery_date ? { estimatedDeliveryAt: new Date(tracker.est_delivery_date) } : {}),
    ...(next === 'delivered' && !shipment.deliveredAt ? { deliveredAt: eventAt } : {}),
    ...(tracker.public_url ? { publicTrackingUrl: tracker.public_url } : {}),
  });
  if (!moves) return false;

  // The case: a box on its way makes it "in transit"; "received" is the lab's check-in, never the carrier's.
  const carrier = carrierActor(shipment.carrier ?? tracker.carrier);
  const where = latest ? placeOf(latest) : null;
  const at = where ? ` in ${where}` : '';
  if (shipment.kind !== 'return' && referral.status === 'label_issued' && ['in_transit', 'exception', 'out_for_delivery', 'delivered'].includes(next)) {
    await manager.update(Referral, referral.id, { status: 'in_transit' });
  }
  if (shipment.kind === 'return' && previous === 'label_issued' && next !== 'label_issued' && !['returned', 'closed', 'cancelled'].includes(referral.status)) {
    await manager.update(Referral, referral.id, { status: 'returned' });
  }
  const summary: Partial<Record<ShipmentStatus, string>> = {
    in_transit: previous === 'label_issued' ? `Box picked up by ${carrier.name}${at} (tracking ${shipment.trackingCode}).` : `Box moving again${at}.`,
    exception: `Carrier exception${at}: ${latest?.message ?? 'the carrier reported a problem'}.`,
    out_for_delivery: `Box out for delivery${at}.`,
    delivered: shipment.kind === 'return' ? `Return delivered${at}.` : `Box delivered to the lab${at}; waiting for check-in.`,
    returned: `The carrier is returning the box to the sender${at}.`,
  };
  if (summary[next]) {
    // Kinds as the partner events table names them (in_transit, delivered, returned).
    const kind =
      next === 'in_transit'
        ? previous === 'label_issued' ? 'in_transit' : 'shipment_moving'
        : next === 'delivered'
          ? shipment.kind === 'return' ? 'return_delivered' : 'delivered'
          : next === 'returned'
            ? 'returned_to_sender'
            : `shipment_${next}`;
    await addTimelineEntry(manager, referral.id, {
      kind: shipment.kind === 'return' && previous === 'label_issued' && next !== 'delivered' ? 'returned' : kind,
      summary: summary[next]!,
      actor: carrier,
      at: eventAt,
      details: { shipmentId: shipment.id, trackingCode: shipment.trackingCode, status: next, statusDetail: latest?.status_detail ?? null },
    });
  }
  if (shipment.kind !== 'return' && (next === 'delivered' || previous === 'label_issued')) await appendCustody(manager, referral.id, { action: next === 'delivered' ? 'delivered' : 'handed_to_carrier', actor: carrier, location: where, at: eventAt, details: { shipmentId: shipment.id, trackingCode: shipment.trackingCode } });
  if (next === 'exception' && shipment.kind !== 'return') {
    const people: { email: string; name: string }[] = await manager.query(
      `SELECT email, name FROM users WHERE organization_id = $1 AND role IN ('partner_admin', 'partner_staff') AND status = 'active' ORDER BY email`,
      [referral.partnerOrganizationId],
    );
    for (const person of people) {
      await enqueueEmailToUser(manager, { email: person.email }, 'shipment_exception', {
        name: person.name,
        reference: referral.reference,
        carrier: carrier.name,
        trackingCode: shipment.trackingCode ?? '',
        message: latest?.message ?? 'The carrier reported a problem with the box.',
        url: `${ctx.config.appUrl}/partner/cases/${referral.id}`,
      });
    }
  }
  return true;
}

// ---- reconcile: read trackers of boxes in flight ---------------------------------------------

const IN_FLIGHT: ShipmentStatus[] = ['label_issued', 'in_transit', 'out_for_delivery', 'exception'];

/**
 * Reads the tracker of each box on its way that has not been read for `staleAfterMs`, and settles label
 * purchases whose answer was lost. Covers a server that was down when the webhooks came.
 */
export async function reconcileShipments(ctx: ServiceContext, options: { now?: Date; limit?: number; staleAfterMs?: number } = {}): Promise<{ read: number; changed: number; settled: number }> {
  const now = options.now ?? new Date();
  const limit = options.limit ?? 50;
  const staleBefore = new Date(now.getTime() - (options.staleAfterMs ?? 5 * 60_000));
  const client = carrierClient(ctx.config.shipping);
  let read = 0;
  let changed = 0;
  let settled = 0;

  const pending = await ctx.db.manager.find(Shipment, {
    where: { status: 'awaiting_purchase', purchaseAttemptedAt: LessThan(new Date(now.getTime() - 30_000)) },
    take: limit,
  });
  for (const s of pending) if ((await settlePurchase(ctx, s.id)) === 'bought') settled++;

  const due = await ctx.db.manager.find(Shipment, {
    where: [
      { status: In(IN_FLIGHT), historical: false, providerTrackerId: Not(IsNull()), lastReconciledAt: IsNull() },
      { status: In(IN_FLIGHT), historical: false, providerTrackerId: Not(IsNull()), lastReconciledAt: LessThan(staleBefore) },
    ],
    order: { lastReconciledAt: { direction: 'ASC', nulls: 'FIRST' } },
    take: limit,
  });
  for (const s of due) {
    let tracker: ProviderTracker;
    try {
      tracker = (await client.Tracker.retrieve(s.providerTrackerId!)) as unknown as ProviderTracker;
    } catch (error) {
      const failure = classifyCarrierError(error);
      logger.warn({ shipmentId: s.id, failure }, 'tracker read failed; next run tries again');
      if (failure.kind === 'unavailable') break;
      continue;
    }
    read++;
    const moved = await ctx.db.transaction(async (manager) => {
      const result = await applyTracker(ctx, manager, s.id, tracker);
      await manager.update(Shipment, s.id, { lastReconciledAt: now });
      return result;
    });
    if (moved) changed++;
  }
  return { read, changed, settled };
}

// ---- overdue --------------------------------------------------------------------------------

/** The daily job: boxes whose expected delivery has passed get marked overdue, once, on their case's timeline. */
export async function markOverdueShipments(ctx: ServiceContext, now: Date = new Date()): Promise<number> {
  const due = await ctx.db.manager.find(Shipment, {
    where: { status: In(IN_FLIGHT), overdueAt: IsNull(), checkedInAt: IsNull(), estimatedDeliveryAt: LessThan(now) },
    take: 1000,
  });
  let marked = 0;
  for (const s of due) {
    await ctx.db.transaction(async (manager) => {
      const updated = await manager.update(Shipment, { id: s.id, overdueAt: IsNull(), status: In(IN_FLIGHT) }, { overdueAt: now });
      if (!updated.affected) return;
      marked++;
      await addTimelineEntry(manager, s.referralId, {
        kind: 'shipment_overdue',
        summary: `Box ${s.trackingCode ?? ''} is overdue: it was expected by ${s.estimatedDeliveryAt!.toISOString().slice(0, 10)}.`,
        actor: { type: 'system', id: null, name: 'Platterpost tracking' },
        at: now,
        details: { shipmentId: s.id, trackingCode: s.trackingCode, expected: s.estimatedDeliveryAt!.toISOString() },
      });
    });
  }
  return marked;
}

// ---- webhook registration ---------------------------------------------------------------------

/** Registers our webhook URL with the shipping service unless it is there already. */
export async function ensureWebhookRegistered(ctx: ServiceContext): Promise<'registered' | 'present' | 'not_configured'> {
  const url = ctx.config.shipping.webhookUrl;
  if (!url) return 'not_configured';
  const client = carrierClient(ctx.config.shipping);
  const wanted = new URL(url).toString();
  const { webhooks } = (await client.Webhook.all()) as unknown as { webhooks: { url: string; disabled_at: string | null }[] };
  if (webhooks.some((w) => w.url === wanted && !w.disabled_at)) return 'present';
  await client.Webhook.create({ url: wanted, webhook_secret: ctx.config.shipping.webhookSecret });
  return 'registered';
}
