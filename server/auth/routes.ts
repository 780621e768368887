import { Router, type Request, type Response, type CookieOptions } from 'express';
import { rateLimit } from 'express-rate-limit';
import { slowDown } from 'express-slow-down';
import {
  acceptInvitationInput,
  changePasswordInput,
  forgotPasswordInput,
  resetPasswordInput,
  signInInput,
} from '@shared/schemas/auth';
import { AppError } from '../lib/errors';
import { parseInput } from '../lib/validate';
import type { ServiceContext } from '../lib/context';
import { actorOf, type Guard } from './guard';
import * as auth from './service';

export const REFRESH_COOKIE = 'pp_refresh';

const tooMany = (message: string) => (_req: Request, _res: Response, next: (err: unknown) => void, options: { windowMs: number }) =>
  next(new AppError('rate_limited', 429, message, undefined, { headers: { 'Retry-After': String(Math.ceil(options.windowMs / 1000)) } }));

// Keyed by address and e-mail so one shop's shared IP does not lock out its colleagues.
const signInKey = (req: Request) => `${req.ip}|${String((req.body as { email?: unknown })?.email ?? '').toLowerCase()}`;

export function authRoutes(ctx: ServiceContext, guard: Guard): Router {
  const router = Router();
  const secure = ctx.config.appUrl.startsWith('https://');
  const cookieOptions: CookieOptions = { httpOnly: true, sameSite: 'strict', secure, path: '/api/auth' };

  const setRefreshCookie = (res: Response, session: auth.IssuedSession) =>
    res.cookie(REFRESH_COOKIE, session.refreshToken, { ...cookieOptions, expires: session.refreshExpiresAt });
  const sessionBody = (s: auth.IssuedSession) => ({ accessToken: s.accessToken, user: s.user });

  const signInLimiter = rateLimit({
    windowMs: 15 * 60_000,
    limit: 20,
    skipSuccessfulRequests: true,
    keyGenerator: signInKey,
    standardHeaders: 'draft-7',
    legacyHeaders: false,
    handler: tooMany('Too many sign-in attempts from here. Wait 15 minutes and try again.'),
    validate: { keyGeneratorIpFallback: false },
  });
  // Each failure beyond the third waits a little longer before it is answered.
  const signInSlowDown = slowDown({
    windowMs: 15 * 60_000,
    delayAfter: 3,
    delayMs: (used) => (used - 3) * 250,
    maxDelayMs: 3000,
    skipSuccessfulRequests: true,
    keyGenerator: signInKey,
    validate: { keyGeneratorIpFallback: false, delayMs: false },
  });
  const linkLimiter = rateLimit({
    windowMs: 60 * 60_000,
    limit: 10,
    keyGenerator: signInKey,
    standardHeaders: 'draft-7',
    legacyHeaders: false,
    handler: tooMany('Too many requests for a link. Wait an hour and try again.'),
    validate: { keyGeneratorIpFallback: false },
  });

  router.post('/sign-in', signInLimiter, signInSlowDown, async (req, res) => {
    const input = parseInput(signInInput, req.body);
    const session = await auth.signIn(ctx, { ...input, ip: req.ip });
    setRefreshCookie(res, session).json(sessionBody(session));
  });

  router.post('/refresh', async (req, res) => {
    try {
      const session = await auth.refreshSession(ctx, req.cookies?.[REFRESH_COOKIE]);
      setRefreshCookie(res, session).json(sessionBody(session));
    } catch (err) {
      res.clearCookie(REFRESH_COOKIE, cookieOptions);
      throw err;
    }
  });

  router.post('/sign-out', async (req, res) => {
    await auth.signOut(ctx, req.cookies?.[REFRESH_COOKIE]);
    res.clearCookie(REFRESH_COOKIE, cookieOptions).status(204).end();
  });

  router.get('/me', guard.authorize('profile.read'), async (req, res) => {
    res.json(await auth.getMe(ctx, actorOf(req)));
  });

  router.post('/password', guard.authorize('profile.read'), async (req, res) => {
    await auth.changePassword(ctx, actorOf(req), parseInput(changePasswordInput, req.body));
    res.status(204).end();
  });

  router.post('/forgot-password', linkLimiter, async (req, res) => {
    const { email } = parseInput(forgotPasswordInput, req.body);
    await auth.requestPasswordReset(ctx, email);
    res.status(202).json({ message: 'If an account exists for that address, we have sent a link to reset its password.' });
  });

  router.post('/reset-password', async (req, res) => {
    await auth.resetPassword(ctx, parseInput(resetPasswordInput, req.body));
    res.status(204).end();
  });

  router.get('/invitations/:token', async (req, res) => {
    res.json(await auth.getInvitation(ctx, req.params.token));
  });

  router.post('/invitations/accept', async (req, res) => {
    const input = parseInput(acceptInvitationInput, req.body);
    const session = await auth.acceptInvitation(ctx, { ...input, ip: req.ip });
    setRefreshCookie(res, session).json(sessionBody(session));
  });

  return router;
}
