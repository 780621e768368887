import type { DataSource, EntityManager } from 'typeorm';
import type { CreateWebhookEndpointInput, PartnerEventType, WebhookDeliveryDto, WebhookEndpointDto } from '@shared/schemas/webhooks';
import { createWebhookEndpointInput, updateWebhookEndpointInput } from '@shared/schemas/webhooks';
import type { z } from 'zod';
import { recordAudit } from '../audit';
import { appendBufferOf, newRowId } from '../db/appends';
import { User } from '../auth';
import { AppError } from '../lib/errors';
import type { Actor, ServiceContext } from '../lib/context';
import { logger } from '../lib/logger';
import { enqueueEmailToUser } from '../notifications';
import { WebhookAttempt, WebhookDelivery, WebhookEndpoint, WebhookEvent } from './entities';
import { newWebhookSecret, webhookHeaders } from './signing';

const toDto = (e: WebhookEndpoint): WebhookEndpointDto => ({
  id: e.id,
  url: e.url,
  description: e.description,
  events: e.events,
  status: e.status,
  failingSince: e.failingSince?.toISOString() ?? null,
  disabledAt: e.disabledAt?.toISOString() ?? null,
  disabledReason: e.disabledReason,
  createdAt: e.createdAt.toISOString(),
});

export async function createEndpoint(ctx: ServiceContext, actor: Actor, input: z.output<typeof createWebhookEndpointInput>) {
  return ctx.db.transaction(async (manager) => {
    const endpoint = await manager.save(
      manager.create(WebhookEndpoint, {
        organizationId: actor.organizationId,
        url: input.url,
        description: input.description ?? null,
        events: input.events,
        secret: newWebhookSecret(),
        createdById: actor.userId,
      }),
    );
    await recordAudit(manager, { action: 'webhook_endpoint.created', actorUserId: actor.userId, organizationId: actor.organizationId, targetType: 'webhook_endpoint', targetId: endpoint.id, details: { url: endpoint.url, events: endpoint.events } });
    return { ...toDto(endpoint), secret: endpoint.secret };
  });
}

export async function listEndpoints(ctx: ServiceContext, actor: Actor): Promise<WebhookEndpointDto[]> {
  const rows = await ctx.db.getRepository(WebhookEndpoint).find({ where: { organizationId: actor.organizationId }, order: { createdAt: 'DESC' } });
  return rows.map(toDto);
}

async function ownEndpoint(manager: EntityManager, actor: Actor, id: string) {
  const endpoint = await manager.findOneBy(WebhookEndpoint, { id, organizationId: actor.organizationId });
  if (!endpoint) throw AppError.notFound('That webhook endpoint');
  return endpoint;
}

export async function updateEndpoint(ctx: ServiceContext, actor: Actor, id: string, input: z.output<typeof updateWebhookEndpointInput>) {
  return ctx.db.transaction(async (manager) => {
    const endpoint = await ownEndpoint(manager, actor, id);
    if (input.events) endpoint.events = input.events;
    if (input.description !== undefined) endpoint.description = input.description || null;
    if (input.enabled === true) Object.assign(endpoint, { status: 'active', disabledAt: null, disabledReason: null, failingSince: null });
    if (input.enabled === false) Object.assign(endpoint, { status: 'disabled', disabledAt: new Date(), disabledReason: 'Disabled by the shop' });
    await manager.save(endpoint);
    await recordAudit(manager, { action: 'webhook_endpoint.updated', actorUserId: actor.userId, organizationId: actor.organizationId, targetType: 'webhook_endpoint', targetId: id, details: input });
    return toDto(endpoint);
  });
}

export async function deleteEndpoint(ctx: ServiceContext, actor: Actor, id: string): Promise<void> {
  await ctx.db.transaction(async (manager) => {
    const endpoint = await ownEndpoint(manager, actor, id);
    await manager.delete(WebhookEndpoint, endpoint.id);
    await recordAudit(manager, { action: 'webhook_endpoint.deleted', actorUserId: actor.userId, organizationId: actor.organizationId, targetType: 'webhook_endpoint', targetId: id, details: { url: endpoint.url } });
  });
}

