import EasyPostClient from '@easypost/api';
import bwipjs from 'bwip-js/node';
import geographiclib from 'geographiclib-geodesic';
import request from 'supertest';
import zipcodes from 'zipcodes';
import { afterAll, describe, expect, it } from 'vitest';
import { createShippingFake } from '../../fakes/shipping/shipping-fake';
import { hmacSignature, serializeEvent } from '../../fakes/shipping/webhooks';
import { distanceZone, transitDaysForZone } from '@shared/domain/zones';
import { caseShippingDto, shipmentDto } from '@shared/schemas/shipping';
import { referralDto } from '@shared/schemas/referrals';
import { createApp } from '../../server/app';
import { createDataSource } from '../../server/db/data-source';
import { ensureWebhookRegistered, markOverdueShipments, reconcileShipments, slipBarcodes } from '../../server/shipping';
import { setupApi } from '../support/api';
import { auth, makeAcceptedCase, makeApiKey, makeOrganization, person, readPdf, startGate, startSlowProxy } from './shipping-helpers';

// Prepaid labels, documents and tracking against the shipping fake (fakes/shipping), started here in
// process and reached only through the official @easypost/api client. This file's shops sit in Bismarck,
// ND (58501) and its labs in Phoenix, AZ (85004), away from other files' records.
const API_KEY = 'shipping_test_key';
const SECRET = 'shipping-test-webhook-secret';
const fake = createShippingFake({ port: 0, apiKey: API_KEY, webhookSecret: SECRET, clockSpeed: 0, seed: 20261201, webhookRetryDelaysMs: [20, 40] });
await fake.start();
const slow = await startSlowProxy(fake.url);
// The gate is the address the fake posts events to; the app behind it can be "stopped" and replaced.
let gate: Awaited<ReturnType<typeof startGate>>;
gate = await startGate((req, res) => res.writeHead(503).end());
const overrides = {
  SHIPPING_API_URL: fake.baseUrl,
  SHIPPING_API_KEY: API_KEY,
  SHIPPING_WEBHOOK_SECRET: SECRET,
  SHIPPING_WEBHOOK_URL: gate.url,
  SHIPPING_API_TIMEOUT_MS: '1000',
};
const { app, db, config } = await setupApi(overrides);
gate.up(app);
await ensureWebhookRegistered({ config, db });
const ctx = { config, db };
// A second app whose shipping calls go through the slow proxy (to play a timeout).
const slowConfig = { ...config, shipping: { ...config.shipping, apiUrl: slow.baseUrl } };
const slowApp = createApp({ config: slowConfig, db });

afterAll(async () => {
  await fake.stop();
  await slow.close();
  await gate.close();
});

const SHOP_ZIP = '58501';
const LAB_ZIP = '85004';
const box = { lengthIn: 12, widthIn: 10, heightIn: 8, weightLb: 3 };

async function scene(caseOptions: Parameters<typeof makeAcceptedCase>[3] = {}) {
  const shop = await makeOrganization(db, 'partner', SHOP_ZIP);
  const lab = await makeOrganization(db, 'lab', LAB_ZIP);
  const staff = await person(app, db, 'partner_staff', shop.id);
  const clerk = await person(app, db, 'shipping_clerk', lab.id);
  const referral = await makeAcceptedCase(db, shop, lab, caseOptions);
  return { shop, lab, staff, clerk, referral };
}

async function quote(token: string, referralId: string, parcel: object = box, client = app) {
  return request(client).post(`/api/referrals/${referralId}/shipments`).set(auth(token)).send({ parcel });
}

async function buyCheapestGround(token: string, referralId: string) {
  const rated = await quote(token, referralId);
  expect(rated.status).toBe(201);
  const rate = rated.body.rates.find((r: { mode: string }) => r.mode === 'ground');
  const bought = await request(app).post(`/api/shipments/${rated.body.id}/buy`).set(auth(token)).send({ rateId: rate.id });
  expect(bought.status).toBe(200);
  return bought.body as ReturnType<typeof shipmentDto.parse>;
}

