import { Router } from 'express';
import { z } from 'zod';
import { createWebhookEndpointInput, updateWebhookEndpointInput } from '@shared/schemas/webhooks';
import { actorOf, type Guard } from '../auth';
import { parseInput } from '../lib/validate';
import type { ServiceContext } from '../lib/context';
import * as webhooks from './service';

const idParams = z.object({ id: z.string().uuid('Not a valid id') });
const deliveryParams = idParams.extend({ deliveryId: z.string().uuid('Not a valid id') });

export function webhookRoutes(ctx: ServiceContext, guard: Guard): Router {
  const router = Router();
  const can = guard.authorize('webhooks.manage');

  router.get('/partner/webhooks', can, async (req, res) => {
    res.json(await webhooks.listEndpoints(ctx, actorOf(req)));
  });
  router.post('/partner/webhooks', can, async (req, res) => {
    res.status(201).json(await webhooks.createEndpoint(ctx, actorOf(req), parseInput(createWebhookEndpointInput, req.body)));
  });
  router.patch('/partner/webhooks/:id', can, async (req, res) => {
    const { id } = parseInput(idParams, req.params);
    res.json(await webhooks.updateEndpoint(ctx, actorOf(req), id, parseInput(updateWebhookEndpointInput, req.body)));
  });
  router.delete('/partner/webhooks/:id', can, async (req, res) => {
    const { id } = parseInput(idParams, req.params);
    await webhooks.deleteEndpoint(ctx, actorOf(req), id);
    res.status(204).end();
  });
  router.get('/partner/webhooks/:id/deliveries', can, async (req, res) => {
    const { id } = parseInput(idParams, req.params);
    res.json(await webhooks.listDeliveries(ctx, actorOf(req), id));
  });
  router.post('/partner/webhooks/:id/deliveries/:deliveryId/resend', can, async (req, res) => {
    const { id, deliveryId } = parseInput(deliveryParams, req.params);
    await webhooks.resendDelivery(ctx, actorOf(req), id, deliveryId);
    res.status(202).json({ status: 'pending' });
  });
  return router;
}
