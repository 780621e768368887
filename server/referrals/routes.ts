import { Router } from 'express';
import { z } from 'zod';
import { counterReferralInput } from '@shared/schemas/referrals';
import { actorOf, type Guard } from '../auth';
import type { ServiceContext } from '../lib/context';
import { parseInput } from '../lib/validate';
import * as referrals from './service';

const idParam = z.object({ id: z.string().uuid('Not a valid id') });

/** The web app's case routes (/api/referrals…) and the network's queue (/api/network/attention…). */
export function referralRoutes(ctx: ServiceContext, guard: Guard): Router {
  const router = Router();

  router.post('/referrals/preview', guard.authorize('referrals.create'), async (req, res) => {
    res.json(await referrals.previewRouting(ctx, actorOf(req).organizationId, req.body));
  });
  router.post('/referrals', guard.authorize('referrals.create'), async (req, res) => {
    const actor = actorOf(req);
    // The counter form: the customer's consent is required here (the partner API makes it optional).
    const input = parseInput(counterReferralInput, req.body);
    const who = await referrals.userActor(ctx.db.manager, actor);
    res.status(201).json(await referrals.createReferral(ctx, { partnerOrganizationId: actor.organizationId, actor: who }, input));
  });
  router.get('/referrals', guard.authorize('referrals.read'), async (req, res) => {
    res.json(await referrals.listReferrals(ctx, referrals.scopeOf(actorOf(req)), req.query));
  });
  router.get('/referrals/:id', guard.authorize('referrals.read'), async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    res.json(await referrals.getReferral(ctx, referrals.scopeOf(actorOf(req)), id));
  });
  router.delete('/referrals/:id', guard.authorize('referrals.cancel'), async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    const actor = actorOf(req);
    res.json(await referrals.cancelReferral(ctx, referrals.scopeOf(actor), id, await referrals.userActor(ctx.db.manager, actor)));
  });

  router.get('/network/attention', guard.authorize('network.manage'), async (_req, res) => {
    res.json(await referrals.listAttention(ctx));
  });
  router.post('/network/referrals/:id/assign', guard.authorize('network.manage'), async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    res.json(await referrals.assignLab(ctx, actorOf(req), id, req.body));
  });

  return router;
}
