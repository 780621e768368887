import { randomBytes } from 'node:crypto';
import type { Express } from 'express';
import request from 'supertest';
import type { DataSource } from 'typeorm';
import { afterAll, inject } from 'vitest';
import { createApp } from '../../server/app';
import { loadConfig, type Config } from '../../server/config';
import { createDataSource } from '../../server/db/data-source';
import { setLogLevel } from '../../server/lib/logger';
import { startWorkers, type WorkerSelection, type Workers } from '../../server/workers';
import { DEMO_PASSWORD } from '../../server/db/seed/demo-accounts';

export interface TestContext {
  app: Express;
  db: DataSource;
  config: Config;
}

/** The real app on the real test database; hosted services are our fakes. Closed after the file. */
export async function setupApi(overrides: Record<string, string> = {}, options: { workers?: WorkerSelection } = {}): Promise<TestContext> {
  const config = loadConfig({
    NODE_ENV: 'test',
    DATABASE_URL: inject('databaseUrl'),
    SMTP_PORT: String(inject('smtpPort')),
    APP_URL: 'http://app.test',
    LOG_LEVEL: 'warn',
    ...overrides,
  });
  setLogLevel(config.logLevel);
  const db = await createDataSource({ url: config.databaseUrl, poolSize: 4, applicationName: 'platterpost-test' }).initialize();
  let workers: Workers | undefined;
  if (options.workers) workers = await startWorkers({ config, db }, options.workers);
  afterAll(async () => {
    await workers?.stop();
    await db.destroy();
  });
  return { app: createApp({ config, db }), db, config };
}

export function unique(prefix = 't'): string {
  return `${prefix}${Date.now().toString(36)}${randomBytes(3).toString('hex')}`;
}

export interface SignedIn {
  accessToken: string;
  refreshCookie: string;
  user: { id: string; role: string; organization: { id: string; kind: string; name: string } };
}

export function refreshCookieFrom(res: request.Response): string {
  const raw = res.headers['set-cookie'] as unknown as string[] | undefined;
  const cookie = raw?.find((c) => c.startsWith('pp_refresh='));
  if (!cookie) throw new Error('no refresh cookie was set');
  return cookie.split(';')[0]!;
}

export async function signIn(app: Express, email: string, password = DEMO_PASSWORD): Promise<SignedIn> {
  const res = await request(app).post('/api/auth/sign-in').send({ email, password });
  if (res.status !== 200) throw new Error(`sign-in of ${email} answered ${res.status}: ${JSON.stringify(res.body)}`);
  return { accessToken: res.body.accessToken, refreshCookie: refreshCookieFrom(res), user: res.body.user };
}

export interface FakeMail {
  id: string;
  to: string[];
  subject: string;
  text: string;
  html: string;
}

/** Waits for a message to arrive at the mail fake (the outbox is sent by a worker). */
export async function waitForMail(to: string, match: (m: FakeMail) => boolean = () => true, timeoutMs = 30_000): Promise<FakeMail> {
  const deadline = Date.now() + timeoutMs;
  const base = inject('mailApiUrl');
  while (Date.now() < deadline) {
    const res = await fetch(`${base}/api/messages?to=${encodeURIComponent(to)}`);
    const list = (await res.json()) as FakeMail[];
    const found = list.find(match);
    if (found) return found;
    await new Promise((r) => setTimeout(r, 150));
  }
  throw new Error(`no e-mail to ${to} arrived within ${timeoutMs} ms`);
}

export function linkToken(text: string, path: string): string {
  const m = text.match(new RegExp(`${path.replace('/', '\\/')}\\?token=([^\\s"<]+)`));
  if (!m) throw new Error(`no ${path} link in the message`);
  return decodeURIComponent(m[1]!);
}
