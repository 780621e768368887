import { Router } from 'express';
import { z } from 'zod';
import { labListQuery } from '@shared/schemas/labs';
import { actorOf, type Guard } from '../auth';
import type { ServiceContext } from '../lib/context';
import { parseInput } from '../lib/validate';
import * as offers from './offers';
import { onboardOrganization, setOrganizationActive } from './onboarding';
import * as profiles from './profiles';

const idParam = z.object({ id: z.string().uuid('Not a valid id') });

/** Lab profiles and offers (/api/lab/…), the network's lab list (/api/network/labs…) and onboarding. */
export function routingRoutes(ctx: ServiceContext, guard: Guard): Router {
  const router = Router();

  router.get('/lab/profile', guard.authorize('lab-profile.manage'), async (req, res) => {
    res.json(await profiles.getOwnLabProfile(ctx, actorOf(req)));
  });
  router.put('/lab/profile', guard.authorize('lab-profile.manage'), async (req, res) => {
    res.json(await profiles.updateOwnLabProfile(ctx, actorOf(req), req.body));
  });
  router.post('/lab/profile/certificates', guard.authorize('lab-profile.manage'), async (req, res) => {
    res.status(201).json(await profiles.addOwnCertificate(ctx, actorOf(req), req.body));
  });

  router.get('/lab/offers', guard.authorize('offers.respond'), async (req, res) => {
    res.json(await offers.listLabOffers(ctx, actorOf(req), req.query));
  });
  router.get('/lab/offers/:id', guard.authorize('offers.respond'), async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    res.json(await offers.getLabOffer(ctx, actorOf(req), id));
  });
  router.post('/lab/offers/:id/accept', guard.authorize('offers.respond'), async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    res.json(await offers.acceptOffer(ctx, actorOf(req), id));
  });
  router.post('/lab/offers/:id/decline', guard.authorize('offers.respond'), async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    res.json(await offers.declineOffer(ctx, actorOf(req), id, req.body));
  });

  router.post('/network/organizations', guard.authorize('network.manage'), async (req, res) => {
    res.status(201).json(await onboardOrganization(ctx, actorOf(req), req.body));
  });
  router.put('/network/organizations/:id/active', guard.authorize('network.manage'), async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    res.json(await setOrganizationActive(ctx, actorOf(req), id, req.body));
  });

  router.get('/network/labs', guard.authorize('network.organizations.read'), async (req, res) => {
    res.json(await profiles.listLabs(ctx, parseInput(labListQuery, req.query)));
  });
  router.get('/network/labs/:id', guard.authorize('network.organizations.read'), async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    res.json(await profiles.getLabProfile(ctx, id));
  });
  router.put('/network/labs/:id', guard.authorize('network.manage'), async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    res.json(await profiles.updateLabProfile(ctx, actorOf(req), id, req.body));
  });
  router.post('/network/labs/:id/certificates', guard.authorize('network.manage'), async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    res.status(201).json(await profiles.addLabCertificate(ctx, actorOf(req), id, req.body));
  });

  return router;
}
