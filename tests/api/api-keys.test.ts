import { readFileSync } from 'node:fs';
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { apiKeyPattern } from '@shared/schemas/partner-api';
import { AuditEvent } from '../../server/audit';
import { sha256 } from '../../server/auth/tokens';
import { demoApiKeys, demoApiKeyValues } from '../../server/db/seed/demo-api-keys';
import { ApiKey } from '../../server/partner-api';
import { touchApiKey } from '../../server/partner-api/api-keys';
import { setupApi, signIn } from '../support/api';
import { createOrganization, createUser, TEST_PASSWORD } from '../support/factories';

const { app, db, config } = await setupApi();

async function partnerWithAdmin() {
  const org = await createOrganization(db, 'partner');
  const admin = await createUser(db, { role: 'partner_admin', organizationId: org.id });
  const staff = await createUser(db, { role: 'partner_staff', organizationId: org.id });
  const adminToken = (await signIn(app, admin.email, TEST_PASSWORD)).accessToken;
  const staffToken = (await signIn(app, staff.email, TEST_PASSWORD)).accessToken;
  return { org, admin, adminToken, staffToken };
}

const shopA = await partnerWithAdmin();
const shopB = await partnerWithAdmin();

async function createKey(token: string, name = 'Ticketing') {
  const res = await request(app).post('/api/partner/api-keys').set('Authorization', `Bearer ${token}`).send({ name });
  expect(res.status).toBe(201);
  return res.body as { id: string; name: string; prefix: string; key: string; createdAt: string };
}

describe('API keys: creation', () => {
  it('shows the full key once, in the ppk_live_<prefix>_<secret> format, and audits the creation', async () => {
    const created = await createKey(shopA.adminToken, 'Front desk tickets');

    expect(created).toEqual({ id: expect.any(String), name: 'Front desk tickets', prefix: expect.any(String), key: expect.any(String), createdAt: expect.any(String) });
    const m = apiKeyPattern.exec(created.key);
    expect(m).not.toBeNull();
    expect(m![1]).toBe(created.prefix);

    const audit = await db.getRepository(AuditEvent).findOneByOrFail({ action: 'api_key.created', targetId: created.id });
    expect(audit.actorUserId).toBe(shopA.admin.id);
    expect(audit.organizationId).toBe(shopA.org.id);
    expect(JSON.stringify(audit.details)).not.toContain(m![2]);
  });

  it('stores only the SHA-256 of the secret: no column of the row holds the key or the secret', async () => {
    const created = await createKey(shopA.adminToken);
    const secret = apiKeyPattern.exec(created.key)![2]!;

    const [row] = await db.query(`SELECT * FROM api_keys WHERE id = $1`, [created.id]);
    expect(row.secret_hash).toBe(sha256(secret));
    const stored = JSON.stringify(row);
    expect(stored).not.toContain(secret);
    expect(stored).not.toContain(created.key);
  });

  it('never shows the key again: the list has the prefix and no key or secret', async () => {
    const created = await createKey(shopA.adminToken, 'Listed');
    const secret = apiKeyPattern.exec(created.key)![2]!;

    const res = await request(app).get('/api/partner/api-keys').set('Authorization', `Bearer ${shopA.adminToken}`);

    expect(res.status).toBe(200);
    const listed = res.body.find((k: { id: string }) => k.id === created.id);
    expect(listed).toEqual({ id: created.id, name: 'Listed', prefix: created.prefix, createdAt: created.createdAt, lastUsedAt: null, revokedAt: null });
    expect(JSON.stringify(res.body)).not.toContain(secret);
  });

  it('lists only the own organisation’s keys', async () => {
    const other = await createKey(shopB.adminToken, 'Other shop');
    const res = await request(app).get('/api/partner/api-keys').set('Authorization', `Bearer ${shopA.adminToken}`);
    expect(res.body.map((k: { id: string }) => k.id)).not.toContain(other.id);
  });

  it('refuses a missing or too long name with 400 naming the field and creates no key', async () => {
    const before = await db.getRepository(ApiKey).countBy({ organizationId: shopA.org.id });
    const missing = await request(app).post('/api/partner/api-keys').set('Authorization', `Bearer ${shopA.adminToken}`).send({});
    const long = await request(app).post('/api/partner/api-keys').set('Authorization', `Bearer ${shopA.adminToken}`).send({ name: 'x'.repeat(81) });
    const wrongType = await request(app).post('/api/partner/api-keys').set('Authorization', `Bearer ${shopA.adminToken}`).send({ name: 42 });

    for (const res of [missing, long, wrongType]) {
      expect(res.status).toBe(400);
      expect(res.body.error.code).toBe('validation_failed');
      expect(res.body.error.fields).toEqual([{ path: 'name', message: expect.any(String) }]);
    }
    expect(await db.getRepository(ApiKey).countBy({ organizationId: shopA.org.id })).toBe(before);
  });

  it('refuses malformed JSON with 400 malformed_json and creates no key', async () => {
    const before = await db.getRepository(ApiKey).countBy({ organizationId: shopA.org.id });
    const res = await request(app)
      .post('/api/partner/api-keys')
      .set('Authorization', `Bearer ${shopA.adminToken}`)
      .set('Content-Type', 'application/json')
      .send('{"name": "half');
    expect(res.status).toBe(400);
    expect(res.body.error).toEqual({ code: 'malformed_json', message: expect.any(String), fields: [{ path: '(body)', message: expect.any(String) }] });
    expect(await db.getRepository(ApiKey).countBy({ organizationId: shopA.org.id })).toBe(before);
  });

  it('is for the shop admin only: shop staff get 403 and no sign-in gets 401', async () => {
    const staff = await request(app).post('/api/partner/api-keys').set('Authorization', `Bearer ${shopA.staffToken}`).send({ name: 'Nope' });
    const anonymous = await request(app).get('/api/partner/api-keys');
    expect(staff.status).toBe(403);
    expect(staff.body.error.code).toBe('forbidden');
    expect(anonymous.status).toBe(401);
  });
});

