import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { auditFacetsDto, auditListDto, type AuditEventDto } from '@shared/schemas/audit';
import { setupApi, signIn, unique } from '../support/api';
import { createOrganization, createUser, TEST_PASSWORD } from '../support/factories';

const { app, db } = await setupApi();
const network = (await signIn(app, 'ines.albright@platterpost.example')).accessToken;
const auth = (token: string) => ({ Authorization: `Bearer ${token}` });

/** Audit lines of a family of our own, at chosen times, so that filters see only this test's lines. */
async function writeEvents(family: string, rows: { action: string; at: string; actorUserId?: string; organizationId?: string; details?: object }[]) {
  for (const r of rows) {
    await db.query(
      `INSERT INTO audit_events (at, action, actor_user_id, organization_id, target_type, target_id, details, ip) VALUES ($1, $2, $3, $4, 'referral', 'x', $5, '127.0.0.1')`,
      [r.at, `${family}.${r.action}`, r.actorUserId ?? null, r.organizationId ?? null, JSON.stringify(r.details ?? {})],
    );
  }
}

const list = (query: Record<string, string | number>, token = network) => request(app).get('/api/network/audit').query(query).set(auth(token));

describe('GET /api/network/audit', () => {
  it('lists a real sign-in with its actor and organisation, newest first', async () => {
    const shop = await createOrganization(db, 'partner');
    const person = await createUser(db, { role: 'partner_admin', organizationId: shop.id });
    await signIn(app, person.email, TEST_PASSWORD);

    const res = await list({ action: 'auth.sign_in', actor: person.id });

    expect(res.status).toBe(200);
    const body = auditListDto.parse(res.body);
    expect(body.data).toHaveLength(1);
    expect(body.data[0]).toMatchObject({
      action: 'auth.sign_in',
      actor: { id: person.id, name: person.name, email: person.email },
      organization: { id: shop.id, name: shop.name, kind: 'partner' },
    });
  });

  it('filters by an exact action or its family, by actor name or e-mail, by organisation and by a date range', async () => {
    const family = unique('fam');
    const lab = await createOrganization(db, 'lab');
    const other = await createOrganization(db, 'lab');
    const manager = await createUser(db, { role: 'lab_manager', organizationId: lab.id });
    await writeEvents(family, [
      { action: 'created', at: '2026-02-27T23:30:00Z', actorUserId: manager.id, organizationId: lab.id },
      { action: 'created', at: '2026-02-28T10:00:00Z', organizationId: other.id },
      { action: 'revoked', at: '2026-03-01T00:00:00Z', actorUserId: manager.id, organizationId: lab.id },
      { action: 'revoked', at: '2026-03-02T12:00:00Z', organizationId: other.id },
    ]);
    const actions = async (query: Record<string, string>) => auditListDto.parse((await list({ action: family, ...query })).body).data.map((e: AuditEventDto) => `${e.action.split('.')[1]}@${e.at}`);

    expect(await actions({})).toEqual([
      'revoked@2026-03-02T12:00:00.000Z',
      'revoked@2026-03-01T00:00:00.000Z',
      'created@2026-02-28T10:00:00.000Z',
      'created@2026-02-27T23:30:00.000Z',
    ]);
    expect(auditListDto.parse((await list({ action: `${family}.created` })).body).data).toHaveLength(2);
    expect(await actions({ organization: lab.id })).toEqual(['revoked@2026-03-01T00:00:00.000Z', 'created@2026-02-27T23:30:00.000Z']);
    expect(await actions({ actor: manager.email.slice(0, 12).toUpperCase() })).toHaveLength(2);
    expect(await actions({ actor: manager.id, organization: other.id })).toEqual([]);
    // A calendar date is the whole UTC day; `to` includes its day.
    expect(await actions({ from: '2026-02-28', to: '2026-03-01' })).toEqual(['revoked@2026-03-01T00:00:00.000Z', 'created@2026-02-28T10:00:00.000Z']);
    // A date-time `to` is exclusive, and an offset is honoured (00:30 at UTC+01:00 is 23:30 UTC the day before).
    expect(await actions({ from: '2026-02-28T00:30:00+01:00', to: '2026-03-01T00:00:00Z' })).toEqual(['created@2026-02-28T10:00:00.000Z', 'created@2026-02-27T23:30:00.000Z']);
  });

  it('pages with a keyset cursor without skipping or repeating lines that share a time', async () => {
    const family = unique('page');
    await writeEvents(
      family,
      Array.from({ length: 7 }, (_, i) => ({ action: `step${i}`, at: i < 4 ? '2026-01-05T08:00:00.123456Z' : `2026-01-0${i}T08:00:00Z` })),
    );

    const seen: string[] = [];
    let cursor: string | null = null;
    let pages = 0;
    do {
      const res = await list({ action: family, limit: 3, ...(cursor ? { cursor } : {}) });
      const body = auditListDto.parse(res.body);
      seen.push(...body.data.map((e) => e.id));
      cursor = body.nextCursor;
      pages += 1;
    } while (cursor && pages < 10);

    expect(pages).toBe(3);
    expect(seen).toHaveLength(7);
    expect(new Set(seen).size).toBe(7);
  });

  it('answers field errors for a range that ends before it starts, a bad date and a foreign cursor', async () => {
    const backwards = await list({ from: '2026-03-02', to: '2026-03-01' });
    const badDate = await list({ from: '03/01/2026' });
    const badCursor = await list({ cursor: 'bm90LWEtY3Vyc29y' });
    const badAction = await list({ action: 'DROP TABLE' });

    expect(backwards.status).toBe(400);
    expect(backwards.body.error.fields).toEqual([{ path: 'to', message: 'The end of the range must come after its start' }]);
    expect(badDate.body.error.fields).toEqual([{ path: 'from', message: expect.stringContaining('ISO 8601') }]);
    expect(badCursor.body.error.fields).toEqual([{ path: 'cursor', message: expect.any(String) }]);
    expect(badAction.body.error.fields).toEqual([{ path: 'action', message: expect.any(String) }]);
  });

  it('is for the network admin only', async () => {
    const lab = await createOrganization(db, 'lab');
    const manager = await createUser(db, { role: 'lab_manager', organizationId: lab.id });
    const token = (await signIn(app, manager.email, TEST_PASSWORD)).accessToken;

    expect((await list({}, token)).status).toBe(403);
    expect((await request(app).get('/api/network/audit/facets').set(auth(token))).status).toBe(403);
    expect((await request(app).get('/api/network/audit')).status).toBe(401);
  });
});

describe('GET /api/network/audit/facets', () => {
  it('offers every action written so far with its count, and the organisations', async () => {
    const family = unique('facet');
    await writeEvents(family, [
      { action: 'one', at: '2026-01-01T00:00:00Z' },
      { action: 'one', at: '2026-01-02T00:00:00Z' },
    ]);

    const res = await request(app).get('/api/network/audit/facets').set(auth(network));

    expect(res.status).toBe(200);
    const facets = auditFacetsDto.parse(res.body);
    expect(facets.actions).toContainEqual({ action: `${family}.one`, count: 2 });
    expect(facets.organizations.some((o) => o.kind === 'network')).toBe(true);
  });
});
