import { readFileSync } from 'node:fs';
import express from 'express';
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { errorHandler } from '../../server/lib/errors';
import { IdempotencyRecord } from '../../server/partner-api';
import { idempotency } from '../../server/partner-api/idempotency';
import { requireApiKey } from '../../server/partner-api/middleware';
import { referralDto, referralListDto, routingPreviewDto } from '@shared/schemas/referrals';
import { setupApi, signIn, unique } from '../support/api';
import { createOrganization, createUser, TEST_PASSWORD } from '../support/factories';

const api = await setupApi();
const { app, db, config } = api;
// A second app on the same database whose keys may make only 3 requests a minute.
const limited = await setupApi({ PARTNER_API_RATE_LIMIT_PER_MINUTE: '3' });

async function shopWithKey(target = app) {
  const org = await createOrganization(db, 'partner');
  const admin = await createUser(db, { role: 'partner_admin', organizationId: org.id });
  const token = (await signIn(target, admin.email, TEST_PASSWORD)).accessToken;
  const res = await request(target).post('/api/partner/api-keys').set('Authorization', `Bearer ${token}`).send({ name: 'Ticketing' });
  expect(res.status).toBe(201);
  return { org, admin, token, key: res.body.key as string, keyId: res.body.id as string };
}

describe('per-key rate limit', () => {
  it('answers 429 in the error shape with Retry-After once a key has used its requests for the minute', async () => {
    const shop = await shopWithKey(limited.app);
    const statuses: number[] = [];
    for (let i = 0; i < 3; i++) statuses.push((await request(limited.app).get('/api/v1/me').set('Authorization', `Bearer ${shop.key}`)).status);

    const over = await request(limited.app).get('/api/v1/me').set('Authorization', `Bearer ${shop.key}`);

    expect(statuses).toEqual([200, 200, 200]);
    expect(over.status).toBe(429);
    expect(over.body).toEqual({ error: { code: 'rate_limited', message: expect.stringContaining('3 requests') } });
    const retryAfter = Number(over.headers['retry-after']);
    expect(Number.isInteger(retryAfter)).toBe(true);
    expect(retryAfter).toBeGreaterThanOrEqual(1);
    expect(retryAfter).toBeLessThanOrEqual(60);
  });

  it('counts each key on its own: another key of the same shop is not limited by the first', async () => {
    const shop = await shopWithKey(limited.app);
    for (let i = 0; i < 4; i++) await request(limited.app).get('/api/v1/me').set('Authorization', `Bearer ${shop.key}`);
    const second = await request(limited.app).post('/api/partner/api-keys').set('Authorization', `Bearer ${shop.token}`).send({ name: 'Second' });

    const res = await request(limited.app).get('/api/v1/me').set('Authorization', `Bearer ${second.body.key}`);

    expect(res.status).toBe(200);
    expect(res.headers['ratelimit']).toMatch(/limit=3, remaining=2/);
  });

  it('reads the limit from the configuration (PARTNER_API_RATE_LIMIT_PER_MINUTE, default 600)', async () => {
    expect(config.partnerApiRateLimitPerMinute).toBe(600);
    const shop = await shopWithKey();
    const res = await request(app).get('/api/v1/me').set('Authorization', `Bearer ${shop.key}`);
    expect(res.headers['ratelimit']).toMatch(/limit=600, remaining=599/);
  });
});

// The idempotency layer on its own, in front of a handler whose work the test can count and
// hold; the referral routes below use the same middleware.
function idempotencyHarness() {
  let runs = 0;
  let gate: Promise<void> | null = null;
  let fail = false;
  const harness = express();
  harness.use(express.json());
  harness.post('/work', requireApiKey(api), idempotency(api), async (req, res) => {
    runs += 1;
    const run = runs;
    // A held gate stops only the next run; later runs go straight through.
    const held = gate;
    gate = null;
    if (held) await held;
    if (fail) return res.status(503).json({ error: { code: 'unavailable', message: 'try later' } });
    res.status(201).json({ run, echo: req.body });
  });
  harness.use(errorHandler);
  return {
    app: harness,
    runs: () => runs,
    hold() {
      let open!: () => void;
      gate = new Promise((r) => (open = r));
      return () => open();
    },
    failNext(value: boolean) {
      fail = value;
    },
  };
}

