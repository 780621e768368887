import { Router, type Request } from 'express';
import { z } from 'zod';
import type { ServiceContext } from '../lib/context';
import { parseInput } from '../lib/validate';
import * as referrals from '../referrals';
import type { ReferralPhotoDto } from '@shared/schemas/partner-api';
import type { ReferralDto } from '@shared/schemas/referrals';
import { addReferralPhotos, filesOf, listReferralPhotos, openPhoto, receivePhotos, sendPhoto, storageFromConfig, type BlobStorage } from '../uploads';
import { actorOfKey } from './api-keys';
import { idempotency } from './idempotency';
import { apiKeyOf, perKeyRateLimit, requireApiKey } from './middleware';
import { openApiDocument } from './openapi';

/**
 * Through the API the shop records the customer's consent itself, under its agreement with the
 * network; a body without `consent` is taken as that record, made by the key.
 */
function withPartnerConsent(body: unknown): unknown {
  if (body && typeof body === 'object' && !Array.isArray(body) && !('consent' in body)) return { ...body, consent: { accepted: true } };
  return body;
}

/** Photo links a key can follow: /api/v1/photos/{id} rather than the app's session route. */
const forKey = (photos: ReferralPhotoDto[]) => photos.map((p) => ({ ...p, url: `/api/v1/photos/${p.id}` }));

const idParam = z.object({ id: z.string().uuid('Not a valid id') });
const scopeOf = (req: Request) => ({ partnerOrganizationId: apiKeyOf(req).organizationId });

/**
 * The partner API, mounted at /api/v1. Every route but the document needs a key and counts
 * against the key's rate limit. Each route here is described in openapi.ts (a test checks both
 * lists agree).
 */
export function partnerApiRoutes(ctx: ServiceContext, storage: BlobStorage = storageFromConfig(ctx.config)): Router {
  const router = Router();

  router.get('/openapi.json', (_req, res) => {
    res.setHeader('Cache-Control', 'public, max-age=300');
    res.json(openApiDocument(ctx.config));
  });

  // The case's own photo list says whether there are any; only then are they read again with their key links.
  const withPhotos = async (dto: ReferralDto): Promise<ReferralDto> =>
    dto.photos.length === 0 ? dto : { ...dto, photos: forKey(await listReferralPhotos(ctx.db.manager, dto.id)) };

  // Intake ranks labs, so its key lookup also reads the network's open cases (one statement fewer per case).
  const ranksLabs = (req: Request) => req.method === 'POST' && req.path === '/referrals';
  router.use(requireApiKey(ctx, { withDirectoryReading: ranksLabs }), perKeyRateLimit(ctx));
  // Per route, after the body is parsed (multer for photos), so that the fingerprint covers what was sent.
  const idempotent = idempotency(ctx);

  router.get('/me', (req, res) => {
    const key = apiKeyOf(req);
    res.json({ apiKey: { id: key.apiKeyId, name: key.name, prefix: key.prefix }, organization: { id: key.organizationId, name: key.organizationName } });
  });

  router.post('/referrals', idempotent, async (req, res) => {
    const key = apiKeyOf(req);
    const created = await referrals.createReferral(
      ctx,
      { partnerOrganizationId: key.organizationId, actor: actorOfKey(key), shop: key.organization, directoryReading: key.directoryReading },
      withPartnerConsent(req.body),
      { idempotencyKey: res.locals.idempotency?.key },
    );
    res.status(201).json(await withPhotos(created));
  });

  router.get('/referrals', async (req, res) => {
    res.json(await referrals.listReferrals(ctx, scopeOf(req), req.query));
  });

  router.get('/referrals/:id', async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    res.json(await withPhotos(await referrals.getReferral(ctx, scopeOf(req), id)));
  });

  router.delete('/referrals/:id', async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    res.json(await withPhotos(await referrals.cancelReferral(ctx, scopeOf(req), id, actorOfKey(apiKeyOf(req)))));
  });

  router.post('/referrals/:id/photos', receivePhotos(), idempotent, async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    const key = apiKeyOf(req);
    const uploader = { partnerOrganizationId: key.organizationId, actor: actorOfKey(key) };
    res.status(201).json(forKey(await addReferralPhotos(ctx, storage, uploader, id, filesOf(req))));
  });

  router.get('/photos/:id', async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    const opened = await openPhoto(ctx, storage, { organizationId: apiKeyOf(req).organizationId, organizationKind: 'partner' }, id);
    await sendPhoto(res, opened, req.header('if-none-match'));
  });

  router.post('/routing/preview', idempotent, async (req, res) => {
    res.json(await referrals.previewRouting(ctx, apiKeyOf(req).organizationId, req.body));
  });

  return router;
}
