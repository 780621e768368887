import { Router } from 'express';
import { z } from 'zod';
import { createApiKeyInput } from '@shared/schemas/partner-api';
import { actorOf, type Guard } from '../auth';
import { parseInput } from '../lib/validate';
import type { ServiceContext } from '../lib/context';
import * as apiKeys from './api-keys';

const idParam = z.object({ id: z.string().uuid('Not a valid id') });

/** The shop admin's key management in the app (session sign-in, not an API key). */
export function apiKeyRoutes(ctx: ServiceContext, guard: Guard): Router {
  const router = Router();
  router.get('/partner/api-keys', guard.authorize('api-keys.manage'), async (req, res) => {
    res.json(await apiKeys.listApiKeys(ctx, actorOf(req)));
  });
  router.post('/partner/api-keys', guard.authorize('api-keys.manage'), async (req, res) => {
    const input = parseInput(createApiKeyInput, req.body ?? {});
    res.setHeader('Cache-Control', 'no-store');
    res.status(201).json(await apiKeys.createApiKey(ctx, actorOf(req), input, { ip: req.ip }));
  });
  router.delete('/partner/api-keys/:id', guard.authorize('api-keys.manage'), async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    res.json(await apiKeys.revokeApiKey(ctx, actorOf(req), id, { ip: req.ip }));
  });
  return router;
}