describe('idempotency (Idempotency-Key on POST)', () => {
  it('replays the first answer, status and body, for the same key and body, and does the work once', async () => {
    const shop = await shopWithKey();
    const h = idempotencyHarness();
    const send = () => request(h.app).post('/work').set('Authorization', `Bearer ${shop.key}`).set('Idempotency-Key', 'order-1').send({ a: 1, b: [1, 2] });

    const first = await send();
    const again = await send();

    expect(first.status).toBe(201);
    expect(again.status).toBe(201);
    expect(again.body).toEqual(first.body);
    expect(again.headers['idempotent-replayed']).toBe('true');
    expect(h.runs()).toBe(1);
  });

  it('treats the same body with its keys in another order as the same request', async () => {
    const shop = await shopWithKey();
    const h = idempotencyHarness();
    await request(h.app).post('/work').set('Authorization', `Bearer ${shop.key}`).set('Idempotency-Key', 'k').send({ a: 1, b: { c: 2, d: 3 } });
    const again = await request(h.app).post('/work').set('Authorization', `Bearer ${shop.key}`).set('Idempotency-Key', 'k').send({ b: { d: 3, c: 2 }, a: 1 });
    expect(again.status).toBe(201);
    expect(h.runs()).toBe(1);
  });

  it('answers 409 idempotency_key_reused for the same key with another body, without doing the work', async () => {
    const shop = await shopWithKey();
    const h = idempotencyHarness();
    await request(h.app).post('/work').set('Authorization', `Bearer ${shop.key}`).set('Idempotency-Key', 'order-2').send({ a: 1 });

    const other = await request(h.app).post('/work').set('Authorization', `Bearer ${shop.key}`).set('Idempotency-Key', 'order-2').send({ a: 2 });

    expect(other.status).toBe(409);
    expect(other.body.error.code).toBe('idempotency_key_reused');
    expect(other.body.error.fields).toEqual([{ path: 'Idempotency-Key', message: expect.any(String) }]);
    expect(h.runs()).toBe(1);
  });

  it('answers 409 idempotency_in_progress to a duplicate while the first is still running, then replays its answer', async () => {
    const shop = await shopWithKey();
    const h = idempotencyHarness();
    const release = h.hold();
    const send = () => request(h.app).post('/work').set('Authorization', `Bearer ${shop.key}`).set('Idempotency-Key', 'slow').send({ a: 1 });

    const first = send().then((r) => r);
    // Wait until the first request holds the key (its row exists), then send the duplicate.
    for (let i = 0; i < 200 && h.runs() === 0; i++) await new Promise((r) => setImmediate(r));
    const duplicate = await send();
    release();
    const firstRes = await first;
    const afterwards = await send();

    expect(duplicate.status).toBe(409);
    expect(duplicate.body.error.code).toBe('idempotency_in_progress');
    expect(duplicate.headers['retry-after']).toBeDefined();
    expect(firstRes.status).toBe(201);
    expect(afterwards.body).toEqual(firstRes.body);
    expect(h.runs()).toBe(1);
  });

  it('lets a retry take over a key whose first request never finished (its lease ran out)', async () => {
    const shop = await shopWithKey();
    const h = idempotencyHarness();
    // What a process that died mid-request leaves behind: an unfinished record with the request's hash.
    const release = h.hold();
    const first = request(h.app).post('/work').set('Authorization', `Bearer ${shop.key}`).set('Idempotency-Key', 'crashed').send({ a: 1 }).then((r) => r);
    // Wait until the first request's unfinished record exists, then let its lease run out.
    let expired = 0;
    for (let i = 0; i < 400 && expired === 0; i++) {
      const [, count] = (await db.query(`UPDATE idempotency_records SET lease_until = now() - interval '1 second' WHERE api_key_id = $1`, [shop.keyId])) as [unknown, number];
      expired = count;
      if (!expired) await new Promise((r) => setTimeout(r, 10));
    }
    expect(expired).toBe(1);

    const retry = await request(h.app).post('/work').set('Authorization', `Bearer ${shop.key}`).set('Idempotency-Key', 'crashed').send({ a: 1 });
    release();
    await first;

    expect(retry.status).toBe(201);
    expect(retry.body.run).toBe(2);
    // The stale attempt finished after the takeover; the stored answer stays the retry's.
    const replay = await request(h.app).post('/work').set('Authorization', `Bearer ${shop.key}`).set('Idempotency-Key', 'crashed').send({ a: 1 });
    expect(replay.body).toEqual(retry.body);
  });

  it('keeps no record of a failed request, so the key may be used again', async () => {
    const shop = await shopWithKey();
    const h = idempotencyHarness();
    h.failNext(true);
    const failed = await request(h.app).post('/work').set('Authorization', `Bearer ${shop.key}`).set('Idempotency-Key', 'flaky').send({ a: 1 });
    h.failNext(false);
    const retried = await request(h.app).post('/work').set('Authorization', `Bearer ${shop.key}`).set('Idempotency-Key', 'flaky').send({ a: 1 });

    expect(failed.status).toBe(503);
    expect(retried.status).toBe(201);
    expect(h.runs()).toBe(2);
  });

  it('keeps keys apart per API key: another key may use the same Idempotency-Key', async () => {
    const a = await shopWithKey();
    const b = await shopWithKey();
    const h = idempotencyHarness();
    await request(h.app).post('/work').set('Authorization', `Bearer ${a.key}`).set('Idempotency-Key', 'shared').send({ a: 1 });
    const res = await request(h.app).post('/work').set('Authorization', `Bearer ${b.key}`).set('Idempotency-Key', 'shared').send({ a: 2 });
    expect(res.status).toBe(201);
    expect(h.runs()).toBe(2);
  });

  it('stores the record for 24 hours with the hash of the request, not the request itself', async () => {
    const shop = await shopWithKey();
    const h = idempotencyHarness();
    await request(h.app).post('/work').set('Authorization', `Bearer ${shop.key}`).set('Idempotency-Key', 'ttl').send({ secretish: 'value' });
    const record = await db.getRepository(IdempotencyRecord).findOneByOrFail({ apiKeyId: shop.keyId, idempotencyKey: 'ttl' });
    expect(record.state).toBe('completed');
    expect(record.requestHash).toMatch(/^[0-9a-f]{64}$/);
    expect(record.expiresAt.getTime() - record.createdAt.getTime()).toBe(24 * 3_600_000);
  });

  it('answers 400 naming the header for an unusable Idempotency-Key', async () => {
    const shop = await shopWithKey();
    const h = idempotencyHarness();
    const res = await request(h.app).post('/work').set('Authorization', `Bearer ${shop.key}`).set('Idempotency-Key', 'x'.repeat(300)).send({ a: 1 });
    expect(res.status).toBe(400);
    expect(res.body.error.fields[0].path).toBe('Idempotency-Key');
    expect(h.runs()).toBe(0);
  });
});

