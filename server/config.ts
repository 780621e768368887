import { createPrivateKey } from 'node:crypto';
import { z } from 'zod';

// The one place that reads the environment. A bad value stops the process with a
// message naming the variable.
const bool = z
  .enum(['true', 'false', '1', '0', 'yes', 'no'])
  .transform((v) => v === 'true' || v === '1' || v === 'yes');

const configSchema = z
  .object({
    NODE_ENV: z.enum(['development', 'test', 'production']).default('development'),
    HOST: z.string().default('127.0.0.1'),
    PORT: z.coerce.number().int().min(1).max(65535).default(3000),
    APP_URL: z.string().url().optional(),
    DATABASE_URL: z.string().url().default('postgres://postgres@127.0.0.1:54320/platterpost'),
    DATABASE_POOL_SIZE: z.coerce.number().int().min(1).max(100).default(10),
    JWT_SECRET: z.string().min(32, 'JWT_SECRET must be at least 32 characters').optional(),
    ACCESS_TOKEN_TTL_SECONDS: z.coerce.number().int().min(30).default(900),
    REFRESH_TOKEN_TTL_DAYS: z.coerce.number().int().min(1).default(14),
    PASSWORD_RESET_TTL_MINUTES: z.coerce.number().int().min(5).default(60),
    INVITATION_TTL_HOURS: z.coerce.number().int().min(1).default(72),
    SIGN_IN_MAX_FAILURES: z.coerce.number().int().min(1).default(5),
    SIGN_IN_LOCK_MINUTES: z.coerce.number().int().min(1).default(15),
    SMTP_HOST: z.string().default('127.0.0.1'),
    SMTP_PORT: z.coerce.number().int().min(1).max(65535).default(2525),
    MAIL_FROM: z.string().default('Platterpost <no-reply@platterpost.example>'),
    LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
    STATIC_DIR: z.string().default('dist'),
    UPLOAD_DIR: z.string().default('.data/uploads'),
    RUN_WORKERS: bool.default(true),
    // App processes on this machine (node:cluster); one per core uses the machine fully.
    // The customer's link pages, per client address: requests a minute, and unknown links per 15 minutes.
    CUSTOMER_RATE_LIMIT_PER_MINUTE: z.coerce.number().int().min(1).default(120),
    CUSTOMER_FAILED_LOOKUPS_PER_15_MINUTES: z.coerce.number().int().min(1).default(30),
    WEB_CONCURRENCY: z.coerce.number().int().min(1).max(64).default(1),
    JSON_BODY_LIMIT: z.string().default('256kb'),
    // Seconds to wait after each failed webhook delivery; about 24 hours in all (the issue's window).
    WEBHOOK_RETRY_SCHEDULE_SECONDS: z
      .string()
      .default('10,60,300,1800,3600,7200,14400,28800,28800')
      .transform((v, ctx) => {
        const steps = v.split(',').map((s) => Number(s.trim()));
        if (steps.some((n) => !Number.isFinite(n) || n < 0)) ctx.addIssue({ code: 'custom', message: 'a comma-separated list of seconds' });
        return steps;
      }),
    WEBHOOK_DISABLE_AFTER_HOURS: z.coerce.number().min(0).default(24),
    /** Business hours (in the lab's calendar) a lab has to answer an offer. */
    OFFER_RESPONSE_BUSINESS_HOURS: z.coerce.number().positive().max(80).default(4),
    /** Requests per minute per partner API key; load tests raise it. */
    PARTNER_API_RATE_LIMIT_PER_MINUTE: z.coerce.number().int().min(1).default(600),
    /** The shipping API (our local fake in development and tests); the official SDK's baseUrl. */
    SHIPPING_API_URL: z.string().url().default('http://127.0.0.1:4010/v2/'),
    SHIPPING_API_KEY: z.string().min(1).optional(),
    /** Verifies the tracking webhooks the shipping service signs. */
    SHIPPING_WEBHOOK_SECRET: z.string().min(1).optional(),
    /** Where the shipping service should post tracking events; registered with it when the workers start. */
    SHIPPING_WEBHOOK_URL: z.string().url().optional(),
    /** How long one call to the shipping API may take before it counts as failed. */
    SHIPPING_API_TIMEOUT_MS: z.coerce.number().int().min(100).max(120_000).default(15_000),
    /** GS1 Company Prefix for the SSCC-18 on each box (default: GS1's documentation example prefix). */
    SSCC_COMPANY_PREFIX: z.string().regex(/^\d{7,10}$/, 'SSCC_COMPANY_PREFIX must be 7 to 10 digits').default('0614141'),
    /** The payment provider (our local fake in development and tests), reached through the official SDK. */
    PAYMENTS_API_URL: z.string().url().default('http://127.0.0.1:4020'),
    PAYMENTS_SECRET_KEY: z.string().min(8, 'PAYMENTS_SECRET_KEY looks too short').optional(),
    PAYMENTS_WEBHOOK_SECRET: z.string().min(8, 'PAYMENTS_WEBHOOK_SECRET looks too short').optional(),
    /** Immediate retries the SDK makes itself on a network error or 5xx (same Idempotency-Key). */
    PAYMENTS_MAX_NETWORK_RETRIES: z.coerce.number().int().min(0).max(10).default(2),
    /** Transfers a settlement run sends at once. */
    SETTLEMENT_CONCURRENCY: z.coerce.number().int().min(1).max(64).default(8),
    /** Attempts at one payout before it waits for a person (retried with back-off in between). */
    PAYOUT_MAX_ATTEMPTS: z.coerce.number().int().min(1).max(50).default(6),
    /** Ed25519 private key (PEM, PKCS #8) that signs custody-log exports; development generates one at start. */
    CUSTODY_SIGNING_KEY: z
      .string()
      .transform((v) => v.replace(/\\n/g, '\n').trim())
      .refine((pem) => {
        try {
          return createPrivateKey(pem).asymmetricKeyType === 'ed25519';
        } catch {
          return false;
        }
      }, 'CUSTODY_SIGNING_KEY must be an Ed25519 private key in PEM form (openssl genpkey -algorithm ed25519)')
      .optional(),
  })
  .transform((env, ctx) => {
    if (env.NODE_ENV === 'production' && !env.JWT_SECRET) {
      ctx.addIssue({ code: 'custom', path: ['JWT_SECRET'], message: 'JWT_SECRET is required in production' });
    }
    for (const key of ['PAYMENTS_SECRET_KEY', 'PAYMENTS_WEBHOOK_SECRET'] as const) {
      if (env.NODE_ENV === 'production' && !env[key]) ctx.addIssue({ code: 'custom', path: [key], message: `${key} is required in production` });
    }
    if (env.NODE_ENV === 'production' && !env.CUSTODY_SIGNING_KEY) {
      ctx.addIssue({ code: 'custom', path: ['CUSTODY_SIGNING_KEY'], message: 'CUSTODY_SIGNING_KEY is required in production' });
    }
    for (const name of ['SHIPPING_API_KEY', 'SHIPPING_WEBHOOK_SECRET'] as const) {
      if (env.NODE_ENV === 'production' && !env[name]) ctx.addIssue({ code: 'custom', path: [name], message: `${name} is required in production` });
    }
    return {
      env: env.NODE_ENV,
      host: env.HOST,
      port: env.PORT,
      appUrl: (env.APP_URL ?? `http://localhost:${env.PORT}`).replace(/\/$/, ''),
      databaseUrl: env.DATABASE_URL,
      databasePoolSize: env.DATABASE_POOL_SIZE,
      // Development and test fall back to a fixed secret so that `npm start` needs no set-up.
      jwtSecret: env.JWT_SECRET ?? 'platterpost-development-secret-not-for-production-use',
      accessTokenTtlSeconds: env.ACCESS_TOKEN_TTL_SECONDS,
      refreshTokenTtlDays: env.REFRESH_TOKEN_TTL_DAYS,
      passwordResetTtlMinutes: env.PASSWORD_RESET_TTL_MINUTES,
      invitationTtlHours: env.INVITATION_TTL_HOURS,
      signInMaxFailures: env.SIGN_IN_MAX_FAILURES,
      signInLockMinutes: env.SIGN_IN_LOCK_MINUTES,
      smtp: { host: env.SMTP_HOST, port: env.SMTP_PORT },
      mailFrom: env.MAIL_FROM,
      logLevel: env.LOG_LEVEL,
      staticDir: env.STATIC_DIR,
      uploadDir: env.UPLOAD_DIR,
      runWorkers: env.RUN_WORKERS,
      webConcurrency: env.WEB_CONCURRENCY,
      customerRateLimit: { perMinute: env.CUSTOMER_RATE_LIMIT_PER_MINUTE, failedLookupsPer15Minutes: env.CUSTOMER_FAILED_LOOKUPS_PER_15_MINUTES },
      jsonBodyLimit: env.JSON_BODY_LIMIT,
      webhooks: { retryScheduleSeconds: env.WEBHOOK_RETRY_SCHEDULE_SECONDS, disableAfterMs: env.WEBHOOK_DISABLE_AFTER_HOURS * 3_600_000 },
      offerResponseBusinessHours: env.OFFER_RESPONSE_BUSINESS_HOURS,
      partnerApiRateLimitPerMinute: env.PARTNER_API_RATE_LIMIT_PER_MINUTE,
      shipping: {
        apiUrl: env.SHIPPING_API_URL.endsWith('/') ? env.SHIPPING_API_URL : `${env.SHIPPING_API_URL}/`,
        // Development falls back to the key the local fake accepts when none is set.
        apiKey: env.SHIPPING_API_KEY ?? 'shipping_fake_local_key',
        webhookSecret: env.SHIPPING_WEBHOOK_SECRET ?? 'shipping-fake-local-webhook-secret',
        webhookUrl: env.SHIPPING_WEBHOOK_URL ?? null,
        timeoutMs: env.SHIPPING_API_TIMEOUT_MS,
        ssccCompanyPrefix: env.SSCC_COMPANY_PREFIX,
      },
      payments: {
        apiUrl: env.PAYMENTS_API_URL.replace(/\/$/, ''),
        // Development and test fall back to the local fake's own defaults (fakes/payments/main.ts).
        secretKey: env.PAYMENTS_SECRET_KEY ?? 'sk_test_platterpost_local',
        webhookSecret: env.PAYMENTS_WEBHOOK_SECRET ?? 'whsec_platterpost_local',
        maxNetworkRetries: env.PAYMENTS_MAX_NETWORK_RETRIES,
      },
      settlementConcurrency: env.SETTLEMENT_CONCURRENCY,
      payoutMaxAttempts: env.PAYOUT_MAX_ATTEMPTS,
      /** null outside production when unset: the custody component then signs with a key generated at start. */
      custodySigningKey: env.CUSTODY_SIGNING_KEY ?? null,
    };
  });

export type Config = z.output<typeof configSchema>;

export class ConfigError extends Error {}

export function loadConfig(env: Record<string, string | undefined> = process.env): Config {
  const result = configSchema.safeParse(env);
  if (!result.success) {
    const lines = result.error.issues.map((i) => `  ${i.path.join('.') || '(environment)'}: ${i.message}`);
    throw new ConfigError(`Invalid configuration:\n${lines.join('\n')}`);
  }
  return result.data;
}
