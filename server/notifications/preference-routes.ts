import { Router, type Request } from 'express';
// Type-only: the auth component sends its e-mails through this one, so a value import would be a cycle.
import type { Guard } from '../auth';
import type { Actor, ServiceContext } from '../lib/context';
import { getNotificationPreferences, updateNotificationPreferences } from './preferences';

function signedIn(req: Request): Actor {
  if (!req.actor) throw new Error('a preferences route was mounted without the guard');
  return req.actor;
}

/** The signed-in person's own e-mail choices. */
export function notificationPreferenceRoutes(ctx: ServiceContext, guard: Guard): Router {
  const router = Router();
  router.get('/profile/notifications', guard.authorize('profile.read'), async (req, res) => {
    res.json(await getNotificationPreferences(ctx, signedIn(req)));
  });
  router.put('/profile/notifications', guard.authorize('notification-preferences.manage'), async (req, res) => {
    res.json(await updateNotificationPreferences(ctx, signedIn(req), req.body));
  });
  return router;
}
