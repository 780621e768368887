import { Router } from 'express';
import { z } from 'zod';
import { inviteStaffInput } from '@shared/schemas/auth';
import { organizationKinds } from '@shared/vocabulary';
import { actorOf, type Guard } from '../auth';
import { parseInput } from '../lib/validate';
import type { ServiceContext } from '../lib/context';
import * as organizations from './service';

const idParam = z.object({ id: z.string().uuid('Not a valid id') });

export function organizationRoutes(ctx: ServiceContext, guard: Guard): Router {
  const router = Router();

  router.get('/organization', guard.authorize('organization.read'), async (req, res) => {
    res.json(await organizations.getOwnOrganization(ctx, actorOf(req)));
  });
  router.get('/organization/staff', guard.authorize('staff.read'), async (req, res) => {
    res.json(await organizations.listStaff(ctx, actorOf(req)));
  });
  router.get('/organization/staff/:id', guard.authorize('staff.read'), async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    res.json(await organizations.getStaffMember(ctx, actorOf(req), id));
  });
  router.post('/organization/staff/invitations', guard.authorize('staff.invite'), async (req, res) => {
    res.status(201).json(await organizations.inviteStaff(ctx, actorOf(req), parseInput(inviteStaffInput, req.body)));
  });

  router.get('/network/organizations', guard.authorize('network.organizations.read'), async (req, res) => {
    const { kind } = parseInput(z.object({ kind: z.enum(organizationKinds).optional() }), req.query);
    res.json(await organizations.listOrganizations(ctx, { kind }));
  });
  router.get('/network/organizations/:id', guard.authorize('network.organizations.read'), async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    res.json(await organizations.getOrganization(ctx, id));
  });

  return router;
}