export async function listDeliveries(ctx: ServiceContext, actor: Actor, endpointId: string, limit = 50): Promise<WebhookDeliveryDto[]> {
  await ownEndpoint(ctx.db.manager, actor, endpointId);
  const rows: { id: string; event_id: string; type: PartnerEventType; status: WebhookDeliveryDto['status']; next_attempt_at: Date | null; created_at: Date; attempts: { at: string; statusCode: number | null; durationMs: number; error: string | null }[] | null }[] =
    await ctx.db.query(
      `SELECT d.id, d.event_id, e.type, d.status, d.next_attempt_at, d.created_at,
              (SELECT json_agg(json_build_object('at', a.at, 'statusCode', a.status_code, 'durationMs', a.duration_ms, 'error', a.error) ORDER BY a.at)
                 FROM webhook_attempts a WHERE a.delivery_id = d.id) AS attempts
         FROM webhook_deliveries d JOIN webhook_events e ON e.id = d.event_id
        WHERE d.endpoint_id = $1 ORDER BY d.created_at DESC LIMIT $2`,
      [endpointId, limit],
    );
  return rows.map((r) => ({
    id: r.id,
    eventId: r.event_id,
    eventType: r.type,
    status: r.status,
    attempts: (r.attempts ?? []).map((a) => ({ ...a, at: new Date(a.at).toISOString() })),
    nextAttemptAt: r.next_attempt_at?.toISOString() ?? null,
    createdAt: r.created_at.toISOString(),
  }));
}

/** "Send again": the same event, byte for byte, attempted now. */
export async function resendDelivery(ctx: ServiceContext, actor: Actor, endpointId: string, deliveryId: string): Promise<void> {
  await ctx.db.transaction(async (manager) => {
    await ownEndpoint(manager, actor, endpointId);
    const delivery = await manager.findOneBy(WebhookDelivery, { id: deliveryId, endpointId });
    if (!delivery) throw AppError.notFound('That delivery');
    await manager.update(WebhookDelivery, delivery.id, { status: 'pending', nextAttemptAt: new Date() });
    await recordAudit(manager, { action: 'webhook_delivery.resent', actorUserId: actor.userId, organizationId: actor.organizationId, targetType: 'webhook_delivery', targetId: deliveryId });
  });
}

/**
 * Records an event for a partner inside the caller's transaction and schedules one delivery per
 * subscribed, active endpoint; nothing is sent unless the change commits.
 */
export async function emitPartnerEvent(manager: EntityManager, organizationId: string, type: PartnerEventType, data: Record<string, unknown>): Promise<string | null> {
  const buffer = appendBufferOf(manager);
  if (buffer) {
    // Written at the end of the transaction, and only where an endpoint wants it (see db/appends.ts).
    const id = newRowId();
    buffer.events.push({ id, organizationId, type, payload: JSON.stringify({ type, timestamp: new Date().toISOString(), data }) });
    return id;
  }
  const endpoints: { id: string }[] = await manager.query(
    `SELECT id FROM webhook_endpoints WHERE organization_id = $1 AND status = 'active' AND $2 = ANY(events)`,
    [organizationId, type],
  );
  if (endpoints.length === 0) return null;
  const event = manager.create(WebhookEvent, { organizationId, type, payload: '' });
  event.id = crypto.randomUUID();
  event.payload = JSON.stringify({ type, timestamp: new Date().toISOString(), data });
  await manager.insert(WebhookEvent, event);
  await manager.insert(
    WebhookDelivery,
    endpoints.map((e) => ({ endpointId: e.id, eventId: event.id, status: 'pending' as const, nextAttemptAt: new Date() })),
  );
  return event.id;
}

export interface DispatchWebhookOptions {
  /** Seconds to wait after each failed attempt; when exhausted, the delivery has failed. */
  retryScheduleSeconds: number[];
  /** An endpoint that has failed this long is disabled and its admins are told. */
  disableAfterMs: number;
  timeoutMs?: number;
  batchSize?: number;
}

