import { createHash, randomUUID } from 'node:crypto';
import type { Request, RequestHandler, Response } from 'express';
import { idempotencyKeySchema } from '@shared/schemas/partner-api';
import { AppError } from '../lib/errors';
import { logger } from '../lib/logger';
import type { ServiceContext } from '../lib/context';
import { apiKeyOf } from './middleware';

/** How long an answer is kept for replay. */
export const IDEMPOTENCY_TTL_HOURS = 24;
/**
 * How long a request may run before a retry with the same key may take over. A process that
 * dies mid-request leaves its row behind; after the lease the next retry runs the work again
 * (the referrals service also refuses to open a second case for the same key).
 */
export const IDEMPOTENCY_LEASE_SECONDS = 60;

/** JSON with object keys sorted, so that key order does not make "another body". */
export function canonicalJson(value: unknown): string {
  if (value === undefined) return 'null';
  if (value === null || typeof value !== 'object') return JSON.stringify(value);
  if (Array.isArray(value)) return `[${value.map(canonicalJson).join(',')}]`;
  const entries = Object.entries(value as Record<string, unknown>)
    .filter(([, v]) => v !== undefined)
    .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
  return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonicalJson(v)}`).join(',')}}`;
}

/** What makes two requests "the same": method, path and body (uploaded files by their content hash). */
export function requestFingerprint(req: Request): string {
  const uploaded = (req as { files?: unknown }).files;
  const files = Array.isArray(uploaded)
    ? (uploaded as { fieldname: string; buffer: Buffer }[]).map((f) => ({ field: f.fieldname, sha256: createHash('sha256').update(f.buffer).digest('hex') }))
    : undefined;
  return createHash('sha256')
    .update(canonicalJson({ method: req.method, path: req.originalUrl, body: req.body ?? null, files }))
    .digest('hex');
}

/** What the route may pass on to its service (the referrals service keeps one case per key). */
export interface IdempotencyHandle {
  key: string;
}

declare module 'express-serve-static-core' {
  interface Locals {
    idempotency?: IdempotencyHandle;
  }
}

interface Claim {
  id: string;
  token: string;
}

type Existing = { request_hash: string; state: 'in_progress' | 'completed'; response_status: number | null; response_body: unknown; lease_until: Date };

let lastSweep = 0;
const SWEEP_EVERY_MS = 10 * 60_000;

async function sweepExpired(ctx: ServiceContext) {
  if (Date.now() - lastSweep < SWEEP_EVERY_MS) return;
  lastSweep = Date.now();
  await ctx.db.query(
    `DELETE FROM idempotency_records WHERE id IN (SELECT id FROM idempotency_records WHERE expires_at < now() LIMIT 1000)`,
  );
}

/**
 * `Idempotency-Key` on a POST: the first request with a key does the work; a retry with the same
 * body gets the first answer again (status and body, header `Idempotent-Replayed: true`); the
 * same key with another body answers 409, and so does a retry while the first is still running.
 * Only successful answers are kept: after a 4xx or 5xx the key is free again, so a corrected
 * request may reuse it.
 *
 * The answer is stored just before it is sent, not in the work's own transaction. What makes that
 * safe: the referrals service writes the key on the case in its transaction and answers a retry
 * with that case, and an unfinished record only holds its lease for IDEMPOTENCY_LEASE_SECONDS.
 * A crash between the work and the record therefore neither blocks the key nor opens a second case.
 */
