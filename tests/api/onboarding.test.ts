import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { onboardedOrganizationDto, organizationDto } from '@shared/schemas/organizations';
import { lookupPostalCode } from '../../server/routing';
import { linkToken, setupApi, signIn, unique, waitForMail } from '../support/api';
import { createOrganization, createUser, TEST_PASSWORD } from '../support/factories';
import { bearer, testNetwork } from '../support/network';

// The network admin adds a shop or a lab and invites the person who runs it; the lab is not routed to
// until its profile says what it can do. The admin can switch either off and on again. Every refusal
// writes nothing. This file's shops and labs sit in Jackson, WY (ZIP 83001).
const { app, db } = await setupApi({}, { workers: { mail: true } });

async function networkAdmin() {
  const org = await createOrganization(db, 'network');
  const admin = await createUser(db, { role: 'network_admin', organizationId: org.id });
  return { ...admin, token: (await signIn(app, admin.email, TEST_PASSWORD)).accessToken };
}

const onboard = (token: string, body: unknown) => request(app).post('/api/network/organizations').set('Authorization', `Bearer ${token}`).send(body as object);

const counts = async (name: string, email: string) => {
  const [row]: { orgs: string; users: string }[] = await db.query(
    `SELECT (SELECT count(*) FROM organizations WHERE name = $1) AS orgs, (SELECT count(*) FROM users WHERE email = $2) AS users`,
    [name, email],
  );
  return { orgs: Number(row!.orgs), users: Number(row!.users) };
};

