import request from 'supertest';
import zipcodes from 'zipcodes';
import { describe, expect, it } from 'vitest';
import { offerDeadline } from '@shared/domain/business-hours';
import { parseReference } from '@shared/domain/reference';
import { referralDto, referralListDto, routingPreviewDto } from '@shared/schemas/referrals';
import { roles, type Role } from '@shared/vocabulary';
import { demoAccounts } from '../../server/db/seed/demo-accounts';
import { createReferral } from '../../server/referrals';
import { setupApi, signIn, unique } from '../support/api';
import { classFive, daysAgo, testNetwork } from '../support/network';

const ctx = await setupApi();
const { app, db, config } = ctx;

// Intake through POST /api/referrals: the case, triage, routing, the offer and the timeline, all in one
// transaction. This file's shops and labs sit in Billings, MT (ZIP 59101), far from the other files'
// and the demo network's, and its labs answer in one business day, so they rank first here; each test
// stops its labs taking new cases when it ends.
const ZIP = '59101';
const { place, makeShop: shopAt, makeLab: labAt } = testNetwork(ctx, { zip: ZIP, timeZone: 'America/Denver', holidayRegion: 'MT' });
const calendar = { timeZone: 'America/Denver', country: 'US', region: 'MT', opensAt: '09:00', closesAt: '17:00', workdays: [1, 2, 3, 4, 5] };
const auth = (token: string) => ({ Authorization: `Bearer ${token}` });


const makeShop = () => shopAt({ line1: '1 Counter Street' });
const makeLab = (options: { skills: { skill: string; turnaroundDays: number }[]; certificate?: object; profile?: Record<string, unknown> }) =>
  labAt({ ...options, line1: '2 Bench Road', mediaTypes: ['hdd_3_5', 'hdd_2_5', 'ssd_sata', 'usb_flash'] });

const clickingDrive = (overrides: Record<string, unknown> = {}) => ({
  customer: { name: 'Wendell Okafor', email: 'wendell.okafor@customer.test', phone: '+1 406 555 0101' },
  device: { mediaType: 'hdd_3_5', capacityGb: 4000, interface: 'sata', make: 'Examplar', model: 'X-4000' },
  symptoms: ['clicking'],
  description: 'Fell off the desk while copying; now it clicks.',
  priorities: [{ category: 'photos', note: '2019–2023 family photos' }, { category: 'documents' }],
  sensitivity: ['none'],
  consent: { accepted: true },
  ...overrides,
});

const deletedFiles = (overrides: Record<string, unknown> = {}) =>
  clickingDrive({ symptoms: ['deleted_files'], device: { mediaType: 'usb_flash', capacityGb: 64 }, ...overrides });

async function counts() {
  const [row] = await db.query(
    `SELECT (SELECT count(*) FROM referrals)::int AS referrals, (SELECT count(*) FROM lab_offers)::int AS offers,
            (SELECT count(*) FROM referral_timeline)::int AS timeline, (SELECT count(*) FROM job_outbox)::int AS jobs`,
  );
  return row as { referrals: number; offers: number; timeline: number; jobs: number };
}

