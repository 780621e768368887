import { createHash, randomBytes, randomInt, timingSafeEqual } from 'node:crypto';
import type { RequestHandler } from 'express';
import { createLabKeyInput } from '@shared/schemas/lab-work';
import { apiKeyPattern, type ApiKeyDto, type CreatedApiKeyDto } from '@shared/schemas/partner-api';
import { recordAudit } from '../audit';
import { AppError } from '../lib/errors';
import type { Actor, ServiceContext } from '../lib/context';
import { parseInput } from '../lib/validate';
import { ApiKey, formatApiKey, insertApiKey } from '../partner-api';
import type { LabPrincipal } from './access';

// Keys for a lab's own tooling (imagers posting progress, recovery software posting the file list).
// They live in the same api_keys table and format as the shops' partner API keys, but belong to a
// lab organisation: the partner API accepts only shops' keys, and these routes only labs' keys.

declare module 'express-serve-static-core' {
  interface Request {
    labKey?: LabPrincipal & { type: 'api_key' };
  }
}

const PREFIX_ALPHABET = 'abcdefghijklmnopqrstuvwxyz0123456789';
const sha256 = (text: string) => createHash('sha256').update(text).digest('hex');

const toDto = (k: ApiKey): ApiKeyDto => ({
  id: k.id,
  name: k.name,
  prefix: k.prefix,
  createdAt: k.createdAt.toISOString(),
  lastUsedAt: k.lastUsedAt?.toISOString() ?? null,
  revokedAt: k.revokedAt?.toISOString() ?? null,
});

function requireLab(actor: Actor): void {
  if (actor.organizationKind !== 'lab') throw AppError.forbidden('Only a lab has tooling keys');
}

export async function createLabKey(ctx: ServiceContext, actor: Actor, rawInput: unknown, meta: { ip?: string | null } = {}): Promise<CreatedApiKeyDto> {
  requireLab(actor);
  const input = parseInput(createLabKeyInput, rawInput);
  return ctx.db.transaction(async (manager) => {
    let prefix = '';
    for (let i = 0; i < 12; i++) prefix += PREFIX_ALPHABET[randomInt(PREFIX_ALPHABET.length)];
    const secret = randomBytes(32).toString('base64url');
    const key = await insertApiKey(manager, { organizationId: actor.organizationId, name: input.name, prefix, secret, createdById: actor.userId });
    await recordAudit(manager, {
      action: 'lab_key.created',
      actorUserId: actor.userId,
      organizationId: actor.organizationId,
      targetType: 'api_key',
      targetId: key.id,
      details: { name: key.name, prefix: key.prefix },
      ip: meta.ip ?? null,
    });
    return { id: key.id, name: key.name, prefix: key.prefix, key: formatApiKey(key.prefix, secret), createdAt: key.createdAt.toISOString() };
  });
}

export async function listLabKeys(ctx: ServiceContext, actor: Actor): Promise<{ data: ApiKeyDto[] }> {
  requireLab(actor);
  const keys = await ctx.db.getRepository(ApiKey).find({ where: { organizationId: actor.organizationId }, order: { createdAt: 'DESC', id: 'DESC' } });
  return { data: keys.map(toDto) };
}

export async function revokeLabKey(ctx: ServiceContext, actor: Actor, id: string, meta: { ip?: string | null } = {}): Promise<ApiKeyDto> {
  requireLab(actor);
  if (!/^[0-9a-f-]{36}$/i.test(id)) throw AppError.notFound('That key');
  return ctx.db.transaction(async (manager) => {
    const key = await manager.findOne(ApiKey, { where: { id, organizationId: actor.organizationId }, lock: { mode: 'pessimistic_write' } });
    if (!key) throw AppError.notFound('That key');
    if (key.revokedAt) return toDto(key);
    key.revokedAt = new Date();
    key.revokedById = actor.userId;
    await manager.save(key);
    await recordAudit(manager, {
      action: 'lab_key.revoked',
      actorUserId: actor.userId,
      organizationId: actor.organizationId,
      targetType: 'api_key',
      targetId: key.id,
      details: { name: key.name, prefix: key.prefix },
      ip: meta.ip ?? null,
    });
    return toDto(key);
  });
}

/** The lab's key behind a bearer value; null when malformed, unknown, revoked or not a lab's. */
export async function findLabKey(ctx: ServiceContext, bearer: string): Promise<(LabPrincipal & { type: 'api_key' }) | null> {
  const m = apiKeyPattern.exec(bearer);
  if (!m) return null;
  const rows: { id: string; name: string; prefix: string; secret_hash: string; organization_id: string }[] = await ctx.db.query(
    `SELECT k.id, k.name, k.prefix, k.secret_hash, k.organization_id FROM api_keys k JOIN organizations o ON o.id = k.organization_id
     WHERE k.prefix = $1 AND k.revoked_at IS NULL AND o.active AND o.kind = 'lab'`,
    [m[1]],
  );
  const row = rows[0];
  if (!row) return null;
  const given = Buffer.from(sha256(m[2]!), 'hex');
  const stored = Buffer.from(row.secret_hash, 'hex');
  if (given.length !== stored.length || !timingSafeEqual(given, stored)) return null;
  await ctx.db.query(`UPDATE api_keys SET last_used_at = now() WHERE id = $1 AND (last_used_at IS NULL OR last_used_at < now() - interval '1 minute')`, [row.id]);
  return { type: 'api_key', organizationId: row.organization_id, apiKeyId: row.id, name: `Lab tool “${row.name}” (${row.prefix})` };
}

/**
 * For the routes the lab's tooling may call: a bearer value in the key format is checked as a lab key;
 * anything else goes on to the signed-in user's guard.
 */
export function labKeyOr(ctx: ServiceContext, userGuard: RequestHandler): RequestHandler {
  return async (req, res, next) => {
    const m = /^Bearer\s+(ppk_live_\S+)\s*$/i.exec(req.header('authorization') ?? '');
    if (!m) return userGuard(req, res, next);
    const key = await findLabKey(ctx, m[1]!);
    if (!key) {
      return next(new AppError('unauthenticated', 401, 'The key is not valid, has been revoked, or is not a lab’s key', undefined, { headers: { 'WWW-Authenticate': 'Bearer realm="platterpost", error="invalid_token"' } }));
    }
    req.labKey = key;
    next();
  };
}
