import { Router, type NextFunction, type Request, type RequestHandler, type Response } from 'express';
import { z } from 'zod';
import { roleCan, type Permission } from '@shared/permissions';
import { actorOf, type Guard } from '../auth';
import { AppError } from '../lib/errors';
import type { Actor, ServiceContext } from '../lib/context';
import { parseInput } from '../lib/validate';
import { actorOfKey, apiKeyOf, idempotency, perKeyRateLimit, requireApiKey } from '../partner-api';
import type { Channel } from './dto';
import { listOutbound, quoteReturn, quoteTransfer } from './outbound';
import * as shipping from './service';
import { handleShippingWebhook } from './tracking';

const idParam = z.object({ id: z.string().uuid('Not a valid id') });
const appChannel: Channel = { kind: 'app' };

async function userActor(ctx: ServiceContext, actor: Actor): Promise<shipping.ShippingActor> {
  const rows: { name: string }[] = await ctx.db.query(`SELECT name FROM users WHERE id = $1`, [actor.userId]);
  return { type: 'user', id: actor.userId, name: rows[0]?.name ?? 'Unknown user' };
}

const viewerOf = (actor: Actor): shipping.ShippingViewer => ({ organizationId: actor.organizationId, organizationKind: actor.organizationKind });

/** Signed in with any one of the permissions. */
function authorizeAny(guard: Guard, wanted: Permission[]): RequestHandler {
  return (req: Request, res: Response, next: NextFunction) =>
    guard.authenticate(req, res, (err?: unknown) => {
      if (err) return next(err);
      if (!wanted.some((p) => roleCan(req.actor!.role, p))) return next(AppError.forbidden());
      next();
    });
}

function sendPdf(res: Response, doc: { pdf: Buffer; fileName: string }, disposition: 'inline' | 'attachment' = 'attachment') {
  res.setHeader('Content-Type', 'application/pdf');
  res.setHeader('Content-Length', String(doc.pdf.length));
  res.setHeader('Content-Disposition', `${disposition}; filename="${doc.fileName.replace(/[^\w.-]/g, '_')}"`);
  res.setHeader('Cache-Control', 'private, no-store');
  res.send(doc.pdf);
}

/** POST /api/webhooks/shipping: the raw body (express.raw in app.ts) is what the signature covers. */
export function shippingWebhookRoutes(ctx: ServiceContext): Router {
  const router = Router();
  router.post('/webhooks/shipping', async (req, res) => {
    const raw = Buffer.isBuffer(req.body) ? req.body : undefined;
    res.json(await handleShippingWebhook(ctx, raw, req.headers));
  });
  return router;
}

/** The web app's shipping routes: the shop's labels, shipments, documents, and the lab's outgoing boxes. */
export function shippingRoutes(ctx: ServiceContext, guard: Guard): Router {
  const router = Router();
  const readShipments = authorizeAny(guard, ['referrals.read', 'inbound.read', 'outbound.ship']);
  const buyLabels = authorizeAny(guard, ['labels.buy', 'outbound.ship']);

  router.get('/referrals/:id/shipping', guard.authorize('referrals.read'), async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    res.json(await shipping.caseShipping(ctx, viewerOf(actorOf(req)), id, appChannel));
  });
  router.post('/referrals/:id/shipments', guard.authorize('labels.buy'), async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    const actor = actorOf(req);
    res.status(201).json(await shipping.quoteInbound(ctx, { partnerOrganizationId: actor.organizationId, actor: await userActor(ctx, actor) }, id, req.body, appChannel));
  });
  router.get('/shipments/:id', readShipments, async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    res.json(await shipping.getShipment(ctx, viewerOf(actorOf(req)), id, appChannel));
  });
  router.post('/shipments/:id/buy', buyLabels, async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    const actor = actorOf(req);
    res.json(await shipping.buyShipment(ctx, viewerOf(actor), await userActor(ctx, actor), id, req.body, appChannel));
  });
  router.post('/shipments/:id/void', buyLabels, async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    const actor = actorOf(req);
    res.json(await shipping.voidShipment(ctx, viewerOf(actor), await userActor(ctx, actor), id, appChannel));
  });
  router.get('/shipments/:id/label.pdf', readShipments, async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    sendPdf(res, await shipping.labelPdf(ctx, viewerOf(actorOf(req)), id));
  });
  router.get('/shipments/:id/packing-slip.pdf', readShipments, async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    sendPdf(res, await shipping.packingSlip(ctx, viewerOf(actorOf(req)), id));
  });

  router.get('/lab/outbound', guard.authorize('outbound.ship'), async (req, res) => {
    res.json(await listOutbound(ctx, labIdOf(actorOf(req)), appChannel));
  });
  router.post('/lab/cases/:id/returns', guard.authorize('outbound.ship'), async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    const actor = actorOf(req);
    res.status(201).json(await quoteReturn(ctx, labIdOf(actor), await userActor(ctx, actor), id, req.body, appChannel));
  });
  router.post('/lab/cases/:id/transfers', guard.authorize('outbound.ship'), async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    const actor = actorOf(req);
    res.status(201).json(await quoteTransfer(ctx, labIdOf(actor), await userActor(ctx, actor), id, req.body, appChannel));
  });
  return router;
}

function labIdOf(actor: Actor): string {
  if (actor.organizationKind !== 'lab') throw AppError.forbidden('Only a lab ships returns and transfers');
  return actor.organizationId;
}

/**
 * The partner API's shipment routes, mounted at /api/v1 beside the partner API's own router with the same
 * key authentication, rate limit and idempotency (a request the partner router already authenticated is not
 * counted twice).
 */
export function shippingPartnerApiRoutes(ctx: ServiceContext): Router {
  const router = Router();
  const authenticate = requireApiKey(ctx);
  const limit = perKeyRateLimit(ctx);
  router.use((req, res, next) => {
    if (req.apiKey) return next();
    authenticate(req, res, (err?: unknown) => (err ? next(err) : limit(req, res, next)));
  });
  const idempotent = idempotency(ctx);
  const channel = (): Channel => ({ kind: 'api', appUrl: ctx.config.appUrl });
  const viewer = (req: Request): shipping.ShippingViewer => ({ organizationId: apiKeyOf(req).organizationId, organizationKind: 'partner' });

  router.post('/referrals/:id/shipments', idempotent, async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    const key = apiKeyOf(req);
    res.status(201).json(await shipping.quoteInbound(ctx, { partnerOrganizationId: key.organizationId, actor: actorOfKey(key) }, id, req.body, channel()));
  });
  router.get('/shipments/:id', async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    res.json(await shipping.getShipment(ctx, viewer(req), id, channel()));
  });
  router.post('/shipments/:id/buy', idempotent, async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    res.json(await shipping.buyShipment(ctx, viewer(req), actorOfKey(apiKeyOf(req)), id, req.body, channel()));
  });
  router.post('/shipments/:id/void', idempotent, async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    res.json(await shipping.voidShipment(ctx, viewer(req), actorOfKey(apiKeyOf(req)), id, channel()));
  });
  router.get('/shipments/:id/label', async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    sendPdf(res, await shipping.labelPdf(ctx, viewer(req), id));
  });
  router.get('/shipments/:id/packing-slip', async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    sendPdf(res, await shipping.packingSlip(ctx, viewer(req), id));
  });
  return router;
}