const caseStatus = async (id: string) => ((await db.query(`SELECT status FROM referrals WHERE id = $1`, [id])) as { status: string }[])[0]!.status;
const timelineKinds = async (id: string) => ((await db.query(`SELECT kind FROM referral_timeline WHERE referral_id = $1 ORDER BY position`, [id])) as { kind: string }[]).map((r) => r.kind);
const fakeShipmentOf = (providerId: string) => fake.state.shipments.get(providerId)!;
const providerIdOf = async (id: string) => ((await db.query(`SELECT provider_shipment_id FROM shipments WHERE id = $1`, [id])) as { provider_shipment_id: string }[])[0]!.provider_shipment_id;
const purchasesAtFake = (providerId: string) => fake.state.events.filter((e) => e.description === 'tracker.created' && (e.result as { shipment_id?: string }).shipment_id === providerId).length;

describe('labels for the shop (POST /api/referrals/:id/shipments, POST /api/shipments/:id/buy)', () => {
  it('rates a 12 × 10 × 8 in box at its billable weight, by the zone of the distance, and buys a prepaid label for the case', async () => {
    const { staff, referral } = await scene();

    const rated = await quote(staff.token, referral.id);

    expect(rated.status).toBe(201);
    const quoteBody = shipmentDto.parse(rated.body);
    expect(quoteBody.status).toBe('awaiting_purchase');
    // Billable weight (from memory, carriers' service guides): 12 × 10 × 8 = 960 in³ ÷ 139 = 6.9 → 7 lb.
    expect(quoteBody.parcel.billableLb).toBe(7);
    // Zone from the geodesic distance between the ZIP centroids (geographiclib, WGS-84) and the carrier-style
    // zone table (from memory); ground transit days by zone.
    const a = zipcodes.lookup(SHOP_ZIP)!;
    const b = zipcodes.lookup(LAB_ZIP)!;
    const metres = geographiclib.Geodesic.WGS84.Inverse(a.latitude, a.longitude, b.latitude, b.longitude).s12!;
    const zone = distanceZone(metres / 1609.344);
    const ground = quoteBody.rates.filter((r) => r.mode === 'ground');
    expect(ground.length).toBeGreaterThan(0);
    expect(quoteBody.rates.some((r) => r.mode === 'air')).toBe(true);
    for (const r of quoteBody.rates) {
      expect(r.zone).toBe(zone);
      expect(Number.isInteger(r.amount)).toBe(true);
    }
    expect(ground.find((r) => r.carrier === 'Brambleway')!.transitDays).toBe(transitDaysForZone(zone, 'ground'));

    const rate = ground[0]!;
    const bought = await request(app).post(`/api/shipments/${quoteBody.id}/buy`).set(auth(staff.token)).send({ rateId: rate.id });

    expect(bought.status).toBe(200);
    const label = shipmentDto.parse(bought.body);
    expect(label).toMatchObject({ status: 'label_issued', carrier: rate.carrier, service: rate.service, amount: rate.amount, currency: 'USD', voidable: true });
    expect(label.trackingCode).toMatch(/^[A-Z]{2}\d{16}$/);
    expect(label.labelUrl).toBe(`/api/shipments/${label.id}/label.pdf`);
    expect(await caseStatus(referral.id)).toBe('label_issued');
    expect(await timelineKinds(referral.id)).toContain('label_issued');
    const [row] = await db.query(`SELECT amount_minor, weight_oz FROM shipments WHERE id = $1`, [label.id]);
    expect(row).toEqual({ amount_minor: rate.amount, weight_oz: 48 }); // the wire protocol counts ounces
    const detail = referralDto.parse((await request(app).get(`/api/referrals/${referral.id}`).set(auth(staff.token))).body);
    expect(detail.shipments).toEqual([{ id: label.id, trackingCode: label.trackingCode, status: 'label_issued' }]);
  });

  it('answers the label and the packing slip as 4 × 6 in PDFs whose barcodes bwip-js draws with their check digits', async () => {
    const { staff, referral, lab } = await scene({ mediaType: 'phone', battery: { installed: true, condition: 'intact', wattHours: 15 } });
    const label = await buyCheapestGround(staff.token, referral.id);

    const pdf = await request(app).get(label.labelUrl!).set(auth(staff.token)).buffer(true).parse((res, cb) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => cb(null, Buffer.concat(chunks)));
    });
    expect(pdf.status).toBe(200);
    expect(pdf.headers['content-type']).toBe('application/pdf');
    const parsedLabel = await readPdf(pdf.body as Buffer);
    // 4 × 6 in at 72 pt per inch.
    expect(parsedLabel.sizes).toEqual([[288, 432]]);
    expect(parsedLabel.text).toContain(label.trackingCode!);

    const slip = await request(app).get(label.packingSlipUrl!).set(auth(staff.token)).buffer(true).parse((res, cb) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => cb(null, Buffer.concat(chunks)));
    });
    expect(slip.status).toBe(200);
    const parsedSlip = await readPdf(slip.body as Buffer);
    expect(parsedSlip.pages).toBe(1);
    expect(parsedSlip.sizes).toEqual([[288, 432]]);
    const text = parsedSlip.text.replace(/\s+/g, ' ');
    expect(text).toContain(referral.reference);
    expect(text).toContain(lab.name);
    expect(text).toContain('12 Bench Road');
    expect(text).toContain('anti-static bag');
    expect(text).toContain('5 cm');
    // The small-battery mark text (IATA PI 967 / 49 CFR 173.185(c), from memory) for a 15 Wh phone battery.
    expect(text).toContain('UN3481');

    // The case reference as Code 128 and the SSCC-18 as GS1-128 (GS1 General Specifications): bwip-js
    // draws them, and refuses the SSCC with its check digit changed.
    const codes = slipBarcodes({ reference: referral.reference, sscc: label.sscc });
    await expect(bwipjs.toBuffer({ bcid: codes.reference.bcid, text: codes.reference.text })).resolves.toBeInstanceOf(Buffer);
    await expect(bwipjs.toBuffer({ bcid: codes.sscc!.bcid, text: codes.sscc!.text })).resolves.toBeInstanceOf(Buffer);
    const wrong = `(00)${label.sscc!.slice(0, 17)}${(Number(label.sscc!.slice(17)) + 1) % 10}`;
    await expect(bwipjs.toBuffer({ bcid: 'gs1-128', text: wrong })).rejects.toThrow();
  });

  it('offers no air service for a swollen battery and shows the fire-risk caution (IATA SP A154, 49 CFR 173.185(f), from memory)', async () => {
    const { staff, referral } = await scene({ mediaType: 'phone', battery: { installed: true, condition: 'swollen', wattHours: 12 } });

    const rated = await quote(staff.token, referral.id);

    expect(rated.status).toBe(201);
    expect(rated.body.rates.length).toBeGreaterThan(0);
    expect(rated.body.rates.every((r: { mode: string }) => r.mode === 'ground')).toBe(true);
    const shipping = caseShippingDto.parse((await request(app).get(`/api/referrals/${referral.id}/shipping`).set(auth(staff.token))).body);
    expect(shipping.battery).toMatchObject({ airAllowed: false, contactLabFirst: true, markText: expect.stringContaining('Damaged/defective') });
    expect(shipping.battery!.cautions.map((c) => c.code)).toContain('battery_fire_risk');
    expect(shipping.battery!.cautions.find((c) => c.code === 'battery_fire_risk')!.message).toMatch(/contact the lab/);
  });

  it('refuses a box whose battery is over 100 Wh, with the reason (IATA PI 967, 49 CFR 173.185(c), from memory)', async () => {
    const { staff, referral } = await scene({ mediaType: 'other', battery: { installed: true, condition: 'intact', wattHours: 160 } });

    const rated = await quote(staff.token, referral.id);

    expect(rated.status).toBe(400);
    expect(rated.body.error.fields[0]).toMatchObject({ path: 'battery', message: expect.stringContaining('100 Wh') });
    expect((await db.query(`SELECT count(*)::int AS n FROM shipments WHERE referral_id = $1`, [referral.id]))[0].n).toBe(0);
  });

  it('voids a label before the first scan (the case is back to accepted) and refuses after it', async () => {
    const { staff, referral } = await scene();
    const first = await buyCheapestGround(staff.token, referral.id);

    const voided = await request(app).post(`/api/shipments/${first.id}/void`).set(auth(staff.token));

    expect(voided.status).toBe(200);
    expect(voided.body.status).toBe('voided');
    expect(await caseStatus(referral.id)).toBe('accepted');
    expect(await timelineKinds(referral.id)).toContain('label_voided');

    const second = await buyCheapestGround(staff.token, referral.id);
    fake.advanceHours(6); // the origin scan comes 4 h after purchase
    await fake.webhooksIdle();
    const late = await request(app).post(`/api/shipments/${second.id}/void`).set(auth(staff.token));
    expect(late.status).toBe(409);
    expect(late.body.error.message).toMatch(/scanned/);
  });

  it('does not rate a case another shop owns (404) nor one no lab has accepted (409)', async () => {
    const { referral } = await scene();
    const other = await makeOrganization(db, 'partner', SHOP_ZIP);
    const stranger = await person(app, db, 'partner_staff', other.id);
    expect((await quote(stranger.token, referral.id)).status).toBe(404);

    const lab = await makeOrganization(db, 'lab', LAB_ZIP);
    const offered = await makeAcceptedCase(db, other, lab, { status: 'offered' });
    const res = await quote(stranger.token, offered.id);
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(/not accepted/);
  });
});

