import jwt from 'jsonwebtoken';
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { demoAccounts, DEMO_PASSWORD } from '../../server/db/seed/demo-accounts';
import { User } from '../../server/auth';
import { linkToken, refreshCookieFrom, setupApi, signIn, unique, waitForMail } from '../support/api';
import { createOrganization, createUser, TEST_PASSWORD } from '../support/factories';

const { app, db, config } = await setupApi({ SIGN_IN_MAX_FAILURES: '5', SIGN_IN_LOCK_MINUTES: '15' }, { workers: { mail: true } });

describe('sign-in', () => {
  it.each(demoAccounts)('signs in the demo $role and answers the user with its organisation', async (account) => {
    const res = await request(app).post('/api/auth/sign-in').send({ email: account.email, password: DEMO_PASSWORD });
    expect(res.status).toBe(200);
    expect(res.body.accessToken).toEqual(expect.any(String));
    expect(res.body.user).toMatchObject({ email: account.email, name: account.name, role: account.role });
    expect(res.body.user.organization).toEqual({ id: expect.any(String), kind: expect.any(String), name: expect.any(String) });
    const me = await request(app).get('/api/auth/me').set('Authorization', `Bearer ${res.body.accessToken}`);
    expect(me.status).toBe(200);
    expect(me.body).toMatchObject({ ...res.body.user, permissions: expect.arrayContaining(['profile.read']) });
  });

  it('refuses a wrong password with 401 and a message that does not say which part was wrong', async () => {
    const org = await createOrganization(db, 'partner');
    const user = await createUser(db, { role: 'partner_staff', organizationId: org.id });
    const wrongPassword = await request(app).post('/api/auth/sign-in').send({ email: user.email, password: 'not-the-password' });
    const unknownEmail = await request(app).post('/api/auth/sign-in').send({ email: `${unique()}@nowhere.example`, password: TEST_PASSWORD });
    expect(wrongPassword.status).toBe(401);
    expect(unknownEmail.status).toBe(401);
    expect(wrongPassword.body.error.message).toBe(unknownEmail.body.error.message);
    expect(wrongPassword.body.error.message).not.toMatch(/password is wrong|no account|unknown/i);
  });

  it('answers a malformed body with 400 and the fields at fault', async () => {
    const res = await request(app).post('/api/auth/sign-in').send({ email: 'not-an-email', password: 42 });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(res.body.error.fields.map((f: { path: string }) => f.path).sort()).toEqual(['email', 'password']);
  });

  it('locks the account after repeated failures, even against the right password', async () => {
    const org = await createOrganization(db, 'partner');
    const user = await createUser(db, { role: 'partner_staff', organizationId: org.id });
    for (let i = 0; i < config.signInMaxFailures; i++) {
      const res = await request(app).post('/api/auth/sign-in').send({ email: user.email, password: `wrong-${i}` });
      expect(res.status).toBe(401);
    }
    const locked = await request(app).post('/api/auth/sign-in').send({ email: user.email, password: TEST_PASSWORD });
    expect(locked.status).toBe(429);
    expect(locked.body.error.code).toBe('account_locked');
    expect(Number(locked.headers['retry-after'])).toBeGreaterThan(0);
    const row = await db.getRepository(User).findOneByOrFail({ id: user.id });
    expect(row.lockedUntil!.getTime()).toBeGreaterThan(Date.now());
  });
});

describe('access tokens', () => {
  const account = demoAccounts[0]!;

  it('refuses a request without a token, an expired token and a tampered token with 401', async () => {
    const { accessToken, user } = await signIn(app, account.email);
    const expired = jwt.sign(
      { sub: user.id, org: user.organization.id, kind: user.organization.kind, role: account.role, exp: Math.floor(Date.now() / 1000) - 60 },
      config.jwtSecret,
      { algorithm: 'HS256', issuer: 'platterpost', audience: 'platterpost-app' },
    );
    const [head, body, sig] = accessToken.split('.');
    const forgedBody = Buffer.from(JSON.stringify({ ...JSON.parse(Buffer.from(body!, 'base64url').toString()), role: 'network_admin' })).toString('base64url');
    const tampered = `${head}.${forgedBody}.${sig}`;
    const otherKey = jwt.sign({ sub: user.id, role: 'network_admin' }, 'another-secret-of-at-least-32-characters!!', { algorithm: 'HS256', issuer: 'platterpost', audience: 'platterpost-app' });

    for (const header of [undefined, `Bearer ${expired}`, `Bearer ${tampered}`, `Bearer ${otherKey}`, 'Bearer nonsense']) {
      const req = request(app).get('/api/auth/me');
      const res = await (header ? req.set('Authorization', header) : req);
      expect(res.status).toBe(401);
      expect(res.body.error.code).toBe('unauthenticated');
    }
  });
});

