import request from 'supertest';
import { afterAll, describe, expect, it } from 'vitest';
import { makeReference } from '@shared/domain/reference';
import { caseShippingDto, checkInLookupDto, inboundBoardDto, outboundListDto, shipmentDto } from '@shared/schemas/shipping';
import { createShippingFake } from '../../fakes/shipping/shipping-fake';
import { ensureWebhookRegistered } from '../../server/shipping';
import { setupApi } from '../support/api';
import { auth, makeAcceptedCase, makeOrganization, person, startGate } from './shipping-helpers';

// The lab's shipping clerk: the inbound board, looking a box up by what was scanned, checking it in (the
// case becomes received, or on hold with the reason for the shop), and the lab's returns and lab-to-lab
// transfers. Shops in Fargo, ND (58102), labs in Tucson, AZ (85701); the shipping fake runs in process.
const API_KEY = 'receiving_test_key';
const SECRET = 'receiving-test-webhook-secret';
const fake = createShippingFake({ port: 0, apiKey: API_KEY, webhookSecret: SECRET, clockSpeed: 0, seed: 7, webhookRetryDelaysMs: [20] });
await fake.start();
const gate = await startGate((_req, res) => res.writeHead(503).end());
const { app, db, config } = await setupApi({
  SHIPPING_API_URL: fake.baseUrl,
  SHIPPING_API_KEY: API_KEY,
  SHIPPING_WEBHOOK_SECRET: SECRET,
  SHIPPING_WEBHOOK_URL: gate.url,
});
gate.up(app);
await ensureWebhookRegistered({ config, db });

afterAll(async () => {
  await fake.stop();
  await gate.close();
});

const SHOP_ZIP = '58102';
const LAB_ZIP = '85701';
const box = { boxPreset: 'drive', weightLb: 3 };
// The smallest PNG: 1 × 1 pixel (PNG signature, IHDR, IDAT, IEND).
const PNG = Buffer.from('89504e470d0a1a0a0000000d49484452000000010000000108060000001f15c4890000000d49444154789c6360000002000154a24f5d0000000049454e44ae426082', 'hex');

async function scene(caseOptions: Parameters<typeof makeAcceptedCase>[3] = {}) {
  const shop = await makeOrganization(db, 'partner', SHOP_ZIP);
  const lab = await makeOrganization(db, 'lab', LAB_ZIP);
  const staff = await person(app, db, 'partner_staff', shop.id);
  const clerk = await person(app, db, 'shipping_clerk', lab.id);
  const manager = await person(app, db, 'lab_manager', lab.id);
  const referral = await makeAcceptedCase(db, shop, lab, caseOptions);
  return { shop, lab, staff, clerk, manager, referral };
}

async function buyLabel(token: string, referralId: string) {
  const rated = await request(app).post(`/api/referrals/${referralId}/shipments`).set(auth(token)).send({ parcel: box });
  expect(rated.status).toBe(201);
  const bought = await request(app).post(`/api/shipments/${rated.body.id}/buy`).set(auth(token)).send({ rateId: rated.body.rates[0].id });
  expect(bought.status).toBe(200);
  return shipmentDto.parse(bought.body);
}

async function deliverAll() {
  fake.advanceHours(24 * 9);
  await fake.webhooksIdle();
}

const intact = (referralId: string, extra: object = {}) => ({
  referralId,
  boxCondition: 'intact',
  seal: { present: true, number: 'S-40417', intact: true },
  contentsMatch: true,
  ...extra,
});

const caseStatus = async (id: string) => ((await db.query(`SELECT status FROM referrals WHERE id = $1`, [id])) as { status: string }[])[0]!.status;
const outbox = async (template: string, to: string) =>
  (await db.query(`SELECT subject, text_body FROM outbox_messages WHERE template = $1 AND recipient = $2`, [template, to])) as { subject: string; text_body: string }[];

