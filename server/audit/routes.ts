import { Router } from 'express';
import type { Guard } from '../auth';
import type { ServiceContext } from '../lib/context';
import { auditFacets, listAuditEvents } from './read';

/** The network admin's audit log: GET /api/network/audit?action=&actor=&organization=&from=&to=&cursor= */
export function auditRoutes(ctx: ServiceContext, guard: Guard): Router {
  const router = Router();
  router.get('/network/audit', guard.authorize('audit.read'), async (req, res) => {
    res.json(await listAuditEvents(ctx, req.query));
  });
  router.get('/network/audit/facets', guard.authorize('audit.read'), async (_req, res) => {
    res.json(await auditFacets(ctx));
  });
  return router;
}
