import { Router } from 'express';
import type { Guard } from '../auth';
import type { ServiceContext } from '../lib/context';
import { ledgerCheck } from './service';

/** The network admin's view of the books: GET /api/network/ledger/check. */
export function ledgerRoutes(ctx: ServiceContext, guard: Guard): Router {
  const router = Router();
  router.get('/network/ledger/check', guard.authorize('settlement.run'), async (_req, res) => {
    res.json(await ledgerCheck(ctx));
  });
  return router;
}