export function idempotency(ctx: ServiceContext): RequestHandler {
  return async (req, res, next) => {
    const header = req.header('idempotency-key');
    if (header === undefined || req.method !== 'POST') return next();
    const parsed = idempotencyKeySchema.safeParse(header);
    if (!parsed.success) throw AppError.validation([{ path: 'Idempotency-Key', message: parsed.error.issues[0]!.message }]);
    const key = parsed.data;
    const apiKeyId = apiKeyOf(req).apiKeyId;
    const requestHash = requestFingerprint(req);
    await sweepExpired(ctx);

    const claim = await claimOrReplay(ctx, res, { apiKeyId, key, requestHash, method: req.method, path: req.originalUrl });
    if (!claim) return; // answered from the record, or refused

    let settled = false;
    res.locals.idempotency = { key };
    const release = () =>
      ctx.db.query(`DELETE FROM idempotency_records WHERE id = $1 AND lease_token = $2 AND state = 'in_progress'`, [claim.id, claim.token]);

    const send = res.json.bind(res);
    res.json = ((body: unknown) => {
      settled = true;
      const status = res.statusCode;
      const work = status < 400 ? complete(ctx, claim, status, body) : release();
      work
        .catch((err) => logger.error({ err, idempotencyKey: key }, 'could not store the idempotent answer'))
        .finally(() => send(body));
      return res;
    }) as Response['json'];
    // An answer that never went through res.json (a dropped connection, a stream) frees the key.
    res.on('close', () => {
      if (!settled) release().catch((err) => logger.error({ err, idempotencyKey: key }, 'could not release an idempotency key'));
    });
    next();
  };
}

async function complete(ctx: ServiceContext, claim: Claim, status: number, body: unknown) {
  await ctx.db.query(
    `UPDATE idempotency_records SET state = 'completed', response_status = $3, response_body = $4::jsonb
     WHERE id = $1 AND lease_token = $2`,
    [claim.id, claim.token, status, JSON.stringify(body ?? null)],
  );
}

async function claimOrReplay(
  ctx: ServiceContext,
  res: Response,
  input: { apiKeyId: string; key: string; requestHash: string; method: string; path: string },
): Promise<Claim | null> {
  for (let attempt = 0; attempt < 3; attempt++) {
    const token = randomUUID();
    // A fresh key is inserted; an expired record, or an abandoned one for the same request, is taken over.
    const claimed: { id: string }[] = await ctx.db.query(
      `INSERT INTO idempotency_records (api_key_id, idempotency_key, method, path, request_hash, state, lease_until, lease_token, expires_at)
       VALUES ($1, $2, $3, $4, $5, 'in_progress', now() + $6 * interval '1 second', $7, now() + $8 * interval '1 hour')
       ON CONFLICT (api_key_id, idempotency_key) DO UPDATE SET
         method = EXCLUDED.method, path = EXCLUDED.path, request_hash = EXCLUDED.request_hash, state = 'in_progress',
         lease_until = EXCLUDED.lease_until, lease_token = EXCLUDED.lease_token, response_status = NULL, response_body = NULL,
         created_at = now(), expires_at = EXCLUDED.expires_at
       WHERE idempotency_records.expires_at <= now()
          OR (idempotency_records.state = 'in_progress' AND idempotency_records.lease_until <= now()
              AND idempotency_records.request_hash = EXCLUDED.request_hash)
       RETURNING id`,
      [input.apiKeyId, input.key, input.method, input.path, input.requestHash, IDEMPOTENCY_LEASE_SECONDS, token, IDEMPOTENCY_TTL_HOURS],
    );
    if (claimed[0]) return { id: claimed[0].id, token };

    const rows: Existing[] = await ctx.db.query(
      `SELECT request_hash, state, response_status, response_body, lease_until FROM idempotency_records
       WHERE api_key_id = $1 AND idempotency_key = $2`,
      [input.apiKeyId, input.key],
    );
    const existing = rows[0];
    if (!existing) continue; // released between the two statements: try to claim again
    if (existing.request_hash !== input.requestHash) {
      throw new AppError(
        'idempotency_key_reused',
        409,
        'This Idempotency-Key was already used with a different request. Use a new key for a new request.',
        [{ path: 'Idempotency-Key', message: 'Already used with a different request' }],
      );
    }
    if (existing.state === 'in_progress') {
      const wait = Math.max(1, Math.ceil((new Date(existing.lease_until).getTime() - Date.now()) / 1000));
      throw new AppError('idempotency_in_progress', 409, 'A request with this Idempotency-Key is still being processed. Retry in a moment.', undefined, {
        headers: { 'Retry-After': String(Math.min(wait, 5)) },
      });
    }
    res.setHeader('Idempotent-Replayed', 'true');
    res.status(existing.response_status!).json(existing.response_body);
    return null;
  }
  throw new AppError('idempotency_in_progress', 409, 'A request with this Idempotency-Key is still being processed. Retry in a moment.');
}
