import { randomInt } from 'node:crypto';
import type { EntityManager } from 'typeorm';
import { API_KEY_PREFIX, apiKeyPattern, type ApiKeyDto, type CreateApiKeyInput, type CreatedApiKeyDto } from '@shared/schemas/partner-api';
import { recordAudit } from '../audit';
import { AppError } from '../lib/errors';
import type { Actor, ServiceContext } from '../lib/context';
import { newOpaqueSecret, secretMatches, sha256 } from '../auth/tokens';
import { hydrateRow, namedQuery } from '../db/named-query';
import { Organization } from '../organizations/entities';
import { DIRECTORY_READING_COLUMNS, type DirectoryReadingRow } from '../routing';
import { ApiKey } from './entities';

/** Who a partner API request acts as: the key, on behalf of its partner organisation. */
export interface ApiKeyPrincipal {
  apiKeyId: string;
  name: string;
  prefix: string;
  organizationId: string;
  organizationName: string;
  /** The shop, read with the key (active, kind partner). */
  organization: Organization;
  lastUsedAt: Date | null;
  /** The network's directory versions and open cases, read with the key when the route ranks labs. */
  directoryReading?: DirectoryReadingRow;
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

export const apiKeyToDto = (k: ApiKey): ApiKeyDto => ({
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

/**
 * Keys of one organisation, whichever kind: the shops' partner API keys and the labs' tooling keys live in
 * the same table and format and differ only in who may hold them and what their audit lines are called.
 */
export interface KeyAudit {
  created: string;
  revoked: string;
}

/** A new key for the actor's organisation, audited; its secret is in the answer and nowhere else. */
export async function issueOrganizationKey(ctx: ServiceContext, actor: Actor, name: string, audit: KeyAudit, meta: { ip?: string | null } = {}): Promise<CreatedApiKeyDto> {
  return ctx.db.transaction(async (manager) => {
    const { secret } = newOpaqueSecret();
    const key = await insertApiKey(manager, { organizationId: actor.organizationId, name, prefix: newPrefix(), secret, createdById: actor.userId });
    await recordAudit(manager, {
      action: audit.created,
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

export async function listOrganizationKeys(ctx: ServiceContext, organizationId: string): Promise<ApiKeyDto[]> {
  const keys = await ctx.db.getRepository(ApiKey).find({ where: { organizationId }, order: { createdAt: 'DESC', id: 'DESC' } });
  return keys.map(apiKeyToDto);
}

/** Revoking twice is harmless: the first revocation stands and is the only one audited. */
export async function revokeOrganizationKey(ctx: ServiceContext, actor: Actor, id: string, audit: KeyAudit, meta: { ip?: string | null } = {}): Promise<ApiKeyDto> {
  if (!/^[0-9a-f-]{36}$/i.test(id)) throw AppError.notFound('That key');
  return ctx.db.transaction(async (manager) => {
    const key = await manager.findOne(ApiKey, { where: { id, organizationId: actor.organizationId }, lock: { mode: 'pessimistic_write' } });
    if (!key) throw AppError.notFound('That key');
    if (key.revokedAt) return apiKeyToDto(key);
    key.revokedAt = new Date();
    key.revokedById = actor.userId;
    await manager.save(key);
    await recordAudit(manager, {
      action: audit.revoked,
      actorUserId: actor.userId,
      organizationId: actor.organizationId,
      targetType: 'api_key',
      targetId: key.id,
      details: { name: key.name, prefix: key.prefix },
      ip: meta.ip ?? null,
    });
    return apiKeyToDto(key);
  });
}

const partnerKeyAudit: KeyAudit = { created: 'api_key.created', revoked: 'api_key.revoked' };

function requirePartner(actor: Actor): void {
  if (actor.organizationKind !== 'partner') throw AppError.forbidden('Only a partner organisation has API keys');
}

export async function createApiKey(ctx: ServiceContext, actor: Actor, input: CreateApiKeyInput, meta: { ip?: string | null } = {}): Promise<CreatedApiKeyDto> {
  requirePartner(actor);
  return issueOrganizationKey(ctx, actor, input.name, partnerKeyAudit, meta);
}

export async function listApiKeys(ctx: ServiceContext, actor: Actor): Promise<ApiKeyDto[]> {
  return listOrganizationKeys(ctx, actor.organizationId);
}

export async function revokeApiKey(ctx: ServiceContext, actor: Actor, id: string, meta: { ip?: string | null } = {}): Promise<ApiKeyDto> {
  return revokeOrganizationKey(ctx, actor, id, partnerKeyAudit, meta);
}

/**
 * The key behind a bearer value, or null when it is malformed, unknown, revoked, or its
 * organisation is no longer active. The secret is compared in constant time. With
 * `withDirectoryReading` (intake), the same statement also reads what the case's ranking needs
 * fresh, saving a round trip.
 */
export async function findActiveKey(ctx: ServiceContext, bearer: string, options: { withDirectoryReading?: boolean } = {}): Promise<ApiKeyPrincipal | null> {
  const parsed = parseApiKey(bearer);
  if (!parsed) return null;
  const manager = ctx.db.manager;
  // The shop comes with its key: intake needs its address, and this saves reading it again.
  const withReading = options.withDirectoryReading === true;
  const rows: Record<string, unknown>[] = withReading
    ? await namedQuery(manager, 'api-keys.find-active-with-directory', findActiveKeySql(manager, true), [parsed.prefix])
    : await namedQuery(manager, 'api-keys.find-active', findActiveKeySql(manager, false), [parsed.prefix]);
  const row = rows[0];
  if (!row || !secretMatches(parsed.secret, row.k_secret_hash as string)) return null;
  const organization = hydrateRow(manager, Organization, row.o as Record<string, unknown>);
  return {
    apiKeyId: row.k_id as string,
    name: row.k_name as string,
    prefix: row.k_prefix as string,
    organizationId: organization.id,
    organizationName: organization.name,
    organization,
    lastUsedAt: row.k_last_used_at as Date | null,
    ...(withReading
      ? {
          directoryReading: {
            directory_version: row.directory_version as string,
            directory_recipients_version: row.directory_recipients_version as string,
            directory_open_cases: row.directory_open_cases as Record<string, number>,
          },
        }
      : {}),
  };
}

// Built once from the entity's columns, so each statement's text (and its prepared name) never changes.
const keySql: { plain?: string; withDirectory?: string } = {};
function findActiveKeySql(manager: EntityManager, withDirectory: boolean): string {
  // The shop as one JSON column (its columns by name): a narrow row is parsed faster than one
  // column per field, which counts on a statement that runs on every request.
  const orgColumns = () => [`to_jsonb(o) AS o`];
  const keyColumns = `k.id AS k_id, k.name AS k_name, k.prefix AS k_prefix, k.secret_hash AS k_secret_hash, k.last_used_at AS k_last_used_at`;
  const where = (p: string) => `WHERE k.prefix = ${p} AND k.revoked_at IS NULL AND o.active AND o.kind = 'partner'`;
  if (withDirectory) {
    return (keySql.withDirectory ??= `SELECT ${keyColumns}, ${orgColumns().join(', ')}, ${DIRECTORY_READING_COLUMNS}
     FROM api_keys k JOIN organizations o ON o.id = k.organization_id
     ${where('$1')}`);
  }
  return (keySql.plain ??= `SELECT ${keyColumns}, ${orgColumns().join(', ')}
     FROM api_keys k JOIN organizations o ON o.id = k.organization_id
     ${where('$1')}`);
}

/** How stale `last_used_at` may get before a request writes it again. */
export const LAST_USED_RESOLUTION_MS = 60_000;

/** At most one write a minute per key, and none at all when another instance just wrote it. */
export async function touchApiKey(ctx: ServiceContext, principal: Pick<ApiKeyPrincipal, 'apiKeyId' | 'lastUsedAt'>, now = new Date()): Promise<void> {
  if (principal.lastUsedAt && now.getTime() - principal.lastUsedAt.getTime() < LAST_USED_RESOLUTION_MS) return;
  await ctx.db.query(
    `UPDATE api_keys SET last_used_at = $2 WHERE id = $1 AND (last_used_at IS NULL OR last_used_at < $2::timestamptz - interval '1 minute')`,
    [principal.apiKeyId, now],
  );
}
