import { mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import bwipjs from 'bwip-js/node';
import request from 'supertest';
import { afterAll, describe, expect, it } from 'vitest';
import { labOfferDto, labOfferListDto } from '@shared/schemas/labs';
import { roles, type Role } from '@shared/vocabulary';
import { demoAccounts } from '../../server/db/seed/demo-accounts';
import { relayJobOutbox, startQueue } from '../../server/jobs';
import { expireOffer } from '../../server/routing';
import { setupApi, signIn, unique } from '../support/api';
import { testNetwork } from '../support/network';

const uploadDir = mkdtempSync(path.join(os.tmpdir(), 'platterpost-offers-uploads-'));
const api = await setupApi({ UPLOAD_DIR: uploadDir });
const { app, db, config } = api;
const ctx = { db, config };
afterAll(() => rmSync(uploadDir, { recursive: true, force: true }));

// Offers from the lab's side: seeing them, accepting, declining, deadlines. This file's shops and labs
// sit in Bangor, ME (ZIP 04401), far from the other files' and the demo network's; its labs answer in
// one or two business days so that they rank first here. Each test stops its labs taking new cases.
const ZIP = '04401';
const network = testNetwork(api, { zip: ZIP, timeZone: 'America/New_York', holidayRegion: 'ME' });
const auth = (token: string) => ({ Authorization: `Bearer ${token}` });

const makeShop = () => network.makeShop({ line1: '5 Harbor Street', role: 'partner_admin' });

/** A lab taking only logical work on cards and sticks, open 08:00–16:00. */
const makeLab = (turnaroundDays: number) =>
  network.makeLab({
    mediaTypes: ['usb_flash', 'memory_card'],
    skills: [{ skill: 'logical', turnaroundDays }],
    profile: {
      businessHours: { opensAt: '08:00', closesAt: '16:00', workdays: [1, 2, 3, 4, 5], holidayCountry: 'US', holidayRegion: 'ME' },
      weeklyThroughput: 5,
      queueCapacity: 10,
    },
  });

const deletedPhotos = {
  customer: { name: 'Odessa Marchetti', email: 'odessa.marchetti@customer.test', phone: '+1 207 555 0144' },
  device: { mediaType: 'memory_card', capacityGb: 128 },
  symptoms: ['deleted_files'],
  priorities: [{ category: 'photos', note: 'Wedding, June' }],
  consent: { accepted: true },
};

/** A shop, a first-choice lab (1 day) and a second-choice lab (2 days), and a case offered to the first. */
async function offeredCase() {
  const shop = await makeShop();
  const first = await makeLab(1);
  const second = await makeLab(2);
  const res = await request(app).post('/api/referrals').set(auth(shop.token)).send(deletedPhotos);
  expect(res.status).toBe(201);
  expect(res.body.offer.labId).toBe(first.org.id);
  return { shop, first, second, referral: res.body, offerId: res.body.offer.id as string };
}

async function referral(id: string, token: string) {
  return (await request(app).get(`/api/referrals/${id}`).set(auth(token))).body;
}

describe('what a lab sees', () => {
  it("shows a lab manager the offers to the own lab only, never another lab's case", async () => {
    const { first, second, referral: kase, offerId } = await offeredCase();

    const own = await request(app).get('/api/lab/offers').set(auth(first.token));
    expect(own.status).toBe(200);
    const list = labOfferListDto.parse(own.body);
    expect(list.data.map((o) => o.id)).toEqual([offerId]);
    const offer = labOfferDto.parse((await request(app).get(`/api/lab/offers/${offerId}`).set(auth(first.token))).body);
    expect(offer).toMatchObject({ status: 'pending', distanceKm: 0, rank: 1, case: { id: kase.id, reference: kase.reference, photos: [] } });
    expect(offer.case.triage.requiredSkills).toEqual(['logical']);
    expect(offer.case.priorities).toEqual([{ category: 'photos', note: 'Wedding, June' }]);
    expect(offer.deadline).toBe(kase.offer.deadline);
    // Deciding needs the device and the damage, not the customer's contact details.
    expect(JSON.stringify(offer)).not.toContain('odessa.marchetti@customer.test');

    const other = await request(app).get('/api/lab/offers').set(auth(second.token));
    expect(other.body.data).toEqual([]);
    for (const res of [
      await request(app).get(`/api/lab/offers/${offerId}`).set(auth(second.token)),
      await request(app).post(`/api/lab/offers/${offerId}/accept`).set(auth(second.token)),
      await request(app).post(`/api/lab/offers/${offerId}/decline`).set(auth(second.token)).send({ reason: 'no_capacity' }),
    ]) {
      expect(res.status).toBe(404);
      expect(JSON.stringify(res.body)).not.toContain(kase.reference);
    }
    const [row] = await db.query(`SELECT status FROM lab_offers WHERE id = $1`, [offerId]);
    expect(row.status).toBe('pending');
  });
});

describe('condition photos', () => {
  it('shows the lab offered the case its photos, which the lab can open, and the shop sees them on the case', async () => {
    const { shop, first, second, referral: kase, offerId } = await offeredCase();
    const image = await bwipjs.toBuffer({ bcid: 'code128', text: unique('PHOTO') });
    const upload = await request(app).post(`/api/referrals/${kase.id}/photos`).set(auth(shop.token)).attach('photos', image, 'label-side.png');
    expect(upload.status).toBe(201);
    const photoId = upload.body[0].id as string;

    const offer = await request(app).get(`/api/lab/offers/${offerId}`).set(auth(first.token));
    expect(offer.body.case.photos).toEqual([{ id: photoId, url: `/api/photos/${photoId}`, contentType: 'image/png', sizeBytes: image.length }]);
    const file = await request(app).get(offer.body.case.photos[0].url).set(auth(first.token));
    expect(file.status).toBe(200);
    expect((await request(app).get(`/api/photos/${photoId}`).set(auth(second.token))).status).toBe(404);

    const onCase = await referral(kase.id, shop.token);
    expect(onCase.photos).toEqual([{ id: photoId, url: `/api/photos/${photoId}`, contentType: 'image/png', sizeBytes: image.length }]);
  });
});

describe('POST /api/lab/offers/:id/accept', () => {
  it('gives the case to the lab, records who accepted and tells the shop', async () => {
    const { shop, first, referral: kase, offerId } = await offeredCase();

    const res = await request(app).post(`/api/lab/offers/${offerId}/accept`).set(auth(first.token));

    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ status: 'accepted', respondedBy: 'Test lab_manager', autoAccepted: false });
    const after = await referral(kase.id, shop.token);
    expect(after).toMatchObject({ status: 'accepted', lab: { id: first.org.id, name: first.org.name }, offer: { status: 'accepted' } });
    expect(after.timeline.at(-1)).toMatchObject({ kind: 'offer_accepted', actor: { type: 'user', name: 'Test lab_manager' } });
    const mail = await db.query(`SELECT template, subject FROM outbox_messages WHERE recipient = $1`, [shop.user.email]);
    expect(mail).toEqual([{ template: 'referral_accepted', subject: `${first.org.name} accepted case ${kase.reference}` }]);
    const profile = await request(app).get('/api/lab/profile').set(auth(first.token));
    expect(profile.body.openCases).toBe(1);

    const again = await request(app).post(`/api/lab/offers/${offerId}/accept`).set(auth(first.token));
    expect(again.status).toBe(409);
  });
});

