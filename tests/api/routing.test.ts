import request from 'supertest';
import zipcodes from 'zipcodes';
import { describe, expect, it } from 'vitest';
import { geodesicDistanceKm } from '@shared/domain/geo';
import { attentionListDto, labSummaryDto } from '@shared/schemas/labs';
import { demoAccounts } from '../../server/db/seed/demo-accounts';
import { listAttention } from '../../server/referrals/service';
import { setupApi, signIn } from '../support/api';
import { statementsOf } from '../support/statements';
import { createOrganization } from '../support/factories';
import { classFive, daysAgo, testNetwork } from '../support/network';

const ctx = await setupApi();
const { app, db, config } = ctx;

// Capability routing as the API shows it: which labs qualify, in which order, why the others do not,
// automatic acceptance, and the network admin's queue for cases no lab takes. This file's shops and labs
// sit in Fargo, ND (ZIP 58102), far from the other files' and the demo network's; its labs answer in one
// to three business days so that they rank first here. Each test stops its labs taking new cases.
const ZIP = '58102';
const { place, makeShop, makeLab } = testNetwork(ctx, { zip: ZIP, timeZone: 'America/Chicago', holidayRegion: 'ND' });
const auth = (token: string) => ({ Authorization: `Bearer ${token}` });
const adminToken = (await signIn(app, demoAccounts.find((a) => a.role === 'network_admin')!.email)).accessToken;

/** ISO class 7: 0.5 µm 120 000/m³ is over the class 6 limit (35 200) and within class 7 (352 000). */
const classSeven = (testedOn: string) => ({
  testedOn,
  areaName: 'Open bench',
  areaM2: 1.5,
  samples: [
    { location: 'L1', sizeUm: 0.5, perM3: 120_000, volumeLitres: 28.3 },
    { location: 'L1', sizeUm: 1, perM3: 30_000, volumeLitres: 28.3 },
    { location: 'L1', sizeUm: 5, perM3: 900, volumeLitres: 28.3 },
  ],
});

const kase = (overrides: Record<string, unknown> = {}) => ({
  customer: { name: 'Ansel Varga-Moreau', email: 'ansel@customer.test' },
  device: { mediaType: 'hdd_3_5', capacityGb: 2000 },
  symptoms: ['clicking'],
  sensitivity: [],
  consent: { accepted: true },
  ...overrides,
});

