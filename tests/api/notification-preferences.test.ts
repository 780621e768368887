import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { notificationPreferencesDto } from '@shared/schemas/notification-preferences';
import { enqueueEmailToUser } from '../../server/notifications';
import { setupApi, signIn, unique } from '../support/api';
import { createOrganization, createUser, TEST_PASSWORD } from '../support/factories';
import { auth, labWorlds, receivedCase } from '../support/lab-work';

const ctx = await setupApi();
const { app, db } = ctx;
// Wyoming ZIP centroids, away from the demo network and the other files' worlds.
const makeWorld = labWorlds(ctx, ['82001', '82050', '82052', '82053', '82054']);

async function person(role: 'partner_admin' | 'partner_staff' | 'lab_manager', organizationId?: string) {
  const orgId = organizationId ?? (await createOrganization(db, role === 'lab_manager' ? 'lab' : 'partner')).id;
  const user = await createUser(db, { role, organizationId: orgId });
  return { user, token: (await signIn(app, user.email, TEST_PASSWORD)).accessToken };
}

const outbox = async (to: string, template: string) =>
  Number((await db.query(`SELECT count(*) FROM outbox_messages WHERE recipient = $1 AND template = $2`, [to, template]))[0].count);

describe('GET /api/profile/notifications', () => {
  it('lists the messages a shop admin is sent, all on at first, the security ones marked required', async () => {
    const { token } = await person('partner_admin');

    const res = await request(app).get('/api/profile/notifications').set(auth(token));

    expect(res.status).toBe(200);
    const { messages } = notificationPreferencesDto.parse(res.body);
    const templates = messages.map((m) => m.template);
    expect(templates).toEqual(expect.arrayContaining(['password_reset', 'staff_invitation', 'referral_accepted', 'box_checked_in', 'webhook_endpoint_disabled', 'statement_ready']));
    expect(templates).not.toContain('lab_offer_new');
    expect(messages.every((m) => m.enabled)).toBe(true);
    expect(messages.filter((m) => m.required).map((m) => m.template).sort()).toEqual(['password_reset', 'staff_invitation']);
  });

  it('lists a lab manager’s offers, not the shop’s case messages', async () => {
    const { token } = await person('lab_manager');
    const { messages } = notificationPreferencesDto.parse((await request(app).get('/api/profile/notifications').set(auth(token))).body);
    expect(messages.map((m) => m.template)).toEqual(expect.arrayContaining(['lab_offer_new', 'lab_offer_withdrawn', 'payout_sent']));
    expect(messages.map((m) => m.template)).not.toContain('referral_accepted');
  });
});

describe('PUT /api/profile/notifications', () => {
  it('turns a message off and keeps the others as they were', async () => {
    const { user, token } = await person('partner_staff');

    const res = await request(app).put('/api/profile/notifications').set(auth(token)).send({ preferences: { referral_accepted: false } });
    const again = await request(app).put('/api/profile/notifications').set(auth(token)).send({ preferences: { box_checked_in: false } });

    expect(res.status).toBe(200);
    const enabled = Object.fromEntries(notificationPreferencesDto.parse(again.body).messages.map((m) => [m.template, m.enabled]));
    expect(enabled).toMatchObject({ referral_accepted: false, box_checked_in: false, case_on_hold: true, password_reset: true });
    const [row]: { notification_preferences: Record<string, boolean> }[] = await db.query(`SELECT notification_preferences FROM users WHERE id = $1`, [user.id]);
    expect(row!.notification_preferences).toEqual({ referral_accepted: false, box_checked_in: false });
  });

  it('refuses turning off what security needs, a message the person is not sent, and an unknown one, changing nothing', async () => {
    const { user, token } = await person('partner_staff');

    const res = await request(app)
      .put('/api/profile/notifications')
      .set(auth(token))
      .send({ preferences: { password_reset: false, staff_invitation: false, lab_offer_new: false, no_such_message: false, referral_accepted: false } });

    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual([
      { path: 'preferences.password_reset', message: 'Password reset links keep your account safe and cannot be turned off' },
      { path: 'preferences.staff_invitation', message: 'Invitations keep your account safe and cannot be turned off' },
      { path: 'preferences.lab_offer_new', message: expect.stringContaining('Not a message sent to you') },
      { path: 'preferences.no_such_message', message: expect.stringContaining('Not a message sent to you') },
    ]);
    const [row]: { notification_preferences: Record<string, boolean> }[] = await db.query(`SELECT notification_preferences FROM users WHERE id = $1`, [user.id]);
    expect(row!.notification_preferences).toEqual({});
    const malformed = await request(app).put('/api/profile/notifications').set(auth(token)).send({ preferences: { referral_accepted: 'no' } });
    expect(malformed.body.error.fields).toEqual([{ path: 'preferences.referral_accepted', message: expect.any(String) }]);
  });

  it('needs a signed-in person', async () => {
    expect((await request(app).put('/api/profile/notifications').send({ preferences: {} })).status).toBe(401);
  });
});

