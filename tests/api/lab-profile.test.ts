import request from 'supertest';
import zipcodes from 'zipcodes';
import { afterEach, describe, expect, it } from 'vitest';
import { labProfileDto } from '@shared/schemas/labs';
import { roles, type Role } from '@shared/vocabulary';
import { demoAccounts } from '../../server/db/seed/demo-accounts';
import { Organization } from '../../server/organizations';
import { setupApi, signIn, unique } from '../support/api';
import { createOrganization, createUser, TEST_PASSWORD } from '../support/factories';

const { app, db } = await setupApi();

// Lab profiles: what routing reads about a lab, edited by its manager or by the network admin. This
// file's labs sit in Cheyenne, WY (ZIP 82001); each test stops its labs taking new cases when it ends.
const ZIP = '82001';
const place = zipcodes.lookup(ZIP)!;
const auth = (token: string) => ({ Authorization: `Bearer ${token}` });
const labsOfThisTest: string[] = [];
const adminToken = (await signIn(app, demoAccounts.find((a) => a.role === 'network_admin')!.email)).accessToken;

afterEach(async () => {
  await db.query(`UPDATE lab_profiles SET accepting_new_cases = false WHERE organization_id = ANY($1)`, [labsOfThisTest]);
  labsOfThisTest.length = 0;
});

async function newLab() {
  const org = await createOrganization(db, 'lab', unique('Test Lab '));
  const manager = await createUser(db, { role: 'lab_manager', organizationId: org.id });
  const { accessToken: token } = await signIn(app, manager.email, TEST_PASSWORD);
  labsOfThisTest.push(org.id);
  return { org, manager, token };
}

const profile = (overrides: Record<string, unknown> = {}) => ({
  address: { line1: '300 Clean Room Way', postalCode: ZIP, country: 'US' },
  timeZone: 'America/Denver',
  businessHours: { opensAt: '08:30', closesAt: '17:30', workdays: [1, 2, 3, 4, 5], holidayCountry: 'US', holidayRegion: 'WY' },
  mediaTypes: ['hdd_3_5', 'hdd_2_5', 'ssd_sata'],
  skills: [
    { skill: 'logical', turnaroundDays: 2 },
    { skill: 'hdd_head_swap', turnaroundDays: 6 },
  ],
  weeklyThroughput: 8,
  queueCapacity: 24,
  healthDataAgreement: { signed: true },
  acceptingNewCases: true,
  autoAcceptRules: [{ skills: ['logical'], maxDistanceKm: 800 }],
  ...overrides,
});

const isoDate = (d: Date) => d.toISOString().slice(0, 10);
const daysAgo = (n: number) => isoDate(new Date(Date.now() - n * 86_400_000));
const certificate = (testedOn: string, perM3At05 = 900) => ({
  testedOn,
  areaName: 'Bench A',
  areaM2: 1.5,
  samples: [
    { location: 'L1', sizeUm: 0.5, perM3: perM3At05, volumeLitres: 28.3 },
    { location: 'L1', sizeUm: 1, perM3: Math.round(perM3At05 / 4), volumeLitres: 28.3 },
    { location: 'L1', sizeUm: 5, perM3: Math.round(perM3At05 / 400), volumeLitres: 28.3 },
  ],
});