describe('the inbound board (GET /api/lab/inbound)', () => {
  it('shows the lab’s boxes by status with counts, searchable by tracking code, reference and shop; another lab sees none', async () => {
    const { staff, clerk, referral, shop, lab } = await scene();
    const label = await buyLabel(staff.token, referral.id);
    const second = await makeAcceptedCase(db, shop, lab);
    const secondLabel = await buyLabel(staff.token, second.id);
    await db.query(`UPDATE shipments SET status = 'delivered', status_rank = 4, delivered_at = now() WHERE id = $1`, [secondLabel.id]);

    const board = inboundBoardDto.parse((await request(app).get('/api/lab/inbound').set(auth(clerk.token))).body);

    expect(board.counts.label_issued).toBe(1);
    expect(board.counts.delivered_today).toBe(1);
    expect(board.data.map((r) => r.trackingCode).sort()).toEqual([label.trackingCode, secondLabel.trackingCode].sort());
    expect(board.data.find((r) => r.shipmentId === secondLabel.id)).toMatchObject({ bucket: 'delivered_today', reference: second.reference, from: { name: shop.name } });

    const byCode = inboundBoardDto.parse((await request(app).get('/api/lab/inbound').query({ q: label.trackingCode }).set(auth(clerk.token))).body);
    expect(byCode.data.map((r) => r.shipmentId)).toEqual([label.id]);
    const byReference = inboundBoardDto.parse((await request(app).get('/api/lab/inbound').query({ q: second.reference.toLowerCase() }).set(auth(clerk.token))).body);
    expect(byReference.data.map((r) => r.shipmentId)).toEqual([secondLabel.id]);
    const byShop = inboundBoardDto.parse((await request(app).get('/api/lab/inbound').query({ q: shop.name.slice(5, 14) }).set(auth(clerk.token))).body);
    expect(byShop.data).toHaveLength(2);
    const onlyDelivered = inboundBoardDto.parse((await request(app).get('/api/lab/inbound').query({ bucket: 'delivered_today' }).set(auth(clerk.token))).body);
    expect(onlyDelivered.data.map((r) => r.shipmentId)).toEqual([secondLabel.id]);

    const otherLab = await makeOrganization(db, 'lab', LAB_ZIP);
    const otherClerk = await person(app, db, 'shipping_clerk', otherLab.id);
    const theirs = inboundBoardDto.parse((await request(app).get('/api/lab/inbound').set(auth(otherClerk.token))).body);
    expect(theirs.data).toEqual([]);
    expect((await request(app).get('/api/lab/inbound').set(auth(staff.token))).status).toBe(403);
  });
});

describe('looking a box up (GET /api/lab/check-in/lookup)', () => {
  it('finds the box by tracking code or case reference, and refuses a reference with a wrong check symbol before looking anything up', async () => {
    const { staff, clerk, referral } = await scene({ mediaType: 'phone', battery: { installed: true, condition: 'intact', wattHours: 14 } });
    const label = await buyLabel(staff.token, referral.id);

    const byCode = checkInLookupDto.parse((await request(app).get('/api/lab/check-in/lookup').query({ code: ` ${label.trackingCode!.toLowerCase()} ` }).set(auth(clerk.token))).body);
    expect(byCode).toMatchObject({ matchedBy: 'tracking_code', canCheckIn: true, referral: { id: referral.id, askBattery: true }, shipment: { id: label.id } });
    const byReference = checkInLookupDto.parse((await request(app).get('/api/lab/check-in/lookup').query({ code: referral.reference }).set(auth(clerk.token))).body);
    expect(byReference.matchedBy).toBe('reference');
    expect(byReference.shipment?.id).toBe(label.id);

    // Crockford's Base 32 check symbol (mod 37): change it and the reference is refused as mistyped.
    const symbols = '0123456789ABCDEFGHJKMNPQRSTVWXYZ*~$=U';
    const last = referral.reference.slice(-1);
    const wrong = `${referral.reference.slice(0, -1)}${symbols[(symbols.indexOf(last) + 1) % symbols.length]}`;
    const refused = await request(app).get('/api/lab/check-in/lookup').query({ code: wrong }).set(auth(clerk.token));
    expect(refused.status).toBe(400);
    expect(refused.body.error.fields).toEqual([{ path: 'code', message: expect.stringContaining('check symbol') }]);
    // A well-formed reference nobody has is looked up, and not found.
    expect((await request(app).get('/api/lab/check-in/lookup').query({ code: makeReference(2n ** 40n) }).set(auth(clerk.token))).status).toBe(404);
  });
});

