import { Router } from 'express';
import type { ServiceContext } from '../lib/context';
import { idempotency } from './idempotency';
import { apiKeyOf, perKeyRateLimit, requireApiKey } from './middleware';
import { openApiDocument } from './openapi';

/** The partner API, mounted at /api/v1: every route but the document needs a key. */
export function partnerApiRoutes(ctx: ServiceContext): Router {
  const router = Router();

  router.get('/openapi.json', (_req, res) => {
    res.setHeader('Cache-Control', 'public, max-age=300');
    res.json(openApiDocument(ctx.config));
  });

  router.use(requireApiKey(ctx), perKeyRateLimit(ctx));
  // After body parsing (multer for photos), so that the fingerprint covers what was sent.
  const idempotent = idempotency(ctx);
  void idempotent;

  router.get('/me', (req, res) => {
    const key = apiKeyOf(req);
    res.json({ apiKey: { id: key.apiKeyId, name: key.name, prefix: key.prefix }, organization: { id: key.organizationId, name: key.organizationName } });
  });

  return router;
}
