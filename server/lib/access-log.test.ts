import { Writable } from 'node:stream';
import express from 'express';
import pino from 'pino';
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { redactCustomerToken } from '../customer-link/links';
import { accessLog } from './access-log';

function capture(level = 'info') {
  const lines: Record<string, unknown>[] = [];
  const stream = new Writable({
    write(chunk, _enc, cb) {
      for (const line of String(chunk).split('\n').filter(Boolean)) lines.push(JSON.parse(line));
      cb();
    },
  });
  return { lines, logger: pino({ level }, stream) };
}

function app(logger: pino.Logger) {
  const a = express();
  a.use((_req, res, next) => {
    res.setHeader('X-Request-Id', 'req-12345678');
    next();
  });
  a.use(accessLog(logger, { ignore: (req) => req.url === '/api/health', redactUrl: redactCustomerToken }));
  a.get('/api/health', (_req, res) => res.json({ ok: true }));
  a.get('/c/:token', (_req, res) => res.json({ ok: true }));
  a.get('/boom', (_req, res) => res.status(503).json({ down: true }));
  return a;
}

describe('access log', () => {
  it('writes one line per request with method, path, status, time and request id', async () => {
    const { lines, logger } = capture();
    await request(app(logger)).get('/boom?x=1');
    expect(lines).toHaveLength(1);
    expect(lines[0]).toMatchObject({ level: 50, msg: 'request completed', requestId: 'req-12345678', req: { method: 'GET', url: '/boom?x=1' }, res: { statusCode: 503 } });
    expect(typeof lines[0].responseTime).toBe('number');
  });

  it('keeps the customer token out of the logged path, and skips the health check', async () => {
    const { lines, logger } = capture();
    const a = app(logger);
    await request(a).get('/api/health');
    await request(a).get('/c/abcdefghijklmnopqrstuvwxyz012345');
    expect(lines.map((l) => (l.req as { url: string }).url)).toEqual(['/c/[token]']);
    expect(JSON.stringify(lines)).not.toContain('abcdefghijklmnopqrstuvwxyz012345');
  });

  it('writes nothing below the configured level', async () => {
    const { lines, logger } = capture('warn');
    await request(app(logger)).get('/c/abcdefghijklmnopqrstuvwxyz012345');
    expect(lines).toEqual([]);
  });
});