describe('checking a box in (POST /api/lab/check-ins)', () => {
  it('receives a box in order with its seal and a photo: the case is received, the timeline says so, the shop is e-mailed', async () => {
    const { staff, clerk, referral, lab } = await scene();
    const label = await buyLabel(staff.token, referral.id);
    await deliverAll();
    expect(await caseStatus(referral.id)).toBe('in_transit');

    const res = await request(app)
      .post('/api/lab/check-ins')
      .set(auth(clerk.token))
      .field('data', JSON.stringify(intact(referral.id, { shipmentId: label.id })))
      .attach('photos', PNG, { filename: 'box-top.png', contentType: 'image/png' });

    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ caseStatus: 'received', checkIn: { outcome: 'received', sealNumber: 'S-40417', sealIntact: true, photoCount: 1, labName: lab.name } });
    expect(await caseStatus(referral.id)).toBe('received');
    const shipping = caseShippingDto.parse((await request(app).get(`/api/referrals/${referral.id}/shipping`).set(auth(staff.token))).body);
    expect(shipping.checkIn).toMatchObject({ outcome: 'received', holdReason: null });
    expect(shipping.shipments[0]).toMatchObject({ status: 'delivered', checkedInAt: expect.any(String) });
    const [entry] = await db.query(`SELECT summary FROM referral_timeline WHERE referral_id = $1 AND kind = 'received'`, [referral.id]);
    expect(entry.summary).toMatch(/seal S-40417 intact/);
    expect(await outbox('box_checked_in', staff.user.email)).toEqual([expect.objectContaining({ subject: expect.stringContaining('Box delivered and checked in') })]);

    const [photo] = await db.query(`SELECT p.id FROM check_in_photos p JOIN check_ins c ON c.id = p.check_in_id WHERE c.referral_id = $1`, [referral.id]);
    const image = await request(app).get(`/api/check-in-photos/${photo.id}`).set(auth(staff.token));
    expect(image.status).toBe(200);
    expect(image.headers['content-type']).toBe('image/png');

    const again = await request(app).post('/api/lab/check-ins').set(auth(clerk.token)).send(intact(referral.id));
    expect(again.status).toBe(409);
  });

  it('puts the case on hold with the reason when the box is damaged, the seal broken or the battery swollen', async () => {
    const { staff, clerk, referral } = await scene({ mediaType: 'phone', battery: { installed: true, condition: 'intact', wattHours: 14 } });
    await buyLabel(staff.token, referral.id);

    const res = await request(app)
      .post('/api/lab/check-ins')
      .set(auth(clerk.token))
      .send(intact(referral.id, { boxCondition: 'damaged', seal: { present: true, number: 'S-9', intact: false }, batteryCondition: 'swollen' }));

    expect(res.status).toBe(201);
    expect(res.body.caseStatus).toBe('on_hold');
    expect(res.body.checkIn.holdReason).toMatch(/box arrived damaged.*seal S-9 was broken.*battery is swollen/);
    expect(await caseStatus(referral.id)).toBe('on_hold');
    const shipping = caseShippingDto.parse((await request(app).get(`/api/referrals/${referral.id}/shipping`).set(auth(staff.token))).body);
    expect(shipping.checkIn?.holdReason).toBe(res.body.checkIn.holdReason);
    const mails = await outbox('case_on_hold', staff.user.email);
    expect(mails).toHaveLength(1);
    expect(mails[0]!.text_body).toContain('seal S-9 was broken');
  });

  it('asks what differs when the contents do not match, and refuses a clerk of another lab (404) and shop staff (403)', async () => {
    const { staff, clerk, referral } = await scene();
    const missing = await request(app).post('/api/lab/check-ins').set(auth(clerk.token)).send(intact(referral.id, { contentsMatch: false }));
    expect(missing.status).toBe(400);
    expect(missing.body.error.fields).toEqual([{ path: 'contentsNote', message: expect.any(String) }]);

    const otherLab = await makeOrganization(db, 'lab', LAB_ZIP);
    const otherClerk = await person(app, db, 'shipping_clerk', otherLab.id);
    expect((await request(app).post('/api/lab/check-ins').set(auth(otherClerk.token)).send(intact(referral.id))).status).toBe(404);
    expect((await request(app).post('/api/lab/check-ins').set(auth(staff.token)).send(intact(referral.id))).status).toBe(403);
  });
});

