import type { Readable } from 'node:stream';
import type { EntityManager } from 'typeorm';
import { PHOTO_MAX_BYTES, PHOTOS_PER_REFERRAL, type ReferralPhotoDto } from '@shared/schemas/partner-api';
import type { FieldError } from '@shared/schemas/api-error';
import type { OrganizationKind } from '@shared/vocabulary';
import { AppError } from '../lib/errors';
import { logger } from '../lib/logger';
// Through routing's public file rather than referrals', so that referrals may list photos from here without a cycle.
import { recordTimeline } from '../routing';
import type { ServiceContext } from '../lib/context';
import { ReferralPhoto } from './entities';
import { detectPhotoType, type PhotoContentType } from './image-type';
import { contentHash, type BlobStorage } from './storage';

export interface IncomingPhoto {
  /** The sender's file name: used in messages only, never to decide the type. */
  originalName: string;
  bytes: Buffer;
}

/** Who adds photos: a shop user or a shop's API key, always on behalf of the shop. */
export interface PhotoUploader {
  partnerOrganizationId: string;
  actor: { type: 'user' | 'api_key'; id: string; name?: string };
}

/** Who asks to see a photo. */
export interface PhotoViewer {
  organizationId: string;
  organizationKind: OrganizationKind;
}

/** Cases whose photos no longer change. */
const FROZEN_STATUSES = ['cancelled', 'closed'];
const MB = PHOTO_MAX_BYTES / 1024 / 1024;
const quoted = (name: string) => `“${name.slice(0, 120)}”`;

export function photoUrl(id: string): string {
  return `/api/photos/${id}`;
}

export function toPhotoDto(p: ReferralPhoto): ReferralPhotoDto {
  return { id: p.id, url: photoUrl(p.id), contentType: p.contentType, sizeBytes: p.sizeBytes, uploadedAt: p.uploadedAt.toISOString() };
}

/** A case's photos, oldest first; for the referrals component to put into its case view. */
export async function listReferralPhotos(manager: EntityManager, referralId: string): Promise<ReferralPhotoDto[]> {
  const photos = await manager.find(ReferralPhoto, { where: { referralId }, order: { uploadedAt: 'ASC', id: 'ASC' } });
  return photos.map(toPhotoDto);
}

/**
 * Adds condition photos to one of the shop's cases. All or nothing: if any photo is refused
 * (not an image we accept, too large, too many for the case) nothing is stored and each refusal
 * is named in the 400's fields. A photo the case already has is not added twice.
 */