describe('API keys: authentication of /api/v1', () => {
  it('lets a key act as its partner organisation and records when it was last used', async () => {
    const created = await createKey(shopA.adminToken);

    const res = await request(app).get('/api/v1/me').set('Authorization', `Bearer ${created.key}`);

    expect(res.status).toBe(200);
    expect(res.body).toEqual({ apiKey: { id: created.id, name: 'Ticketing', prefix: created.prefix }, organization: { id: shopA.org.id, name: shopA.org.name } });
    const row = await db.getRepository(ApiKey).findOneByOrFail({ id: created.id });
    expect(row.lastUsedAt).toBeInstanceOf(Date);
    const list = await request(app).get('/api/partner/api-keys').set('Authorization', `Bearer ${shopA.adminToken}`);
    expect(list.body.find((k: { id: string }) => k.id === created.id).lastUsedAt).toBe(row.lastUsedAt!.toISOString());
  });

  it('answers 401 in the error shape for a missing, malformed or unknown key', async () => {
    const created = await createKey(shopA.adminToken);
    const wrongSecret = created.key.slice(0, -4) + (created.key.endsWith('AAAA') ? 'BBBB' : 'AAAA');
    const cases = [
      await request(app).get('/api/v1/me'),
      await request(app).get('/api/v1/me').set('Authorization', 'Bearer not-a-key'),
      await request(app).get('/api/v1/me').set('Authorization', `Basic ${created.key}`),
      await request(app).get('/api/v1/me').set('Authorization', `Bearer ${wrongSecret}`),
      await request(app).get('/api/v1/me').set('Authorization', `Bearer ppk_live_${'z'.repeat(12)}_${'A'.repeat(43)}`),
    ];
    for (const res of cases) {
      expect(res.status).toBe(401);
      expect(res.body).toEqual({ error: { code: 'unauthenticated', message: expect.any(String) } });
      // RFC 6750 §3: the challenge names the Bearer scheme.
      expect(res.headers['www-authenticate']).toMatch(/^Bearer /);
    }
  });

  it('does not accept a signed-in user’s access token on /api/v1', async () => {
    const res = await request(app).get('/api/v1/me').set('Authorization', `Bearer ${shopA.adminToken}`);
    expect(res.status).toBe(401);
  });

  it('writes last_used_at at most once a minute', async () => {
    const created = await createKey(shopA.adminToken);
    const principal = { apiKeyId: created.id, name: 'Ticketing', prefix: created.prefix, organizationId: shopA.org.id, organizationName: shopA.org.name, lastUsedAt: null };
    const first = new Date('2026-03-02T10:00:00Z');

    await touchApiKey({ db, config }, principal, first);
    await touchApiKey({ db, config }, { ...principal, lastUsedAt: first }, new Date('2026-03-02T10:00:30Z'));
    // Another instance that read the key before the first write still does not write within the minute.
    await touchApiKey({ db, config }, principal, new Date('2026-03-02T10:00:40Z'));
    expect((await db.getRepository(ApiKey).findOneByOrFail({ id: created.id })).lastUsedAt!.toISOString()).toBe(first.toISOString());

    await touchApiKey({ db, config }, { ...principal, lastUsedAt: first }, new Date('2026-03-02T10:01:01Z'));
    expect((await db.getRepository(ApiKey).findOneByOrFail({ id: created.id })).lastUsedAt!.toISOString()).toBe('2026-03-02T10:01:01.000Z');
  });
});