describe('GET/PUT /api/lab/profile', () => {
  it('starts unconfigured, then stores the profile with coordinates from the ZIP code', async () => {
    const lab = await newLab();
    const empty = await request(app).get('/api/lab/profile').set(auth(lab.token));
    expect(empty.status).toBe(200);
    expect(empty.body).toMatchObject({ labId: lab.org.id, configured: false, acceptingNewCases: false, skills: [], cleanAir: { latest: null, history: [] } });

    const res = await request(app).put('/api/lab/profile').set(auth(lab.token)).send(profile());

    expect(res.status).toBe(200);
    const body = labProfileDto.parse(res.body);
    expect(body).toMatchObject({
      configured: true,
      address: { line1: '300 Clean Room Way', city: place.city, region: 'WY', postalCode: ZIP, country: 'US' },
      location: { lat: place.latitude, lon: place.longitude },
      timeZone: 'America/Denver',
      businessHours: { opensAt: '08:30', closesAt: '17:30', workdays: [1, 2, 3, 4, 5], holidayCountry: 'US', holidayRegion: 'WY' },
      weeklyThroughput: 8,
      queueCapacity: 24,
      openCases: 0,
      acceptingNewCases: true,
      autoAcceptRules: [{ skills: ['logical'], maxDistanceKm: 800 }],
    });
    expect(body.healthDataAgreement.signed).toBe(true);
    const signedAt = body.healthDataAgreement.signedAt;
    expect(signedAt).not.toBeNull();

    // Saving again keeps the date the agreement was signed; withdrawing it clears it.
    const again = await request(app).put('/api/lab/profile').set(auth(lab.token)).send(profile({ weeklyThroughput: 9 }));
    expect(again.body.healthDataAgreement.signedAt).toBe(signedAt);
    const withdrawn = await request(app).put('/api/lab/profile').set(auth(lab.token)).send(profile({ healthDataAgreement: { signed: false } }));
    expect(withdrawn.body.healthDataAgreement).toEqual({ signed: false, signedAt: null });

    const audit = await db.query(`SELECT action, details FROM audit_events WHERE target_id = $1 ORDER BY at`, [lab.org.id]);
    expect(audit.map((a: { action: string }) => a.action)).toEqual(['lab_profile.created', 'lab_profile.updated', 'lab_profile.updated']);
    expect(audit[2].details).toMatchObject({ healthDataAgreement: false, healthDataAgreementChanged: true });
  });

  it('answers bad values with 400 naming each field, and keeps the stored profile', async () => {
    const lab = await newLab();
    await request(app).put('/api/lab/profile').set(auth(lab.token)).send(profile());
    const before = (await request(app).get('/api/lab/profile').set(auth(lab.token))).body;

    const cases: [Record<string, unknown>, string][] = [
      [profile({ address: { postalCode: '00000', country: 'US' } }), 'address.postalCode'],
      [profile({ queueCapacity: -1 }), 'queueCapacity'],
      [profile({ queueCapacity: 2.5 }), 'queueCapacity'],
      [profile({ weeklyThroughput: -2 }), 'weeklyThroughput'],
      [profile({ skills: [{ skill: 'welding', turnaroundDays: 3 }] }), 'skills.0.skill'],
      [profile({ skills: [{ skill: 'logical', turnaroundDays: 0 }] }), 'skills.0.turnaroundDays'],
      [profile({ mediaTypes: ['floppy'] }), 'mediaTypes.0'],
      [profile({ timeZone: 'Mars/Olympus_Mons' }), 'timeZone'],
      [profile({ businessHours: { opensAt: '17:00', closesAt: '09:00', workdays: [1, 2, 3, 4, 5] } }), 'businessHours.closesAt'],
      [profile({ businessHours: { opensAt: '09:00', closesAt: '17:00', workdays: [1, 2, 3, 4, 5], holidayCountry: 'US', holidayRegion: 'ZZ' } }), 'businessHours.holidayRegion'],
      [profile({ autoAcceptRules: [{ skills: ['ssd_controller'], maxDistanceKm: 100 }] }), 'autoAcceptRules.0.skills.0'],
      [profile({ autoAcceptRules: [{ skills: ['logical'], maxDistanceKm: -5 }] }), 'autoAcceptRules.0.maxDistanceKm'],
    ];
    for (const [body, path] of cases) {
      const res = await request(app).put('/api/lab/profile').set(auth(lab.token)).send(body);
      expect(res.status, path).toBe(400);
      expect(res.body.error.fields.map((f: { path: string }) => f.path)).toContain(path);
    }
    const missing = await request(app).put('/api/lab/profile').set(auth(lab.token)).send({});
    expect(missing.status).toBe(400);
    expect(missing.body.error.fields.map((f: { path: string }) => f.path)).toEqual(
      expect.arrayContaining(['address', 'timeZone', 'businessHours', 'mediaTypes', 'skills', 'weeklyThroughput', 'queueCapacity', 'acceptingNewCases']),
    );
    expect((await request(app).get('/api/lab/profile').set(auth(lab.token))).body).toEqual(before);
  });

  it('counts open cases from the cases the lab holds, not from a stored number', async () => {
    const lab = await newLab();
    await request(app).put('/api/lab/profile').set(auth(lab.token)).send(profile({ skills: [{ skill: 'logical', turnaroundDays: 1 }], autoAcceptRules: [{ skills: ['logical'], maxDistanceKm: 10 }] }));
    const shop = await db.getRepository(Organization).save({
      kind: 'partner',
      name: unique('Test Shop '),
      slug: unique('shop-'),
      postalCode: ZIP,
      city: place.city,
      region: place.state,
      country: 'US',
      lat: place.latitude,
      lon: place.longitude,
    });
    const staff = await createUser(db, { role: 'partner_staff', organizationId: shop.id });
    const shopToken = (await signIn(app, staff.email, TEST_PASSWORD)).accessToken;

    const created = await request(app)
      .post('/api/referrals')
      .set(auth(shopToken))
      .send({ customer: { name: 'Bo Lindahl', email: 'bo@customer.test' }, device: { mediaType: 'hdd_2_5' }, symptoms: ['formatted'], consent: { accepted: true } });
    expect(created.body).toMatchObject({ status: 'accepted', lab: { id: lab.org.id } });
    expect((await request(app).get('/api/lab/profile').set(auth(lab.token))).body.openCases).toBe(1);

    await request(app).delete(`/api/referrals/${created.body.id}`).set(auth(shopToken));
    expect((await request(app).get('/api/lab/profile').set(auth(lab.token))).body.openCases).toBe(0);
  });
});