describe('POST /api/network/organizations', () => {
  it('adds a lab placed by its ZIP code, invites its manager, and leaves it out of routing until it is set up', async () => {
    const admin = await networkAdmin();
    const name = unique('Lab ');
    const email = `${unique('manager')}@test.example`;
    const res = await onboard(admin.token, {
      kind: 'lab',
      name,
      phone: '+1 307 555 0100',
      address: { line1: '200 W 17th St', postalCode: '83001', country: 'US' },
      timeZone: 'America/Denver',
      admin: { name: 'Casey Newlab', email },
    });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const body = onboardedOrganizationDto.parse(res.body);
    const place = lookupPostalCode('83001', 'US')!;
    expect(body.organization).toMatchObject({ kind: 'lab', name, address: { city: place.city, region: place.region, postalCode: '83001' }, location: { lat: place.lat, lon: place.lon } });
    expect(body.admin).toMatchObject({ email, role: 'lab_manager', status: 'invited' });

    const listed = await request(app).get('/api/network/labs').set('Authorization', `Bearer ${admin.token}`);
    expect(listed.body.find((l: { id: string }) => l.id === body.organization.id)).toMatchObject({ configured: false });
    // A shop next door is not offered to it: it has said nothing yet of what it can do.
    const shop = await createOrganization(db, 'partner');
    const staff = await createUser(db, { role: 'partner_staff', organizationId: shop.id });
    const preview = await request(app)
      .post('/api/referrals/preview')
      .set('Authorization', `Bearer ${(await signIn(app, staff.email, TEST_PASSWORD)).accessToken}`)
      .send({ device: { mediaType: 'usb_flash' }, symptoms: ['deleted_files'], origin: { postalCode: '83001', country: 'US' } });
    expect(preview.status, JSON.stringify(preview.body)).toBe(200);
    expect(preview.body.routing.candidates.map((c: { labId: string }) => c.labId)).not.toContain(body.organization.id);
    expect(preview.body.routing.excluded.find((e: { labId: string }) => e.labId === body.organization.id)).toMatchObject({ reasons: [{ code: 'not_configured' }] });

    const [audit]: { n: string }[] = await db.query(`SELECT count(*) AS n FROM audit_events WHERE action = 'organization.onboarded' AND target_id = $1 AND actor_user_id = $2`, [body.organization.id, admin.id]);
    expect(Number(audit!.n)).toBe(1);

    // The manager joins from the e-mail and lands in the new lab.
    const mail = await waitForMail(email, (m) => m.subject.includes('invited'));
    expect(mail.text).toContain(name);
    const token = linkToken(mail.text, '/accept-invitation');
    const accepted = await request(app).post('/api/auth/invitations/accept').send({ token, name: 'Casey Newlab', password: 'caseys-own-passphrase' });
    expect(accepted.status).toBe(200);
    expect(accepted.body.user).toMatchObject({ role: 'lab_manager', organization: { id: body.organization.id, kind: 'lab' } });
  });

  it('adds a shop whose admin is a shop admin, and lists it with the shops', async () => {
    const admin = await networkAdmin();
    const name = unique('Shop ');
    const res = await onboard(admin.token, {
      kind: 'partner',
      name,
      email: 'desk@newshop.example',
      address: { postalCode: '83001', country: 'US' },
      timeZone: 'America/Denver',
      admin: { name: 'Sam Newshop', email: `${unique('shop')}@test.example` },
    });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.admin.role).toBe('partner_admin');
    const shops = await request(app).get('/api/network/organizations').query({ kind: 'partner' }).set('Authorization', `Bearer ${admin.token}`);
    expect(shops.body.map((s: { name: string }) => s.name)).toContain(name);
  });

  it('says field by field what is wrong, refuses a second of the same name and place or a known e-mail, and writes nothing', async () => {
    const admin = await networkAdmin();
    const name = unique('Shop ');
    const email = `${unique('x')}@test.example`;
    const valid = { kind: 'partner', name, address: { postalCode: '83001', country: 'US' }, timeZone: 'America/Denver', admin: { name: 'X', email } };

    const bad = await onboard(admin.token, { kind: 'network', name: '', address: { postalCode: '1' }, timeZone: 'Mars/Olympus', admin: { email: 'nope' } });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.map((f: { path: string }) => f.path).sort()).toEqual(['address.postalCode', 'admin.email', 'admin.name', 'kind', 'name', 'timeZone']);

    const unknownZip = await onboard(admin.token, { ...valid, address: { postalCode: '00000', country: 'US' } });
    expect(unknownZip.status).toBe(400);
    expect(unknownZip.body.error.fields).toEqual([{ path: 'address.postalCode', message: 'Unknown ZIP code "00000"' }]);

    const knownEmail = await onboard(admin.token, { ...valid, admin: { name: 'X', email: admin.email } });
    expect(knownEmail.status).toBe(409);
    expect(knownEmail.body.error.fields).toEqual([{ path: 'admin.email', message: 'Already has an account' }]);
    expect(await counts(name, email)).toEqual({ orgs: 0, users: 0 });

    expect((await onboard(admin.token, valid)).status).toBe(201);
    const twice = await onboard(admin.token, { ...valid, admin: { name: 'Y', email: `${unique('y')}@test.example` } });
    expect(twice.status).toBe(409);
    expect(twice.body.error.fields).toEqual([{ path: 'name', message: 'Already in the network at this postal code' }]);
    expect(await counts(name, email)).toEqual({ orgs: 1, users: 1 });

    // Only the network admin onboards.
    const shop = await createOrganization(db, 'partner');
    const shopAdmin = await createUser(db, { role: 'partner_admin', organizationId: shop.id });
    const { accessToken } = await signIn(app, shopAdmin.email, TEST_PASSWORD);
    expect((await onboard(accessToken, { ...valid, name: unique('Shop ') })).status).toBe(403);
  });
});