describe('API keys: revocation', () => {
  it('revokes a key: it answers 401 from then on, the list shows when, and the revocation is audited', async () => {
    const created = await createKey(shopA.adminToken);
    expect((await request(app).get('/api/v1/me').set('Authorization', `Bearer ${created.key}`)).status).toBe(200);

    const res = await request(app).delete(`/api/partner/api-keys/${created.id}`).set('Authorization', `Bearer ${shopA.adminToken}`);

    expect(res.status).toBe(200);
    expect(res.body.revokedAt).toEqual(expect.any(String));
    const after = await request(app).get('/api/v1/me').set('Authorization', `Bearer ${created.key}`);
    expect(after.status).toBe(401);
    expect(after.body.error.code).toBe('unauthenticated');
    const audits = await db.getRepository(AuditEvent).findBy({ action: 'api_key.revoked', targetId: created.id });
    expect(audits).toHaveLength(1);
    expect(audits[0]!.actorUserId).toBe(shopA.admin.id);
  });

  it('revoking twice keeps the first revocation and audits it once', async () => {
    const created = await createKey(shopA.adminToken);
    const first = await request(app).delete(`/api/partner/api-keys/${created.id}`).set('Authorization', `Bearer ${shopA.adminToken}`);
    const second = await request(app).delete(`/api/partner/api-keys/${created.id}`).set('Authorization', `Bearer ${shopA.adminToken}`);
    expect(second.status).toBe(200);
    expect(second.body.revokedAt).toBe(first.body.revokedAt);
    expect(await db.getRepository(AuditEvent).countBy({ action: 'api_key.revoked', targetId: created.id })).toBe(1);
  });

  it('answers 404 for another partner’s key and leaves it working', async () => {
    const other = await createKey(shopB.adminToken);

    const res = await request(app).delete(`/api/partner/api-keys/${other.id}`).set('Authorization', `Bearer ${shopA.adminToken}`);

    expect(res.status).toBe(404);
    expect(res.body.error.code).toBe('not_found');
    expect((await db.getRepository(ApiKey).findOneByOrFail({ id: other.id })).revokedAt).toBeNull();
    expect((await request(app).get('/api/v1/me').set('Authorization', `Bearer ${other.key}`)).status).toBe(200);
  });

  it('answers 400 for an id that is not a UUID', async () => {
    const res = await request(app).delete('/api/partner/api-keys/nope').set('Authorization', `Bearer ${shopA.adminToken}`);
    expect(res.status).toBe(400);
    expect(res.body.error.fields[0].path).toBe('id');
  });

  it('refuses the keys of a deactivated organisation', async () => {
    const shop = await partnerWithAdmin();
    const created = await createKey(shop.adminToken);
    await db.query(`UPDATE organizations SET active = false WHERE id = $1`, [shop.org.id]);
    const res = await request(app).get('/api/v1/me').set('Authorization', `Bearer ${created.key}`);
    expect(res.status).toBe(401);
  });
});

describe('demo API keys', () => {
  it('seeds a key for Juniper Lane PC Clinic and one for Bramblewood Device Repair, each acting as its own shop', async () => {
    for (const [slug, name] of [
      ['juniper-lane', 'Juniper Lane PC Clinic'],
      ['bramblewood', 'Bramblewood Device Repair'],
    ] as const) {
      const res = await request(app).get('/api/v1/me').set('Authorization', `Bearer ${demoApiKeyValues[slug]}`);
      expect(res.status).toBe(200);
      expect(res.body.organization.name).toBe(name);
    }
  });

  it('stores the demo keys hashed like any other key', async () => {
    const rows: { prefix: string; secret_hash: string }[] = await db.query(`SELECT prefix, secret_hash FROM api_keys WHERE prefix LIKE 'demo%'`);
    for (const k of demoApiKeys) {
      const row = rows.find((r) => r.prefix === k.prefix)!;
      expect(row.secret_hash).toBe(sha256(k.secret));
    }
  });

  it('lists each demo key in README.md on a line that says “API key”', () => {
    const readme = readFileSync('README.md', 'utf8');
    for (const key of Object.values(demoApiKeyValues)) {
      const line = readme.split('\n').find((l) => l.includes(`\`${key}\``));
      expect(line).toMatch(/API key/);
    }
  });
});
