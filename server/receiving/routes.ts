import { pipeline } from 'node:stream/promises';
import { Router, type RequestHandler } from 'express';
import multer from 'multer';
import { z } from 'zod';
import { actorOf, type Guard } from '../auth';
import { AppError } from '../lib/errors';
import type { ServiceContext } from '../lib/context';
import { parseInput } from '../lib/validate';
import { storageFromConfig, type BlobStorage } from '../uploads';
import * as receiving from './service';

const idParam = z.object({ id: z.string().uuid('Not a valid id') });

/**
 * A check-in is JSON, or multipart/form-data with the JSON in the field `data` and the photos in the
 * field `photos` (at most 8 × 10 MB, held in memory).
 */
function checkInBody(): RequestHandler {
  const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: 10 * 1024 * 1024, files: 8, fields: 5, fieldSize: 64 * 1024 } }).array('photos');
  return (req, res, next) =>
    upload(req, res, (err?: unknown) => {
      if (err instanceof multer.MulterError) {
        return next(AppError.validation([{ path: 'photos', message: err.code === 'LIMIT_FILE_SIZE' ? 'Each photo may be at most 10 MB' : `The upload could not be read (${err.message})` }]));
      }
      if (err) return next(err);
      if (req.is('multipart/form-data')) {
        try {
          req.body = JSON.parse(String((req.body as { data?: unknown })?.data ?? '{}'));
        } catch {
          return next(AppError.validation([{ path: 'data', message: 'The field “data” must hold the check-in as JSON' }]));
        }
      }
      next();
    });
}

/** The lab's inbound board, box look-up and check-in (/api/lab/…), and declining after arrival. */
export function receivingRoutes(ctx: ServiceContext, guard: Guard, storage: BlobStorage = storageFromConfig(ctx.config)): Router {
  const router = Router();

  router.get('/lab/inbound', guard.authorize('inbound.read'), async (req, res) => {
    res.json(await receiving.inboundBoard(ctx, actorOf(req), req.query));
  });
  router.get('/lab/check-in/lookup', guard.authorize('inbound.check-in'), async (req, res) => {
    res.json(await receiving.lookupBox(ctx, actorOf(req), req.query, { kind: 'app' }));
  });
  router.post('/lab/check-ins', guard.authorize('inbound.check-in'), checkInBody(), async (req, res) => {
    const files = Array.isArray(req.files) ? (req.files as Express.Multer.File[]) : [];
    const photos = files.map((f) => ({ originalName: f.originalname, bytes: f.buffer }));
    res.status(201).json(await receiving.checkInBox(ctx, storage, actorOf(req), req.body, photos));
  });
  router.get('/check-in-photos/:id', guard.authenticate, async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    const photo = await receiving.openCheckInPhoto(ctx, storage, actorOf(req), id);
    res.setHeader('Content-Type', photo.contentType);
    res.setHeader('Content-Length', String(photo.sizeBytes));
    res.setHeader('ETag', photo.etag);
    res.setHeader('Cache-Control', 'private, max-age=86400');
    res.setHeader('X-Content-Type-Options', 'nosniff');
    await pipeline(photo.stream, res);
  });
  router.post('/lab/cases/:id/release-hold', guard.authorize('offers.respond'), async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    res.json(await receiving.releaseHold(ctx, actorOf(req), id, req.body));
  });
  router.post('/lab/cases/:id/decline-after-arrival', guard.authorize('offers.respond'), async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    res.json(await receiving.declineAfterArrival(ctx, actorOf(req), id, req.body));
  });
  return router;
}