describe('the partner API (POST /api/v1/referrals/:id/shipments, POST /api/v1/shipments/:id/buy)', () => {
  it('rates, buys, serves the label to the same key and lists the shipment on the case', async () => {
    const { shop, referral } = await scene();
    const key = await makeApiKey(db, shop.id);

    const rated = await request(app).post(`/api/v1/referrals/${referral.id}/shipments`).set(auth(key)).send({ parcel: box });

    expect(rated.status).toBe(201);
    expect(rated.body).toMatchObject({ id: expect.any(String), status: 'awaiting_purchase' });
    for (const r of rated.body.rates) {
      expect(Object.keys(r)).toEqual(expect.arrayContaining(['id', 'carrier', 'service', 'mode', 'amount', 'currency', 'transitDays']));
      expect(['ground', 'air']).toContain(r.mode);
    }
    const bought = await request(app).post(`/api/v1/shipments/${rated.body.id}/buy`).set(auth(key)).send({ rateId: rated.body.rates[0].id });
    expect(bought.status).toBe(200);
    expect(bought.body).toMatchObject({ id: rated.body.id, status: 'label_issued', trackingCode: expect.any(String) });
    expect(bought.body.labelUrl).toBe(`${config.appUrl}/api/v1/shipments/${rated.body.id}/label`);

    const path = new URL(bought.body.labelUrl).pathname;
    const pdf = await request(app).get(path).set(auth(key));
    expect(pdf.status).toBe(200);
    expect(pdf.headers['content-type']).toBe('application/pdf');
    expect((await request(app).get(path)).status).toBe(401);
    const otherKey = await makeApiKey(db, (await makeOrganization(db, 'partner', SHOP_ZIP)).id);
    expect((await request(app).get(path).set(auth(otherKey))).status).toBe(404);

    const kase = await request(app).get(`/api/v1/referrals/${referral.id}`).set(auth(key));
    expect(kase.body.shipments).toEqual([{ id: rated.body.id, trackingCode: bought.body.trackingCode, status: 'label_issued' }]);
  });
});

