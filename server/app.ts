import { randomUUID } from 'node:crypto';
import { existsSync } from 'node:fs';
import path from 'node:path';
import cookieParser from 'cookie-parser';
import express, { type Express } from 'express';
import helmet from 'helmet';
import type { DataSource } from 'typeorm';
import { authRoutes, createGuard } from './auth';
import type { Config } from './config';
import { accessLog } from './lib/access-log';
import { errorHandler, notFoundHandler } from './lib/errors';
import { logger, requestContext } from './lib/logger';
import { organizationRoutes } from './organizations';
import { referralRoutes } from './referrals';
import { routingRoutes } from './routing';
import { apiKeyRoutes, partnerApiRoutes } from './partner-api';
import { photoRoutes } from './uploads';
import { commissionRoutes } from './commissions';
import { ledgerRoutes } from './ledger';
import { paymentWebhookRoutes, payoutRoutes } from './payouts';
import { webhookRoutes } from './webhooks';
import { customerLinkRoutes, redactCustomerToken } from './customer-link';
import { customerRoutes, labWorkRoutes } from './lab-work';
import { shippingPartnerApiRoutes, shippingRoutes, shippingWebhookRoutes } from './shipping';
import { receivingRoutes } from './receiving';
import { auditRoutes } from './audit';
import { custodyRoutes } from './custody';
import { dispositionRoutes } from './disposition';
import { notificationPreferenceRoutes } from './notifications';

export interface AppDeps {
  config: Config;
  db: DataSource;
}

const REQUEST_ID = /^[A-Za-z0-9._-]{8,100}$/;

/** Builds the whole app without listening, so tests drive it with supertest. */
export function createApp({ config, db }: AppDeps): Express {
  const ctx = { config, db };
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', 'loopback');

  // A request id on every response and every log line; a caller's own id is kept when sane.
  app.use((req, res, next) => {
    const incoming = req.header('x-request-id');
    const requestId = incoming && REQUEST_ID.test(incoming) ? incoming : randomUUID();
    res.setHeader('X-Request-Id', requestId);
    requestContext.run({ requestId }, next);
  });
  // The customer's private page carries its token in the path; the log keeps the path without it.
  app.use(accessLog(logger, { ignore: (req) => req.url === '/api/health', redactUrl: redactCustomerToken }));
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          // Map tiles are drawn from data shipped with the app; images may be data: URLs.
          'img-src': ["'self'", 'data:', 'blob:'],
          'upgrade-insecure-requests': config.appUrl.startsWith('https://') ? [] : null,
        },
      },
      strictTransportSecurity: config.appUrl.startsWith('https://'),
    }),
  );
  // No CORS middleware: the API answers its own origin only (closed by default).
  // Only the session routes read cookies (the refresh cookie); the partner API and the rest do not.
  app.use('/api/auth', cookieParser());
  // The shipping service signs the bytes it sends: its webhook keeps the raw body.
  app.use('/api/webhooks/shipping', express.raw({ type: () => true, limit: '1mb' }));
  // The payment provider signs the exact bytes it sends: its webhook reads the raw body, before the JSON parser.
  app.use('/api', paymentWebhookRoutes(ctx));
  app.use('/api', express.json({ limit: config.jsonBodyLimit }));

  const guard = createGuard(ctx);

  app.get('/api/health', async (_req, res) => {
    try {
      await db.query('SELECT 1');
      res.json({ status: 'ok', db: 'ok' });
    } catch {
      res.status(503).json({ status: 'degraded', db: 'unreachable' });
    }
  });
  // The partner API first: its requests then skip the app's routers (measured on intake under load).
  app.use('/api/v1', partnerApiRoutes(ctx));
  app.use('/api/v1', shippingPartnerApiRoutes(ctx));
  app.use('/api/auth', authRoutes(ctx, guard));
  app.use('/api', organizationRoutes(ctx, guard));
  app.use('/api', referralRoutes(ctx, guard));
  app.use('/api', routingRoutes(ctx, guard));
  app.use('/api', apiKeyRoutes(ctx, guard));
  app.use('/api', photoRoutes(ctx, guard));
  app.use('/api', webhookRoutes(ctx, guard));
  app.use('/api', labWorkRoutes(ctx, guard));
  app.use('/api', customerLinkRoutes(ctx, guard));
  app.use('/api', customerRoutes(ctx));
  app.use('/api', shippingWebhookRoutes(ctx));
  app.use('/api', shippingRoutes(ctx, guard));
  app.use('/api', receivingRoutes(ctx, guard));
  app.use('/api', commissionRoutes(ctx, guard));
  app.use('/api', ledgerRoutes(ctx, guard));
  app.use('/api', payoutRoutes(ctx, guard));
  app.use('/api', custodyRoutes(ctx, guard));
  app.use('/api', dispositionRoutes(ctx, guard));
  app.use('/api', auditRoutes(ctx, guard));
  app.use('/api', notificationPreferenceRoutes(ctx, guard));
  app.use('/api', notFoundHandler);

  // The built client, with the router's paths falling back to index.html.
  const staticDir = path.resolve(config.staticDir);
  if (existsSync(path.join(staticDir, 'index.html'))) {
    app.use(express.static(staticDir, { index: false, maxAge: '1h' }));
    app.get(/^\/(?!api\/).*/, (_req, res) => {
      res.setHeader('Cache-Control', 'no-cache');
      res.sendFile(path.join(staticDir, 'index.html'));
    });
  }

  app.use(errorHandler);
  return app;
}