describe('ranking and exclusions', () => {
  it('ranks qualifying labs by estimated days and names every excluded lab with its reason', async () => {
    const shop = await makeShop();
    const best = await makeLab({ certificate: classFive(daysAgo(20)) });
    const slower = await makeLab({ skills: [{ skill: 'hdd_head_swap', turnaroundDays: 3 }], certificate: classFive(daysAgo(20)) });
    const nearby = await makeLab({ zip: '56560', skills: [{ skill: 'hdd_head_swap', turnaroundDays: 1 }], certificate: classFive(daysAgo(20)) });
    const expired = await makeLab({ certificate: classFive(daysAgo(250)) });
    const dusty = await makeLab({ certificate: classSeven(daysAgo(20)) });
    const noCertificate = await makeLab();
    const noSkill = await makeLab({ skills: [{ skill: 'logical', turnaroundDays: 1 }] });
    const noMedia = await makeLab({ mediaTypes: ['usb_flash'], certificate: classFive(daysAgo(20)) });
    const full = await makeLab({ certificate: classFive(daysAgo(20)), profile: { queueCapacity: 0 } });
    const closed = await makeLab({ certificate: classFive(daysAgo(20)), profile: { acceptingNewCases: false } });

    const res = await request(app).post('/api/referrals').set(auth(shop.token)).send(kase());
    expect(res.status).toBe(201);
    const { candidates, excluded } = res.body.routing as {
      candidates: { labId: string; estimatedDays: number; distanceKm: number; zone: number; transitDays: number; reasons: string[] }[];
      excluded: { labId: string; reasons: { code: string; message: string }[] }[];
    };

    const days = candidates.map((c) => c.estimatedDays);
    expect(days).toEqual([...days].sort((a, b) => a - b));
    expect(candidates[0].labId).toBe(best.org.id);
    // Same estimate (1 + 0 + 1 days), ties go to the nearer lab: Moorhead, MN is across the river.
    expect(candidates[1].labId).toBe(nearby.org.id);
    expect(candidates[1].reasons.at(-1)).toMatch(/ties go to the nearer lab/);
    expect(candidates.map((c) => c.labId)).toContain(slower.org.id);
    expect(candidates.find((c) => c.labId === slower.org.id)!.estimatedDays).toBe(4);

    // Distance: geodesic on WGS-84 (geographiclib, Karney 2013) between the ZIP centroids, rounded to 0.1 km;
    // zone 1 is up to 50 miles (carrier-style zone table, from memory), one ground day.
    const moorhead = zipcodes.lookup('56560')!;
    const km = geodesicDistanceKm({ lat: place.latitude, lon: place.longitude }, { lat: moorhead.latitude, lon: moorhead.longitude });
    expect(candidates[1]).toMatchObject({ distanceKm: Math.round(km * 10) / 10, zone: 1, transitDays: 1 });
    expect(candidates[0].reasons[0]).toBe('About 2 business days until the customer has data.');

    const reasonOf = (id: string) => excluded.find((e) => e.labId === id)?.reasons.map((r) => r.code);
    expect(reasonOf(expired.org.id)).toEqual(['clean_air_expired']);
    expect(reasonOf(dusty.org.id)).toEqual(['clean_air_class']);
    expect(reasonOf(noCertificate.org.id)).toEqual(['clean_air_missing']);
    expect(reasonOf(noSkill.org.id)).toEqual(['missing_skills']);
    expect(reasonOf(noMedia.org.id)).toEqual(['media_type']);
    expect(reasonOf(full.org.id)).toEqual(['queue_full']);
    expect(reasonOf(closed.org.id)).toEqual(['not_accepting']);
    expect(excluded.find((e) => e.labId === dusty.org.id)!.reasons[0].message).toMatch(/ISO class 7/);

    // The snapshot is stored with the case: the same ranking, read back later.
    const [snapshot] = await db.query(`SELECT trigger, candidates, excluded FROM routing_snapshots WHERE referral_id = $1`, [res.body.id]);
    expect(snapshot.trigger).toBe('intake');
    expect(snapshot.candidates.map((c: { labId: string }) => c.labId)).toEqual(candidates.map((c) => c.labId));
  });

  it('offers health records only to labs that signed the health-data agreement', async () => {
    const shop = await makeShop();
    const unsigned = await makeLab({ skills: [{ skill: 'logical', turnaroundDays: 1 }] });
    const signed = await makeLab({ skills: [{ skill: 'logical', turnaroundDays: 2 }], profile: { healthDataAgreement: { signed: true } } });

    const res = await request(app)
      .post('/api/referrals')
      .set(auth(shop.token))
      .send(kase({ device: { mediaType: 'usb_flash' }, symptoms: ['deleted_files'], sensitivity: ['health_records'] }));

    expect(res.status).toBe(201);
    expect(res.body.triage.needsHealthDataAgreement).toBe(true);
    expect(res.body.offer.labId).toBe(signed.org.id);
    expect(res.body.routing.excluded.find((e: { labId: string }) => e.labId === unsigned.org.id).reasons.map((r: { code: string }) => r.code)).toEqual([
      'health_data_agreement',
    ]);
  });
});