// A referral as a shop's ticketing system sends it. Invented customer and device.
const referralBody = (extra: Record<string, unknown> = {}) => ({
  externalRef: unique('JL-'),
  customer: { name: 'Dana Whitcombe', email: 'dana.whitcombe@example.com' },
  device: { mediaType: 'hdd_2_5', capacityGb: 1000 },
  symptoms: ['clicking'],
  priorities: [{ category: 'photos', note: 'family photos' }],
  origin: { postalCode: '80202' },
  ...extra,
});

const countCases = async (orgId: string) => Number((await db.query(`SELECT count(*) FROM referrals WHERE partner_organization_id = $1`, [orgId]))[0].count);

describe('POST /api/v1/referrals', () => {
  it('opens a case for the key’s shop, answers the shared referral shape, and records consent by the key', async () => {
    const shop = await shopWithKey();
    const body = referralBody();

    const res = await request(app).post('/api/v1/referrals').set('Authorization', `Bearer ${shop.key}`).send(body);

    expect(res.status).toBe(201);
    expect(() => referralDto.parse(res.body)).not.toThrow();
    expect(res.body.partner).toEqual({ id: shop.org.id, name: shop.org.name });
    expect(res.body.externalRef).toBe(body.externalRef);
    expect(res.body.consent).toEqual({ recordedAt: expect.any(String), recordedBy: expect.stringContaining('API key') });
    const opened = res.body.timeline.find((e: { kind: string }) => e.kind === 'opened');
    expect(opened.actor.type).toBe('api_key');
    const [row] = await db.query(`SELECT created_by_type, created_by_id FROM referrals WHERE id = $1`, [res.body.id]);
    expect(row).toEqual({ created_by_type: 'api_key', created_by_id: shop.keyId });
  });

  it('replays the first answer for the same Idempotency-Key and body, and opens one case', async () => {
    const shop = await shopWithKey();
    const body = referralBody();
    const send = () => request(app).post('/api/v1/referrals').set('Authorization', `Bearer ${shop.key}`).set('Idempotency-Key', 'ticket-1').send(body);

    const first = await send();
    const second = await send();

    expect(first.status).toBe(201);
    expect(second.status).toBe(201);
    expect(second.headers['idempotent-replayed']).toBe('true');
    expect(second.body).toEqual(first.body);
    expect(await countCases(shop.org.id)).toBe(1);
  });

  it('opens one case when the same request arrives several times at once', async () => {
    const shop = await shopWithKey();
    const body = referralBody();
    const answers = await Promise.all(
      Array.from({ length: 4 }, () => request(app).post('/api/v1/referrals').set('Authorization', `Bearer ${shop.key}`).set('Idempotency-Key', 'burst').send(body)),
    );

    // Each answer is the case (first or replayed) or "still in progress"; never a second case.
    const created = answers.filter((r) => r.status === 201);
    expect(created.length).toBeGreaterThanOrEqual(1);
    expect(new Set(created.map((r) => r.body.id)).size).toBe(1);
    for (const r of answers.filter((x) => x.status !== 201)) {
      expect(r.status).toBe(409);
      expect(r.body.error.code).toBe('idempotency_in_progress');
    }
    expect(await countCases(shop.org.id)).toBe(1);
  });

  it('answers 409 for the same Idempotency-Key with another body and opens no second case', async () => {
    const shop = await shopWithKey();
    await request(app).post('/api/v1/referrals').set('Authorization', `Bearer ${shop.key}`).set('Idempotency-Key', 'ticket-2').send(referralBody());

    const res = await request(app).post('/api/v1/referrals').set('Authorization', `Bearer ${shop.key}`).set('Idempotency-Key', 'ticket-2').send(referralBody());

    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('idempotency_key_reused');
    expect(await countCases(shop.org.id)).toBe(1);
  });

  it('opens one case when a retry arrives after the first attempt’s record was lost (the case itself holds the key)', async () => {
    const shop = await shopWithKey();
    const body = referralBody();
    const first = await request(app).post('/api/v1/referrals').set('Authorization', `Bearer ${shop.key}`).set('Idempotency-Key', 'ticket-3').send(body);
    // As if the process had died after the case committed and before its answer was stored.
    await db.query(`DELETE FROM idempotency_records WHERE api_key_id = $1`, [shop.keyId]);

    const retry = await request(app).post('/api/v1/referrals').set('Authorization', `Bearer ${shop.key}`).set('Idempotency-Key', 'ticket-3').send(body);

    expect(retry.status).toBe(201);
    expect(retry.body.id).toBe(first.body.id);
    expect(await countCases(shop.org.id)).toBe(1);
  });

  it('answers 400 naming each field for wrong types, unknown codes and a negative capacity, and writes nothing', async () => {
    const shop = await shopWithKey();
    const res = await request(app)
      .post('/api/v1/referrals')
      .set('Authorization', `Bearer ${shop.key}`)
      .set('Idempotency-Key', 'bad-body')
      .send(referralBody({ customer: { name: 42, email: 'not-an-email' }, device: { mediaType: 'floppy', capacityGb: -5 }, symptoms: ['haunted'] }));

    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    const paths = res.body.error.fields.map((f: { path: string }) => f.path);
    expect(paths).toEqual(expect.arrayContaining(['customer.name', 'customer.email', 'device.mediaType', 'device.capacityGb', 'symptoms.0']));
    expect(await countCases(shop.org.id)).toBe(0);
    // A refused request keeps no idempotency record, so the corrected one may reuse the key.
    const fixed = await request(app).post('/api/v1/referrals').set('Authorization', `Bearer ${shop.key}`).set('Idempotency-Key', 'bad-body').send(referralBody());
    expect(fixed.status).toBe(201);
  });

  it('answers 400 malformed_json for a body that is not JSON and writes nothing', async () => {
    const shop = await shopWithKey();
    const res = await request(app)
      .post('/api/v1/referrals')
      .set('Authorization', `Bearer ${shop.key}`)
      .set('Content-Type', 'application/json')
      .send('{"customer": {"name": "Dana"');
    expect(res.status).toBe(400);
    expect(res.body.error).toEqual({ code: 'malformed_json', message: expect.any(String), fields: [{ path: '(body)', message: expect.any(String) }] });
    expect(await countCases(shop.org.id)).toBe(0);
  });

  it('answers 401 for a revoked key and opens nothing', async () => {
    const shop = await shopWithKey();
    await request(app).delete(`/api/partner/api-keys/${shop.keyId}`).set('Authorization', `Bearer ${shop.token}`);
    const res = await request(app).post('/api/v1/referrals').set('Authorization', `Bearer ${shop.key}`).send(referralBody());
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe('unauthenticated');
    expect(await countCases(shop.org.id)).toBe(0);
  });
});

