import { In, type EntityManager } from 'typeorm';
import type { TimelineEntryDto } from '@shared/schemas/referrals';
import { benchQuery, benchStatuses, type BenchRowDto, type LabCaseDto, type PaymentDto, type ReturnAddressDto, type ShopLabWorkDto } from '@shared/schemas/lab-work';
import { mediaTypeLabels } from '@shared/vocabulary';
import { AppError } from '../lib/errors';
import type { ServiceContext } from '../lib/context';
import { parseInput } from '../lib/validate';
import { Organization } from '../organizations';
import { Referral, TimelineEntry } from '../referrals/entities';
import { listReferralPhotos, photoUrl, ReferralPhoto } from '../uploads';
import { findLabCase } from './access';
import { CustomerCheckout, CustomerReturnAddress, LabEvaluation } from './entities';
import { toEvaluationDto } from './evaluation';
import { latestImaging, toImagingDto } from './imaging';
import { currentManifest, toManifestDto } from './manifest';
import { currentQuote, toQuoteDto } from './quotes';
import { refundedMinorOf } from './refunds';

// What each reader sees of the lab's work: the bench queue and case page for the lab, the shop's
// panel, and the amounts on the case for every reader of referrals.

export function toTimelineEntryDto(e: TimelineEntry): TimelineEntryDto {
  return {
    id: e.id,
    at: e.at.toISOString(),
    kind: e.kind,
    summary: e.summary,
    actor: { type: e.actorType, name: e.actorName },
    ...(Object.keys(e.details ?? {}).length ? { details: e.details } : {}),
  };
}

export async function paymentOf(manager: EntityManager, referralId: string): Promise<PaymentDto> {
  const checkouts = await manager.find(CustomerCheckout, { where: { referralId }, order: { createdAt: 'DESC' } });
  const paid = checkouts.find((c) => c.status === 'paid');
  if (paid) {
    return { state: 'paid', amountMinor: paid.amountMinor, currency: paid.currency, paidAt: paid.paidAt!.toISOString(), lastFailure: null, refundedMinor: await refundedMinorOf(manager, referralId) };
  }
  const failure = checkouts.find((c) => c.lastFailure)?.lastFailure ?? null;
  return { state: 'unpaid', amountMinor: null, currency: null, paidAt: null, lastFailure: failure, refundedMinor: 0 };
}

export function toReturnAddressDto(a: CustomerReturnAddress): ReturnAddressDto {
  return {
    name: a.name,
    line1: a.line1,
    line2: a.line2,
    city: a.city,
    region: a.region,
    postalCode: a.postalCode,
    country: a.country,
    phone: a.phone,
    updatedAt: a.updatedAt.toISOString(),
  };
}

function deviceName(r: Referral): string {
  const makeModel = [r.deviceMake, r.deviceModel].filter(Boolean).join(' ');
  return makeModel ? `${mediaTypeLabels[r.mediaType]} · ${makeModel}` : mediaTypeLabels[r.mediaType];
}

/** When the shop was told to expect the data: the accepted offer's business-day estimate, counted as calendar days from acceptance (the bench sorts by it). */
const PROMISED_BY_SQL = `(SELECT o.responded_at + make_interval(days => ceil(o.estimated_days)::int)
   FROM lab_offers o WHERE o.referral_id = r.id AND o.status = 'accepted' AND o.estimated_days IS NOT NULL
   ORDER BY o.responded_at DESC LIMIT 1)`;

/** When the box was checked in at the lab (receiving writes a `checked_in` step on the timeline). */
const RECEIVED_AT_SQL = `(SELECT max(t.at) FROM referral_timeline t WHERE t.referral_id = r.id AND t.kind = 'checked_in')`;

export async function listBench(ctx: ServiceContext, labOrganizationId: string, rawQuery: unknown): Promise<{ data: BenchRowDto[] }> {
  const query = parseInput(benchQuery, rawQuery ?? {});
  const statuses = query.status ? [query.status] : [...benchStatuses];
  const manager = ctx.db.manager;
  const rows: { id: string; promised_by: Date | null; received_at: Date | null }[] = await manager.query(
    `SELECT r.id, ${PROMISED_BY_SQL} AS promised_by, ${RECEIVED_AT_SQL} AS received_at
     FROM referrals r WHERE r.lab_organization_id = $1 AND r.status = ANY($2)
     ORDER BY promised_by ASC NULLS LAST, r.created_at ASC`,
    [labOrganizationId, statuses],
  );
  if (rows.length === 0) return { data: [] };
  const ids = rows.map((r) => r.id);
  const [referrals, photoRows, shops, reports, manifests] = await Promise.all([
    manager.find(Referral, { where: { id: In(ids) } }),
    manager.find(ReferralPhoto, { where: { referralId: In(ids) }, order: { uploadedAt: 'ASC', id: 'ASC' } }),
    manager.query(`SELECT r.id, o.name FROM referrals r JOIN organizations o ON o.id = r.partner_organization_id WHERE r.id = ANY($1)`, [ids]) as Promise<
      { id: string; name: string }[]
    >,
    manager.query(
      `SELECT DISTINCT ON (referral_id) referral_id, bytes_read, total_bytes FROM imaging_reports WHERE referral_id = ANY($1) ORDER BY referral_id, reported_at DESC, id DESC`,
      [ids],
    ) as Promise<{ referral_id: string; bytes_read: string; total_bytes: string }[]>,
    manager.query(
      `SELECT DISTINCT ON (referral_id) referral_id, review_status FROM recovered_file_manifests WHERE referral_id = ANY($1) ORDER BY referral_id, version DESC`,
      [ids],
    ) as Promise<{ referral_id: string; review_status: string }[]>,
  ]);
  const byId = new Map(referrals.map((r) => [r.id, r]));
  const shopName = new Map(shops.map((s) => [s.id, s.name]));
  const imaging = new Map(reports.map((r) => [r.referral_id, (Number(r.bytes_read) / Number(r.total_bytes)) * 100]));
  const review = new Map(manifests.map((m) => [m.referral_id, m.review_status]));
  const photos = new Map<string, { id: string; url: string }[]>();
  for (const p of photoRows) photos.set(p.referralId, [...(photos.get(p.referralId) ?? []), { id: p.id, url: photoUrl(p.id) }]);
  const data = rows.map((row): BenchRowDto => {
    const r = byId.get(row.id)!;
    const status = review.get(r.id);
    return {
      id: r.id,
      reference: r.reference,
      status: r.status,
      shopName: shopName.get(r.id) ?? '',
      customerName: r.customerName,
      mediaType: r.mediaType,
      device: deviceName(r),
      capacityGb: r.capacityGb,
      symptoms: r.symptoms,
      requiredSkills: r.triage.requiredSkills,
      cautions: r.triage.cautions,
      priorities: r.priorities,
      photos: photos.get(r.id) ?? [],
      promisedBy: row.promised_by?.toISOString() ?? null,
      receivedAt: row.received_at?.toISOString() ?? null,
      imagingPercent: imaging.get(r.id) ?? null,
      reviewStatus: status === 'confirmed' || status === 'disputed' || status === 'pending' ? status : null,
      updatedAt: r.updatedAt.toISOString(),
    };
  });
  return { data };
}