describe('POST /api/lab/offers/:id/decline', () => {
  it('records the reason and offers the case to the next candidate by itself', async () => {
    const { shop, first, second, referral: kase, offerId } = await offeredCase();

    const res = await request(app).post(`/api/lab/offers/${offerId}/decline`).set(auth(first.token)).send({ reason: 'no_capacity', note: 'Bench full this week' });

    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ status: 'declined', declineReason: 'no_capacity', declineNote: 'Bench full this week' });
    const after = await referral(kase.id, shop.token);
    expect(after.status).toBe('offered');
    expect(after.offer).toMatchObject({ labId: second.org.id, status: 'pending' });
    expect(after.routing.excluded.find((e: { labId: string }) => e.labId === first.org.id).reasons).toEqual([
      { code: 'previously_offered', message: 'Lab was already offered this case.' },
    ]);
    expect(after.timeline.slice(-3).map((t: { kind: string }) => t.kind)).toEqual(['offer_declined', 'routed', 'offered']);
    const nextOffers = await request(app).get('/api/lab/offers').query({ status: 'pending' }).set(auth(second.token));
    expect(nextOffers.body.data.map((o: { case: { id: string } }) => o.case.id)).toEqual([kase.id]);
    const mail = await db.query(`SELECT template FROM outbox_messages WHERE recipient = $1`, [second.manager.email]);
    expect(mail).toEqual([{ template: 'lab_offer_new' }]);
  });

  it('needs a note for "other" and changes nothing without it', async () => {
    const { first, offerId } = await offeredCase();
    const res = await request(app).post(`/api/lab/offers/${offerId}/decline`).set(auth(first.token)).send({ reason: 'other' });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual([{ path: 'note', message: expect.any(String) }]);
    const [row] = await db.query(`SELECT status FROM lab_offers WHERE id = $1`, [offerId]);
    expect(row.status).toBe('pending');
  });
});

