import type { RequestHandler } from 'express';
import { createLabKeyInput } from '@shared/schemas/lab-work';
import type { ApiKeyDto, CreatedApiKeyDto } from '@shared/schemas/partner-api';
import { secretMatches } from '../auth/tokens';
import { AppError } from '../lib/errors';
import type { Actor, ServiceContext } from '../lib/context';
import { parseInput } from '../lib/validate';
import { issueOrganizationKey, listOrganizationKeys, parseApiKey, revokeOrganizationKey, touchApiKey, type KeyAudit } from '../partner-api';
import type { LabPrincipal } from './access';

// Keys for a lab's own tooling (imagers posting progress, recovery software posting the file list).
// They live in the same api_keys table and format as the shops' partner API keys, but belong to a
// lab organisation: the partner API accepts only shops' keys, and these routes only labs' keys.

declare module 'express-serve-static-core' {
  interface Request {
    labKey?: LabPrincipal & { type: 'api_key' };
  }
}

const labKeyAudit: KeyAudit = { created: 'lab_key.created', revoked: 'lab_key.revoked' };

function requireLab(actor: Actor): void {
  if (actor.organizationKind !== 'lab') throw AppError.forbidden('Only a lab has tooling keys');
}

export async function createLabKey(ctx: ServiceContext, actor: Actor, rawInput: unknown, meta: { ip?: string | null } = {}): Promise<CreatedApiKeyDto> {
  requireLab(actor);
  const input = parseInput(createLabKeyInput, rawInput);
  return issueOrganizationKey(ctx, actor, input.name, labKeyAudit, meta);
}

export async function listLabKeys(ctx: ServiceContext, actor: Actor): Promise<{ data: ApiKeyDto[] }> {
  requireLab(actor);
  return { data: await listOrganizationKeys(ctx, actor.organizationId) };
}

export async function revokeLabKey(ctx: ServiceContext, actor: Actor, id: string, meta: { ip?: string | null } = {}): Promise<ApiKeyDto> {
  requireLab(actor);
  return revokeOrganizationKey(ctx, actor, id, labKeyAudit, meta);
}

/** The lab's key behind a bearer value; null when malformed, unknown, revoked or not a lab's. */
export async function findLabKey(ctx: ServiceContext, bearer: string): Promise<(LabPrincipal & { type: 'api_key' }) | null> {
  const parsed = parseApiKey(bearer);
  if (!parsed) return null;
  const rows: { id: string; name: string; prefix: string; secret_hash: string; organization_id: string; last_used_at: Date | null }[] = await ctx.db.query(
    `SELECT k.id, k.name, k.prefix, k.secret_hash, k.organization_id, k.last_used_at FROM api_keys k JOIN organizations o ON o.id = k.organization_id
     WHERE k.prefix = $1 AND k.revoked_at IS NULL AND o.active AND o.kind = 'lab'`,
    [parsed.prefix],
  );
  const row = rows[0];
  if (!row || !secretMatches(parsed.secret, row.secret_hash)) return null;
  await touchApiKey(ctx, { apiKeyId: row.id, lastUsedAt: row.last_used_at });
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