describe('POST /api/referrals (intake)', () => {
  it('stores the case with triage, ranks the labs, offers it to the best one and writes every step on the timeline', async () => {
    const shop = await makeShop();
    const fast = await makeLab({ skills: [{ skill: 'hdd_head_swap', turnaroundDays: 1 }, { skill: 'logical', turnaroundDays: 1 }], certificate: classFive(daysAgo(30)) });
    const slower = await makeLab({ skills: [{ skill: 'hdd_head_swap', turnaroundDays: 2 }], certificate: classFive(daysAgo(40)) });
    const expired = await makeLab({ skills: [{ skill: 'hdd_head_swap', turnaroundDays: 1 }], certificate: classFive(daysAgo(240)) });

    const res = await request(app).post('/api/referrals').set(auth(shop.token)).send(clickingDrive());

    expect(res.status).toBe(201);
    const body = referralDto.parse(res.body);
    expect(parseReference(body.reference)).toMatchObject({ ok: true, reference: body.reference });
    expect(body.status).toBe('offered');
    expect(body.partner).toEqual({ id: shop.org.id, name: shop.org.name });
    expect(body.origin).toMatchObject({ postalCode: ZIP, country: 'US', location: { lat: place.latitude, lon: place.longitude } });
    expect(body.priorities).toEqual([{ category: 'photos', note: '2019–2023 family photos' }, { category: 'documents', note: null }]);
    expect(body.consent?.recordedBy).toBe('Test partner_staff');

    // Triage (shared/domain/triage.ts): a clicking hard drive needs a head swap in clean air, and the shop
    // is told not to power it again.
    expect(body.triage.requiredSkills).toEqual(['hdd_head_swap']);
    expect(body.triage.needsCleanAir).toBe(true);
    expect(body.triage.cautions.map((c) => c.code)).toEqual(expect.arrayContaining(['do_not_power_on', 'do_not_open_drive']));

    // Routing: candidates by estimated days, fastest first; the lab whose class 5 certificate is past its
    // 6-month re-test interval (ISO 14644-2, from memory) is excluded with that reason.
    const days = body.routing.candidates.map((c) => c.estimatedDays);
    expect(days).toEqual([...days].sort((a, b) => a - b));
    expect(body.routing.candidates[0]).toMatchObject({ labId: fast.org.id, distanceKm: 0, transitDays: 1, queueDays: 0, turnaroundDays: 1, estimatedDays: 2 });
    const ids = body.routing.candidates.map((c) => c.labId);
    expect(ids.indexOf(slower.org.id)).toBeGreaterThan(0);
    expect(ids).not.toContain(expired.org.id);
    const excluded = body.routing.excluded.find((e) => e.labId === expired.org.id);
    expect(excluded?.reasons).toEqual([{ code: 'clean_air_expired', message: expect.stringContaining('re-test') }]);

    // The offer: to the top candidate, with a deadline 4 business hours later in the lab's calendar
    // (shared/domain/business-hours.ts with date-holidays; 4 hours is the default).
    expect(body.offer).toMatchObject({ labId: fast.org.id, status: 'pending', autoAccepted: false, respondedAt: null });
    expect(body.routing.offeredTo).toEqual({ labId: fast.org.id, labName: fast.org.name });
    const offeredAt = new Date(body.offer!.offeredAt);
    expect(new Date(body.offer!.deadline).getTime()).toBe(offerDeadline(offeredAt, calendar, 4).getTime());

    expect(body.timeline.map((t) => t.kind)).toEqual(['opened', 'triaged', 'routed', 'offered']);
    expect(body.timeline[0].actor).toEqual({ type: 'user', name: 'Test partner_staff' });
    expect(body.timeline[3].summary).toContain(fast.org.name);

    // In the same transaction: the deadline job (job outbox) and the e-mail to the lab's managers.
    const jobs = await db.query(`SELECT queue, data, start_after, singleton_key FROM job_outbox WHERE singleton_key = $1`, [body.offer!.id]);
    expect(jobs).toHaveLength(1);
    expect(jobs[0]).toMatchObject({ queue: 'offer-expire', data: expect.objectContaining({ offerId: body.offer!.id }) });
    expect(new Date(jobs[0].start_after).getTime()).toBe(new Date(body.offer!.deadline).getTime());
    const mail = await db.query(`SELECT template, subject, text_body FROM outbox_messages WHERE recipient = $1`, [fast.manager.email]);
    expect(mail).toHaveLength(1);
    expect(mail[0].template).toBe('lab_offer_new');
    expect(mail[0].subject).toContain(body.reference);
    expect(mail[0].text_body).toContain('answer');
  });

  it('defaults the origin to the shop and takes a given origin from its ZIP code', async () => {
    const shop = await makeShop();
    await makeLab({ skills: [{ skill: 'logical', turnaroundDays: 1 }] });
    const atShop = await request(app).post('/api/referrals').set(auth(shop.token)).send(deletedFiles());
    expect(atShop.status).toBe(201);
    expect(atShop.body.origin).toMatchObject({ line1: '1 Counter Street', postalCode: ZIP });

    const elsewhere = await request(app)
      .post('/api/referrals')
      .set(auth(shop.token))
      .send(deletedFiles({ origin: { line1: '9 Depot Lane', postalCode: '59801', country: 'US' } }));
    expect(elsewhere.status).toBe(201);
    const missoula = zipcodes.lookup('59801')!;
    expect(elsewhere.body.origin).toMatchObject({ line1: '9 Depot Lane', city: missoula.city, region: 'MT', location: { lat: missoula.latitude, lon: missoula.longitude } });
  });

  it('answers bad input with 400 naming each field, and writes nothing', async () => {
    const shop = await makeShop();
    await makeLab({ skills: [{ skill: 'logical', turnaroundDays: 1 }] });
    const before = await counts();
    const cases: [object, string[]][] = [
      [clickingDrive({ symptoms: ['grinding'] }), ['symptoms.0']],
      [clickingDrive({ device: { mediaType: 'floppy' } }), ['device.mediaType']],
      [clickingDrive({ customer: { email: 'not-an-address' } }), ['customer.name', 'customer.email']],
      [clickingDrive({ device: { mediaType: 'hdd_3_5', capacityGb: -1 } }), ['device.capacityGb']],
      [clickingDrive({ origin: { postalCode: '00000', country: 'US' } }), ['origin.postalCode']],
      [clickingDrive({ consent: undefined }), ['consent']],
      [clickingDrive({ priorities: [{ category: 'photos' }, { category: 'photos' }] }), ['priorities.1.category']],
      [clickingDrive({ device: { mediaType: 'raid_nas' } }), ['device.memberCount']],
    ];
    for (const [body, paths] of cases) {
      const res = await request(app).post('/api/referrals').set(auth(shop.token)).send(body);
      expect(res.status, JSON.stringify(body)).toBe(400);
      expect(res.body.error.code).toBe('validation_failed');
      expect(res.body.error.fields.map((f: { path: string }) => f.path).sort()).toEqual(expect.arrayContaining(paths));
    }
    expect(await counts()).toEqual(before);
  });

  it('keeps a case that no lab can take, for the network (needs_attention is not an error)', async () => {
    const shop = await makeShop();
    const res = await request(app)
      .post('/api/referrals')
      .set(auth(shop.token))
      .send(clickingDrive({ device: { mediaType: 'tape' }, symptoms: ['liquid_damage'], sensitivity: ['health_records'] }));
    expect(res.status).toBe(201);
    expect(res.body.status).toBe('needs_attention');
    expect(res.body.offer).toBeNull();
    expect(res.body.routing.candidates).toEqual([]);
    expect(res.body.attentionReason).toMatch(/^No lab can take this case now: /);
    expect(res.body.timeline.map((t: { kind: string }) => t.kind)).toEqual(['opened', 'triaged', 'routed', 'needs_attention']);
  });
});

