import type { OpenAPIRegistry } from '@asteasolutions/zod-to-openapi';
import { z } from 'zod';
import { partnerEventTypes } from '@shared/schemas/webhooks';
import { caseStatuses } from '@shared/vocabulary';
import { partnerEventForTimelineKind } from './timeline-events';

// The events a shop's endpoint receives, described in the partner API's OpenAPI document
// (OpenAPI 3.1 `webhooks`), one entry per event type.
const kindsByEvent = Object.fromEntries(
  partnerEventTypes.map((t) => [t, Object.entries(partnerEventForTimelineKind).filter(([, e]) => e === t).map(([k]) => k)]),
);

const EventData = z
  .object({
    referral: z.object({ id: z.string().uuid(), reference: z.string(), externalRef: z.string().nullable(), status: z.enum(caseStatuses) }),
    change: z.object({
      kind: z.string().describe('The timeline entry that raised the event'),
      summary: z.string().describe('The change in plain words'),
      at: z.string().describe('ISO 8601 time of the change'),
      actor: z.string().describe('Who made the change'),
      details: z.record(z.string(), z.unknown()),
    }),
  })
  .meta({ id: 'WebhookEventData' });

const signatureHeaders = z.object({
  'webhook-id': z.string().describe('The event id; the same on every retry and on "send again", so you can ignore repeats'),
  'webhook-timestamp': z.string().describe('Unix seconds when this attempt was signed'),
  'webhook-signature': z.string().describe('v1,<base64 HMAC-SHA256 of "id.timestamp.body"> with your endpoint secret (Standard Webhooks)'),
});

export function registerWebhookEvents(registry: OpenAPIRegistry): void {
  for (const type of partnerEventTypes) {
    const payload = z
      .object({ type: z.literal(type), timestamp: z.string(), data: EventData })
      .meta({ id: `WebhookEvent_${type.replace('.', '_')}`, description: `Sent when: ${kindsByEvent[type]?.join(', ') || 'the monthly settlement pays your commission'}.` });
    registry.registerWebhook({
      method: 'post',
      path: type,
      tags: ['Webhooks'],
      summary: `Event ${type}`,
      description:
        'POSTed to each endpoint that subscribed to this event. Verify the signature headers with your endpoint secret ' +
        '(any Standard Webhooks library does it); answer 2xx within 10 s. Failures are retried with growing waits for about a day.',
      request: { headers: signatureHeaders, body: { content: { 'application/json': { schema: payload } } } },
      responses: { 200: { description: 'Any 2xx answer counts as delivered' } },
    });
  }
}