describe('releasing a hold (POST /api/lab/cases/:id/release-hold)', () => {
  it('lets the lab manager release a held case with a note: it is received, the timeline says why; only once, only for the own lab', async () => {
    const { staff, clerk, manager, referral } = await scene();
    await buyLabel(staff.token, referral.id);
    const held = await request(app).post('/api/lab/check-ins').set(auth(clerk.token)).send(intact(referral.id, { boxCondition: 'damaged' }));
    expect(held.body.caseStatus).toBe('on_hold');

    const noNote = await request(app).post(`/api/lab/cases/${referral.id}/release-hold`).set(auth(manager.token)).send({});
    expect(noNote.status).toBe(400);
    expect(noNote.body.error.fields).toEqual([{ path: 'note', message: 'Say what settled the hold, for the shop' }]);
    const byClerk = await request(app).post(`/api/lab/cases/${referral.id}/release-hold`).set(auth(clerk.token)).send({ note: 'Drive inspected' });
    expect(byClerk.status).toBe(403);
    const other = await scene();
    const otherLab = await request(app).post(`/api/lab/cases/${referral.id}/release-hold`).set(auth(other.manager.token)).send({ note: 'Not ours' });
    expect(otherLab.status).toBe(404);
    expect(await caseStatus(referral.id)).toBe('on_hold');

    const released = await request(app)
      .post(`/api/lab/cases/${referral.id}/release-hold`)
      .set(auth(manager.token))
      .send({ note: 'Outer box dented only; the drive is unharmed.' });
    expect(released.status).toBe(200);
    expect(released.body).toEqual({ referralId: referral.id, status: 'received' });
    expect(await caseStatus(referral.id)).toBe('received');
    const [entry] = await db.query(`SELECT summary, actor_name FROM referral_timeline WHERE referral_id = $1 AND kind = 'hold_released'`, [referral.id]);
    expect(entry.summary).toBe(`Hold released by ${entry.actor_name}: Outer box dented only; the drive is unharmed.`);

    const again = await request(app).post(`/api/lab/cases/${referral.id}/release-hold`).set(auth(manager.token)).send({ note: 'Twice' });
    expect(again.status).toBe(409);
  });
});

describe('the shop’s e-mail when the next lab accepts a transferred case', () => {
  it('says the lab holding the device ships it on, rather than asking the shop for a label', async () => {
    const { staff, clerk, manager, referral, lab } = await scene();
    await buyLabel(staff.token, referral.id);
    await request(app).post('/api/lab/check-ins').set(auth(clerk.token)).send(intact(referral.id)).expect(201);
    await request(app).post(`/api/lab/cases/${referral.id}/decline-after-arrival`).set(auth(manager.token)).send({ reason: 'no_capacity' }).expect(200);
    const [offer] = await db.query(`SELECT id, lab_organization_id FROM lab_offers WHERE referral_id = $1 AND status = 'pending'`, [referral.id]);
    expect(offer).toBeDefined();
    const nextManager = await person(app, db, 'lab_manager', offer.lab_organization_id);
    const accepted = await request(app).post(`/api/lab/offers/${offer.id}/accept`).set(auth(nextManager.token)).send({});
    expect(accepted.status).toBe(200);
    const mails = await outbox('referral_accepted', staff.user.email);
    expect(mails).toHaveLength(1);
    expect(mails[0]!.text_body).toContain(`${lab.name} ships the device on to`);
    expect(mails[0]!.text_body).not.toContain('buy the prepaid label');
  });
});

