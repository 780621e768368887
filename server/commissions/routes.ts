import { Router } from 'express';
import { z } from 'zod';
import { actorOf, type Guard } from '../auth';
import type { ServiceContext } from '../lib/context';
import { parseInput } from '../lib/validate';
import * as plans from './service';

const idParam = z.object({ id: z.uuid('Not a valid id') });
const partnerParam = z.object({ partnerId: z.uuid('Not a valid id') });

/** The network admin's commission plans and which shop is on which (every change audited). */
export function commissionRoutes(ctx: ServiceContext, guard: Guard): Router {
  const router = Router();
  const manage = guard.authorize('network.manage');

  router.get('/network/commission-plans', manage, async (_req, res) => {
    res.json(await plans.listPlans(ctx));
  });
  router.post('/network/commission-plans', manage, async (req, res) => {
    res.status(201).json(await plans.createPlan(ctx, actorOf(req), req.body ?? {}));
  });
  router.get('/network/commission-plans/:id', manage, async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    res.json(await plans.getPlan(ctx, id));
  });
  router.patch('/network/commission-plans/:id', manage, async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    res.json(await plans.updatePlan(ctx, actorOf(req), id, req.body ?? {}));
  });
  router.delete('/network/commission-plans/:id', manage, async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    await plans.archivePlan(ctx, actorOf(req), id);
    res.status(204).end();
  });
  router.put('/network/partners/:partnerId/commission-plan', manage, async (req, res) => {
    const { partnerId } = parseInput(partnerParam, req.params);
    res.json(await plans.assignPlan(ctx, actorOf(req), partnerId, req.body ?? {}));
  });
  return router;
}