describe('auto-accept rules', () => {
  it('accepts at once, without a person, when every required skill is in the rule and the shop is close enough', async () => {
    const shop = await makeShop();
    const lab = await makeLab({ skills: [{ skill: 'logical', turnaroundDays: 1 }], profile: { autoAcceptRules: [{ skills: ['logical'], maxDistanceKm: 50 }] } });

    const res = await request(app).post('/api/referrals').set(auth(shop.token)).send(kase({ device: { mediaType: 'usb_flash' }, symptoms: ['deleted_files'] }));

    expect(res.status).toBe(201);
    expect(res.body.status).toBe('accepted');
    expect(res.body.lab).toEqual({ id: lab.org.id, name: lab.org.name });
    expect(res.body.offer).toMatchObject({ labId: lab.org.id, status: 'accepted', autoAccepted: true });
    expect(res.body.timeline.slice(-2).map((t: { kind: string; actor: { name: string } }) => [t.kind, t.actor.name])).toEqual([
      ['offered', 'Platterpost routing'],
      ['offer_accepted', 'system (auto-accept rule)'],
    ]);
    // No deadline to watch: nothing waits for the lab.
    expect(await db.query(`SELECT 1 FROM job_outbox WHERE singleton_key = $1`, [res.body.offer.id])).toEqual([]);
    expect(await db.query(`SELECT template FROM outbox_messages WHERE recipient = $1`, [shop.user.email])).toEqual([{ template: 'referral_accepted' }]);
    expect(await db.query(`SELECT template FROM outbox_messages WHERE recipient = $1`, [lab.manager.email])).toEqual([{ template: 'lab_case_auto_accepted' }]);
  });

  it('leaves the offer for a person when a required skill is outside the rule or the shop is too far', async () => {
    const near = await makeShop();
    const far = await makeShop({ zip: '58501' }); // Bismarck, ND: about 300 km west
    await makeLab({
      skills: [{ skill: 'logical', turnaroundDays: 1 }, { skill: 'encrypted_volumes', turnaroundDays: 1 }],
      profile: { autoAcceptRules: [{ skills: ['logical'], maxDistanceKm: 50 }] },
    });

    const encrypted = await request(app).post('/api/referrals').set(auth(near.token)).send(kase({ device: { mediaType: 'usb_flash' }, symptoms: ['deleted_files', 'encrypted'] }));
    expect(encrypted.body.triage.requiredSkills).toEqual(['logical', 'encrypted_volumes']);
    expect(encrypted.body.status).toBe('offered');
    expect(encrypted.body.offer.autoAccepted).toBe(false);

    const distant = await request(app).post('/api/referrals').set(auth(far.token)).send(kase({ device: { mediaType: 'usb_flash' }, symptoms: ['deleted_files'] }));
    expect(distant.body.routing.candidates[0].distanceKm).toBeGreaterThan(50);
    expect(distant.body.status).toBe('offered');
  });
});

