import { Router, type Request, type RequestHandler } from 'express';
import { rateLimit } from 'express-rate-limit';
import type { EntityManager } from 'typeorm';
import multer from 'multer';
import { z } from 'zod';
import { MANIFEST_MAX_BYTES } from '@shared/schemas/lab-work';
import { CUSTOMER_LINK_SCHEME, customerTokenPattern } from '@shared/schemas/customer';
import { actorOf, type Guard } from '../auth';
import { AppError } from '../lib/errors';
import type { ServiceContext } from '../lib/context';
import { parseInput } from '../lib/validate';
import { storageFromConfig, type BlobStorage } from '../uploads';
import type { LabPrincipal } from './access';
import { confirmCheckoutReturn, startCheckout } from './checkout';
import { asCustomer, getCustomerCase, setReturnAddress, type CustomerRequest } from './customer';
import { recordEvaluation, startEvaluation } from './evaluation';
import { reportImaging } from './imaging';
import { createLabKey, labKeyOr, listLabKeys, revokeLabKey } from './lab-keys';
import { confirmFiles, disputeFiles, uploadManifest } from './manifest';
import { approveQuote, declineQuote, sendQuote, type CustomerMeta } from './quotes';
import { refundCase } from './refunds';
import type { Referral } from '../referrals/entities';
import { getLabCase, getShopLabWork, listBench } from './views';

const idParam = z.object({ id: z.string().min(1).max(100) });

/** The person signed in, or the lab's tooling key, as the worker on a lab's case. */
function principalOf(req: Request): LabPrincipal {
  if (req.labKey) return req.labKey;
  const actor = actorOf(req);
  if (actor.organizationKind !== 'lab') throw AppError.forbidden('Only the lab that holds a case works on it');
  return { type: 'user', organizationId: actor.organizationId, userId: actor.userId };
}

function labOf(req: Request): string {
  const actor = actorOf(req);
  if (actor.organizationKind !== 'lab') throw AppError.forbidden('Only a lab has a bench');
  return actor.organizationId;
}

/** The manifest CSV in the multipart field `manifest`, held in memory up to the size limit. */
function receiveManifest(): RequestHandler {
  const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: MANIFEST_MAX_BYTES, files: 1, fields: 5, parts: 6 } }).single('manifest');
  return (req, res, next) =>
    upload(req, res, (err?: unknown) => {
      if (!err) return next();
      if (err instanceof multer.MulterError) {
        const message =
          err.code === 'LIMIT_FILE_SIZE'
            ? `The file list is larger than ${MANIFEST_MAX_BYTES / 1024 / 1024} MB`
            : err.code === 'LIMIT_UNEXPECTED_FILE'
              ? 'Send the CSV in the field “manifest”'
              : `The upload could not be read (${err.message})`;
        return next(AppError.validation([{ path: 'manifest', message }]));
      }
      next(err);
    });
}

/** The lab's bench: the queue, the case page, evaluation, quote, imaging and the recovered-file list. */
export function labWorkRoutes(ctx: ServiceContext, guard: Guard, storage: BlobStorage = storageFromConfig(ctx.config)): Router {
  const router = Router();
  const benchOrKey = labKeyOr(ctx, guard.authorize('bench.work'));

  router.get('/lab/bench', guard.authorize('bench.work'), async (req, res) => {
    res.json(await listBench(ctx, labOf(req), req.query));
  });
  router.get('/lab/cases/:id', guard.authorize('bench.work'), async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    res.json(await getLabCase(ctx, labOf(req), id));
  });
  router.post('/lab/cases/:id/evaluation/start', guard.authorize('bench.work'), async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    const caseId = await startEvaluation(ctx, principalOf(req), id, { ip: req.ip });
    res.json(await getLabCase(ctx, labOf(req), caseId));
  });
  router.put('/lab/cases/:id/evaluation', guard.authorize('bench.work'), async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    const caseId = await recordEvaluation(ctx, principalOf(req), id, req.body, { ip: req.ip });
    res.json(await getLabCase(ctx, labOf(req), caseId));
  });
  router.post('/lab/cases/:id/quote', guard.authorize('quotes.send'), async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    const caseId = await sendQuote(ctx, principalOf(req), id, req.body, { ip: req.ip });
    res.status(201).json(await getLabCase(ctx, labOf(req), caseId));
  });

  router.post('/lab/cases/:id/refunds', guard.authorize('refunds.issue'), async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    const caseId = await refundCase(ctx, principalOf(req), id, req.body, { ip: req.ip, idempotencyKey: req.header('idempotency-key') });
    res.status(201).json(await getLabCase(ctx, labOf(req), caseId));
  });

  // The lab's tooling may call these two with the lab's key instead of a person's sign-in.
  router.post('/lab/cases/:id/imaging', benchOrKey, async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    const who = principalOf(req);
    const caseId = await reportImaging(ctx, who, id, req.body, { ip: req.ip });
    res.status(201).json(await getLabCase(ctx, who.organizationId, caseId));
  });
  router.post('/lab/cases/:id/manifest', benchOrKey, receiveManifest(), async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    const who = principalOf(req);
    const file = (req as { file?: Express.Multer.File }).file;
    const caseId = await uploadManifest(ctx, storage, who, id, file ? { originalName: file.originalname, bytes: file.buffer } : null, { ip: req.ip });
    res.status(201).json(await getLabCase(ctx, who.organizationId, caseId));
  });

  router.get('/lab/api-keys', guard.authorize('lab-api-keys.manage'), async (req, res) => {
    res.json(await listLabKeys(ctx, actorOf(req)));
  });
  router.post('/lab/api-keys', guard.authorize('lab-api-keys.manage'), async (req, res) => {
    res.setHeader('Cache-Control', 'no-store');
    res.status(201).json(await createLabKey(ctx, actorOf(req), req.body, { ip: req.ip }));
  });
  router.delete('/lab/api-keys/:id', guard.authorize('lab-api-keys.manage'), async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    res.json(await revokeLabKey(ctx, actorOf(req), id, { ip: req.ip }));
  });

  // The shop's (and the network's) view of the lab's work on a case.
  router.get('/referrals/:id/lab-work', guard.authorize('referrals.read'), async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    const actor = actorOf(req);
    if (actor.organizationKind === 'lab') throw AppError.forbidden('Labs see their cases on the bench');
    res.json(await getShopLabWork(ctx, actor.organizationKind === 'network' ? { network: true } : { partnerOrganizationId: actor.organizationId }, id));
  });

  return router;
}