describe('reading cases', () => {
  it("answers 404 for another shop's case and shows none of its data", async () => {
    const owner = await makeShop();
    const other = await makeShop();
    await makeLab({ skills: [{ skill: 'logical', turnaroundDays: 1 }] });
    const created = await request(app).post('/api/referrals').set(auth(owner.token)).send(deletedFiles({ customer: { name: 'Private Person', email: 'private@customer.test' } }));
    expect(created.status).toBe(201);

    const read = await request(app).get(`/api/referrals/${created.body.id}`).set(auth(other.token));
    expect(read.status).toBe(404);
    expect(JSON.stringify(read.body)).not.toContain('Private Person');
    const cancel = await request(app).delete(`/api/referrals/${created.body.id}`).set(auth(other.token));
    expect(cancel.status).toBe(404);
    const list = await request(app).get('/api/referrals').query({ q: 'Private Person' }).set(auth(other.token));
    expect(list.body.data).toEqual([]);

    const own = await request(app).get(`/api/referrals/${created.body.id}`).set(auth(owner.token));
    expect(own.status).toBe(200);
    expect(own.body.customer.name).toBe('Private Person');
  });

  it('lists the own cases newest first, page by page with a cursor, and finds them by reference or customer', async () => {
    const shop = await makeShop();
    const other = await makeShop();
    await makeLab({ skills: [{ skill: 'logical', turnaroundDays: 1 }] });
    const ids: string[] = [];
    const references: string[] = [];
    for (let i = 0; i < 5; i++) {
      const res = await request(app).post('/api/referrals').set(auth(shop.token)).send(deletedFiles({ customer: { name: `Customer ${i} Lindqvale`, email: `c${i}@customer.test` } }));
      expect(res.status).toBe(201);
      ids.push(res.body.id);
      references.push(res.body.reference);
    }
    await request(app).post('/api/referrals').set(auth(other.token)).send(deletedFiles());

    const seen: string[] = [];
    let cursor: string | null = null;
    let pages = 0;
    do {
      const res: request.Response = await request(app)
        .get('/api/referrals')
        .query({ limit: 2, ...(cursor ? { cursor } : {}) })
        .set(auth(shop.token));
      expect(res.status).toBe(200);
      const page = referralListDto.parse(res.body);
      expect(page.data.length).toBeLessThanOrEqual(2);
      seen.push(...page.data.map((r) => r.id));
      cursor = page.nextCursor;
      pages++;
    } while (cursor);
    expect(pages).toBe(3);
    expect(seen).toEqual([...ids].reverse());

    const byReference = await request(app).get('/api/referrals').query({ q: references[2].toLowerCase() }).set(auth(shop.token));
    expect(byReference.body.data.map((r: { id: string }) => r.id)).toEqual([ids[2]]);
    const byName = await request(app).get('/api/referrals').query({ q: 'customer 3 lindq' }).set(auth(shop.token));
    expect(byName.body.data.map((r: { id: string }) => r.id)).toEqual([ids[3]]);
    const offered = await request(app).get('/api/referrals').query({ status: 'offered' }).set(auth(shop.token));
    expect(offered.body.data).toHaveLength(5);
    const none = await request(app).get('/api/referrals').query({ status: 'cancelled' }).set(auth(shop.token));
    expect(none.body.data).toEqual([]);

    const badCursor = await request(app).get('/api/referrals').query({ cursor: 'bm90LWEtY3Vyc29y' }).set(auth(shop.token));
    expect(badCursor.status).toBe(400);
    expect(badCursor.body.error.fields[0].path).toBe('cursor');
  });
});

