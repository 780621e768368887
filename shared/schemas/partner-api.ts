import { z } from 'zod';

// Partner API keys: created and revoked by a shop admin in the app, used by the shop's own
// ticketing system against /api/v1.

export const API_KEY_PREFIX = 'ppk_live_';

/** `ppk_live_<prefix>_<secret>`: the prefix finds the row, the secret is checked against its SHA-256. */
export const apiKeyPattern = /^ppk_live_([a-z0-9]{12})_([A-Za-z0-9_-]{32,128})$/;

export const createApiKeyInput = z.object({
  name: z
    .string({ message: 'Name the key, e.g. after the system that will use it' })
    .trim()
    .min(1, 'Name the key, e.g. after the system that will use it')
    .max(80, 'Use at most 80 characters'),
});
export type CreateApiKeyInput = z.infer<typeof createApiKeyInput>;

export const apiKeyDto = z.object({
  id: z.string().uuid(),
  name: z.string(),
  /** The public part of the key, enough to tell keys apart; never the secret. */
  prefix: z.string(),
  createdAt: z.string(),
  lastUsedAt: z.string().nullable(),
  revokedAt: z.string().nullable(),
});
export type ApiKeyDto = z.infer<typeof apiKeyDto>;

/** The answer to creating a key: the only time the full key is ever shown. */
export const createdApiKeyDto = z.object({
  id: z.string().uuid(),
  name: z.string(),
  prefix: z.string(),
  key: z.string(),
  createdAt: z.string(),
});
export type CreatedApiKeyDto = z.infer<typeof createdApiKeyDto>;

/** Idempotency-Key request header: printable ASCII, as most payment and shipping APIs accept. */
export const idempotencyKeySchema = z
  .string()
  .min(1, 'The Idempotency-Key header is empty')
  .max(255, 'Use an Idempotency-Key of at most 255 characters')
  .regex(/^[\x21-\x7e]+$/, 'Use printable ASCII characters without spaces in the Idempotency-Key');

export const referralPhotoDto = z.object({
  id: z.string().uuid(),
  url: z.string(),
  contentType: z.string(),
  sizeBytes: z.number().int(),
  uploadedAt: z.string(),
});
export type ReferralPhotoDto = z.infer<typeof referralPhotoDto>;

/** Condition photos: what an upload may hold, shared by the counter form and the server. */
export const PHOTO_MAX_BYTES = 10 * 1024 * 1024;
export const PHOTOS_PER_REFERRAL = 8;
export const photoContentTypes = ['image/jpeg', 'image/png', 'image/webp', 'image/heic', 'image/heif'] as const;