describe('the offer deadline', () => {
  it('expires an unanswered offer at its deadline and offers the case to the next candidate; running again changes nothing', async () => {
    const { shop, second, referral: kase, offerId } = await offeredCase();
    const deadline = new Date(kase.offer.deadline);

    // Before the deadline the job does nothing.
    expect(await expireOffer(ctx, offerId, new Date(deadline.getTime() - 60_000))).toBe('not_due');
    // Time advanced past the deadline: the job's handler, run directly.
    expect(await expireOffer(ctx, offerId, new Date(deadline.getTime() + 60_000))).toBe('expired');

    const after = await referral(kase.id, shop.token);
    expect(after.offer).toMatchObject({ labId: second.org.id, status: 'pending' });
    const expired = after.timeline.find((t: { kind: string }) => t.kind === 'offer_expired');
    expect(expired.actor).toEqual({ type: 'system', name: 'Platterpost (offer deadline)' });
    const [row] = await db.query(`SELECT status FROM lab_offers WHERE id = $1`, [offerId]);
    expect(row.status).toBe('expired');

    const timelineLength = after.timeline.length;
    expect(await expireOffer(ctx, offerId, new Date(deadline.getTime() + 120_000))).toBe('not_pending');
    expect((await referral(kase.id, shop.token)).timeline).toHaveLength(timelineLength);
  });

  it('answers 409 to a lab that accepts after its deadline, and the case has moved on', async () => {
    const { shop, first, second, referral: kase, offerId } = await offeredCase();
    await db.query(`UPDATE lab_offers SET offered_at = now() - interval '6 hours', deadline = now() - interval '1 minute' WHERE id = $1`, [offerId]);

    const res = await request(app).post(`/api/lab/offers/${offerId}/accept`).set(auth(first.token));

    expect(res.status).toBe(409);
    const after = await referral(kase.id, shop.token);
    expect(after.status).toBe('offered');
    expect(after.offer).toMatchObject({ labId: second.org.id, status: 'pending' });
    expect(after.lab).toBeNull();
  });

  it('schedules the expiry in pg-boss for the deadline, once per offer, through the job outbox', async () => {
    const { offerId, referral: kase } = await offeredCase();
    const boss = await startQueue(config, { applicationName: 'platterpost-test-relay' });
    try {
      for (let i = 0; i < 20; i++) {
        const [row] = await db.query(`SELECT relayed_at FROM job_outbox WHERE singleton_key = $1`, [offerId]);
        if (row.relayed_at) break;
        await relayJobOutbox(db, boss, 500);
      }
      // A second outbox row for the same offer (a retried transaction, say) adds no second job.
      await db.query(`INSERT INTO job_outbox (queue, data, start_after, singleton_key) VALUES ('offer-expire', $1, $2, $3)`, [
        { offerId },
        kase.offer.deadline,
        offerId,
      ]);
      for (let i = 0; i < 20; i++) {
        const pending = await db.query(`SELECT 1 FROM job_outbox WHERE singleton_key = $1 AND relayed_at IS NULL`, [offerId]);
        if (pending.length === 0) break;
        await relayJobOutbox(db, boss, 500);
      }
      const jobs = await db.query(`SELECT name, data, start_after, state FROM pgboss.job WHERE singleton_key = $1`, [offerId]);
      expect(jobs).toHaveLength(1);
      expect(jobs[0]).toMatchObject({ name: 'offer-expire', state: 'created', data: expect.objectContaining({ offerId }) });
      expect(new Date(jobs[0].start_after).getTime()).toBe(new Date(kase.offer.deadline).getTime());
    } finally {
      await boss.stop({ graceful: false, timeout: 1000 });
    }
  });
});

describe('guard matrix: offer routes × every role', () => {
  const tokens = new Map<Role, string>();
  const missing = '00000000-0000-4000-8000-000000000000';
  const matrix: { method: 'get' | 'post'; path: string; body?: object; pass: number }[] = [
    { method: 'get', path: '/api/lab/offers', pass: 200 },
    { method: 'get', path: `/api/lab/offers/${missing}`, pass: 404 },
    { method: 'post', path: `/api/lab/offers/${missing}/accept`, pass: 404 },
    { method: 'post', path: `/api/lab/offers/${missing}/decline`, body: {}, pass: 400 },
  ];
  const allowed: readonly Role[] = ['lab_manager'];
  for (const route of matrix) {
    it(`${route.method.toUpperCase()} ${route.path} without a token answers 401`, async () => {
      expect((await request(app)[route.method](route.path).send(route.body)).status).toBe(401);
    });
    for (const role of roles) {
      const ok = allowed.includes(role);
      it(`${route.method.toUpperCase()} ${route.path} as ${role} answers ${ok ? route.pass : 403}`, async () => {
        if (!tokens.has(role)) tokens.set(role, (await signIn(app, demoAccounts.find((a) => a.role === role)!.email)).accessToken);
        const res = await request(app)[route.method](route.path).set(auth(tokens.get(role)!)).send(route.body);
        expect(res.status).toBe(ok ? route.pass : 403);
        if (!ok) expect(res.body.error.code).toBe('forbidden');
      });
    }
  }
});
