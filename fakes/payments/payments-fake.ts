import { randomBytes, timingSafeEqual } from 'node:crypto';
import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import express, { type NextFunction, type Request, type Response } from 'express';
import Stripe from 'stripe';
import { z } from 'zod';
import { apiRoutes, type ApiRoute } from './api-routes';
import { parseExpiry, type CardInput } from './cards';
import { errorResponse, FakeApiError, invalidRequest, type ApiErrorBody } from './errors';
import { checkoutPage, messagePage, onboardingPage } from './hosted-pages';
import { PaymentsOperations, successRedirect, type PayOutcome } from './operations';
import { newId, nowSeconds, PaymentsStore } from './store';
import { WebhookSender, type WebhookDelivery } from './webhooks';

/*
 * A local stand-in for the payment provider that speaks its REST wire protocol, so the official `stripe`
 * client works against it unchanged: `new Stripe(key, { host: '127.0.0.1', port, protocol: 'http' })`.
 * Besides the `/v1` API it serves the hosted test pages (`/pay/:session`, `/onboard/:token`) and a few
 * controls for tests and the demo under `/_fake/`. All state is in memory.
 */

export interface PaymentsFakeOptions {
  /** 0 picks a free port (tests); the start command defaults to 4020. */
  port: number;
  host?: string;
  /** The only API key the fake accepts (`sk_test_…`). */
  secretKey: string;
  /** Where events are POSTed; can also be set later with `setWebhookUrl` or `POST /_fake/webhook-endpoint`. */
  webhookUrl?: string;
  /** Endpoint signing secret (`whsec_…`); a random one is made when not given. */
  webhookSecret?: string;
  /** Base URL of the hosted pages as browsers reach them; defaults to http://127.0.0.1:<port>. */
  publicUrl?: string;
  /** Waits before each webhook retry; defaults to 0.5 s, 2 s, 8 s (three retries). */
  webhookRetryDelaysMs?: readonly number[];
  webhookTimeoutMs?: number;
}

interface SavedResponse {
  fingerprint: string;
  status: number;
  body: unknown;
  requestId: string;
}

interface InjectedFailure {
  path: string;
  method: string | null;
  status: number;
  remaining: number;
}

export interface PaymentsFakeState {
  store: PaymentsStore;
  webhookDeliveries: readonly WebhookDelivery[];
  failures: InjectedFailure[];
  idempotency: Map<string, SavedResponse>;
}

export interface PaymentsFake {
  start(): Promise<{ port: number; url: string }>;
  stop(): Promise<void>;
  readonly app: express.Express;
  /** The port listened on (known after `start()` when 0 was asked for). */
  readonly port: number;
  readonly url: string;
  readonly webhookSecret: string;
  readonly state: PaymentsFakeState;
  setWebhookUrl(url: string | undefined): void;
  /** Resolves when every webhook delivery started so far has succeeded or given up. */
  webhooksIdle(): Promise<void>;
  reset(): void;
}

const DEFAULT_RETRY_DELAYS_MS = [500, 2000, 8000];