describe('GET and DELETE /api/v1/referrals/:id', () => {
  it('answers the shop’s own case', async () => {
    const shop = await shopWithKey();
    const created = await request(app).post('/api/v1/referrals').set('Authorization', `Bearer ${shop.key}`).send(referralBody());
    const res = await request(app).get(`/api/v1/referrals/${created.body.id}`).set('Authorization', `Bearer ${shop.key}`);
    expect(res.status).toBe(200);
    expect(res.body.id).toBe(created.body.id);
    expect(res.body.reference).toBe(created.body.reference);
  });

  it('answers 404 for another partner’s case, for reading and for cancelling, and leaves it as it was', async () => {
    const owner = await shopWithKey();
    const other = await shopWithKey();
    const created = await request(app).post('/api/v1/referrals').set('Authorization', `Bearer ${owner.key}`).send(referralBody());

    const read = await request(app).get(`/api/v1/referrals/${created.body.id}`).set('Authorization', `Bearer ${other.key}`);
    const cancel = await request(app).delete(`/api/v1/referrals/${created.body.id}`).set('Authorization', `Bearer ${other.key}`);

    expect(read.status).toBe(404);
    expect(read.body.error.code).toBe('not_found');
    expect(JSON.stringify(read.body)).not.toContain(created.body.customer.email);
    expect(cancel.status).toBe(404);
    const [row] = await db.query(`SELECT status FROM referrals WHERE id = $1`, [created.body.id]);
    expect(row.status).toBe(created.body.status);
  });

  it('answers 400 for an id that is not a UUID', async () => {
    const shop = await shopWithKey();
    const res = await request(app).get('/api/v1/referrals/PP-123').set('Authorization', `Bearer ${shop.key}`);
    expect(res.status).toBe(400);
    expect(res.body.error.fields[0].path).toBe('id');
  });

  it('cancels a case that has not shipped, on the timeline as the key; a second cancel answers 409', async () => {
    const shop = await shopWithKey();
    const created = await request(app).post('/api/v1/referrals').set('Authorization', `Bearer ${shop.key}`).send(referralBody());

    const res = await request(app).delete(`/api/v1/referrals/${created.body.id}`).set('Authorization', `Bearer ${shop.key}`);
    const again = await request(app).delete(`/api/v1/referrals/${created.body.id}`).set('Authorization', `Bearer ${shop.key}`);

    expect(res.status).toBe(200);
    expect(res.body.status).toBe('cancelled');
    const entry = res.body.timeline.find((e: { kind: string }) => e.kind === 'cancelled');
    expect(entry.actor.type).toBe('api_key');
    expect(again.status).toBe(409);
  });

  it('refuses to cancel a case whose box is already in transit, with 409, and leaves it as it was', async () => {
    const shop = await shopWithKey();
    const created = await request(app).post('/api/v1/referrals').set('Authorization', `Bearer ${shop.key}`).send(referralBody());
    await db.query(`UPDATE referrals SET status = 'in_transit' WHERE id = $1`, [created.body.id]);
    const res = await request(app).delete(`/api/v1/referrals/${created.body.id}`).set('Authorization', `Bearer ${shop.key}`);
    expect(res.status).toBe(409);
    const [row] = await db.query(`SELECT status FROM referrals WHERE id = $1`, [created.body.id]);
    expect(row.status).toBe('in_transit');
  });
});

