import { createServer, type IncomingHttpHeaders } from 'node:http';
import type { AddressInfo } from 'node:net';
import request from 'supertest';
import { Webhook } from 'standardwebhooks';
import { afterAll, describe, expect, it } from 'vitest';
import { dispatchWebhooks, emitPartnerEvent } from '../../server/webhooks';
import { setupApi, signIn } from '../support/api';
import { createOrganization, createUser, TEST_PASSWORD } from '../support/factories';

// The e-mail is checked in the outbox: sending it is the mail worker's job, tested in auth.test.ts.
const { app, db, config } = await setupApi();

// A partner's receiving system on loopback; each test scripts its answers.
const received: { headers: IncomingHttpHeaders; body: string }[] = [];
let answers: number[] = [];
const receiver = createServer((req, res) => {
  let body = '';
  req.on('data', (c) => (body += c));
  req.on('end', () => {
    received.push({ headers: req.headers, body });
    res.statusCode = answers.shift() ?? 200;
    res.end();
  });
});
await new Promise<void>((r) => receiver.listen(0, '127.0.0.1', r));
const receiverUrl = `http://127.0.0.1:${(receiver.address() as AddressInfo).port}/hooks`;
afterAll(() => new Promise<void>((r) => receiver.close(() => r())));

const fastRetries = { retryScheduleSeconds: [0, 0, 0, 0], disableAfterMs: 24 * 3_600_000, timeoutMs: 2000 };

async function partnerAdmin() {
  const org = await createOrganization(db, 'partner');
  const admin = await createUser(db, { role: 'partner_admin', organizationId: org.id });
  const { accessToken } = await signIn(app, admin.email, TEST_PASSWORD);
  return { org, admin, auth: `Bearer ${accessToken}` };
}

async function register(auth: string, events = ['referral.created', 'referral.accepted']) {
  const res = await request(app).post('/api/partner/webhooks').set('Authorization', auth).send({ url: receiverUrl, events });
  expect(res.status).toBe(201);
  return res.body as { id: string; secret: string };
}

async function dispatchUntilIdle(options = fastRetries) {
  for (let i = 0; i < 10 && (await dispatchWebhooks(db, options)) > 0; i++);
}

describe('partner webhook endpoints', () => {
  it('shows the signing secret once; the list never carries it', async () => {
    const { auth } = await partnerAdmin();
    const created = await register(auth);
    expect(created.secret).toMatch(/^whsec_/);
    const list = await request(app).get('/api/partner/webhooks').set('Authorization', auth);
    expect(list.status).toBe(200);
    expect(list.body).toHaveLength(1);
    expect(list.body[0]).not.toHaveProperty('secret');
  });

  it('refuses plain http outside loopback and unknown events, field by field, writing nothing', async () => {
    const { auth, org } = await partnerAdmin();
    const res = await request(app).post('/api/partner/webhooks').set('Authorization', auth).send({ url: 'http://tickets.example.com/hook', events: ['referral.created', 'case.exploded'] });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.map((f: { path: string }) => f.path).sort()).toEqual(['events.1', 'url']);
    const [{ count }] = await db.query(`SELECT count(*)::int AS count FROM webhook_endpoints WHERE organization_id = $1`, [org.id]);
    expect(count).toBe(0);
  });

  it('is for the partner admin only', async () => {
    const org = await createOrganization(db, 'partner');
    const staff = await createUser(db, { role: 'partner_staff', organizationId: org.id });
    const { accessToken } = await signIn(app, staff.email, TEST_PASSWORD);
    const res = await request(app).get('/api/partner/webhooks').set('Authorization', `Bearer ${accessToken}`);
    expect(res.status).toBe(403);
  });

  it("answers 404 for another partner's endpoint", async () => {
    const first = await partnerAdmin();
    const second = await partnerAdmin();
    const { id } = await register(first.auth);
    const res = await request(app).get(`/api/partner/webhooks/${id}/deliveries`).set('Authorization', second.auth);
    expect(res.status).toBe(404);
  });
});

