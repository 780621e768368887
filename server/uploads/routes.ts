import { pipeline } from 'node:stream/promises';
import { Router, type RequestHandler, type Response } from 'express';
import multer from 'multer';
import { z } from 'zod';
import { PHOTO_MAX_BYTES, PHOTOS_PER_REFERRAL } from '@shared/schemas/partner-api';
import { actorOf, type Guard } from '../auth';
import { AppError } from '../lib/errors';
import { parseInput } from '../lib/validate';
import type { ServiceContext } from '../lib/context';
import { photoExtensions } from './image-type';
import * as photos from './service';
import { assertOutsideWebRoot, localDiskStorage, type BlobStorage } from './storage';

const MB = PHOTO_MAX_BYTES / 1024 / 1024;
const idParam = z.object({ id: z.string().uuid('Not a valid id') });

/**
 * multipart/form-data with the images in the field `photos`, held in memory (at most
 * 8 × 10 MB per request). multer's refusals become 400s naming the photo.
 */
const arrived = new WeakMap<object, string[]>();

export function receivePhotos(): RequestHandler {
  const upload = multer({
    storage: multer.memoryStorage(),
    limits: { fileSize: PHOTO_MAX_BYTES, files: PHOTOS_PER_REFERRAL, fields: 10, fieldSize: 1024, parts: PHOTOS_PER_REFERRAL + 10 },
    fileFilter: (req, file, cb) => {
      // Named as they arrive, so that a refusal can say which photo it was.
      const names = arrived.get(req) ?? [];
      names.push(file.originalname);
      arrived.set(req, names);
      cb(null, true);
    },
  }).array('photos');
  return (req, res, next) =>
    upload(req, res, (err?: unknown) => {
      if (!err) return next();
      next(uploadError(err, arrived.get(req) ?? []));
    });
}

function uploadError(err: unknown, names: string[]): unknown {
  if (!(err instanceof multer.MulterError)) return err;
  const index = Math.max(0, names.length - 1);
  const name = (err as { filename?: string }).filename ?? names[index] ?? 'A photo';
  switch (err.code) {
    case 'LIMIT_FILE_SIZE':
      return AppError.validation([{ path: `photos.${index}`, message: `“${name}” is larger than ${MB} MB` }], 'A photo was refused');
    case 'LIMIT_FILE_COUNT':
      return AppError.validation([{ path: 'photos', message: `Send at most ${PHOTOS_PER_REFERRAL} photos at once` }]);
    case 'LIMIT_UNEXPECTED_FILE':
      return AppError.validation([{ path: err.field ?? '(body)', message: 'Send the images in the field “photos”' }]);
    default:
      return AppError.validation([{ path: err.field ?? '(body)', message: `The upload could not be read (${err.message})` }]);
  }
}

export function filesOf(req: Express.Request): photos.IncomingPhoto[] {
  const files = (req as { files?: unknown }).files;
  if (!Array.isArray(files)) return [];
  return (files as Express.Multer.File[]).map((f) => ({ originalName: f.originalname, bytes: f.buffer }));
}

/** Streams a photo with the type recognised at upload; the browser is told not to guess another. */
export async function sendPhoto(res: Response, opened: Awaited<ReturnType<typeof photos.openPhoto>>, ifNoneMatch?: string) {
  const { photo, stream } = opened;
  const etag = `"${photo.contentHash}"`;
  res.setHeader('ETag', etag);
  res.setHeader('Cache-Control', 'private, max-age=86400');
  res.setHeader('X-Content-Type-Options', 'nosniff');
  if (ifNoneMatch === etag) {
    stream.destroy();
    return res.status(304).end();
  }
  res.setHeader('Content-Type', photo.contentType);
  res.setHeader('Content-Length', String(photo.sizeBytes));
  res.setHeader('Content-Disposition', `inline; filename="photo-${photo.id}.${photoExtensions[photo.contentType]}"`);
  await pipeline(stream, res);
}

/** The app's photo routes (signed-in users). */
/** The configured blob storage: the local disk under UPLOAD_DIR, never inside the web root. */
export function storageFromConfig(config: Pick<ServiceContext['config'], 'uploadDir' | 'staticDir'>): BlobStorage {
  assertOutsideWebRoot(config.uploadDir, config.staticDir);
  return localDiskStorage(config.uploadDir);
}

export function photoRoutes(ctx: ServiceContext, guard: Guard, storage: BlobStorage = storageFromConfig(ctx.config)): Router {
  const router = Router();

  router.post('/referrals/:id/photos', guard.authorize('photos.upload'), receivePhotos(), async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    const actor = actorOf(req);
    const uploader = { partnerOrganizationId: actor.organizationId, actor: { type: 'user' as const, id: actor.userId } };
    res.status(201).json(await photos.addReferralPhotos(ctx, storage, uploader, id, filesOf(req)));
  });

  router.get('/photos/:id', guard.authorize('photos.read'), async (req, res) => {
    const { id } = parseInput(idParam, req.params);
    const actor = actorOf(req);
    const opened = await photos.openPhoto(ctx, storage, { organizationId: actor.organizationId, organizationKind: actor.organizationKind }, id);
    await sendPhoto(res, opened, req.header('if-none-match'));
  });

  return router;
}