describe('buying when the shipping service fails', () => {
  it('answers a 500 from the service with a clear 503, records nothing as bought, and a retry buys one label', async () => {
    const { staff, referral } = await scene();
    const rated = await quote(staff.token, referral.id);
    const providerId = await providerIdOf(rated.body.id);
    await fetch(`${fake.url}/_fake/fail`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ path: '/v2/shipments/:id/buy', times: 1 }) });

    const failed = await request(app).post(`/api/shipments/${rated.body.id}/buy`).set(auth(staff.token)).send({ rateId: rated.body.rates[0].id });

    expect(failed.status).toBe(503);
    expect(failed.body.error.message).toMatch(/did not answer.*Nothing was bought; try again/);
    const [row] = await db.query(`SELECT status, tracking_code FROM shipments WHERE id = $1`, [rated.body.id]);
    expect(row).toEqual({ status: 'awaiting_purchase', tracking_code: null });
    expect(await caseStatus(referral.id)).toBe('accepted');

    const retried = await request(app).post(`/api/shipments/${rated.body.id}/buy`).set(auth(staff.token)).send({ rateId: rated.body.rates[0].id });
    expect(retried.status).toBe(200);
    expect(retried.body.status).toBe('label_issued');
    expect(purchasesAtFake(providerId)).toBe(1);
    const again = await request(app).post(`/api/shipments/${rated.body.id}/buy`).set(auth(staff.token)).send({ rateId: rated.body.rates[0].id });
    expect(again.body.trackingCode).toBe(retried.body.trackingCode);
    expect(purchasesAtFake(providerId)).toBe(1);
  });

  it('answers a purchase that timed out (the service did buy it) with a 503, and the retry takes the label already bought', async () => {
    const { staff, referral } = await scene();
    const rated = await quote(staff.token, referral.id, box, slowApp);
    const providerId = await providerIdOf(rated.body.id);
    slow.slow(1500); // longer than SHIPPING_API_TIMEOUT_MS, for the purchase and the read-back alike

    const failed = await request(slowApp).post(`/api/shipments/${rated.body.id}/buy`).set(auth(staff.token)).send({ rateId: rated.body.rates[0].id });

    expect(failed.status).toBe(503);
    expect((await db.query(`SELECT status FROM shipments WHERE id = $1`, [rated.body.id]))[0].status).toBe('awaiting_purchase');
    expect(fakeShipmentOf(providerId).body.tracking_code).toBeTruthy(); // the service bought it
    slow.slow(0);

    const retried = await request(slowApp).post(`/api/shipments/${rated.body.id}/buy`).set(auth(staff.token)).send({ rateId: rated.body.rates[0].id });

    expect(retried.status).toBe(200);
    expect(retried.body.trackingCode).toBe(fakeShipmentOf(providerId).body.tracking_code);
    expect(purchasesAtFake(providerId)).toBe(1);
    expect((await timelineKinds(referral.id)).filter((k) => k === 'label_issued')).toHaveLength(1);
  });
});

