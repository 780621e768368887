import { Router } from 'express';
import { z } from 'zod';
import { actorOf, type Guard } from '../auth';
import type { ServiceContext } from '../lib/context';
import { parseInput } from '../lib/validate';
import { issueLinkForShop, listLinks, revokeLinksForShop } from './service';

const idParam = z.object({ id: z.string().min(1) });

/** The shop's management of a case's customer links. */
export function customerLinkRoutes(ctx: ServiceContext, guard: Guard): Router {
  const router = Router();
  router.get('/referrals/:id/customer-links', guard.authorize('customer-link.manage'), async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    res.json(await listLinks(ctx, actorOf(req), id));
  });
  router.post('/referrals/:id/customer-links', guard.authorize('customer-link.manage'), async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    res.setHeader('Cache-Control', 'no-store');
    res.status(201).json(await issueLinkForShop(ctx, actorOf(req), id, req.body, { ip: req.ip }));
  });
  router.delete('/referrals/:id/customer-links', guard.authorize('customer-link.manage'), async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    res.json(await revokeLinksForShop(ctx, actorOf(req), id, { ip: req.ip }));
  });
  return router;
}