describe('DELETE /api/referrals/:id (cancel)', () => {
  it('cancels a case that has not shipped, withdraws its offer and tells the lab', async () => {
    const shop = await makeShop();
    const lab = await makeLab({ skills: [{ skill: 'logical', turnaroundDays: 1 }] });
    const created = await request(app).post('/api/referrals').set(auth(shop.token)).send(deletedFiles());
    expect(created.body.offer.labId).toBe(lab.org.id);

    const res = await request(app).delete(`/api/referrals/${created.body.id}`).set(auth(shop.token));

    expect(res.status).toBe(200);
    expect(res.body.status).toBe('cancelled');
    expect(res.body.offer).toMatchObject({ labId: lab.org.id, status: 'withdrawn' });
    expect(res.body.timeline.slice(-2).map((t: { kind: string }) => t.kind)).toEqual(['offer_withdrawn', 'cancelled']);
    const mail = await db.query(`SELECT template FROM outbox_messages WHERE recipient = $1 ORDER BY created_at`, [lab.manager.email]);
    expect(mail.map((m: { template: string }) => m.template)).toEqual(['lab_offer_new', 'lab_offer_withdrawn']);
    const pending = await request(app).get('/api/lab/offers').query({ status: 'pending' }).set(auth(lab.token));
    expect(pending.body.data).toEqual([]);

    const again = await request(app).delete(`/api/referrals/${created.body.id}`).set(auth(shop.token));
    expect(again.status).toBe(409);
  });

  it('refuses to cancel once a label has been issued', async () => {
    const shop = await makeShop();
    await makeLab({ skills: [{ skill: 'logical', turnaroundDays: 1 }] });
    const created = await request(app).post('/api/referrals').set(auth(shop.token)).send(deletedFiles());
    await db.query(`UPDATE referrals SET status = 'label_issued' WHERE id = $1`, [created.body.id]);
    const res = await request(app).delete(`/api/referrals/${created.body.id}`).set(auth(shop.token));
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(/label/);
    const [row] = await db.query(`SELECT status FROM referrals WHERE id = $1`, [created.body.id]);
    expect(row.status).toBe('label_issued');
  });
});

