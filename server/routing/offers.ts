import type { EntityManager } from 'typeorm';
import { declineOfferInput } from '@shared/schemas/referrals';
import { labOfferListQuery, type LabOfferDto } from '@shared/schemas/labs';
import { AppError } from '../lib/errors';
import type { Actor, ServiceContext } from '../lib/context';
import { parseInput } from '../lib/validate';
import { Organization } from '../organizations';
import { Referral } from '../referrals/entities';
import { acceptInTransaction, declineInTransaction, expireInTransaction, lockReferral } from './dispatch';
import { LabOffer } from './entities';
import { formatLocal } from './notify';
import { personActor } from './timeline';

// A lab's side of offers: the lab manager sees the offers made to the own lab (never a case that was not
// offered to it), and accepts or declines them while they are pending.

function labIdOf(actor: Actor): string {
  if (actor.organizationKind !== 'lab') throw AppError.forbidden('Only a lab answers offers');
  return actor.organizationId;
}

type Photo = LabOfferDto['case']['photos'][number];

export function toLabOfferDto(offer: LabOffer, referral: Referral, shop: Pick<Organization, 'name' | 'city' | 'region'>, photos: Photo[] = []): LabOfferDto {
  const t = referral.triage;
  return {
    id: offer.id,
    status: offer.status,
    offeredAt: offer.offeredAt.toISOString(),
    deadline: offer.deadline.toISOString(),
    respondedAt: offer.respondedAt?.toISOString() ?? null,
    respondedBy: offer.respondedByName,
    autoAccepted: offer.autoAccepted,
    declineReason: offer.declineReason,
    declineNote: offer.declineNote,
    rank: offer.rank,
    distanceKm: offer.distanceKm,
    estimatedDays: offer.estimatedDays,
    case: {
      id: referral.id,
      reference: referral.reference,
      shop: { name: shop.name, city: shop.city, region: shop.region },
      device: {
        mediaType: referral.mediaType,
        capacityGb: referral.capacityGb,
        interface: referral.deviceInterface,
        make: referral.deviceMake,
        model: referral.deviceModel,
        memberCount: referral.memberCount,
      },
      symptoms: referral.symptoms,
      description: referral.description,
      priorities: referral.priorities,
      sensitivity: referral.sensitivity,
      battery: referral.battery ? { installed: referral.battery.installed, condition: referral.battery.condition, wattHours: referral.battery.wattHours } : null,
      triage: { requiredSkills: t.requiredSkills, needsCleanAir: t.needsCleanAir, needsHealthDataAgreement: t.needsHealthDataAgreement, cautions: t.cautions },
      photos,
    },
  };
}

async function offerRows(manager: EntityManager, where: { labId: string; offerId?: string; status?: string }) {
  const qb = manager
    .createQueryBuilder(LabOffer, 'o')
    .innerJoinAndMapOne('o.referral', Referral, 'r', 'r.id = o.referralId')
    .innerJoinAndMapOne('o.shop', Organization, 's', 's.id = r.partnerOrganizationId')
    .where('o.labOrganizationId = :labId', { labId: where.labId })
    .orderBy('o.offeredAt', 'DESC')
    .addOrderBy('o.id', 'DESC');
  if (where.offerId) qb.andWhere('o.id = :offerId', { offerId: where.offerId });
  if (where.status) qb.andWhere('o.status = :status', { status: where.status });
  const rows = (await qb.getMany()) as (LabOffer & { referral: Referral; shop: Organization })[];
  // The lab may see the condition photos of cases offered to it; the uploads component serves them at
  // /api/photos/:id to the same readers. Read here from its table, since uploads itself imports routing.
  const photoRows: { id: string; referral_id: string; content_type: string; size_bytes: number }[] = rows.length
    ? await manager.query(
        `SELECT id, referral_id, content_type, size_bytes FROM referral_photos WHERE referral_id = ANY($1::uuid[]) ORDER BY uploaded_at, id`,
        [[...new Set(rows.map((o) => o.referralId))]],
      )
    : [];
  return rows.map((o) =>
    toLabOfferDto(
      o,
      o.referral,
      o.shop,
      photoRows.filter((p) => p.referral_id === o.referralId).map((p) => ({ id: p.id, url: `/api/photos/${p.id}`, contentType: p.content_type, sizeBytes: p.size_bytes })),
    ),
  );
}

export async function listLabOffers(ctx: ServiceContext, actor: Actor, query: unknown): Promise<{ data: LabOfferDto[] }> {
  const { status } = parseInput(labOfferListQuery, query);
  return { data: await offerRows(ctx.db.manager, { labId: labIdOf(actor), status }) };
}

export async function getLabOffer(ctx: ServiceContext, actor: Actor, offerId: string): Promise<LabOfferDto> {
  const [offer] = await offerRows(ctx.db.manager, { labId: labIdOf(actor), offerId });
  if (!offer) throw AppError.notFound('That offer');
  return offer;
}

type Response = { kind: 'accept' } | { kind: 'decline'; input: ReturnType<typeof declineOfferInput.parse> };

/** Locks the case, then the offer, and answers it; an offer past its deadline expires instead (409). */
async function respond(ctx: ServiceContext, actor: Actor, offerId: string, response: Response): Promise<LabOfferDto> {
  const labId = labIdOf(actor);
  const now = new Date();
  const outcome = await ctx.db.transaction(async (manager) => {
    const found = await manager.findOneBy(LabOffer, { id: offerId, labOrganizationId: labId });
    if (!found) throw AppError.notFound('That offer');
    const referral = await lockReferral(manager, found.referralId);
    const offer = await manager.findOne(LabOffer, { where: { id: offerId }, lock: { mode: 'pessimistic_write' } });
    if (!referral || !offer) throw AppError.notFound('That offer');
    if (offer.status !== 'pending') return { error: AppError.conflict(`This offer was already ${offer.status}; nothing changed.`) };
    const lab = await manager.findOneByOrFail(Organization, { id: labId });
    if (offer.deadline <= now) {
      // Its time ran out before the job got to it: expire it now and move the case on, then say so.
      await expireInTransaction(ctx, manager, referral, offer, now);
      return { error: AppError.conflict(`This offer expired at ${formatLocal(offer.deadline, lab.timeZone)} and has gone to the next lab.`) };
    }
    const who = await personActor(manager, actor.userId, 'Lab manager');
    if (response.kind === 'accept') await acceptInTransaction(ctx, manager, referral, offer, lab, { actor: who, now });
    else await declineInTransaction(ctx, manager, referral, offer, lab.name, { actor: who, input: response.input, now });
    return { error: null };
  });
  if (outcome.error) throw outcome.error;
  return getLabOffer(ctx, actor, offerId);
}

export async function acceptOffer(ctx: ServiceContext, actor: Actor, offerId: string): Promise<LabOfferDto> {
  return respond(ctx, actor, offerId, { kind: 'accept' });
}

export async function declineOffer(ctx: ServiceContext, actor: Actor, offerId: string, input: unknown): Promise<LabOfferDto> {
  return respond(ctx, actor, offerId, { kind: 'decline', input: parseInput(declineOfferInput, input) });
}