export function createPaymentsFake(options: PaymentsFakeOptions): PaymentsFake {
  if (!options.secretKey) throw new Error('createPaymentsFake needs a secretKey (the API key clients will send).');
  const host = options.host ?? '127.0.0.1';
  let port = options.port;
  let webhookUrl = options.webhookUrl;
  const webhookSecret = options.webhookSecret ?? `whsec_${randomBytes(24).toString('hex')}`;
  const publicUrl = () => (options.publicUrl ?? `http://${host}:${port}`).replace(/\/+$/, '');

  const store = new PaymentsStore();
  const idempotency = new Map<string, SavedResponse>();
  const failures: InjectedFailure[] = [];
  const webhooks = new WebhookSender({
    url: () => webhookUrl,
    secret: () => webhookSecret,
    retryDelaysMs: options.webhookRetryDelaysMs ?? DEFAULT_RETRY_DELAYS_MS,
    timeoutMs: options.webhookTimeoutMs ?? 10_000,
    onDelivered: (event) => {
      const stored = store.collections.events.get(event.id);
      if (stored) stored.pending_webhooks = 0;
    },
  });
  const ops = new PaymentsOperations(store, {
    apiVersion: Stripe.API_VERSION,
    publicUrl,
    hasWebhookEndpoint: () => Boolean(webhookUrl),
    onEvent: (event) => webhooks.send(event),
  });

  const app = express();
  app.disable('x-powered-by');
  // Nested `a[b][c]` keys in query strings, as the client sends list filters and `expand[]`.
  app.set('query parser', 'extended');

  app.use(injectFailures(failures));

  // ── /v1: the provider's API ──────────────────────────────────────────────────────────────────────────
  app.use('/v1', (req, res, next) => {
    res.locals.requestId = newId('req');
    res.set('Request-Id', res.locals.requestId);
    res.set('Stripe-Version', req.get('stripe-version') ?? Stripe.API_VERSION);
    next();
  });
  app.use('/v1', authenticate(options.secretKey));
  app.use('/v1', (req, res, next) => {
    if (req.get('stripe-account')) {
      sendApiError(res, 400, {
        type: 'invalid_request_error',
        param: 'Stripe-Account',
        message: 'This payments fake does not act on behalf of connected accounts (the Stripe-Account header).',
      });
      return;
    }
    next();
  });
  app.use('/v1', express.urlencoded({ extended: true, limit: '1mb' }));
  for (const route of apiRoutes(ops)) {
    const handler = runApiRoute(route, idempotency);
    if (route.method === 'GET') app.get(route.path, handler);
    else app.post(route.path, handler);
  }
  app.use('/v1', (req, res) => {
    sendApiError(res, 404, {
      type: 'invalid_request_error',
      message: `Unrecognized request URL (${req.method}: ${req.originalUrl.split('?')[0]}). This payments fake serves only the subset of the API that Platterpost uses.`,
    });
  });

  // ── Hosted pages ─────────────────────────────────────────────────────────────────────────────────────
  const form = express.urlencoded({ extended: false, limit: '16kb' });

  app.get('/', (_req, res) => {
    res.type('html').send(messagePage('Platterpost payments fake', 'This local server stands in for the payment provider during development and tests.'));
  });

  app.get('/pay/:id', (req, res) => {
    const session = store.collections.checkoutSessions.get(req.params.id) && ops.getCheckoutSession(req.params.id);
    if (!session) {
      res.status(404).type('html').send(messagePage('Payment not found', 'This payment link is not valid. Ask the lab for a new one.'));
      return;
    }
    res.type('html').send(renderSessionPage(session.id));
  });

  app.post('/pay/:id', form, (req, res) => {
    const session = store.collections.checkoutSessions.get(req.params.id) && ops.getCheckoutSession(req.params.id);
    if (!session) {
      res.status(404).type('html').send(messagePage('Payment not found', 'This payment link is not valid. Ask the lab for a new one.'));
      return;
    }
    if (session.status !== 'open') {
      res.status(409).type('html').send(renderSessionPage(session.id));
      return;
    }
    const fields = (req.body ?? {}) as Record<string, string>;
    const expiry = parseExpiry(String(fields.expiry ?? ''));
    if (!expiry) {
      res
        .status(400)
        .type('html')
        .send(renderSessionPage(session.id, 'Enter the expiry date as MM/YY, for example 12/34.', fields.expiry));
      return;
    }
    const outcome = ops.payCheckoutSession(session.id, {
      number: String(fields.cardNumber ?? ''),
      cvc: String(fields.cvc ?? ''),
      ...expiry,
    });
    if (outcome.kind === 'succeeded') {
      res.redirect(303, outcome.redirectTo);
      return;
    }
    const message = outcome.kind === 'declined' ? outcome.decline.message : outcome.problem.message;
    res
      .status(402)
      .type('html')
      .send(renderSessionPage(session.id, message, fields.expiry));
  });

  function renderSessionPage(sessionId: string, error?: string, typedExpiry?: string): string {
    const session = ops.getCheckoutSession(sessionId);
    if (session.status === 'complete') {
      return messagePage('Payment received', 'This payment is complete. Thank you.', {
        href: successRedirect(session),
        label: 'Continue',
      });
    }
    if (session.status === 'expired') {
      return messagePage('Payment link expired', 'This payment link has expired. Ask the lab for a new one.');
    }
    return checkoutPage({ session, lineItems: store.lineItems.get(session.id) ?? [], error, typed: { expiry: typedExpiry } });
  }

  app.get('/onboard/:token', (req, res) => {
    const link = store.accountLinks.get(req.params.token);
    if (!link) {
      res.status(404).type('html').send(messagePage('Link not valid', 'This set-up link is not valid.'));
      return;
    }
    // As with the provider, a used or expired link sends the person to refresh_url for a fresh one.
    if (link.used || nowSeconds() >= link.expires_at) {
      if (link.refresh_url) res.redirect(303, link.refresh_url);
      else res.status(410).type('html').send(messagePage('Link expired', 'This set-up link has expired. Ask for a new one.'));
      return;
    }
    res.type('html').send(onboardingPage(store.get('accounts', link.account), link.token, link.refresh_url));
  });

  app.post('/onboard/:token', form, (req, res) => {
    const link = store.accountLinks.get(req.params.token);
    if (!link || link.used || nowSeconds() >= link.expires_at) {
      if (link?.refresh_url) res.redirect(303, link.refresh_url);
      else res.status(410).type('html').send(messagePage('Link expired', 'This set-up link is not valid any more.'));
      return;
    }
    link.used = true;
    ops.completeOnboarding(link.account, String((req.body as Record<string, string> | undefined)?.businessName ?? ''));
    if (link.return_url) res.redirect(303, link.return_url);
    else res.type('html').send(messagePage('Set-up complete', 'Payouts are set up. You can close this page.'));
  });

  // ── /_fake: controls for tests and the demo ──────────────────────────────────────────────────────────
  const fake = express.Router();
  fake.use(express.json({ limit: '64kb' }));

  fake.get('/health', (_req, res) => {
    res.json({ ok: true, url: publicUrl(), webhookUrl: webhookUrl ?? null });
  });

  fake.post('/fail', (req, res) => {
    const parsed = z
      .strictObject({
        path: z.string().startsWith('/', { message: 'path must start with "/", e.g. "/v1/transfers"' }),
        times: z.number().int().min(1).max(1000),
        method: z.enum(['GET', 'POST']).optional(),
        status: z.number().int().min(500).max(599).optional(),
      })
      .safeParse(req.body);
    if (!parsed.success) {
      res.status(400).json({ error: { message: `Bad /_fake/fail body: ${z.prettifyError(parsed.error)}` } });
      return;
    }
    const { path, times, method, status } = parsed.data;
    failures.push({ path, method: method ?? null, status: status ?? 500, remaining: times });
    res.json({ path, method: method ?? null, times, status: status ?? 500 });
  });

  fake.post('/checkout/:id/pay', (req, res) => {
    const parsed = z
      .strictObject({
        cardNumber: z.string(),
        expiry: z.string().optional(),
        cvc: z.string().optional(),
      })
      .safeParse(req.body);
    if (!parsed.success) {
      res.status(400).json({ error: { type: 'invalid_request_error', message: `Bad pay body: ${z.prettifyError(parsed.error)}` } });
      return;
    }
    const { cardNumber, expiry, cvc } = parsed.data;
    const card: CardInput = { number: cardNumber, ...defaultCardDetails(cardNumber), ...(cvc ? { cvc } : {}) };
    if (expiry !== undefined) {
      const typed = parseExpiry(expiry);
      if (!typed) {
        res.status(400).json({ error: { type: 'invalid_request_error', param: 'expiry', message: 'expiry must look like MM/YY' } });
        return;
      }
      Object.assign(card, typed);
    }
    try {
      const { status: httpStatus, body } = payOutcomeResponse(ops.payCheckoutSession(req.params.id, card));
      res.status(httpStatus).json(body);
    } catch (error) {
      if (error instanceof FakeApiError) res.status(error.status).json(errorResponse(error.body));
      else throw error;
    }
  });

  fake.post('/accounts/:id/onboard', (req, res) => {
    try {
      res.json(ops.completeOnboarding(req.params.id));
    } catch (error) {
      if (error instanceof FakeApiError) res.status(error.status).json(errorResponse(error.body));
      else throw error;
    }
  });

  fake.post('/webhook-endpoint', (req, res) => {
    const parsed = z.strictObject({ url: z.url().nullable() }).safeParse(req.body);
    if (!parsed.success) {
      res.status(400).json({ error: { message: `Bad webhook-endpoint body: ${z.prettifyError(parsed.error)}` } });
      return;
    }
    webhookUrl = parsed.data.url ?? undefined;
    res.json({ url: webhookUrl ?? null });
  });

  fake.get('/webhook-deliveries', (_req, res) => {
    res.json({ data: webhooks.deliveries });
  });

  fake.post('/reset', (_req, res) => {
    reset();
    res.json({ ok: true });
  });

  app.use('/_fake', fake);

  app.use((error: unknown, req: Request, res: Response, _next: NextFunction) => {
    const status = (error as { status?: number }).status ?? 500;
    const message =
      status < 500 ? `Could not read the request: ${(error as Error).message}` : 'The payments fake failed to handle this request.';
    if (status >= 500) console.error('[payments-fake]', req.method, req.originalUrl, error);
    sendApiError(res, status, { type: status < 500 ? 'invalid_request_error' : 'api_error', message });
  });

  function reset(): void {
    store.reset();
    idempotency.clear();
    failures.length = 0;
  }

  let server: Server | undefined;

  return {
    app,
    get port() {
      return port;
    },
    get url() {
      return `http://${host}:${port}`;
    },
    webhookSecret,
    state: {
      store,
      get webhookDeliveries() {
        return webhooks.deliveries;
      },
      failures,
      idempotency,
    },
    setWebhookUrl(url) {
      webhookUrl = url;
    },
    webhooksIdle: () => webhooks.idle(),
    reset,
    start() {
      return new Promise((resolve, reject) => {
        const listening = app.listen(options.port, host);
        listening.once('error', reject);
        listening.once('listening', () => {
          server = listening;
          port = (listening.address() as AddressInfo).port;
          resolve({ port, url: `http://${host}:${port}` });
        });
      });
    },
    async stop() {
      webhooks.stop();
      await webhooks.idle();
      if (!server) return;
      const closing = server;
      server = undefined;
      await new Promise<void>((resolve, reject) => {
        closing.close((error) => (error ? reject(error) : resolve()));
        closing.closeAllConnections();
      });
    },
  };
}

