export { WebhookAttempt, WebhookDelivery, WebhookEndpoint, WebhookEvent } from './entities';
export { webhookRoutes } from './routes';
export { emitPartnerEvent, dispatchWebhooks, type DispatchWebhookOptions } from './service';
export { signWebhook, webhookHeaders } from './signing';
export { emitForTimelineEntry, partnerEventForTimelineKind, type CaseForEvent } from './timeline-events';