describe('GET /api/v1/referrals', () => {
  it('lists only the shop’s cases, newest first, a page at a time with a cursor', async () => {
    const shop = await shopWithKey();
    const other = await shopWithKey();
    await request(app).post('/api/v1/referrals').set('Authorization', `Bearer ${other.key}`).send(referralBody());
    const ids: string[] = [];
    for (let i = 0; i < 3; i++) ids.push((await request(app).post('/api/v1/referrals').set('Authorization', `Bearer ${shop.key}`).send(referralBody())).body.id);

    const first = await request(app).get('/api/v1/referrals?limit=2').set('Authorization', `Bearer ${shop.key}`);
    const second = await request(app).get(`/api/v1/referrals?limit=2&cursor=${encodeURIComponent(first.body.nextCursor)}`).set('Authorization', `Bearer ${shop.key}`);

    expect(first.status).toBe(200);
    expect(() => referralListDto.parse(first.body)).not.toThrow();
    expect(first.body.data.map((r: { id: string }) => r.id)).toEqual([ids[2], ids[1]]);
    expect(first.body.nextCursor).toEqual(expect.any(String));
    expect(second.body.data.map((r: { id: string }) => r.id)).toEqual([ids[0]]);
    expect(second.body.nextCursor).toBeNull();
  });

  it('filters by status and by updatedSince', async () => {
    const shop = await shopWithKey();
    const a = (await request(app).post('/api/v1/referrals').set('Authorization', `Bearer ${shop.key}`).send(referralBody())).body;
    const b = (await request(app).post('/api/v1/referrals').set('Authorization', `Bearer ${shop.key}`).send(referralBody())).body;
    await request(app).delete(`/api/v1/referrals/${a.id}`).set('Authorization', `Bearer ${shop.key}`);

    const cancelled = await request(app).get('/api/v1/referrals?status=cancelled').set('Authorization', `Bearer ${shop.key}`);
    const future = await request(app).get('/api/v1/referrals?updatedSince=2999-01-01T00:00:00Z').set('Authorization', `Bearer ${shop.key}`);
    const past = await request(app).get('/api/v1/referrals?updatedSince=2000-01-01T00:00:00Z').set('Authorization', `Bearer ${shop.key}`);

    expect(cancelled.body.data.map((r: { id: string }) => r.id)).toEqual([a.id]);
    expect(future.body.data).toEqual([]);
    expect(past.body.data.map((r: { id: string }) => r.id).sort()).toEqual([a.id, b.id].sort());
  });

  it('answers 400 naming the parameter for a bad status, limit or date', async () => {
    const shop = await shopWithKey();
    const res = await request(app).get('/api/v1/referrals?status=lost&limit=0&updatedSince=yesterday').set('Authorization', `Bearer ${shop.key}`);
    expect(res.status).toBe(400);
    expect(res.body.error.fields.map((f: { path: string }) => f.path).sort()).toEqual(['limit', 'status', 'updatedSince']);
  });
});