/** Matches the next `times` requests to a path (and method, when given) and answers them with a 5xx. */
function injectFailures(failures: InjectedFailure[]) {
  return (req: Request, res: Response, next: NextFunction) => {
    if (req.path.startsWith('/_fake')) return next();
    const hit = failures.find((f) => f.remaining > 0 && f.path === req.path && (!f.method || f.method === req.method));
    if (!hit) return next();
    hit.remaining -= 1;
    // Refused before the endpoint runs, so nothing is saved under the Idempotency-Key and a retry runs for real.
    res.set('Request-Id', newId('req'));
    sendApiError(res, hit.status, {
      type: 'api_error',
      message: `The payments fake was told to fail this request (POST /_fake/fail); ${hit.remaining} more to fail.`,
    });
  };
}

function authenticate(secretKey: string) {
  const expected = Buffer.from(secretKey);
  return (req: Request, res: Response, next: NextFunction) => {
    const key = apiKeyFrom(req.get('authorization'));
    if (!key) {
      sendApiError(res, 401, {
        type: 'invalid_request_error',
        message:
          "You did not provide an API key. Send it in the Authorization header using Bearer auth (e.g. 'Authorization: Bearer YOUR_SECRET_KEY').",
      });
      return;
    }
    const given = Buffer.from(key);
    if (given.length !== expected.length || !timingSafeEqual(given, expected)) {
      sendApiError(res, 401, { type: 'invalid_request_error', message: `Invalid API Key provided: ${redactKey(key)}` });
      return;
    }
    next();
  };
}