export async function addReferralPhotos(
  ctx: ServiceContext,
  storage: BlobStorage,
  uploader: PhotoUploader,
  referralId: string,
  files: IncomingPhoto[],
): Promise<ReferralPhotoDto[]> {
  if (files.length === 0) {
    throw AppError.validation([{ path: 'photos', message: 'Attach at least one photo (multipart/form-data, field “photos”)' }]);
  }
  return ctx.db.transaction(async (manager) => {
    // Locked so that two uploads at once cannot both pass the per-case limit.
    const rows: { status: string }[] = await manager.query(
      `SELECT status FROM referrals WHERE id = $1 AND partner_organization_id = $2 FOR UPDATE`,
      [referralId, uploader.partnerOrganizationId],
    );
    const referral = rows[0];
    if (!referral) throw AppError.notFound('That referral');
    if (FROZEN_STATUSES.includes(referral.status)) throw AppError.conflict(`The case is ${referral.status}; its photos can no longer change`);

    const refusals: FieldError[] = [];
    const accepted: { hash: string; type: PhotoContentType; bytes: Buffer }[] = [];
    for (const [i, file] of files.entries()) {
      if (file.bytes.length === 0) {
        refusals.push({ path: `photos.${i}`, message: `${quoted(file.originalName)} is empty` });
        continue;
      }
      if (file.bytes.length > PHOTO_MAX_BYTES) {
        refusals.push({ path: `photos.${i}`, message: `${quoted(file.originalName)} is larger than ${MB} MB` });
        continue;
      }
      const type = await detectPhotoType(file.bytes);
      if (!type) {
        refusals.push({ path: `photos.${i}`, message: `${quoted(file.originalName)} is not a JPEG, PNG, WebP or HEIC image` });
        continue;
      }
      accepted.push({ hash: contentHash(file.bytes), type, bytes: file.bytes });
    }
    if (refusals.length) throw AppError.validation(refusals, refusals.length === 1 ? 'A photo was refused' : 'Some photos were refused');

    const existing = new Set(
      (await manager.find(ReferralPhoto, { where: { referralId }, select: { contentHash: true } })).map((p) => p.contentHash),
    );
    const fresh = accepted.filter((p, i) => !existing.has(p.hash) && accepted.findIndex((q) => q.hash === p.hash) === i);
    if (existing.size + fresh.length > PHOTOS_PER_REFERRAL) {
      const room = Math.max(0, PHOTOS_PER_REFERRAL - existing.size);
      throw AppError.validation([
        {
          path: 'photos',
          message: `A case has at most ${PHOTOS_PER_REFERRAL} photos; this one has ${existing.size}, so ${room === 0 ? 'no more can be added' : `at most ${room} more can be added`}`,
        },
      ]);
    }

    const uploadedByName = uploader.actor.name ?? (await uploaderName(manager, uploader.actor.id));
    // The bytes first: should the transaction then fail, a stored blob without a row is harmless
    // (content-addressed, and the next upload of the same photo reuses it).
    for (const photo of fresh) {
      await storage.put(photo.bytes);
      await manager.insert(ReferralPhoto, {
        referralId,
        contentHash: photo.hash,
        contentType: photo.type,
        sizeBytes: photo.bytes.length,
        uploadedByType: uploader.actor.type,
        uploadedById: uploader.actor.id,
        uploadedByName,
      });
    }
    if (fresh.length) {
      const n = fresh.length;
      await recordTimeline(manager, referralId, {
        kind: 'photos_added',
        summary: `${n} condition ${n === 1 ? 'photo' : 'photos'} added by ${uploadedByName}.`,
        actor: { type: uploader.actor.type, id: uploader.actor.id, name: uploadedByName },
        details: { count: n },
      });
      // The case changed: partners syncing with updatedSince see it.
      await manager.query(`UPDATE referrals SET updated_at = now() WHERE id = $1`, [referralId]);
    }
    return listReferralPhotos(manager, referralId);
  });
}

async function uploaderName(manager: EntityManager, userId: string): Promise<string> {
  const rows: { name: string }[] = await manager.query(`SELECT name FROM users WHERE id = $1`, [userId]);
  return rows[0]?.name ?? 'Unknown user';
}

/**
 * A photo for whoever may see its case: the shop that opened it, a lab it was offered to (or
 * that holds it), and the network admin. Everyone else is told it does not exist.
 */
export async function openPhoto(
  ctx: ServiceContext,
  storage: BlobStorage,
  viewer: PhotoViewer,
  photoId: string,
): Promise<{ photo: ReferralPhoto; stream: Readable }> {
  const photo = await ctx.db.getRepository(ReferralPhoto).findOneBy({ id: photoId });
  if (!photo || !(await maySeeCase(ctx.db.manager, viewer, photo.referralId))) throw AppError.notFound('That photo');
  const stream = await storage.get(photo.contentHash);
  if (!stream) {
    logger.error({ photoId, contentHash: photo.contentHash }, 'a photo row has no stored bytes');
    throw AppError.notFound('That photo');
  }
  return { photo, stream };
}

export async function maySeeCase(manager: EntityManager, viewer: PhotoViewer, referralId: string): Promise<boolean> {
  if (viewer.organizationKind === 'network') return true;
  const rows = await manager.query(
    `SELECT 1 FROM referrals r
     WHERE r.id = $1 AND (
       r.partner_organization_id = $2
       OR r.lab_organization_id = $2
       OR EXISTS (SELECT 1 FROM lab_offers o WHERE o.referral_id = r.id AND o.lab_organization_id = $2))`,
    [referralId, viewer.organizationId],
  );
  return rows.length > 0;
}
