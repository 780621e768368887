import { createHmac, randomBytes } from 'node:crypto';

// Standard Webhooks (standardwebhooks.com): the signed content is "<msg id>.<unix seconds>.<body>",
// HMAC-SHA256 with the secret's base64-decoded bytes, sent as "v1,<base64 signature>".
export const SECRET_PREFIX = 'whsec_';

export function newWebhookSecret(): string {
  return SECRET_PREFIX + randomBytes(24).toString('base64');
}

export function signWebhook(secret: string, messageId: string, timestampSeconds: number, body: string): string {
  const key = Buffer.from(secret.startsWith(SECRET_PREFIX) ? secret.slice(SECRET_PREFIX.length) : secret, 'base64');
  return `v1,${createHmac('sha256', key).update(`${messageId}.${timestampSeconds}.${body}`).digest('base64')}`;
}

export function webhookHeaders(secret: string, messageId: string, body: string, now = new Date()): Record<string, string> {
  const timestamp = Math.floor(now.getTime() / 1000);
  return {
    'content-type': 'application/json',
    'user-agent': 'Platterpost-Webhooks/1',
    'webhook-id': messageId,
    'webhook-timestamp': String(timestamp),
    'webhook-signature': signWebhook(secret, messageId, timestamp, body),
  };
}
