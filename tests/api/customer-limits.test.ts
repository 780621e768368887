import { randomBytes } from 'node:crypto';
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { setupApi } from '../support/api';

// The customer's link pages are limited per client address. Apps of their own with small limits, so
// that no other file's customer requests count here.
const strict = await setupApi({ CUSTOMER_RATE_LIMIT_PER_MINUTE: '100', CUSTOMER_FAILED_LOOKUPS_PER_15_MINUTES: '3' });
const busy = await setupApi({ CUSTOMER_RATE_LIMIT_PER_MINUTE: '5', CUSTOMER_FAILED_LOOKUPS_PER_15_MINUTES: '100' });

const unknownLink = () => ({ Authorization: `CustomerLink ${randomBytes(32).toString('base64url')}` });

describe('limits on the customer link pages', () => {
  it('answers 429 with Retry-After after a few links that open no case', async () => {
    const statuses: number[] = [];
    for (let i = 0; i < 3; i++) statuses.push((await request(strict.app).get('/api/customer/case').set(unknownLink())).status);
    const over = await request(strict.app).get('/api/customer/case').set(unknownLink());
    expect(statuses).toEqual([404, 404, 404]);
    expect(over.status).toBe(429);
    expect(over.body).toEqual({ error: { code: 'rate_limited', message: expect.stringContaining('links that do not open a case') } });
    expect(Number(over.headers['retry-after'])).toBe(900);
  });

  it('answers 429 once an address has made its requests for the minute', async () => {
    for (let i = 0; i < 5; i++) expect((await request(busy.app).get('/api/customer/case').set(unknownLink())).status).toBe(404);
    const over = await request(busy.app).post('/api/customer/case/quote/approve').set(unknownLink()).send({});
    expect(over.status).toBe(429);
    expect(over.body.error.message).toContain('More than 5 requests a minute');
  });

  it('leaves the rest of the API alone', async () => {
    for (let i = 0; i < 6; i++) await request(busy.app).get('/api/customer/case').set(unknownLink());
    expect((await request(busy.app).get('/api/health')).status).toBe(200);
  });
});
