import { z } from 'zod';

// Events a partner's systems can subscribe to. Payloads are described in the OpenAPI document.
export const partnerEventTypes = [
  'referral.created',
  'referral.offered',
  'referral.accepted',
  'referral.declined',
  'shipment.label_issued',
  'shipment.in_transit',
  'shipment.delivered',
  'referral.received',
  'quote.sent',
  'quote.approved',
  'payment.succeeded',
  'recovery.ready_for_review',
  'referral.returned',
  'referral.closed',
  'commission.settled',
] as const;
export type PartnerEventType = (typeof partnerEventTypes)[number];

const LOOPBACK_HOSTS = new Set(['localhost', '127.0.0.1', '[::1]', '::1']);

/** HTTPS anywhere; plain HTTP only to this machine, for development. */
export function webhookUrlProblem(raw: string): string | null {
  let url: URL;
  try {
    url = new URL(raw);
  } catch {
    return 'Enter a full URL, e.g. https://tickets.example.com/platterpost';
  }
  if (url.username || url.password) return 'Leave credentials out of the URL; verify our signature instead';
  if (url.protocol === 'https:') return null;
  if (url.protocol === 'http:' && LOOPBACK_HOSTS.has(url.hostname)) return null;
  return 'Use an https:// URL (plain http is allowed only for localhost while developing)';
}

export const createWebhookEndpointInput = z.object({
  url: z
    .string()
    .trim()
    .max(2000)
    .superRefine((value, ctx) => {
      const problem = webhookUrlProblem(value);
      if (problem) ctx.addIssue({ code: 'custom', message: problem });
    }),
  description: z.string().trim().max(200).optional(),
  events: z
    .array(z.enum(partnerEventTypes, { message: 'Unknown event type' }))
    .min(1, 'Choose at least one event')
    .transform((events) => [...new Set(events)]),
});
export type CreateWebhookEndpointInput = z.input<typeof createWebhookEndpointInput>;

export const updateWebhookEndpointInput = z.object({
  events: createWebhookEndpointInput.shape.events.optional(),
  description: z.string().trim().max(200).optional(),
  /** Re-enable an endpoint that was disabled after failing for a day. */
  enabled: z.boolean().optional(),
});

export const webhookEndpointDto = z.object({
  id: z.string().uuid(),
  url: z.string(),
  description: z.string().nullable(),
  events: z.array(z.enum(partnerEventTypes)),
  status: z.enum(['active', 'disabled']),
  failingSince: z.string().nullable(),
  disabledAt: z.string().nullable(),
  disabledReason: z.string().nullable(),
  createdAt: z.string(),
});
export type WebhookEndpointDto = z.infer<typeof webhookEndpointDto>;

/** Only in the answer to creation: the signing secret, shown once. */
export const createdWebhookEndpointDto = webhookEndpointDto.extend({ secret: z.string() });

export const webhookDeliveryDto = z.object({
  id: z.string().uuid(),
  eventId: z.string(),
  eventType: z.enum(partnerEventTypes),
  status: z.enum(['pending', 'succeeded', 'failed']),
  attempts: z.array(
    z.object({ at: z.string(), statusCode: z.number().nullable(), durationMs: z.number(), error: z.string().nullable() }),
  ),
  nextAttemptAt: z.string().nullable(),
  createdAt: z.string(),
});
export type WebhookDeliveryDto = z.infer<typeof webhookDeliveryDto>;

/** What the partner's endpoint receives (the Standard Webhooks payload shape). */
export const webhookPayloadSchema = z.object({
  type: z.enum(partnerEventTypes),
  timestamp: z.string(),
  data: z.record(z.string(), z.unknown()),
});