describe('outbound: returns and lab-to-lab transfers', () => {
  it('ships the device back to the customer, signed for and with a declared value; the case is returned at the first scan', async () => {
    const { staff, clerk, referral } = await scene();
    await buyLabel(staff.token, referral.id);
    await request(app).post('/api/lab/check-ins').set(auth(clerk.token)).send(intact(referral.id)).expect(201);

    const list = outboundListDto.parse((await request(app).get('/api/lab/outbound').set(auth(clerk.token))).body);
    expect(list.data.find((i) => i.referralId === referral.id)).toMatchObject({ purpose: 'return', ready: true });
    const rated = await request(app)
      .post(`/api/lab/cases/${referral.id}/returns`)
      .set(auth(clerk.token))
      .send({
        destination: 'customer',
        address: { name: 'Wren Halloway', street1: '80 Prairie Lane', city: 'Fargo', state: 'ND', zip: '58103' },
        parcel: box,
        signatureRequired: true,
        declaredValue: 25000,
      });
    expect(rated.status).toBe(201);
    expect(rated.body).toMatchObject({ kind: 'return', signatureRequired: true, declaredValue: 25000, to: { name: 'Wren Halloway' } });
    const bought = await request(app).post(`/api/shipments/${rated.body.id}/buy`).set(auth(clerk.token)).send({ rateId: rated.body.rates[0].id });
    expect(bought.status).toBe(200);
    expect((await db.query(`SELECT kind FROM referral_timeline WHERE referral_id = $1 AND kind = 'return_label_issued'`, [referral.id]))).toHaveLength(1);
    // The shop cannot buy the lab's return label, and no longer a label to the lab.
    expect((await request(app).post(`/api/shipments/${rated.body.id}/void`).set(auth(staff.token))).status).toBe(403);

    fake.advanceHours(6);
    await fake.webhooksIdle();
    expect(await caseStatus(referral.id)).toBe('returned');
  });

  it('transfers the device to the next lab when the lab declines after the box arrived; that lab checks it in', async () => {
    const { staff, clerk, manager, referral, lab } = await scene();
    await buyLabel(staff.token, referral.id);
    await request(app).post('/api/lab/check-ins').set(auth(clerk.token)).send(intact(referral.id)).expect(201);

    const declined = await request(app).post(`/api/lab/cases/${referral.id}/decline-after-arrival`).set(auth(manager.token)).send({ reason: 'missing_skill_or_parts', note: 'No donor heads' });
    expect(declined.status).toBe(200);
    // The next ranking counts distances from the lab that holds the device, not from the shop.
    const [held] = await db.query(`SELECT lat, lon FROM organizations WHERE id = $1`, [lab.id]);
    const [shopOrigin] = await db.query(`SELECT origin_lat AS lat, origin_lon AS lon FROM referrals WHERE id = $1`, [referral.id]);
    expect(held).not.toEqual(shopOrigin);
    const [snapshot] = await db.query(`SELECT trigger, origin_lat AS lat, origin_lon AS lon FROM routing_snapshots WHERE referral_id = $1 ORDER BY created_at DESC LIMIT 1`, [referral.id]);
    expect(snapshot).toEqual({ trigger: 'reoffer', lat: held.lat, lon: held.lon });
    const [routed] = await db.query(`SELECT summary FROM referral_timeline WHERE referral_id = $1 AND kind = 'routed' ORDER BY at DESC LIMIT 1`, [referral.id]);
    expect(routed.summary).toContain(`Ranked from ${lab.name}, which holds the device.`);
    expect((await db.query(`SELECT status FROM lab_transfers WHERE referral_id = $1`, [referral.id]))[0].status).toBe('open');
    const shopView = caseShippingDto.parse((await request(app).get(`/api/referrals/${referral.id}/shipping`).set(auth(staff.token))).body);
    expect(shopView.canCreateLabel).toBe(false);
    expect(await db.query(`SELECT count(*)::int AS n FROM outbox_messages WHERE template = 'case_transfer' AND recipient = $1`, [staff.user.email])).toEqual([{ n: 1 }]);

    const waiting = outboundListDto.parse((await request(app).get('/api/lab/outbound').set(auth(clerk.token))).body).data.find((i) => i.referralId === referral.id);
    expect(waiting).toMatchObject({ purpose: 'transfer', ready: false });

    // Another lab accepts the case (routing and offers are tested in their own files).
    const next = await makeOrganization(db, 'lab', '85004');
    const nextClerk = await person(app, db, 'shipping_clerk', next.id);
    await db.query(`UPDATE referrals SET status = 'accepted', lab_organization_id = $2 WHERE id = $1`, [referral.id, next.id]);

    const rated = await request(app).post(`/api/lab/cases/${referral.id}/transfers`).set(auth(clerk.token)).send({ parcel: box });
    expect(rated.status).toBe(201);
    expect(rated.body).toMatchObject({ kind: 'transfer', to: { name: 'Receiving', lines: expect.arrayContaining([next.name]) } });
    const bought = await request(app).post(`/api/shipments/${rated.body.id}/buy`).set(auth(clerk.token)).send({ rateId: rated.body.rates[0].id });
    expect(bought.status).toBe(200);
    expect(await caseStatus(referral.id)).toBe('label_issued');

    const board = inboundBoardDto.parse((await request(app).get('/api/lab/inbound').set(auth(nextClerk.token))).body);
    expect(board.data.map((r) => r.shipmentId)).toContain(rated.body.id);
    expect(board.data.find((r) => r.shipmentId === rated.body.id)).toMatchObject({ kind: 'transfer', from: { name: lab.name } });
    const checked = await request(app).post('/api/lab/check-ins').set(auth(nextClerk.token)).send(intact(referral.id, { shipmentId: rated.body.id }));
    expect(checked.status).toBe(201);
    expect(await caseStatus(referral.id)).toBe('received');
  });
});