describe('tracking (POST /api/webhooks/shipping)', () => {
  it('moves the shipment and the case as the fake posts its signed events; delivery does not make the case received', async () => {
    const { staff, referral } = await scene();
    const label = await buyCheapestGround(staff.token, referral.id);

    fake.advanceHours(6);
    await fake.webhooksIdle();
    expect((await request(app).get(`/api/shipments/${label.id}`).set(auth(staff.token))).body.status).toMatch(/in_transit|exception/);
    expect(await caseStatus(referral.id)).toBe('in_transit');

    fake.advanceHours(24 * 8);
    await fake.webhooksIdle();
    const delivered = shipmentDto.parse((await request(app).get(`/api/shipments/${label.id}`).set(auth(staff.token))).body);
    expect(delivered.status).toBe('delivered');
    expect(delivered.deliveredAt).not.toBeNull();
    expect(delivered.scans.length).toBeGreaterThan(3);
    expect(await caseStatus(referral.id)).toBe('in_transit');
    expect(await timelineKinds(referral.id)).toEqual(expect.arrayContaining(['label_issued', 'in_transit', 'shipment_out_for_delivery', 'delivered']));
  });

  it('refuses unsigned and altered events (4xx) and changes nothing; the SDK accepts the fake’s own signature', async () => {
    const { staff, referral } = await scene();
    const label = await buyCheapestGround(staff.token, referral.id);
    fake.advanceHours(6);
    await fake.webhooksIdle();
    const event = [...fake.state.events].reverse().find((e) => (e.result as { tracking_code?: string }).tracking_code === label.trackingCode)!;
    const body = serializeEvent({ ...event, id: `evt_${label.id.replace(/-/g, '')}` });
    // The official client's own check accepts the fake's signature over these bytes.
    const client = new EasyPostClient(API_KEY);
    expect(client.Utils.validateWebhook(Buffer.from(body), { 'X-Hmac-Signature': hmacSignature(body, SECRET) }, SECRET)).toMatchObject({ id: expect.any(String) });
    const before = await db.query(`SELECT count(*)::int AS n FROM shipping_webhook_events`);

    const unsigned = await request(app).post('/api/webhooks/shipping').set('Content-Type', 'application/json').send(body);
    const altered = await request(app)
      .post('/api/webhooks/shipping')
      .set('Content-Type', 'application/json')
      .set('X-Hmac-Signature', hmacSignature(body, SECRET))
      .send(body.replace('"in_transit"', '"delivered"'));
    const wrongSecret = await request(app).post('/api/webhooks/shipping').set('Content-Type', 'application/json').set('X-Hmac-Signature', hmacSignature(body, 'not-the-secret')).send(body);

    for (const res of [unsigned, altered, wrongSecret]) expect(res.status).toBe(401);
    expect(await db.query(`SELECT count(*)::int AS n FROM shipping_webhook_events`)).toEqual(before);
    expect(client.Utils.validateWebhook.bind(client.Utils, Buffer.from(body.replace('"in_transit"', '"delivered"')), { 'X-Hmac-Signature': hmacSignature(body, SECRET) }, SECRET)).toThrow();
  });

  it('applies the same event once, and keeps the later status when events arrive out of order', async () => {
    const { staff, referral } = await scene();
    const label = await buyCheapestGround(staff.token, referral.id);
    gate.down(); // collect the fake's events without delivering them
    fake.advanceHours(24 * 8);
    await fake.webhooksIdle();
    gate.up(app);
    const mine = fake.state.events.filter((e) => (e.result as { tracking_code?: string }).tracking_code === label.trackingCode && e.description === 'tracker.updated');
    const post = (e: object) => {
      const body = serializeEvent(e);
      return request(app).post('/api/webhooks/shipping').set('Content-Type', 'application/json').set('X-Hmac-Signature', hmacSignature(body, SECRET)).send(body);
    };
    const deliveredEvent = mine[mine.length - 1]!;
    const firstScan = mine[0]!;

    expect((await post(deliveredEvent)).body).toEqual({ outcome: 'applied' });
    const timelineAfterFirst = await timelineKinds(referral.id);
    expect((await post(deliveredEvent)).body).toEqual({ outcome: 'duplicate' });
    expect((await post(firstScan)).body).toEqual({ outcome: 'stale' });

    expect(await timelineKinds(referral.id)).toEqual(timelineAfterFirst);
    expect((await request(app).get(`/api/shipments/${label.id}`).set(auth(staff.token))).body.status).toBe('delivered');
    expect((await db.query(`SELECT count(*)::int AS n FROM shipping_webhook_events WHERE event_id = $1`, [deliveredEvent.id]))[0].n).toBe(1);
  });

  it('still tracks a box when the server was down between buying and the first events: the fake retries, the reconcile job reads the tracker', async () => {
    const { staff, referral } = await scene();
    const label = await buyCheapestGround(staff.token, referral.id);

    // The server stops; every delivery of the first events (and their retries) fails.
    gate.down();
    fake.advanceHours(30);
    await fake.webhooksIdle();
    expect((await db.query(`SELECT status FROM shipments WHERE id = $1`, [label.id]))[0].status).toBe('label_issued');

    // A new server process: its own connection pool and app. Events sent from now on reach it, and the
    // reconcile job catches up on the ones that were lost.
    const restartedDb = await createDataSource({ url: config.databaseUrl, poolSize: 2 }).initialize();
    const restarted = createApp({ config, db: restartedDb });
    gate.up(restarted);
    try {
      const result = await reconcileShipments({ config, db: restartedDb }, { staleAfterMs: 0, limit: 1000 });
      expect(result.read).toBeGreaterThan(0);
      const tracker = [...fake.state.trackers.values()].find((t) => t.tracking_code === label.trackingCode)!;
      const row = (await restartedDb.query(`SELECT status FROM shipments WHERE id = $1`, [label.id]))[0];
      expect(row.status).toBe(tracker.status_detail === 'transit_exception' ? 'exception' : tracker.status.replace('pre_transit', 'label_issued'));
      expect(await caseStatus(referral.id)).toBe('in_transit');

      fake.advanceHours(24 * 8);
      await fake.webhooksIdle();
      expect((await restartedDb.query(`SELECT status FROM shipments WHERE id = $1`, [label.id]))[0].status).toBe('delivered');
    } finally {
      gate.up(app);
      await restartedDb.destroy();
    }
  });

  it('delivers events the server missed for a moment through the fake’s own retries', async () => {
    const { staff, referral } = await scene();
    const label = await buyCheapestGround(staff.token, referral.id);
    let refused = 0;
    gate.up((req, res) => {
      if (refused++ < 1) return void res.writeHead(503).end();
      app(req as never, res as never);
    });
    try {
      fake.advanceHours(6);
      await fake.webhooksIdle();
      expect(refused).toBeGreaterThan(1);
      expect((await db.query(`SELECT status FROM shipments WHERE id = $1`, [label.id]))[0].status).toMatch(/in_transit|exception/);
      expect(await caseStatus(referral.id)).toBe('in_transit');
    } finally {
      gate.up(app);
    }
  });

  it('marks boxes overdue once when their expected delivery has passed (the daily job)', async () => {
    const { staff, referral } = await scene();
    const label = await buyCheapestGround(staff.token, referral.id);
    await db.query(`UPDATE shipments SET estimated_delivery_at = now() - interval '2 days' WHERE id = $1`, [label.id]);

    expect(await markOverdueShipments(ctx)).toBeGreaterThanOrEqual(1);
    expect(await markOverdueShipments(ctx)).toBe(0);

    const after = shipmentDto.parse((await request(app).get(`/api/shipments/${label.id}`).set(auth(staff.token))).body);
    expect(after.overdue).toBe(true);
    expect((await timelineKinds(referral.id)).filter((k) => k === 'shipment_overdue')).toHaveLength(1);
  });
});


