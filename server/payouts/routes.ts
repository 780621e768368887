import { Router, type Response } from 'express';
import { z } from 'zod';
import type { Permission } from '@shared/permissions';
import { periodSchema, settlementRunInput, type StatementDetailDto } from '@shared/schemas/money';
import { actorOf, type Guard } from '../auth';
import type { ServiceContext } from '../lib/context';
import { parseInput } from '../lib/validate';
import { getPayoutAccount, startOnboarding } from './accounts';
import { statementCsv, statementFileName, statementPdf } from './documents';
import { getEarningLines, getEarnings, settlementOverview, settlementPeriod } from './reports';
import { retryPayoutNow, runSettlement } from './settlement';
import { getStatementDetail, listStatements } from './views';

const idParam = z.object({ id: z.uuid('Not a valid id') });
const periodParam = z.object({ period: periodSchema });

async function sendDocument(ctx: ServiceContext, res: Response, detail: StatementDetailDto, format: 'csv' | 'pdf') {
  res.setHeader('Cache-Control', 'private, no-store');
  res.setHeader('Content-Disposition', `attachment; filename="${statementFileName(detail, format)}"`);
  if (format === 'csv') res.type('text/csv; charset=utf-8').send(statementCsv(detail, ctx.config.appUrl));
  else res.type('application/pdf').send(await statementPdf(detail, ctx.config.appUrl));
}

/**
 * Payout accounts, earnings and statements for shops (/api/partner/…) and labs (/api/lab/…); the
 * network admin's settlement (/api/network/settlements…, /api/network/statements/…).
 */
export function payoutRoutes(ctx: ServiceContext, guard: Guard): Router {
  const router = Router();

  // The payee's own: a shop admin (payouts.manage) or a lab manager (lab-payouts.manage).
  const payee = (prefix: '/partner' | '/lab', permission: Permission) => {
    const allowed = guard.authorize(permission);
    router.get(`${prefix}/payout-account`, allowed, async (req, res) => {
      res.json(await getPayoutAccount(ctx, actorOf(req)));
    });
    router.post(`${prefix}/payout-account`, allowed, async (req, res) => {
      res.setHeader('Cache-Control', 'no-store');
      res.status(201).json(await startOnboarding(ctx, actorOf(req)));
    });
    router.get(`${prefix}/earnings`, allowed, async (req, res) => {
      res.json(await getEarnings(ctx, actorOf(req)));
    });
    router.get(`${prefix}/earnings/lines`, allowed, async (req, res) => {
      const { period } = parseInput(periodParam, req.query);
      res.json(await getEarningLines(ctx, actorOf(req), period));
    });
    router.get(`${prefix}/statements`, allowed, async (req, res) => {
      res.json({ statements: await listStatements(ctx.db.manager, { organizationId: actorOf(req).organizationId, limit: 120 }) });
    });
    router.get(`${prefix}/statements/:id`, allowed, async (req, res) => {
      const { id } = parseInput(idParam, req.params);
      res.json(await getStatementDetail(ctx.db.manager, { organizationId: actorOf(req).organizationId }, id));
    });
    for (const format of ['csv', 'pdf'] as const) {
      router.get(`${prefix}/statements/:id/${format}`, allowed, async (req, res) => {
        const { id } = parseInput(idParam, req.params);
        await sendDocument(ctx, res, await getStatementDetail(ctx.db.manager, { organizationId: actorOf(req).organizationId }, id), format);
      });
    }
  };
  payee('/partner', 'payouts.manage');
  payee('/lab', 'lab-payouts.manage');

  const settle = guard.authorize('settlement.run');
  router.get('/network/settlements', settle, async (_req, res) => {
    res.json(await settlementOverview(ctx));
  });
  router.post('/network/settlements', settle, async (req, res) => {
    const input = parseInput(settlementRunInput, req.body ?? {});
    res.status(201).json(await runSettlement(ctx, { period: input.period, organizationIds: input.organizationIds, trigger: 'manual', actor: actorOf(req) }));
  });
  router.get('/network/settlements/:period', settle, async (req, res) => {
    const { period } = parseInput(periodParam, req.params);
    res.json(await settlementPeriod(ctx, period));
  });
  router.get('/network/statements/:id', settle, async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    res.json(await getStatementDetail(ctx.db.manager, {}, id));
  });
  for (const format of ['csv', 'pdf'] as const) {
    router.get(`/network/statements/:id/${format}`, settle, async (req, res) => {
      const { id } = parseInput(idParam, req.params);
      await sendDocument(ctx, res, await getStatementDetail(ctx.db.manager, {}, id), format);
    });
  }
  router.post('/network/statements/:id/retry', settle, async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    const outcome = await retryPayoutNow(ctx, actorOf(req), id);
    res.json({ outcome, statement: await getStatementDetail(ctx.db.manager, {}, id) });
  });
  return router;
}