/** Bearer auth, or basic auth with the key as the user name, as the provider accepts both. */
function apiKeyFrom(header: string | undefined): string | null {
  if (!header) return null;
  const [scheme, value = ''] = header.split(/\s+/, 2);
  if (/^bearer$/i.test(scheme)) return value.trim() || null;
  if (/^basic$/i.test(scheme)) {
    const decoded = Buffer.from(value, 'base64').toString('utf8');
    return decoded.split(':')[0] || null;
  }
  return null;
}

function redactKey(key: string): string {
  return key.length <= 8 ? '*'.repeat(key.length) : `${key.slice(0, 8)}${'*'.repeat(Math.max(0, key.length - 12))}${key.slice(-4)}`;
}

function sendApiError(res: Response, status: number, body: ApiErrorBody): void {
  res.status(status).json(errorResponse(body));
}

/** Runs one `/v1` route with the provider's Idempotency-Key rules and error shape. */
function runApiRoute(route: ApiRoute, saved: Map<string, SavedResponse>) {
  return (req: Request, res: Response) => {
    const requestId = res.locals.requestId as string;
    const key = route.method === 'POST' ? (req.get('idempotency-key') ?? null) : null;
    const body: unknown = req.body ?? {};
    let fingerprint = '';
    if (key !== null) {
      if (key.length > 255) {
        sendApiError(res, 400, invalidRequest('Idempotency-Key must be at most 255 characters long.', { param: 'Idempotency-Key' }).body);
        return;
      }
      fingerprint = JSON.stringify([req.method, req.path, canonical(body)]);
      const previous = saved.get(key);
      if (previous) {
        if (previous.fingerprint !== fingerprint) {
          sendApiError(res, 400, {
            type: 'idempotency_error',
            message: `Keys for idempotent requests can only be used with the same parameters they were first used with. Try using a key other than '${key}' if you meant to execute a different request.`,
          });
          return;
        }
        res.set('Idempotent-Replayed', 'true');
        res.set('Original-Request', previous.requestId);
        res.status(previous.status).json(previous.body);
        return;
      }
    }
    let status = 200;
    let result: unknown;
    try {
      result = route.handler({
        params: req.params as Record<string, string>,
        body,
        query: req.query,
        request: { id: requestId, idempotencyKey: key },
      });
    } catch (error) {
      if (!(error instanceof FakeApiError)) throw error;
      status = error.status;
      result = errorResponse(error.body);
    }
    // Only completed work is saved: a refused request may be retried with the same key once fixed.
    if (key !== null && status < 400) saved.set(key, { fingerprint, status, body: result, requestId });
    if (key !== null) res.set('Idempotency-Key', key);
    res.status(status).json(result);
  };
}

