import express from 'express';
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { errorHandler } from '../../server/lib/errors';
import { IdempotencyRecord } from '../../server/partner-api';
import { idempotency } from '../../server/partner-api/idempotency';
import { requireApiKey } from '../../server/partner-api/middleware';
import { setupApi, signIn } from '../support/api';
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
    for (let i = 0; i < 200 && h.runs() === 0; i++) await new Promise((r) => setImmediate(r));
    await db.query(`UPDATE idempotency_records SET lease_until = now() - interval '1 second' WHERE api_key_id = $1`, [shop.keyId]);

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