describe('PUT /api/network/organizations/:id/active', () => {
  const network = testNetwork({ app, db }, { zip: '83001', timeZone: 'America/Denver', holidayRegion: 'WY' });
  const logicalLab = (turnaroundDays: number) => network.makeLab({ mediaTypes: ['usb_flash'], skills: [{ skill: 'logical', turnaroundDays }] });
  const switchTo = (token: string, id: string, body: unknown) => request(app).put(`/api/network/organizations/${id}/active`).set(bearer(token)).send(body as object);

  it('switches a shop off: its API key and its people stop working, until it is switched on again; audited with why', async () => {
    const admin = await networkAdmin();
    const shop = await createOrganization(db, 'partner');
    const person = await createUser(db, { role: 'partner_admin', organizationId: shop.id });
    const signedIn = await signIn(app, person.email, TEST_PASSWORD);
    const key = (await request(app).post('/api/partner/api-keys').set(bearer(signedIn.accessToken)).send({ name: 'Counter' })).body.key as string;
    expect((await request(app).get('/api/v1/me').set(bearer(key))).status).toBe(200);

    const off = await switchTo(admin.token, shop.id, { active: false, reason: 'Unpaid invoices' });
    expect(off.status, JSON.stringify(off.body)).toBe(200);
    expect(organizationDto.parse(off.body).active).toBe(false);
    expect((await request(app).get('/api/v1/me').set(bearer(key))).status).toBe(401);
    expect((await request(app).get('/api/organization').set(bearer(signedIn.accessToken))).status).toBe(401);
    expect((await request(app).post('/api/auth/sign-in').send({ email: person.email, password: TEST_PASSWORD })).status).toBe(401);

    expect((await switchTo(admin.token, shop.id, { active: true })).body.active).toBe(true);
    expect((await request(app).get('/api/v1/me').set(bearer(key))).status).toBe(200);
    const audit: { action: string; details: { reason: string | null } }[] = await db.query(
      `SELECT action, details FROM audit_events WHERE target_id = $1 AND action LIKE 'organization.switched_%' ORDER BY at`,
      [shop.id],
    );
    expect(audit.map((a) => [a.action, a.details.reason])).toEqual([
      ['organization.switched_off', 'Unpaid invoices'],
      ['organization.switched_on', null],
    ]);
  });

  it('switches a lab off: the offer it has not answered goes to the next lab at once, on the timeline', async () => {
    const admin = await networkAdmin();
    const shop = await network.makeShop();
    const first = await logicalLab(1);
    const second = await logicalLab(2);
    const opened = await request(app)
      .post('/api/referrals')
      .set(bearer(shop.token))
      .send({ customer: { name: 'Reed Calloway', email: 'reed@customer.test' }, device: { mediaType: 'usb_flash' }, symptoms: ['deleted_files'], consent: { accepted: true } });
    expect(opened.body.offer.labId).toBe(first.org.id);

    expect((await switchTo(admin.token, first.org.id, { active: false, reason: 'Clean room closed for repairs' })).status).toBe(200);
    const kase = await request(app).get(`/api/referrals/${opened.body.id}`).set(bearer(shop.token));
    expect(kase.body.offer).toMatchObject({ labId: second.org.id, status: 'pending' });
    expect(kase.body.timeline.slice(-3).map((t: { kind: string }) => t.kind)).toEqual(['offer_withdrawn', 'routed', 'offered']);
    expect(kase.body.timeline.at(-3).summary).toContain('the network switched the lab off');
    expect(kase.body.routing.excluded.find((e: { labId: string }) => e.labId === first.org.id)).toBeTruthy();
    const [audit]: { details: { offersPassedOn: number } }[] = await db.query(`SELECT details FROM audit_events WHERE target_id = $1 AND action = 'organization.switched_off'`, [first.org.id]);
    expect(audit!.details.offersPassedOn).toBe(1);
  });

  it('needs a reason to switch off, and knows only shops and labs', async () => {
    const admin = await networkAdmin();
    const shop = await createOrganization(db, 'partner');
    const noReason = await switchTo(admin.token, shop.id, { active: false });
    expect(noReason.status).toBe(400);
    expect(noReason.body.error.fields).toEqual([{ path: 'reason', message: 'Say why it is switched off; the audit log keeps it' }]);
    const notBoolean = await switchTo(admin.token, shop.id, { active: 'no' });
    expect(notBoolean.body.error.fields.map((f: { path: string }) => f.path)).toEqual(['active']);
    const network = await createOrganization(db, 'network');
    expect((await switchTo(admin.token, network.id, { active: false, reason: 'x' })).status).toBe(404);
    expect((await switchTo(admin.token, '00000000-0000-4000-8000-000000000000', { active: true })).status).toBe(404);
    expect((await db.query(`SELECT active FROM organizations WHERE id = $1`, [shop.id]))[0].active).toBe(true);
  });
});