/** JSON with object keys sorted, so the same parameters in another order count as the same request. */
function canonical(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(canonical);
  if (value && typeof value === 'object') {
    return Object.fromEntries(
      Object.keys(value as object)
        .sort()
        .map((k) => [k, canonical((value as Record<string, unknown>)[k])]),
    );
  }
  return value;
}

/** Defaults for the test control, so a test only has to name the card number. */
function defaultCardDetails(cardNumber: string): Omit<CardInput, 'number'> {
  const amex = /^\s*3[47]/.test(cardNumber);
  return { expMonth: 12, expYear: new Date().getUTCFullYear() + 3, cvc: amex ? '1234' : '123' };
}

/** The test control's answer: what the page would show, in the API's shapes (card problems are 402 `card_error`). */
function payOutcomeResponse(outcome: PayOutcome): { status: number; body: unknown } {
  if (outcome.kind === 'succeeded') {
    return {
      status: 200,
      body: {
        status: 'succeeded',
        redirect_to: outcome.redirectTo,
        checkout_session: outcome.session,
        payment_intent: outcome.paymentIntent,
        charge: outcome.charge,
      },
    };
  }
  if (outcome.kind === 'declined') {
    return {
      status: 402,
      body: errorResponse({
        type: 'card_error',
        code: outcome.decline.code,
        ...(outcome.decline.declineCode ? { decline_code: outcome.decline.declineCode } : {}),
        message: outcome.decline.message,
        payment_intent: outcome.paymentIntent,
      }),
    };
  }
  return {
    status: 402,
    body: errorResponse({ type: 'card_error', code: outcome.problem.code, param: outcome.problem.param, message: outcome.problem.message }),
  };
}
