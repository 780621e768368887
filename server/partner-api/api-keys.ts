import { randomInt } from 'node:crypto';
import type { EntityManager } from 'typeorm';
import { API_KEY_PREFIX, apiKeyPattern, type ApiKeyDto, type CreateApiKeyInput, type CreatedApiKeyDto } from '@shared/schemas/partner-api';
import { recordAudit } from '../audit';
import { AppError } from '../lib/errors';
import type { Actor, ServiceContext } from '../lib/context';
import { newOpaqueSecret, secretMatches, sha256 } from '../auth/tokens';
import { namedQuery } from '../db/named-query';
import { ApiKey } from './entities';

/** Who a partner API request acts as: the key, on behalf of its partner organisation. */
export interface ApiKeyPrincipal {
  apiKeyId: string;
  name: string;
  prefix: string;
  organizationId: string;
  organizationName: string;
  lastUsedAt: Date | null;
}

/** The actor recorded on timelines and audit lines for work done through the API. */
export interface ApiKeyActor {
  type: 'api_key';
  id: string;
  name: string;
}

export function actorOfKey(principal: ApiKeyPrincipal): ApiKeyActor {
  return { type: 'api_key', id: principal.apiKeyId, name: `API key “${principal.name}” (${principal.prefix})` };
}

const PREFIX_ALPHABET = 'abcdefghijklmnopqrstuvwxyz0123456789';

function newPrefix(): string {
  let out = '';
  for (let i = 0; i < 12; i++) out += PREFIX_ALPHABET[randomInt(PREFIX_ALPHABET.length)];
  return out;
}

export function formatApiKey(prefix: string, secret: string): string {
  return `${API_KEY_PREFIX}${prefix}_${secret}`;
}

export function parseApiKey(key: string): { prefix: string; secret: string } | null {
  const m = apiKeyPattern.exec(key);
  return m ? { prefix: m[1]!, secret: m[2]! } : null;
}

const toDto = (k: ApiKey): ApiKeyDto => ({
  id: k.id,
  name: k.name,
  prefix: k.prefix,
  createdAt: k.createdAt.toISOString(),
  lastUsedAt: k.lastUsedAt?.toISOString() ?? null,
  revokedAt: k.revokedAt?.toISOString() ?? null,
});

/** Stores a key whose secret the caller chose (the demo seed) or that was just generated. */
export async function insertApiKey(
  manager: EntityManager,
  input: { organizationId: string; name: string; prefix: string; secret: string; createdById?: string | null },
): Promise<ApiKey> {
  return manager.save(
    manager.create(ApiKey, {
      organizationId: input.organizationId,
      name: input.name,
      prefix: input.prefix,
      secretHash: sha256(input.secret),
      createdById: input.createdById ?? null,
    }),
  );
}

export async function createApiKey(ctx: ServiceContext, actor: Actor, input: CreateApiKeyInput, meta: { ip?: string | null } = {}): Promise<CreatedApiKeyDto> {
  if (actor.organizationKind !== 'partner') throw AppError.forbidden('Only a partner organisation has API keys');
  return ctx.db.transaction(async (manager) => {
    const { secret } = newOpaqueSecret();
    const key = await insertApiKey(manager, { organizationId: actor.organizationId, name: input.name, prefix: newPrefix(), secret, createdById: actor.userId });
    await recordAudit(manager, {
      action: 'api_key.created',
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

export async function listApiKeys(ctx: ServiceContext, actor: Actor): Promise<ApiKeyDto[]> {
  const keys = await ctx.db.getRepository(ApiKey).find({ where: { organizationId: actor.organizationId }, order: { createdAt: 'DESC', id: 'DESC' } });
  return keys.map(toDto);
}

/** Revoking twice is harmless: the first revocation stands and is the only one audited. */
export async function revokeApiKey(ctx: ServiceContext, actor: Actor, id: string, meta: { ip?: string | null } = {}): Promise<ApiKeyDto> {
  return ctx.db.transaction(async (manager) => {
    const key = await manager.findOne(ApiKey, { where: { id, organizationId: actor.organizationId }, lock: { mode: 'pessimistic_write' } });
    if (!key) throw AppError.notFound('That API key');
    if (key.revokedAt) return toDto(key);
    key.revokedAt = new Date();
    key.revokedById = actor.userId;
    await manager.save(key);
    await recordAudit(manager, {
      action: 'api_key.revoked',
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

/**
 * The key behind a bearer value, or null when it is malformed, unknown, revoked, or its
 * organisation is no longer active. The secret is compared in constant time.
 */
export async function findActiveKey(ctx: ServiceContext, bearer: string): Promise<ApiKeyPrincipal | null> {
  const parsed = parseApiKey(bearer);
  if (!parsed) return null;
  const rows: { id: string; name: string; prefix: string; secret_hash: string; organization_id: string; organization_name: string; last_used_at: Date | null }[] =
    await namedQuery(
      ctx.db.manager,
      'api-keys.find-active',
      `SELECT k.id, k.name, k.prefix, k.secret_hash, k.organization_id, o.name AS organization_name, k.last_used_at
       FROM api_keys k JOIN organizations o ON o.id = k.organization_id
       WHERE k.prefix = $1 AND k.revoked_at IS NULL AND o.active AND o.kind = 'partner'`,
      [parsed.prefix],
    );
  const row = rows[0];
  if (!row || !secretMatches(parsed.secret, row.secret_hash)) return null;
  return {
    apiKeyId: row.id,
    name: row.name,
    prefix: row.prefix,
    organizationId: row.organization_id,
    organizationName: row.organization_name,
    lastUsedAt: row.last_used_at,
  };
}

/** How stale `last_used_at` may get before a request writes it again. */
export const LAST_USED_RESOLUTION_MS = 60_000;

/** At most one write a minute per key, and none at all when another instance just wrote it. */
export async function touchApiKey(ctx: ServiceContext, principal: ApiKeyPrincipal, now = new Date()): Promise<void> {
  if (principal.lastUsedAt && now.getTime() - principal.lastUsedAt.getTime() < LAST_USED_RESOLUTION_MS) return;
  await ctx.db.query(
    `UPDATE api_keys SET last_used_at = $2 WHERE id = $1 AND (last_used_at IS NULL OR last_used_at < $2::timestamptz - interval '1 minute')`,
    [principal.apiKeyId, now],
  );
}
