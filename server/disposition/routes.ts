import { pipeline } from 'node:stream/promises';
import { Router } from 'express';
import { z } from 'zod';
import { actorOf, type Guard } from '../auth';
import type { ServiceContext } from '../lib/context';
import { parseInput } from '../lib/validate';
import { storageFromConfig, type BlobStorage } from '../uploads';
import * as disposition from './service';

const idParam = z.object({ id: z.string().uuid('Not a valid id') });
const certificateParams = z.object({ id: z.string().uuid('Not a valid id'), certificateId: z.string().uuid('Not a valid id') });

/** Returning or sanitizing a case's media, and the certificates of sanitization attached to it. */
export function dispositionRoutes(ctx: ServiceContext, guard: Guard, storage: BlobStorage = storageFromConfig(ctx.config)): Router {
  const router = Router();

  router.get('/referrals/:id/dispositions', guard.authorize('custody.read'), async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    res.json(await disposition.readDisposition(ctx, actorOf(req), id));
  });

  router.post('/referrals/:id/dispositions', guard.authorize('disposition.record'), async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    const recorded = await disposition.recordDisposition(ctx, storage, actorOf(req), id, req.body);
    res.status(201).json(recorded.disposition);
  });

  router.get('/referrals/:id/certificates/:certificateId.pdf', guard.authorize('custody.read'), async (req, res) => {
    const { id, certificateId } = parseInput(certificateParams, req.params);
    const { certificate, stream } = await disposition.openCertificate(ctx, storage, actorOf(req), id, certificateId);
    res.setHeader('Content-Type', 'application/pdf');
    res.setHeader('Content-Length', String(certificate.sizeBytes));
    res.setHeader('Content-Disposition', `inline; filename="certificate-of-sanitization-${certificate.number}.pdf"`);
    res.setHeader('ETag', `"${certificate.contentHash}"`);
    res.setHeader('Cache-Control', 'private, max-age=86400');
    res.setHeader('X-Content-Type-Options', 'nosniff');
    try {
      await pipeline(stream, res);
    } catch (err) {
      // A reader that hangs up halfway (a closed tab) is not our failure.
      if ((err as NodeJS.ErrnoException).code !== 'ERR_STREAM_PREMATURE_CLOSE') throw err;
    }
  });

  return router;
}
