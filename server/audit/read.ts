import { auditBounds, auditListQuery, type AuditEventDto, type AuditFacetsDto, type AuditListDto } from '@shared/schemas/audit';
import type { OrganizationKind } from '@shared/vocabulary';
import { AppError } from '../lib/errors';
import type { ServiceContext } from '../lib/context';
import { parseInput } from '../lib/validate';

// The read side of the audit log, for the network admin: filter by action (or a family of actions),
// actor, organisation and time range; newest first with a keyset cursor on (at, id).

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
const CURSOR = /^(\d{1,20})\.([0-9a-f-]{36})$/;

function encodeCursor(micros: string, id: string): string {
  return Buffer.from(`${micros}.${id}`).toString('base64url');
}

function decodeCursor(cursor: string): { micros: string; id: string } {
  const m = CURSOR.exec(Buffer.from(cursor, 'base64url').toString('utf8'));
  if (!m || !UUID.test(m[2]!)) throw AppError.validation([{ path: 'cursor', message: 'Not a cursor from this list; start again without it' }]);
  return { micros: m[1]!, id: m[2]! };
}

const likeEscape = (s: string) => s.replace(/[\\%_]/g, (c) => `\\${c}`);

interface Row {
  id: string;
  at: Date;
  at_micros: string;
  action: string;
  actor_user_id: string | null;
  actor_name: string | null;
  actor_email: string | null;
  organization_id: string | null;
  organization_name: string | null;
  organization_kind: OrganizationKind | null;
  target_type: string | null;
  target_id: string | null;
  details: Record<string, unknown>;
  ip: string | null;
}

function toDto(r: Row): AuditEventDto {
  return {
    id: r.id,
    at: r.at.toISOString(),
    action: r.action,
    actor: r.actor_user_id && r.actor_name !== null ? { id: r.actor_user_id, name: r.actor_name, email: r.actor_email ?? '' } : null,
    organization:
      r.organization_id && r.organization_name !== null ? { id: r.organization_id, name: r.organization_name, kind: r.organization_kind! } : null,
    target: r.target_type ? { type: r.target_type, id: r.target_id } : null,
    details: r.details ?? {},
    ip: r.ip,
  };
}

export async function listAuditEvents(ctx: ServiceContext, rawQuery: unknown): Promise<AuditListDto> {
  const query = parseInput(auditListQuery, rawQuery);
  const where: string[] = [];
  const params: unknown[] = [];
  const param = (value: unknown) => {
    params.push(value);
    return `$${params.length}`;
  };
  if (query.action) {
    const exact = param(query.action);
    where.push(`(e.action = ${exact} OR e.action LIKE ${param(`${likeEscape(query.action)}.%`)})`);
  }
  if (query.actor) {
    if (UUID.test(query.actor)) where.push(`e.actor_user_id = ${param(query.actor)}`);
    else {
      const like = param(`%${likeEscape(query.actor)}%`);
      where.push(`(u.name ILIKE ${like} OR u.email ILIKE ${like})`);
    }
  }
  if (query.organization) where.push(`e.organization_id = ${param(query.organization)}`);
  const { from, to } = auditBounds(query);
  if (from) where.push(`e.at >= ${param(from)}`);
  if (to) where.push(`e.at < ${param(to)}`);
  if (query.cursor) {
    const { micros, id } = decodeCursor(query.cursor);
    where.push(`(e.at, e.id) < (TIMESTAMPTZ 'epoch' + (${param(micros)})::bigint * INTERVAL '1 microsecond', (${param(id)})::uuid)`);
  }
  const limit = param(query.limit + 1);
  const rows: Row[] = await ctx.db.query(
    `SELECT e.id, e.at, (extract(epoch FROM e.at) * 1000000)::bigint::text AS at_micros, e.action, e.actor_user_id,
            u.name AS actor_name, u.email AS actor_email, e.organization_id, o.name AS organization_name, o.kind AS organization_kind,
            e.target_type, e.target_id, e.details, e.ip
       FROM audit_events e
       LEFT JOIN users u ON u.id = e.actor_user_id
       LEFT JOIN organizations o ON o.id = e.organization_id
      ${where.length ? `WHERE ${where.join(' AND ')}` : ''}
      ORDER BY e.at DESC, e.id DESC
      LIMIT ${limit}`,
    params,
  );
  const page = rows.slice(0, query.limit);
  const last = rows.length > query.limit ? page.at(-1)! : null;
  return { data: page.map(toDto), nextCursor: last ? encodeCursor(last.at_micros, last.id) : null };
}

/** What the filters offer: the actions written so far with their counts, and every organisation. */
export async function auditFacets(ctx: ServiceContext): Promise<AuditFacetsDto> {
  const actions: { action: string; count: string }[] = await ctx.db.query(`SELECT action, count(*) AS count FROM audit_events GROUP BY action ORDER BY action`);
  const organizations: { id: string; name: string; kind: OrganizationKind }[] = await ctx.db.query(
    `SELECT id, name, kind FROM organizations ORDER BY kind, name`,
  );
  return { actions: actions.map((a) => ({ action: a.action, count: Number(a.count) })), organizations };
}