describe('POST /api/referrals/preview', () => {
  it('ranks the labs for the form and stores nothing', async () => {
    const shop = await makeShop();
    const lab = await makeLab({ skills: [{ skill: 'hdd_head_swap', turnaroundDays: 1 }], certificate: classFive(daysAgo(10)) });
    const before = await counts();
    const res = await request(app).post('/api/referrals/preview').set(auth(shop.token)).send({ device: { mediaType: 'hdd_2_5' }, symptoms: ['clicking'] });
    expect(res.status).toBe(200);
    const body = routingPreviewDto.parse(res.body);
    expect(body.triage.requiredSkills).toEqual(['hdd_head_swap']);
    expect(body.routing.candidates[0].labId).toBe(lab.org.id);
    expect(body.routing.offeredTo).toBeNull();
    expect(await counts()).toEqual(before);
  });
});

describe('createReferral (the service the partner API calls)', () => {
  it('opens one case per idempotency key and refuses the key with another body', async () => {
    const shop = await makeShop();
    await makeLab({ skills: [{ skill: 'logical', turnaroundDays: 1 }] });
    const ctx = { db, config };
    const who = { partnerOrganizationId: shop.org.id, actor: { type: 'api_key' as const, id: unique('key-'), name: 'Counter system key' } };
    const key = unique('idem-');
    const input = { ...deletedFiles(), consent: undefined, externalRef: 'TICKET-881' };

    const first = await createReferral(ctx, who, input, { idempotencyKey: key });
    const second = await createReferral(ctx, who, input, { idempotencyKey: key });

    expect(second.id).toBe(first.id);
    expect(first.consent).toBeNull();
    expect(first.timeline[0]).toMatchObject({ kind: 'opened', actor: { type: 'api_key', name: 'Counter system key' } });
    const [{ n }] = await db.query(`SELECT count(*)::int AS n FROM referrals WHERE partner_organization_id = $1`, [shop.org.id]);
    expect(n).toBe(1);
    await expect(createReferral(ctx, who, { ...input, externalRef: 'TICKET-882' }, { idempotencyKey: key })).rejects.toMatchObject({ status: 409 });
  });
});

describe('guard matrix: referral routes × every role', () => {
  const tokens = new Map<Role, string>();
  const missing = '00000000-0000-4000-8000-000000000000';
  // "pass": what the route answers once the guard lets the request through (400 for an empty body,
  // 404 for a case id that does not exist).
  const matrix: { method: 'get' | 'post' | 'delete'; path: string; body?: object; allowed: readonly Role[]; pass: number }[] = [
    { method: 'post', path: '/api/referrals', body: {}, allowed: ['partner_admin', 'partner_staff'], pass: 400 },
    { method: 'post', path: '/api/referrals/preview', body: {}, allowed: ['partner_admin', 'partner_staff'], pass: 400 },
    { method: 'get', path: '/api/referrals', allowed: ['partner_admin', 'partner_staff', 'network_admin'], pass: 200 },
    { method: 'get', path: `/api/referrals/${missing}`, allowed: ['partner_admin', 'partner_staff', 'network_admin'], pass: 404 },
    { method: 'delete', path: `/api/referrals/${missing}`, allowed: ['partner_admin', 'partner_staff', 'network_admin'], pass: 404 },
    { method: 'get', path: '/api/network/attention', allowed: ['network_admin'], pass: 200 },
    { method: 'post', path: `/api/network/referrals/${missing}/assign`, body: {}, allowed: ['network_admin'], pass: 400 },
  ];
  for (const route of matrix) {
    it(`${route.method.toUpperCase()} ${route.path} without a token answers 401`, async () => {
      const res = await request(app)[route.method](route.path).send(route.body);
      expect(res.status).toBe(401);
    });
    for (const role of roles) {
      const allowed = route.allowed.includes(role);
      it(`${route.method.toUpperCase()} ${route.path} as ${role} answers ${allowed ? route.pass : 403}`, async () => {
        if (!tokens.has(role)) tokens.set(role, (await signIn(app, demoAccounts.find((a) => a.role === role)!.email)).accessToken);
        const res = await request(app)[route.method](route.path).set(auth(tokens.get(role)!)).send(route.body);
        expect(res.status).toBe(allowed ? route.pass : 403);
        if (!allowed) expect(res.body.error.code).toBe('forbidden');
      });
    }
  }
});
