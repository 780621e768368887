import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { createApp } from '../../server/app';
import { createDataSource } from '../../server/db/data-source';
import { setupApi } from '../support/api';

const { app, config } = await setupApi({ JSON_BODY_LIMIT: '2kb' });

describe('API conventions', () => {
  it('answers health with the database state', async () => {
    const res = await request(app).get('/api/health');
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ status: 'ok', db: 'ok' });
  });

  it('answers 503 on health when the database is unreachable', async () => {
    const unreachable = createDataSource({ url: 'postgres://postgres@127.0.0.1:1/none', poolSize: 1 });
    const res = await request(createApp({ config, db: unreachable })).get('/api/health');
    expect(res.status).toBe(503);
    expect(res.body.db).toBe('unreachable');
  });

  it('puts a request id on every response and keeps a sane incoming one', async () => {
    const fresh = await request(app).get('/api/health');
    expect(fresh.headers['x-request-id']).toMatch(/^[0-9a-f-]{36}$/);
    const kept = await request(app).get('/api/nothing-here').set('X-Request-Id', 'shop-ticket-000123');
    expect(kept.headers['x-request-id']).toBe('shop-ticket-000123');
  });

  it('answers an unknown API route with 404 in the error shape', async () => {
    const res = await request(app).get('/api/nothing-here');
    expect(res.status).toBe(404);
    expect(res.body).toEqual({ error: { code: 'not_found', message: expect.any(String) } });
  });

  it('refuses a body over the size limit with 413 and no stack trace', async () => {
    const res = await request(app).post('/api/auth/sign-in').send({ email: 'a@b.example', password: 'x'.repeat(5000) });
    expect(res.status).toBe(413);
    expect(res.body.error.code).toBe('payload_too_large');
    expect(JSON.stringify(res.body)).not.toMatch(/at .*\.ts:\d+/);
  });

  it("sends helmet's security headers and no CORS permission", async () => {
    const res = await request(app).get('/api/health').set('Origin', 'https://elsewhere.example');
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    expect(res.headers['content-security-policy']).toContain("default-src 'self'");
    expect(res.headers['access-control-allow-origin']).toBeUndefined();
    expect(res.headers['x-powered-by']).toBeUndefined();
  });
});
