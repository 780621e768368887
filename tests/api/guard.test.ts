import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { roles, type Role } from '@shared/vocabulary';
import { demoAccounts } from '../../server/db/seed/demo-accounts';
import { User } from '../../server/auth';
import { setupApi, signIn, unique } from '../support/api';

const { app, db } = await setupApi();

const tokens = new Map<Role, string>();
for (const account of demoAccounts) tokens.set(account.role, (await signIn(app, account.email)).accessToken);

const anyOrgId = (await db.query(`SELECT id FROM organizations WHERE slug = 'quillmark'`))[0].id as string;
const admins: Role[] = ['partner_admin', 'lab_manager', 'network_admin'];

// Every guarded route so far × every role: what each role is answered. "pass" means the guard
// let the request through (the route then answers 200, or 400 for the deliberately empty body).
const matrix: { method: 'get' | 'post' | 'put'; path: string; body?: object; allowed: readonly Role[]; pass: number }[] = [
  { method: 'get', path: '/api/auth/me', allowed: roles, pass: 200 },
  { method: 'post', path: '/api/auth/password', body: {}, allowed: roles, pass: 400 },
  { method: 'get', path: '/api/organization', allowed: roles, pass: 200 },
  { method: 'get', path: '/api/organization/staff', allowed: admins, pass: 200 },
  { method: 'post', path: '/api/organization/staff/invitations', body: {}, allowed: admins, pass: 400 },
  { method: 'get', path: '/api/network/organizations', allowed: ['network_admin'], pass: 200 },
  { method: 'get', path: `/api/network/organizations/${anyOrgId}`, allowed: ['network_admin'], pass: 200 },
  { method: 'post', path: '/api/network/organizations', body: {}, allowed: ['network_admin'], pass: 400 },
  { method: 'put', path: `/api/network/organizations/${anyOrgId}/active`, body: {}, allowed: ['network_admin'], pass: 400 },
];

describe('guard matrix', () => {
  for (const route of matrix) {
    it(`${route.method.toUpperCase()} ${route.path} without a token answers 401`, async () => {
      const res = await request(app)[route.method](route.path).send(route.body);
      expect(res.status).toBe(401);
    });
    for (const role of roles) {
      const allowed = route.allowed.includes(role);
      it(`${route.method.toUpperCase()} ${route.path} as ${role} answers ${allowed ? route.pass : 403}`, async () => {
        const res = await request(app)[route.method](route.path).set('Authorization', `Bearer ${tokens.get(role)}`).send(route.body);
        expect(res.status).toBe(allowed ? route.pass : 403);
        if (!allowed) expect(res.body.error.code).toBe('forbidden');
      });
    }
  }
});

describe('organisation scoping', () => {
  it("answers 404 for another organisation's staff member, never its data", async () => {
    const labUser = await db.getRepository(User).findOneByOrFail({ email: 'sam.idowu@quillmark.example' });
    const res = await request(app).get(`/api/organization/staff/${labUser.id}`).set('Authorization', `Bearer ${tokens.get('partner_admin')}`);
    expect(res.status).toBe(404);
    expect(JSON.stringify(res.body)).not.toContain(labUser.email);
  });

  it('answers a staff member of the own organisation', async () => {
    const colleague = await db.getRepository(User).findOneByOrFail({ email: 'theo.brandt@juniperlane.example' });
    const res = await request(app).get(`/api/organization/staff/${colleague.id}`).set('Authorization', `Bearer ${tokens.get('partner_admin')}`);
    expect(res.status).toBe(200);
    expect(res.body.email).toBe(colleague.email);
  });

  it('lists only the own organisation\u2019s staff', async () => {
    const res = await request(app).get('/api/organization/staff').set('Authorization', `Bearer ${tokens.get('lab_manager')}`);
    expect(res.status).toBe(200);
    expect(res.body.length).toBeGreaterThan(0);
    for (const member of res.body) expect(member.email).toMatch(/@quillmark\.example$/);
  });
});

describe('bad input writes nothing', () => {
  it('answers malformed JSON with 400 malformed_json and creates no user', async () => {
    const before = await db.getRepository(User).count();
    const res = await request(app)
      .post('/api/organization/staff/invitations')
      .set('Authorization', `Bearer ${tokens.get('partner_admin')}`)
      .set('Content-Type', 'application/json')
      .send('{"email": "a@b.example", "name": ');
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('malformed_json');
    expect(res.body.error.fields).toEqual([{ path: '(body)', message: expect.any(String) }]);
    expect(await db.getRepository(User).count()).toBe(before);
  });

  it('answers wrong types with 400 naming each field and creates no user', async () => {
    const email = `${unique()}@test.example`;
    const res = await request(app)
      .post('/api/organization/staff/invitations')
      .set('Authorization', `Bearer ${tokens.get('partner_admin')}`)
      .send({ email, name: 17, role: 'chief' });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.map((f: { path: string }) => f.path).sort()).toEqual(['name', 'role']);
    expect(await db.getRepository(User).countBy({ email })).toBe(0);
  });

  it('answers a bad id with 400 rather than a database error', async () => {
    const res = await request(app).get('/api/organization/staff/not-a-uuid').set('Authorization', `Bearer ${tokens.get('partner_admin')}`);
    expect(res.status).toBe(400);
    expect(res.body.error.fields[0].path).toBe('id');
  });
});
