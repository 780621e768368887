import { Router } from 'express';
import { z } from 'zod';
import type { CustodySigningKeyDto } from '@shared/schemas/custody';
import { actorOf, type Guard } from '../auth';
import type { ServiceContext } from '../lib/context';
import { parseInput } from '../lib/validate';
import * as custody from './service';
import { custodySigner, type CustodySigner } from './signing';

const idParam = z.object({ id: z.string().uuid('Not a valid id') });

/** The case's custody log, its signed export, and the key that checks the export. */
export function custodyRoutes(ctx: ServiceContext, guard: Guard, signer: CustodySigner = custodySigner(ctx.config)): Router {
  const router = Router();

  router.get('/referrals/:id/custody', guard.authorize('custody.read'), async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    res.json(await custody.readCustody(ctx, actorOf(req), id));
  });

  router.post('/referrals/:id/custody', guard.authorize('custody.append'), async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    res.status(201).json(await custody.recordLabCustody(ctx, actorOf(req), id, req.body));
  });

  router.get('/referrals/:id/custody.pdf', guard.authorize('custody.read'), async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    const signed = await custody.exportCustodyPdf(ctx, signer, actorOf(req), id);
    res.setHeader('Content-Type', 'application/pdf');
    res.setHeader('Content-Disposition', `attachment; filename="${signed.fileName}"`);
    res.setHeader('Cache-Control', 'no-store');
    res.setHeader('X-Custody-Head-Hash', signed.statement.headHash);
    res.setHeader('X-Custody-Entry-Count', String(signed.statement.entryCount));
    res.setHeader('X-Custody-Exported-At', signed.statement.exportedAt);
    res.setHeader('X-Custody-Signature', signed.signature);
    res.setHeader('X-Custody-Key-Id', signed.keyId);
    res.send(signed.pdf);
  });

  router.get('/custody/signing-key', guard.authorize('custody.read'), (_req, res) => {
    const body: CustodySigningKeyDto = { algorithm: 'Ed25519', keyId: signer.keyId, publicKeyPem: signer.publicKeyPem, development: signer.development };
    res.json(body);
  });

  router.post('/custody/verify', guard.authorize('custody.read'), async (req, res) => {
    res.json(await custody.verifyCustodySignature(ctx, signer, actorOf(req), req.body));
  });

  return router;
}