describe('the outbox honours the choice (enqueueEmailToUser)', () => {
  it('writes nothing for a message the user turned off, and writes the ones left on', async () => {
    const { user, token } = await person('partner_staff');
    await request(app).put('/api/profile/notifications').set(auth(token)).send({ preferences: { case_on_hold: false } });
    const data = { name: user.name, reference: 'PP-TEST', labName: 'Test Lab', reason: 'Box crushed', url: 'http://app.test/x' };

    const skipped = await db.transaction((m) => enqueueEmailToUser(m, user.id, 'case_on_hold', data));
    const sent = await db.transaction((m) =>
      enqueueEmailToUser(m, { email: user.email.toUpperCase() }, 'box_checked_in', { name: user.name, reference: 'PP-TEST', labName: 'Test Lab', customerName: 'Ola', url: 'http://app.test/x' }),
    );

    expect(skipped).toBeNull();
    expect(sent).toEqual(expect.any(String));
    expect(await outbox(user.email, 'case_on_hold')).toBe(0);
    expect(await outbox(user.email, 'box_checked_in')).toBe(1);
  });

  it('always writes a password reset, even when a stored preference says otherwise', async () => {
    const { user } = await person('partner_staff');
    await db.query(`UPDATE users SET notification_preferences = '{"password_reset": false}'::jsonb WHERE id = $1`, [user.id]);

    const res = await request(app).post('/api/auth/forgot-password').send({ email: user.email });

    expect(res.status).toBeLessThan(300);
    expect(await outbox(user.email, 'password_reset')).toBe(1);
  });

  it('writes nothing but security messages to a disabled account', async () => {
    const shop = await createOrganization(db, 'partner');
    const user = await createUser(db, { role: 'partner_staff', organizationId: shop.id, status: 'disabled' });

    const written = await db.transaction((m) =>
      enqueueEmailToUser(m, user.id, 'box_checked_in', { name: user.name, reference: 'PP-TEST', labName: 'Lab', customerName: 'Ola', url: 'http://app.test/x' }),
    );

    expect(written).toBeNull();
    expect(await outbox(user.email, 'box_checked_in')).toBe(0);
  });

  it('applies to the lab-accepted e-mail routing sends the shop: the person who turned it off gets none, a colleague still does', async () => {
    const world = await makeWorld();
    const colleague = await createUser(db, { role: 'partner_admin', organizationId: world.shop.id });
    const off = await request(app).put('/api/profile/notifications').set(auth(world.shopStaff.token)).send({ preferences: { referral_accepted: false } });
    expect(off.status).toBe(200);

    await receivedCase(ctx, world);

    expect(await outbox(world.shopStaff.email, 'referral_accepted')).toBe(0);
    expect(await outbox(colleague.email, 'referral_accepted')).toBe(1);
  });

  it('still invites a new colleague (invitations cannot be turned off)', async () => {
    const { token } = await person('partner_admin');
    const email = `${unique('invitee')}@test.example`;

    const res = await request(app).post('/api/organization/staff/invitations').set(auth(token)).send({ email, name: 'Ivo Lund', role: 'partner_staff' });

    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(await outbox(email, 'staff_invitation')).toBe(1);
  });
});