describe('POST /api/lab/profile/certificates', () => {
  it('works out the ISO 14644-1 class and the re-test date, keeps the history and uses the latest test', async () => {
    const lab = await newLab();
    await request(app).put('/api/lab/profile').set(auth(lab.token)).send(profile());

    // ISO 14644-1:2015 Table 1: class 5 allows 3 520/m³ at 0.5 µm and 832 at 1 µm; 900 and 225 pass.
    // Re-test within 6 months for class 5 (ISO 14644-2:2015, from memory); 31 Aug + 6 months clamps to 28 Feb.
    const old = await request(app).post('/api/lab/profile/certificates').set(auth(lab.token)).send(certificate('2025-08-31'));
    expect(old.status).toBe(201);
    expect(old.body).toMatchObject({ testedOn: '2025-08-31', isoClass: 5, validUntil: '2026-02-28', areaName: 'Bench A', problems: [] });

    // Class 7: 0.5 µm 120 000/m³ is over class 6 (35 200) and within class 7 (352 000); 12-month interval.
    const seven = await request(app).post('/api/lab/profile/certificates').set(auth(lab.token)).send(certificate('2025-09-30', 120_000));
    expect(seven.body).toMatchObject({ isoClass: 7, validUntil: '2026-09-30' });

    const recent = await request(app).post('/api/lab/profile/certificates').set(auth(lab.token)).send(certificate(daysAgo(20)));
    expect(recent.body).toMatchObject({ isoClass: 5, current: true });
    // Recorded later but tested earlier: history keeps it, the latest test still counts.
    await request(app).post('/api/lab/profile/certificates').set(auth(lab.token)).send(certificate('2025-03-15'));

    const read = await request(app).get('/api/lab/profile').set(auth(lab.token));
    expect(read.body.cleanAir.latest.id).toBe(recent.body.id);
    expect(read.body.cleanAir.history.map((c: { testedOn: string }) => c.testedOn)).toEqual([daysAgo(20), '2025-09-30', '2025-08-31', '2025-03-15']);
    const summary = (await request(app).get('/api/network/labs').set(auth(adminToken))).body.find((l: { id: string }) => l.id === lab.org.id);
    expect(summary.cleanAir).toMatchObject({ isoClass: 5, testedOn: daysAgo(20), current: true });
  });

  it('refuses a test date in the future and sizes outside ISO 14644-1, and records counts that rise with size as unusable', async () => {
    const lab = await newLab();
    await request(app).put('/api/lab/profile').set(auth(lab.token)).send(profile());
    const future = await request(app).post('/api/lab/profile/certificates').set(auth(lab.token)).send(certificate(isoDate(new Date(Date.now() + 3 * 86_400_000))));
    expect(future.status).toBe(400);
    expect(future.body.error.fields[0].path).toBe('testedOn');
    const tooBig = await request(app)
      .post('/api/lab/profile/certificates')
      .set(auth(lab.token))
      .send({ ...certificate(daysAgo(5)), samples: [{ location: 'L1', sizeUm: 10, perM3: 3 }] });
    expect(tooBig.status).toBe(400);
    expect(tooBig.body.error.fields[0].path).toBe('samples.0.sizeUm');

    // Counts are cumulative (≥ size), so more particles at 1 µm than at 0.5 µm is a data error.
    const rising = await request(app)
      .post('/api/lab/profile/certificates')
      .set(auth(lab.token))
      .send({ ...certificate(daysAgo(5)), samples: [{ location: 'L1', sizeUm: 0.5, perM3: 100 }, { location: 'L1', sizeUm: 1, perM3: 400 }] });
    expect(rising.status).toBe(201);
    expect(rising.body.isoClass).toBeNull();
    expect(rising.body.validUntil).toBeNull();
    expect(rising.body.problems[0]).toMatch(/cumulative/);
  });
});

