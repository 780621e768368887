import type { NextFunction, Request, RequestHandler, Response } from 'express';
import { Passport } from 'passport';
import { ExtractJwt, Strategy as JwtStrategy } from 'passport-jwt';
import { roleCan, type Permission } from '@shared/permissions';
import type { OrganizationKind, Role } from '@shared/vocabulary';
import { AppError } from '../lib/errors';
import type { Actor, ServiceContext } from '../lib/context';
import { accessTokenVerifyOptions, type AccessClaims } from './tokens';

declare module 'express-serve-static-core' {
  interface Request {
    actor?: Actor;
  }
}

/**
 * One guard decides access. The access token says who the user is; the database says
 * whether they still may act (a disabled user or organisation is refused at once).
 */
export function createGuard(ctx: ServiceContext) {
  const passport = new Passport();
  passport.use(
    new JwtStrategy(
      {
        jwtFromRequest: ExtractJwt.fromAuthHeaderAsBearerToken(),
        secretOrKey: ctx.config.jwtSecret,
        ...accessTokenVerifyOptions,
      },
      (claims: AccessClaims, done: (err: unknown, actor?: Actor | false) => void) => {
        ctx.db
          .query(
            `SELECT u.role, u.organization_id, o.kind FROM users u JOIN organizations o ON o.id = u.organization_id
             WHERE u.id = $1 AND u.status = 'active' AND o.active`,
            [claims.sub],
          )
          .then((rows: { role: Role; organization_id: string; kind: OrganizationKind }[]) => {
            const row = rows[0];
            if (!row) return done(null, false);
            done(null, { userId: claims.sub, organizationId: row.organization_id, organizationKind: row.kind, role: row.role });
          })
          .catch((err) => done(err));
      },
    ),
  );
  const initialize = passport.initialize();

  const authenticate: RequestHandler = (req, res, next) => {
    initialize(req, res, () => {
      passport.authenticate('jwt', { session: false }, (err: unknown, actor: Actor | false) => {
        if (err) return next(err);
        if (!actor) return next(AppError.unauthenticated('Sign in to continue (the access token is missing, expired or not valid)'));
        req.actor = actor;
        next();
      })(req, res, next);
    });
  };

  /** The route declares what it needs; every role without that permission gets 403. */
  function authorize(permission: Permission): RequestHandler {
    return (req: Request, res: Response, next: NextFunction) =>
      authenticate(req, res, (err?: unknown) => {
        if (err) return next(err);
        if (!roleCan(req.actor!.role, permission)) return next(AppError.forbidden());
        next();
      });
  }

  return { authenticate, authorize };
}

export type Guard = ReturnType<typeof createGuard>;

/** The actor a guarded route established; a route without the guard is a programming error. */
export function actorOf(req: Request): Actor {
  if (!req.actor) throw new Error('actorOf() used on a route without the guard');
  return req.actor;
}