describe('partner webhook deliveries', () => {
  it('delivers a subscribed event signed as the Standard Webhooks specification says (verified by the standardwebhooks package)', async () => {
    const { auth, org } = await partnerAdmin();
    const { secret } = await register(auth);
    received.length = 0;
    const eventId = await db.transaction((m) => emitPartnerEvent(m, org.id, 'referral.created', { referral: { id: 'r-1', reference: 'PP-TEST' } }));
    await dispatchUntilIdle();
    const got = received.find((r) => r.headers['webhook-id'] === eventId)!;
    expect(got).toBeDefined();
    const verified = new Webhook(secret).verify(got.body, got.headers as Record<string, string>) as { type: string; data: { referral: { reference: string } } };
    expect(verified.type).toBe('referral.created');
    expect(verified.data.referral.reference).toBe('PP-TEST');
    // An altered body no longer verifies.
    expect(() => new Webhook(secret).verify(got.body.replace('PP-TEST', 'PP-FAKE'), got.headers as Record<string, string>)).toThrow();
  });

  it('does not send events the endpoint did not subscribe to', async () => {
    const { auth, org } = await partnerAdmin();
    await register(auth, ['referral.accepted']);
    const eventId = await db.transaction((m) => emitPartnerEvent(m, org.id, 'referral.created', {}));
    expect(eventId).toBeNull();
  });

  it('sends nothing when the change that raised the event rolls back', async () => {
    const { auth, org } = await partnerAdmin();
    await register(auth);
    await db
      .transaction(async (m) => {
        await emitPartnerEvent(m, org.id, 'referral.created', {});
        throw new Error('the change failed');
      })
      .catch(() => undefined);
    const [{ count }] = await db.query(`SELECT count(*)::int AS count FROM webhook_events WHERE organization_id = $1`, [org.id]);
    expect(count).toBe(0);
  });

  it('retries an endpoint answering 500 twice then 200: delivered once, three attempts logged', async () => {
    const { auth, org } = await partnerAdmin();
    const { id } = await register(auth);
    received.length = 0;
    answers = [500, 500, 200];
    const eventId = await db.transaction((m) => emitPartnerEvent(m, org.id, 'referral.accepted', { n: 1 }));
    await dispatchUntilIdle();
    expect(received.filter((r) => r.headers['webhook-id'] === eventId)).toHaveLength(3);
    const log = await request(app).get(`/api/partner/webhooks/${id}/deliveries`).set('Authorization', auth);
    expect(log.status).toBe(200);
    expect(log.body[0].status).toBe('succeeded');
    expect(log.body[0].attempts.map((a: { statusCode: number }) => a.statusCode)).toEqual([500, 500, 200]);
  });

  it('sends a delivery again on request, with the same id and body', async () => {
    const { auth, org } = await partnerAdmin();
    const { id } = await register(auth);
    received.length = 0;
    const eventId = await db.transaction((m) => emitPartnerEvent(m, org.id, 'referral.created', { again: true }));
    await dispatchUntilIdle();
    const [delivery] = (await request(app).get(`/api/partner/webhooks/${id}/deliveries`).set('Authorization', auth)).body;
    const resend = await request(app).post(`/api/partner/webhooks/${id}/deliveries/${delivery.id}/resend`).set('Authorization', auth);
    expect(resend.status).toBe(202);
    await dispatchUntilIdle();
    const copies = received.filter((r) => r.headers['webhook-id'] === eventId);
    expect(copies).toHaveLength(2);
    expect(copies[1]!.body).toBe(copies[0]!.body);
  });

  it('disables an endpoint that has failed for a day and e-mails its admin', async () => {
    const { auth, org, admin } = await partnerAdmin();
    const { id } = await register(auth);
    answers = [500];
    await db.query(`UPDATE webhook_endpoints SET failing_since = now() - interval '25 hours' WHERE id = $1`, [id]);
    await db.transaction((m) => emitPartnerEvent(m, org.id, 'referral.created', {}));
    await dispatchUntilIdle({ ...fastRetries, retryScheduleSeconds: [3600] });
    const [endpoint] = (await request(app).get('/api/partner/webhooks').set('Authorization', auth)).body;
    expect(endpoint.status).toBe('disabled');
    expect(endpoint.disabledReason).toMatch(/failed for a day/);
    const mail: { subject: string; text_body: string }[] = await db.query(
      `SELECT subject, text_body FROM outbox_messages WHERE recipient = $1 AND template = 'webhook_endpoint_disabled'`,
      [admin.email],
    );
    expect(mail).toHaveLength(1);
    expect(mail[0].subject).toMatch(/webhook/i);
    expect(mail[0].text_body).toContain(receiverUrl);
  });
});

describe('partner events from the case timeline', () => {
  it('sends referral.created, signed, when the shop opens a referral', async () => {
    const { auth, org, admin } = await partnerAdmin();
    await db.query(`UPDATE organizations SET postal_code = '59801', lat = 46.87, lon = -113.99 WHERE id = $1`, [org.id]);
    const { secret } = await register(auth, ['referral.created']);
    const { createReferral } = await import('../../server/referrals');
    received.length = 0;
    const created = await createReferral(
      { db, config },
      { partnerOrganizationId: org.id, actor: { type: 'user', id: admin.id, name: admin.name } },
      {
        customer: { name: 'Ada Customer', email: 'ada@customer.example' },
        device: { mediaType: 'usb_flash' },
        symptoms: ['deleted_files'],
        priorities: [{ category: 'photos' }],
        sensitivity: [],
        origin: { postalCode: '59801', country: 'US' },
        consent: { accepted: true },
      },
    );
    await dispatchUntilIdle();
    const got = received.find((r) => r.body.includes(created.reference));
    expect(got).toBeDefined();
    const payload = new Webhook(secret).verify(got!.body, got!.headers as Record<string, string>) as { type: string; data: { referral: { id: string } } };
    expect(payload.type).toBe('referral.created');
    expect(payload.data.referral.id).toBe(created.id);
  });
});

describe('event payloads in the OpenAPI document', () => {
  it('describes every partner event under webhooks', async () => {
    const { partnerEventTypes } = await import('@shared/schemas/webhooks');
    const res = await request(app).get('/api/v1/openapi.json');
    expect(res.status).toBe(200);
    expect(Object.keys(res.body.webhooks).sort()).toEqual([...partnerEventTypes].sort());
    expect(res.body.webhooks['referral.created'].post.requestBody.content['application/json'].schema).toBeDefined();
  });
});