describe('the network admin’s attention queue', () => {
  it('keeps a case no lab can take with its reason and current ranking; the admin routes it by hand, audited', async () => {
    const shop = await makeShop();
    await makeLab({ skills: [{ skill: 'tape', turnaroundDays: 1 }] });
    const created = await request(app)
      .post('/api/referrals')
      .set(auth(shop.token))
      .send(kase({ device: { mediaType: 'tape' }, symptoms: ['liquid_damage'] }));
    expect(created.body.status).toBe('needs_attention');
    expect(created.body.attentionReason).toMatch(/lacks? a required skill/);

    // A lab that can do it joins; the queue shows it beside the case.
    const wet = await makeLab({ skills: [{ skill: 'tape', turnaroundDays: 2 }, { skill: 'liquid_remediation', turnaroundDays: 2 }] });
    const queue = await request(app).get('/api/network/attention').set(auth(adminToken));
    expect(queue.status).toBe(200);
    attentionListDto.parse(queue.body);
    const item = queue.body.data.find((i: { referral: { id: string } }) => i.referral.id === created.body.id);
    expect(item).toMatchObject({ attentionReason: created.body.attentionReason, requiredSkills: ['tape', 'liquid_remediation'], previousOffers: [] });
    expect(item.ranking.candidates[0].labId).toBe(wet.org.id);

    const assigned = await request(app)
      .post(`/api/network/referrals/${created.body.id}/assign`)
      .set(auth(adminToken))
      .send({ labId: wet.org.id, note: 'Spoke to their manager by phone' });

    expect(assigned.status).toBe(200);
    expect(assigned.body).toMatchObject({ status: 'offered', attentionReason: null, offer: { labId: wet.org.id, status: 'pending' } });
    expect(assigned.body.timeline.slice(-2).map((t: { kind: string }) => t.kind)).toEqual(['assigned', 'offered']);
    expect(assigned.body.timeline.at(-2).summary).toContain('Spoke to their manager by phone');
    const audit = await db.query(`SELECT action, actor_user_id, details FROM audit_events WHERE target_id = $1`, [created.body.id]);
    expect(audit).toHaveLength(1);
    expect(audit[0]).toMatchObject({ action: 'referral.assigned', details: expect.objectContaining({ labId: wet.org.id }) });
    const after = await request(app).get('/api/network/attention').set(auth(adminToken));
    expect(after.body.data.map((i: { referral: { id: string } }) => i.referral.id)).not.toContain(created.body.id);
  });

  it('reads the queue in the same statements however many cases wait', async () => {
    const shop = await makeShop();
    const open = () => request(app).post('/api/referrals').set(auth(shop.token)).send(kase({ device: { mediaType: 'tape' }, symptoms: ['liquid_damage'] }));
    const mine = [(await open()).body.id, (await open()).body.id, (await open()).body.id] as string[];
    const { result, statements } = await statementsOf(() => listAttention({ config, db }));
    expect(result.data.map((i) => i.referral.id)).toEqual(expect.arrayContaining(mine));
    // One each for the offers, the timeline, the open lab transfers and the labs' open cases, whatever the count.
    // (A reload of the labs themselves, after another file changed one, is not counted: it reads lab_profiles.)
    const touching = (table: string) => statements.filter((s) => s.includes(table) && !s.includes('lab_profiles')).length;
    expect(result.data.length).toBeGreaterThanOrEqual(3);
    expect([touching('lab_offers'), touching('referral_timeline'), touching('lab_transfers'), touching('lab_directory_version')]).toEqual([1, 1, 1, 1]);
    for (const id of mine) await db.query(`UPDATE referrals SET status = 'cancelled', cancelled_at = now() WHERE id = $1`, [id]);
  });

  it('refuses to assign a lab without a profile, or a case that a lab has already accepted', async () => {
    const shop = await makeShop();
    await makeLab({ skills: [{ skill: 'logical', turnaroundDays: 1 }], profile: { autoAcceptRules: [{ skills: ['logical'], maxDistanceKm: 10 }] } });
    const bare = await createOrganization(db, 'lab');
    const accepted = await request(app).post('/api/referrals').set(auth(shop.token)).send(kase({ device: { mediaType: 'usb_flash' }, symptoms: ['deleted_files'] }));
    expect(accepted.body.status).toBe('accepted');

    const stranded = await request(app).post('/api/referrals').set(auth(shop.token)).send(kase({ device: { mediaType: 'tape' }, symptoms: ['liquid_damage'] }));
    const noProfile = await request(app).post(`/api/network/referrals/${stranded.body.id}/assign`).set(auth(adminToken)).send({ labId: bare.id });
    expect(noProfile.status).toBe(400);
    expect(noProfile.body.error.fields[0].path).toBe('labId');

    const taken = await request(app).post(`/api/network/referrals/${accepted.body.id}/assign`).set(auth(adminToken)).send({ labId: accepted.body.lab.id });
    expect(taken.status).toBe(409);
  });
});

describe('GET /api/network/labs (the admin map)', () => {
  it('lists labs with class, queue, skills and location, filtered by skill', async () => {
    const mechanical = await makeLab({ certificate: classFive(daysAgo(20)) });
    const logical = await makeLab({ skills: [{ skill: 'logical', turnaroundDays: 1 }] });

    const all = await request(app).get('/api/network/labs').set(auth(adminToken));
    expect(all.status).toBe(200);
    const row = labSummaryDto.parse(all.body.find((l: { id: string }) => l.id === mechanical.org.id));
    expect(row).toMatchObject({
      configured: true,
      acceptingNewCases: true,
      location: { lat: place.latitude, lon: place.longitude },
      skills: [{ skill: 'hdd_head_swap', turnaroundDays: 1 }],
      openCases: 0,
      queueCapacity: 20,
      cleanAir: { isoClass: 5, current: true },
    });
    expect(all.body.map((l: { id: string }) => l.id)).toContain(logical.org.id);

    const filtered = await request(app).get('/api/network/labs').query({ skill: 'hdd_head_swap' }).set(auth(adminToken));
    const ids = filtered.body.map((l: { id: string }) => l.id);
    expect(ids).toContain(mechanical.org.id);
    expect(ids).not.toContain(logical.org.id);
    for (const l of filtered.body) expect(l.skills.map((s: { skill: string }) => s.skill)).toContain('hdd_head_swap');

    const bad = await request(app).get('/api/network/labs').query({ skill: 'soldering' }).set(auth(adminToken));
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields[0].path).toBe('skill');
  });
});