export async function getLabCase(ctx: ServiceContext, labOrganizationId: string, id: string): Promise<LabCaseDto> {
  const manager = ctx.db.manager;
  const r = await findLabCase(manager, labOrganizationId, id);
  const [shop, timeline, photos, evaluation, quote, imaging, manifest, payment, address, promised] = await Promise.all([
    manager.findOneBy(Organization, { id: r.partnerOrganizationId }),
    manager.find(TimelineEntry, { where: { referralId: r.id }, order: { at: 'ASC', position: 'ASC' } }),
    listReferralPhotos(manager, r.id),
    manager.findOneBy(LabEvaluation, { referralId: r.id }),
    currentQuote(manager, r.id),
    latestImaging(manager, r.id),
    currentManifest(manager, r.id),
    paymentOf(manager, r.id),
    manager.findOneBy(CustomerReturnAddress, { referralId: r.id }),
    manager.query(`SELECT ${PROMISED_BY_SQL} AS promised_by FROM referrals r WHERE r.id = $1`, [r.id]) as Promise<{ promised_by: Date | null }[]>,
  ]);
  return {
    id: r.id,
    reference: r.reference,
    status: r.status,
    shop: { name: shop?.name ?? '', phone: shop?.phone ?? null },
    customerName: r.customerName,
    device: {
      mediaType: r.mediaType,
      capacityGb: r.capacityGb,
      interface: r.deviceInterface,
      make: r.deviceMake,
      model: r.deviceModel,
      serial: r.deviceSerial,
      memberCount: r.memberCount,
    },
    symptoms: r.symptoms,
    description: r.description,
    priorities: r.priorities,
    sensitivity: r.sensitivity,
    battery: r.battery ? { installed: r.battery.installed, condition: r.battery.condition, wattHours: r.battery.wattHours } : null,
    requiredSkills: r.triage.requiredSkills,
    needsCleanAir: r.triage.needsCleanAir,
    cautions: r.triage.cautions,
    photos: photos.map((p) => ({ id: p.id, url: p.url })),
    promisedBy: promised[0]?.promised_by?.toISOString() ?? null,
    timeline: timeline.map(toTimelineEntryDto),
    evaluation: evaluation ? toEvaluationDto(evaluation) : null,
    quote: quote ? toQuoteDto(quote) : null,
    imaging: imaging ? toImagingDto(imaging) : null,
    manifest: manifest ? toManifestDto(manifest, r.priorities) : null,
    payment,
    returnAddress: address ? toReturnAddressDto(address) : null,
  };
}

/** The shop's panel on its case: how the lab's work stands, without the customer's file names. */
export async function getShopLabWork(ctx: ServiceContext, scope: { partnerOrganizationId: string } | { network: true }, id: string): Promise<ShopLabWorkDto> {
  const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
  if (!UUID.test(id)) throw AppError.notFound('That case');
  const manager = ctx.db.manager;
  const r = await manager.findOneBy(Referral, { id, ...('network' in scope ? {} : { partnerOrganizationId: scope.partnerOrganizationId }) });
  if (!r) throw AppError.notFound('That case');
  const [evaluation, quote, imaging, manifest, payment] = await Promise.all([
    manager.findOneBy(LabEvaluation, { referralId: r.id }),
    currentQuote(manager, r.id),
    latestImaging(manager, r.id),
    currentManifest(manager, r.id),
    paymentOf(manager, r.id),
  ]);
  const files = manifest ? toManifestDto(manifest, r.priorities) : null;
  return {
    status: r.status,
    evaluation: evaluation ? { recoverability: evaluation.recoverability, recordedAt: evaluation.recordedAt.toISOString() } : null,
    quote: quote ? toQuoteDto(quote) : null,
    imaging: imaging ? toImagingDto(imaging) : null,
    manifest: files ? { ...files, categories: files.categories.map(({ examples: _examples, ...rest }) => rest) } : null,
    payment,
  };
}