describe('POST /api/v1/routing/preview', () => {
  it('answers triage and routing and creates nothing', async () => {
    const shop = await shopWithKey();
    const res = await request(app)
      .post('/api/v1/routing/preview')
      .set('Authorization', `Bearer ${shop.key}`)
      .send({ device: { mediaType: 'hdd_3_5' }, symptoms: ['clicking'], origin: { postalCode: '80202' } });

    expect(res.status).toBe(200);
    expect(() => routingPreviewDto.parse(res.body)).not.toThrow();
    // Triage rule (common trade practice, no published source): a clicking HDD needs head work.
    expect(res.body.triage.requiredSkills.some((s: string) => s === 'hdd_head_swap' || s === 'hdd_platter_work')).toBe(true);
    expect(await countCases(shop.org.id)).toBe(0);
  });

  it('answers 400 with fields for an unknown media type', async () => {
    const shop = await shopWithKey();
    const res = await request(app).post('/api/v1/routing/preview').set('Authorization', `Bearer ${shop.key}`).send({ device: { mediaType: 'zip_disk' } });
    expect(res.status).toBe(400);
    expect(res.body.error.fields[0].path).toBe('device.mediaType');
  });
});

describe('the README’s curl example', () => {
  it('opens a case with the demo key exactly as written', async () => {
    const readme = readFileSync('README.md', 'utf8');
    const block = readme.slice(readme.indexOf('curl -X POST http://localhost:3000/api/v1/referrals'));
    const auth = /-H 'Authorization: (Bearer [^']+)'/.exec(block)![1]!;
    const body = JSON.parse(/-d '([\s\S]*?)'\n/.exec(block)![1]!);

    const res = await request(app).post('/api/v1/referrals').set('Authorization', auth).set('Idempotency-Key', unique('readme-')).send(body);

    expect(res.status).toBe(201);
    expect(res.body.partner.name).toBe('Juniper Lane PC Clinic');
    expect(res.body.externalRef).toBe(body.externalRef);
  });
});