describe('refresh and sign-out', () => {
  const account = demoAccounts[1]!;

  it('rotates the refresh token on use; the old one stops working', async () => {
    const { refreshCookie } = await signIn(app, account.email);
    const first = await request(app).post('/api/auth/refresh').set('Cookie', refreshCookie);
    expect(first.status).toBe(200);
    expect(first.body.user.email).toBe(account.email);
    const rotated = refreshCookieFrom(first);
    expect(rotated).not.toBe(refreshCookie);
    expect(first.headers['set-cookie']![0]).toMatch(/HttpOnly/);
    expect(first.headers['set-cookie']![0]).toMatch(/SameSite=Strict/);

    const reused = await request(app).post('/api/auth/refresh').set('Cookie', refreshCookie);
    expect(reused.status).toBe(401);
    const next = await request(app).post('/api/auth/refresh').set('Cookie', rotated);
    expect(next.status).toBe(200);
  });

  it('revokes the whole family when a rotated token is replayed after the grace period', async () => {
    const { refreshCookie } = await signIn(app, account.email);
    const first = await request(app).post('/api/auth/refresh').set('Cookie', refreshCookie);
    const rotated = refreshCookieFrom(first);
    const oldId = refreshCookie.split('=')[1]!.split('.')[0];
    await db.query(`UPDATE refresh_tokens SET revoked_at = now() - interval '1 minute' WHERE id = $1`, [oldId]);
    expect((await request(app).post('/api/auth/refresh').set('Cookie', refreshCookie)).status).toBe(401);
    expect((await request(app).post('/api/auth/refresh').set('Cookie', rotated)).status).toBe(401);
  });

  it('signs out by revoking the refresh token and clearing the cookie', async () => {
    const { refreshCookie } = await signIn(app, account.email);
    const out = await request(app).post('/api/auth/sign-out').set('Cookie', refreshCookie);
    expect(out.status).toBe(204);
    expect(out.headers['set-cookie']![0]).toMatch(/pp_refresh=;/);
    const after = await request(app).post('/api/auth/refresh').set('Cookie', refreshCookie);
    expect(after.status).toBe(401);
  });

  it('answers 401 to a refresh without a cookie', async () => {
    const res = await request(app).post('/api/auth/refresh');
    expect(res.status).toBe(401);
  });
});

describe('password reset by e-mail link', () => {
  it('sends a one-time link that sets a new password, ends old sessions and cannot be used twice', async () => {
    const org = await createOrganization(db, 'lab');
    const user = await createUser(db, { role: 'lab_technician', organizationId: org.id });
    const old = await signIn(app, user.email, TEST_PASSWORD);

    const asked = await request(app).post('/api/auth/forgot-password').send({ email: user.email });
    expect(asked.status).toBe(202);
    const mail = await waitForMail(user.email, (m) => m.subject.includes('Reset'));
    expect(mail.html).toContain('/reset-password?token=');
    const token = linkToken(mail.text, '/reset-password');

    const reset = await request(app).post('/api/auth/reset-password').send({ token, password: 'a-brand-new-passphrase' });
    expect(reset.status).toBe(204);
    expect((await request(app).post('/api/auth/sign-in').send({ email: user.email, password: 'a-brand-new-passphrase' })).status).toBe(200);
    expect((await request(app).post('/api/auth/sign-in').send({ email: user.email, password: TEST_PASSWORD })).status).toBe(401);
    expect((await request(app).post('/api/auth/refresh').set('Cookie', old.refreshCookie)).status).toBe(401);

    const again = await request(app).post('/api/auth/reset-password').send({ token, password: 'yet-another-passphrase' });
    expect(again.status).toBe(400);
    expect(again.body.error.code).toBe('invalid_token');
  });

  it('refuses an expired reset link', async () => {
    const org = await createOrganization(db, 'lab');
    const user = await createUser(db, { role: 'lab_technician', organizationId: org.id });
    await request(app).post('/api/auth/forgot-password').send({ email: user.email });
    const token = linkToken((await waitForMail(user.email)).text, '/reset-password');
    await db.query(`UPDATE one_time_tokens SET expires_at = now() - interval '1 second' WHERE user_id = $1`, [user.id]);
    const res = await request(app).post('/api/auth/reset-password').send({ token, password: 'a-brand-new-passphrase' });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('invalid_token');
  });

  it('answers the same for an unknown address and sends nothing', async () => {
    const email = `${unique()}@nowhere.example`;
    const res = await request(app).post('/api/auth/forgot-password').send({ email });
    expect(res.status).toBe(202);
    const [{ count }] = await db.query(`SELECT count(*)::int AS count FROM outbox_messages WHERE recipient = $1`, [email]);
    expect(count).toBe(0);
  });
});

