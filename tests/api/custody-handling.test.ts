import request from 'supertest';
import { afterAll, describe, expect, it } from 'vitest';
import { custodyLogDto } from '@shared/schemas/custody';
import { shipmentDto } from '@shared/schemas/shipping';
import { createShippingFake } from '../../fakes/shipping/shipping-fake';
import { ensureWebhookRegistered } from '../../server/shipping';
import { setupApi } from '../support/api';
import { auth, makeAcceptedCase, makeOrganization, person, startGate } from './shipping-helpers';

// The custody log as the other components write it while a box travels: the shop buys the label
// (packed), the carrier's first scan (handed over), its delivery scan, the lab's check-in. The
// shipping fake runs in process on a clock this file moves. Shops in Billings, MT; labs in Denver, CO.
const API_KEY = 'custody_handling_key';
const SECRET = 'custody-handling-webhook-secret';
const fake = createShippingFake({ port: 0, apiKey: API_KEY, webhookSecret: SECRET, clockSpeed: 0, seed: 11, webhookRetryDelaysMs: [20] });
await fake.start();
const gate = await startGate((_req, res) => res.writeHead(503).end());
const { app, db, config } = await setupApi({ SHIPPING_API_URL: fake.baseUrl, SHIPPING_API_KEY: API_KEY, SHIPPING_WEBHOOK_SECRET: SECRET, SHIPPING_WEBHOOK_URL: gate.url });
gate.up(app);
await ensureWebhookRegistered({ config, db });
afterAll(async () => {
  await fake.stop();
  await gate.close();
});

describe('custody entries written by shipping and receiving', () => {
  it('records packed by the shop, handed to the carrier, delivered and checked in, in order, each by whoever did it, chain intact', async () => {
    const shop = await makeOrganization(db, 'partner', '59101');
    const lab = await makeOrganization(db, 'lab', '80202');
    const staff = await person(app, db, 'partner_staff', shop.id);
    const clerk = await person(app, db, 'shipping_clerk', lab.id);
    const referral = await makeAcceptedCase(db, shop, lab);

    const rated = await request(app).post(`/api/referrals/${referral.id}/shipments`).set(auth(staff.token)).send({ parcel: { boxPreset: 'drive', weightLb: 3 } });
    const bought = shipmentDto.parse((await request(app).post(`/api/shipments/${rated.body.id}/buy`).set(auth(staff.token)).send({ rateId: rated.body.rates[0].id })).body);
    fake.advanceHours(24 * 9);
    await fake.webhooksIdle();
    const checkIn = await request(app)
      .post('/api/lab/check-ins')
      .set(auth(clerk.token))
      .field('data', JSON.stringify({ referralId: referral.id, shipmentId: bought.id, boxCondition: 'intact', seal: { present: true, number: 'S-7001', intact: true }, contentsMatch: true }));
    expect(checkIn.status, JSON.stringify(checkIn.body)).toBe(201);

    const log = custodyLogDto.parse((await request(app).get(`/api/referrals/${referral.id}/custody`).set(auth(staff.token))).body);

    expect(log.entries.map((e) => e.action)).toEqual(['packed_by_shop', 'handed_to_carrier', 'delivered', 'checked_in']);
    const [packed, handed, delivered, checked] = log.entries;
    expect(packed).toMatchObject({ actor: { type: 'user', id: staff.user.id }, location: expect.stringContaining(shop.name), details: { trackingCode: bought.trackingCode } });
    expect(handed!.actor.type).toBe('carrier');
    expect(delivered).toMatchObject({ actor: { type: 'carrier' }, details: { trackingCode: bought.trackingCode } });
    expect(checked).toMatchObject({ actor: { type: 'user', id: clerk.user.id }, location: expect.stringContaining(lab.name), details: { seal: 'seal S-7001 intact', outcome: 'received' } });
    expect(Date.parse(handed!.at)).toBeLessThanOrEqual(Date.parse(delivered!.at));
    expect(log.verification).toEqual({ intact: true });
  });
});
