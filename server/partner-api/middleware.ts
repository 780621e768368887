import type { Request, RequestHandler } from 'express';
import { rateLimit, type RateLimitInfo } from 'express-rate-limit';
import { AppError } from '../lib/errors';
import type { ServiceContext } from '../lib/context';
import { findActiveKey, touchApiKey, type ApiKeyPrincipal } from './api-keys';

declare module 'express-serve-static-core' {
  interface Request {
    apiKey?: ApiKeyPrincipal;
  }
}

// RFC 6750 §3: a 401 for a bearer-protected resource names the scheme.
const challenge = (error?: string) => ({ 'WWW-Authenticate': error ? `Bearer realm="platterpost", error="${error}"` : 'Bearer realm="platterpost"' });

/**
 * `Authorization: Bearer ppk_live_…`: missing, malformed, unknown and revoked keys all answer 401.
 * For requests `withDirectoryReading` picks, the key is read together with what ranking labs needs.
 */
export function requireApiKey(ctx: ServiceContext, options: { withDirectoryReading?: (req: Request) => boolean } = {}): RequestHandler {
  return async (req, _res, next) => {
    const header = req.header('authorization');
    if (!header) {
      throw new AppError('unauthenticated', 401, 'Send your API key in the header Authorization: Bearer ppk_live_…', undefined, { headers: challenge() });
    }
    const m = /^Bearer\s+(\S+)\s*$/i.exec(header);
    const principal = m ? await findActiveKey(ctx, m[1]!, { withDirectoryReading: options.withDirectoryReading?.(req) ?? false }) : null;
    if (!principal) {
      throw new AppError('unauthenticated', 401, 'The API key is not valid or has been revoked', undefined, { headers: challenge('invalid_token') });
    }
    await touchApiKey(ctx, principal);
    req.apiKey = principal;
    next();
  };
}

/** The key a request authenticated with; a route without requireApiKey is a programming error. */
export function apiKeyOf(req: Request): ApiKeyPrincipal {
  if (!req.apiKey) throw new Error('apiKeyOf() used on a route without requireApiKey');
  return req.apiKey;
}

/**
 * A fixed one-minute window per key. The counts live in this process's memory, so with several
 * app instances each enforces the limit on its own share (see README, "Scaling out").
 */
export function perKeyRateLimit(ctx: ServiceContext): RequestHandler {
  const limit = ctx.config.partnerApiRateLimitPerMinute;
  return rateLimit({
    windowMs: 60_000,
    limit,
    keyGenerator: (req) => apiKeyOf(req).apiKeyId,
    standardHeaders: 'draft-7',
    legacyHeaders: false,
    validate: { keyGeneratorIpFallback: false },
    handler: (req, _res, next) => {
      const reset = (req as Request & { rateLimit?: RateLimitInfo }).rateLimit?.resetTime;
      const seconds = reset ? Math.max(1, Math.ceil((reset.getTime() - Date.now()) / 1000)) : 60;
      next(
        new AppError('rate_limited', 429, `This API key has made more than ${limit} requests this minute. Try again in ${seconds} s.`, undefined, {
          headers: { 'Retry-After': String(seconds) },
        }),
      );
    },
  });
}