/** The customer link from `Authorization: CustomerLink <token>`; anything else is not found. */
function customerRequest(req: Request): CustomerRequest {
  const m = new RegExp(`^${CUSTOMER_LINK_SCHEME}\\s+(\\S+)\\s*$`).exec(req.header('authorization') ?? '');
  if (!m || !customerTokenPattern.test(m[1]!)) {
    throw new AppError('not_found', 404, 'This link does not open a case. It may have been switched off; ask your repair shop for a new one.');
  }
  return { token: m[1]!, ip: req.ip ?? null, userAgent: req.header('user-agent') ?? null };
}

/** The customer's page: no account, the link's token in the Authorization header, never in a URL. */
export function customerRoutes(ctx: ServiceContext): Router {
  const router = Router();
  // A link is 256 random bits, so guessing is hopeless; these limits keep anyone from trying at volume
  // (and from loading the case page in a loop). Counted per client address, in this process.
  const limited = (limit: number, windowMs: number, message: string, skipSuccessfulRequests = false) =>
    rateLimit({
      windowMs,
      limit,
      skipSuccessfulRequests,
      standardHeaders: 'draft-7',
      legacyHeaders: false,
      handler: (_req, _res, next) =>
        next(new AppError('rate_limited', 429, message, undefined, { headers: { 'Retry-After': String(Math.ceil(windowMs / 1000)) } })),
    });
  const { perMinute, failedLookupsPer15Minutes } = ctx.config.customerRateLimit;
  router.use(
    '/customer',
    limited(perMinute, 60_000, `More than ${perMinute} requests a minute from here. Wait a minute and try again.`),
    limited(failedLookupsPer15Minutes, 15 * 60_000, 'Too many links that do not open a case from here. Wait 15 minutes and try again.', true),
  );
  router.use((_req, res, next) => {
    // Nothing the customer sees is kept by browsers or proxies.
    res.setHeader('Cache-Control', 'no-store');
    next();
  });
  /** A customer action (the case locked, the link checked, one transaction), answered with the page's new state. */
  const customerAction =
    (action: (manager: EntityManager, referral: Referral, rawInput: unknown, meta: CustomerMeta) => Promise<void>): RequestHandler =>
    async (req, res) => {
      const request = customerRequest(req);
      await asCustomer(ctx, request, (manager, referral, meta) => action(manager, referral, req.body, meta));
      res.json(await getCustomerCase(ctx, request.token));
    };

  router.get('/customer/case', async (req, res) => {
    res.json(await getCustomerCase(ctx, customerRequest(req).token));
  });
  router.post('/customer/case/quote/approve', customerAction(approveQuote));
  router.post('/customer/case/quote/decline', customerAction(declineQuote));
  router.post('/customer/case/files/confirm', customerAction(confirmFiles));
  router.post('/customer/case/files/dispute', customerAction(disputeFiles));
  router.put('/customer/case/return-address', customerAction(setReturnAddress));
  router.post('/customer/case/checkout', async (req, res) => {
    res.status(201).json(await asCustomer(ctx, customerRequest(req), (manager, referral) => startCheckout(ctx, manager, referral)));
  });
  router.post('/customer/case/checkout/confirm', async (req, res) => {
    const request = customerRequest(req);
    const referralId = await asCustomer(ctx, request, async (_m, referral) => referral.id);
    await confirmCheckoutReturn(ctx, referralId, req.body);
    res.json(await getCustomerCase(ctx, request.token));
  });
  return router;
}