describe('staff invitations by e-mail link', () => {
  it('invites a colleague who accepts once, is signed in, and cannot reuse the link', async () => {
    const org = await createOrganization(db, 'partner');
    const admin = await createUser(db, { role: 'partner_admin', organizationId: org.id });
    const { accessToken } = await signIn(app, admin.email, TEST_PASSWORD);
    const email = `${unique('new')}@test.example`;

    const invited = await request(app)
      .post('/api/organization/staff/invitations')
      .set('Authorization', `Bearer ${accessToken}`)
      .send({ email, name: 'Robin New', role: 'partner_staff' });
    expect(invited.status).toBe(201);
    expect(invited.body).toMatchObject({ email, role: 'partner_staff', status: 'invited' });

    const mail = await waitForMail(email, (m) => m.subject.includes('invited'));
    const token = linkToken(mail.text, '/accept-invitation');
    const preview = await request(app).get(`/api/auth/invitations/${encodeURIComponent(token)}`);
    expect(preview.status).toBe(200);
    expect(preview.body).toEqual({ email, name: 'Robin New', role: 'partner_staff', organizationName: org.name });

    const accepted = await request(app).post('/api/auth/invitations/accept').send({ token, name: 'Robin Newcomb', password: 'robins-own-passphrase' });
    expect(accepted.status).toBe(200);
    expect(accepted.body.user).toMatchObject({ email, name: 'Robin Newcomb', role: 'partner_staff', organization: { id: org.id } });

    const reused = await request(app).post('/api/auth/invitations/accept').send({ token, name: 'Mallory', password: 'another-passphrase' });
    expect(reused.status).toBe(400);
    expect((await request(app).get(`/api/auth/invitations/${encodeURIComponent(token)}`)).status).toBe(404);
  });

  it('refuses an expired invitation', async () => {
    const org = await createOrganization(db, 'lab');
    const manager = await createUser(db, { role: 'lab_manager', organizationId: org.id });
    const { accessToken } = await signIn(app, manager.email, TEST_PASSWORD);
    const email = `${unique('late')}@test.example`;
    await request(app).post('/api/organization/staff/invitations').set('Authorization', `Bearer ${accessToken}`).send({ email, name: 'Late Comer', role: 'shipping_clerk' });
    const token = linkToken((await waitForMail(email)).text, '/accept-invitation');
    await db.query(`UPDATE one_time_tokens SET expires_at = now() - interval '1 second' WHERE token_hash IS NOT NULL AND user_id = (SELECT id FROM users WHERE email = $1)`, [email]);
    const res = await request(app).post('/api/auth/invitations/accept').send({ token, name: 'Late Comer', password: 'late-comers-passphrase' });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('invalid_token');
  });

  it('refuses a role of another organisation kind, field by field, and writes nothing', async () => {
    const org = await createOrganization(db, 'partner');
    const admin = await createUser(db, { role: 'partner_admin', organizationId: org.id });
    const { accessToken } = await signIn(app, admin.email, TEST_PASSWORD);
    const email = `${unique('x')}@test.example`;
    const res = await request(app).post('/api/organization/staff/invitations').set('Authorization', `Bearer ${accessToken}`).send({ email, name: 'X', role: 'lab_manager' });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual([{ path: 'role', message: expect.stringContaining('cannot have the role') }]);
    expect(await db.getRepository(User).countBy({ email })).toBe(0);
  });
});

describe('change password', () => {
  it('needs the current password and then accepts the new one', async () => {
    const org = await createOrganization(db, 'partner');
    const user = await createUser(db, { role: 'partner_staff', organizationId: org.id });
    const { accessToken } = await signIn(app, user.email, TEST_PASSWORD);
    const wrong = await request(app).post('/api/auth/password').set('Authorization', `Bearer ${accessToken}`).send({ currentPassword: 'nope', newPassword: 'a-much-longer-passphrase' });
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.fields[0].path).toBe('currentPassword');
    const ok = await request(app).post('/api/auth/password').set('Authorization', `Bearer ${accessToken}`).send({ currentPassword: TEST_PASSWORD, newPassword: 'a-much-longer-passphrase' });
    expect(ok.status).toBe(204);
    expect((await request(app).post('/api/auth/sign-in').send({ email: user.email, password: 'a-much-longer-passphrase' })).status).toBe(200);
  });
});