async function postOnce(url: string, headers: Record<string, string>, body: string, timeoutMs: number) {
  const started = performance.now();
  try {
    const res = await fetch(url, { method: 'POST', headers, body, redirect: 'manual', signal: AbortSignal.timeout(timeoutMs) });
    await res.arrayBuffer().catch(() => undefined);
    return { statusCode: res.status, ok: res.status >= 200 && res.status < 300, error: null, durationMs: Math.round(performance.now() - started) };
  } catch (err) {
    return { statusCode: null, ok: false, error: String((err as Error).message ?? err).slice(0, 300), durationMs: Math.round(performance.now() - started) };
  }
}

/**
 * Attempts every due delivery once. Rows are claimed with SKIP LOCKED, so workers in several
 * processes share the work; the delivery row is the job, so a restart loses nothing.
 */
export async function dispatchWebhooks(db: DataSource, options: DispatchWebhookOptions): Promise<number> {
  const { retryScheduleSeconds, disableAfterMs, timeoutMs = 10_000, batchSize = 20 } = options;
  return db.transaction(async (manager) => {
    const due: { id: string; endpoint_id: string; event_id: string; attempt_count: number; url: string; secret: string; payload: string; failing_since: Date | null; organization_id: string; endpoint_status: string }[] =
      await manager.query(
        `SELECT d.id, d.endpoint_id, d.event_id, d.attempt_count, w.url, w.secret, w.failing_since, w.organization_id, w.status AS endpoint_status, e.payload
           FROM webhook_deliveries d
           JOIN webhook_endpoints w ON w.id = d.endpoint_id
           JOIN webhook_events e ON e.id = d.event_id
          WHERE d.status = 'pending' AND d.next_attempt_at <= now()
          ORDER BY d.next_attempt_at
          LIMIT $1
          FOR UPDATE OF d SKIP LOCKED`,
        [batchSize],
      );
    for (const d of due) {
      if (d.endpoint_status !== 'active') {
        await manager.update(WebhookDelivery, d.id, { status: 'failed', nextAttemptAt: null });
        continue;
      }
      const result = await postOnce(d.url, webhookHeaders(d.secret, d.event_id, d.payload), d.payload, timeoutMs);
      const attemptCount = d.attempt_count + 1;
      await manager.insert(WebhookAttempt, { deliveryId: d.id, at: new Date(), statusCode: result.statusCode, durationMs: result.durationMs, error: result.error });
      if (result.ok) {
        await manager.update(WebhookDelivery, d.id, { status: 'succeeded', attemptCount, deliveredAt: new Date(), nextAttemptAt: null });
        if (d.failing_since) await manager.update(WebhookEndpoint, d.endpoint_id, { failingSince: null });
        continue;
      }
      const failingSince = d.failing_since ?? new Date();
      const wait = retryScheduleSeconds[attemptCount - 1];
      await manager.update(WebhookDelivery, d.id, {
        attemptCount,
        status: wait === undefined ? 'failed' : 'pending',
        nextAttemptAt: wait === undefined ? null : new Date(Date.now() + wait * 1000),
      });
      if (!d.failing_since) await manager.update(WebhookEndpoint, d.endpoint_id, { failingSince });
      if (Date.now() - failingSince.getTime() >= disableAfterMs) await disableFailingEndpoint(manager, d.endpoint_id, d.organization_id, d.url);
    }
    return due.length;
  });
}

async function disableFailingEndpoint(manager: EntityManager, endpointId: string, organizationId: string, url: string) {
  const reason = 'Every delivery failed for a day';
  const { affected } = await manager.update(WebhookEndpoint, { id: endpointId, status: 'active' }, { status: 'disabled', disabledAt: new Date(), disabledReason: reason });
  if (!affected) return;
  await manager.query(`UPDATE webhook_deliveries SET status = 'failed', next_attempt_at = NULL WHERE endpoint_id = $1 AND status = 'pending'`, [endpointId]);
  const admins = await manager.findBy(User, { organizationId, role: 'partner_admin', status: 'active' });
  for (const admin of admins) await enqueueEmailToUser(manager, admin.id, 'webhook_endpoint_disabled', { name: admin.name, url, reason });
  await recordAudit(manager, { action: 'webhook_endpoint.disabled', organizationId, targetType: 'webhook_endpoint', targetId: endpointId, details: { url, reason } });
  logger.warn({ endpointId, url }, 'webhook endpoint disabled after failing for a day');
}