describe('/api/network/labs/:id (onboarding and editing by the network admin)', () => {
  it('lets the network admin set up a lab that has no profile yet, audited as the network', async () => {
    const org = await createOrganization(db, 'lab', unique('Onboarded Lab '));
    labsOfThisTest.push(org.id);
    const before = await request(app).get(`/api/network/labs/${org.id}`).set(auth(adminToken));
    expect(before.body.configured).toBe(false);

    const res = await request(app).put(`/api/network/labs/${org.id}`).set(auth(adminToken)).send(profile());
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ labId: org.id, configured: true, location: { lat: place.latitude, lon: place.longitude } });
    const cert = await request(app).post(`/api/network/labs/${org.id}/certificates`).set(auth(adminToken)).send(certificate(daysAgo(3)));
    expect(cert.status).toBe(201);
    const [audit] = await db.query(`SELECT details FROM audit_events WHERE target_id = $1 AND action = 'lab_profile.created'`, [org.id]);
    expect(audit.details.byNetwork).toBe(true);

    const partner = await createOrganization(db, 'partner');
    expect((await request(app).get(`/api/network/labs/${partner.id}`).set(auth(adminToken))).status).toBe(404);
    expect((await request(app).put(`/api/network/labs/${partner.id}`).set(auth(adminToken)).send(profile())).status).toBe(404);
  });
});

describe('guard matrix: lab profile and network lab routes × every role', () => {
  const tokens = new Map<Role, string>();
  const missing = '00000000-0000-4000-8000-000000000000';
  const quillmark = async () => (await db.query(`SELECT id FROM organizations WHERE slug = 'quillmark'`))[0].id as string;
  // The guard lets lab managers and network admins at /api/lab/profile; the network admin's organisation
  // is no lab, so the service refuses with 403 as well.
  const matrix: { method: 'get' | 'put' | 'post'; path: string | (() => Promise<string>); body?: object; allowed: readonly Role[]; pass: number }[] = [
    { method: 'get', path: '/api/lab/profile', allowed: ['lab_manager'], pass: 200 },
    { method: 'put', path: '/api/lab/profile', body: {}, allowed: ['lab_manager'], pass: 400 },
    { method: 'post', path: '/api/lab/profile/certificates', body: {}, allowed: ['lab_manager'], pass: 400 },
    { method: 'get', path: '/api/network/labs', allowed: ['network_admin'], pass: 200 },
    { method: 'get', path: async () => `/api/network/labs/${await quillmark()}`, allowed: ['network_admin'], pass: 200 },
    { method: 'put', path: `/api/network/labs/${missing}`, body: {}, allowed: ['network_admin'], pass: 400 },
    { method: 'post', path: `/api/network/labs/${missing}/certificates`, body: {}, allowed: ['network_admin'], pass: 400 },
  ];
  for (const route of matrix) {
    const label = typeof route.path === 'string' ? route.path : '/api/network/labs/:quillmark';
    it(`${route.method.toUpperCase()} ${label} without a token answers 401`, async () => {
      const path = typeof route.path === 'string' ? route.path : await route.path();
      expect((await request(app)[route.method](path).send(route.body)).status).toBe(401);
    });
    for (const role of roles) {
      const ok = route.allowed.includes(role);
      it(`${route.method.toUpperCase()} ${label} as ${role} answers ${ok ? route.pass : 403}`, async () => {
        if (!tokens.has(role)) tokens.set(role, (await signIn(app, demoAccounts.find((a) => a.role === role)!.email)).accessToken);
        const path = typeof route.path === 'string' ? route.path : await route.path();
        const res = await request(app)[route.method](path).set(auth(tokens.get(role)!)).send(route.body);
        expect(res.status).toBe(ok ? route.pass : 403);
        if (!ok) expect(res.body.error.code).toBe('forbidden');
      });
    }
  }
});
