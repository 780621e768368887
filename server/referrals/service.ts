import { createHash } from 'node:crypto';
import { In, type EntityManager } from 'typeorm';
import { assessBattery } from '@shared/domain/battery';
import { makeReference, parseReference } from '@shared/domain/reference';
import { triage } from '@shared/domain/triage';
import {
  assignLabInput,
  referralInput,
  referralListQuery,
  routingPreviewInput,
  type ReferralDto,
  type ReferralInputParsed,
  type RoutingPreviewDto,
} from '@shared/schemas/referrals';
import type { AttentionItemDto } from '@shared/schemas/labs';
import { caseStatusLabels, labSkillLabels, type CaseStatus } from '@shared/vocabulary';
import { recordAudit } from '../audit';
import { collectRowsOf, insertRow, newRowId, withBatchedAppends, withBatchedWrite } from '../db/appends';
import { AppError } from '../lib/errors';
import type { Actor, ServiceContext } from '../lib/context';
import { parseInput } from '../lib/validate';
import { enqueueEmailToUser } from '../notifications';
import { Organization } from '../organizations';
import { listReferralPhotos } from '../uploads';
import {
  LabOffer,
  RoutingSnapshot,
  assignInTransaction,
  casesForRoutingNow,
  loadLabs,
  lockReferral,
  primeLabDirectory,
  rankLabs,
  readDirectoryRow,
  recordTimeline,
  resolvePostalCode,
  routeAndOffer,
  withdrawPendingOffer,
  type DirectoryReadingRow,
  type DispatchOutcome,
  type TimelineActor,
} from '../routing';
import { toReferralDto, toSummaryDto, toTriageDto } from './dto';
import { Referral, TimelineEntry, type StoredBattery, type StoredTriage } from './entities';
import { readTogether } from '../db/reads';

// Intake and the case as shops and the network read it. Intake stores the case, triages it, ranks the
// labs, records the ranking and offers the case to the best lab (or accepts it by the lab's rule, or
// leaves it for the network admin), all in one transaction, each step on the timeline.

/** Who opened the case: a person in the web app or a partner system with an API key. */
export interface ReferralActor {
  type: 'user' | 'api_key';
  id: string;
  name: string;
}

/** What a reader may see: one shop's cases, or the whole network's. */
export type ReferralScope = { partnerOrganizationId: string } | { network: true };

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
const triageActor: TimelineActor = { type: 'system', id: null, name: 'Platterpost triage' };

/** Statuses from which a case can still be cancelled: nothing bought or shipped yet. */
export const CANCELLABLE_STATUSES: readonly CaseStatus[] = ['opened', 'needs_attention', 'offered', 'accepted'];

function scopeWhere(scope: ReferralScope): { partnerOrganizationId?: string } {
  return 'network' in scope ? {} : { partnerOrganizationId: scope.partnerOrganizationId };
}

/** The scope an app user reads cases in; labs read cases only through their offers. */
export function scopeOf(actor: Actor): ReferralScope {
  if (actor.organizationKind === 'network') return { network: true };
  if (actor.organizationKind === 'partner') return { partnerOrganizationId: actor.organizationId };
  throw AppError.forbidden('Labs see cases through their offers');
}

export async function userActor(manager: EntityManager, actor: Actor): Promise<ReferralActor> {
  const rows: { name: string }[] = await manager.query(`SELECT name FROM users WHERE id = $1`, [actor.userId]);
  return { type: 'user', id: actor.userId, name: rows[0]?.name ?? 'Unknown user' };
}

function stableJson(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(stableJson).join(',')}]`;
  if (value && typeof value === 'object') {
    return `{${Object.keys(value)
      .sort()
      .filter((k) => (value as Record<string, unknown>)[k] !== undefined)
      .map((k) => `${JSON.stringify(k)}:${stableJson((value as Record<string, unknown>)[k])}`)
      .join(',')}}`;
  }
  return JSON.stringify(value);
}

interface Origin {
  line1: string | null;
  city: string | null;
  region: string | null;
  postalCode: string;
  country: string;
  lat: number;
  lon: number;
}

/** Where the device is: the address given, or the shop's own; coordinates from the postal code. */
function resolveOrigin(given: ReferralInputParsed['origin'], shop: Organization): Origin {
  if (given) {
    const place = resolvePostalCode(given, 'origin');
    return {
      line1: given.line1 ?? null,
      city: given.city ?? place.city,
      region: given.region ?? place.region,
      postalCode: place.postalCode,
      country: place.country,
      lat: place.lat,
      lon: place.lon,
    };
  }
  if (shop.postalCode && shop.lat != null && shop.lon != null) {
    return { line1: shop.addressLine1, city: shop.city, region: shop.region, postalCode: shop.postalCode, country: shop.country, lat: shop.lat, lon: shop.lon };
  }
  if (shop.postalCode) {
    const place = resolvePostalCode({ postalCode: shop.postalCode, country: shop.country }, 'origin');
    return { line1: shop.addressLine1, city: shop.city ?? place.city, region: shop.region ?? place.region, postalCode: place.postalCode, country: place.country, lat: place.lat, lon: place.lon };
  }
  throw AppError.validation([{ path: 'origin', message: 'Your shop has no address on file; enter where the device is' }]);
}

/** Triage and the battery's own assessment; intake shows the cautions of both. */
function runTriage(input: Pick<ReferralInputParsed, 'device' | 'symptoms' | 'sensitivity' | 'battery'>): StoredTriage {
  let result;
  let battery = null;
  try {
    result = triage({
      mediaType: input.device.mediaType,
      symptoms: input.symptoms,
      sensitivity: input.sensitivity,
      ...(input.device.memberCount !== undefined ? { raidMemberCount: input.device.memberCount } : {}),
      ...(input.battery ? { battery: input.battery } : {}),
    });
    if (input.battery) battery = assessBattery(input.battery);
  } catch (error) {
    if (error instanceof RangeError || error instanceof TypeError) throw AppError.validation([{ path: '(body)', message: error.message }]);
    throw error;
  }
  return { ...result, cautions: [...result.cautions, ...(battery?.cautions ?? [])], battery };
}

// Reference numbers come from the sequence a block at a time per server, so that most intakes need no
// round trip for one. As with any sequence, numbers can be skipped (a server stops holding some); a
// reference only has to be unique, and the database's unique index says it is.
const REFERENCE_BLOCK = 25;
const reservedNumbers = new WeakMap<object, string[]>();

async function nextReferralNumber(manager: EntityManager): Promise<string> {
  let pool = reservedNumbers.get(manager.connection);
  if (!pool) reservedNumbers.set(manager.connection, (pool = []));
  if (pool.length === 0) {
    const rows: { n: string }[] = await manager.query(`SELECT n::text AS n FROM (SELECT nextval('referral_number_seq') AS n FROM generate_series(1, $1::int)) s ORDER BY s.n`, [REFERENCE_BLOCK]);
    pool.push(...rows.map((r) => r.n));
  }
  return pool.shift()!;
}

async function shopFor(manager: EntityManager, partnerOrganizationId: string): Promise<Organization> {
  const shop = await manager.findOneBy(Organization, { id: partnerOrganizationId, kind: 'partner' });
  if (!shop || !shop.active) throw AppError.notFound('That shop');
  return shop;
}

export async function createReferral(
  ctx: ServiceContext,
  who: { partnerOrganizationId: string; actor: ReferralActor; shop?: Organization; /** Read with the caller's key, moments ago. */ directoryReading?: DirectoryReadingRow },
  rawInput: unknown,
  options: { idempotencyKey?: string } = {},
): Promise<ReferralDto> {
  const input = parseInput(referralInput, rawInput);
  // Intake writes five timeline steps, e-mails and partner events: collected and written in one statement.
  const opened: OpenedReferral = { replayed: false };
  const open = (manager: EntityManager) => {
    if (who.directoryReading) primeLabDirectory(manager, who.directoryReading);
    return openReferral(ctx, manager, who, input, { idempotencyKey: options.idempotencyKey, now: new Date(), opened });
  };
  // With an idempotency key the case is opened under a lock on that key, so in a transaction; without
  // one, intake only reads until its single batched write, and needs none.
  const { result: referralId, appended } = options.idempotencyKey
    ? await ctx.db.transaction((manager) => withBatchedAppends(manager, () => open(manager)))
    : await withBatchedWrite(ctx.db, open);
  if (opened.replayed || !opened.intake) return getReferral(ctx, { partnerOrganizationId: who.partnerOrganizationId }, referralId);
  // Everything the answer shows was written just now, by this intake: answer from it rather than
  // reading it all back (a test checks the answer equals a later read).
  const { referral, shopName, outcome } = opened.intake;
  const offers = 'offer' in outcome ? [outcome.offer] : [];
  const labName = 'labName' in outcome ? outcome.labName : null;
  const timeline = appended.timeline.map((t) => Object.assign(new TimelineEntry(), { ...t, position: null }));
  const dto = toReferralDto({
    referral,
    partnerName: shopName,
    labName: referral.labOrganizationId ? labName : null,
    snapshot: outcome.snapshot ?? null,
    offers,
    labNames: new Map(offers.map((o) => [o.labOrganizationId, labName ?? ''])),
    timeline,
  });
  return { ...dto, photos: [], shipments: [], amounts: null };
}

collectRowsOf(Referral);

/** What openReferral tells its caller: an earlier case answered again, or the case it just opened. */
export interface OpenedReferral {
  replayed: boolean;
  intake?: { referral: Referral; shopName: string; outcome: DispatchOutcome };
}

/**
 * Intake inside the caller's transaction: stores the case, triages, ranks, offers. Returns the case id
 * (an earlier case's id when the idempotency key was used before with the same body).
 */
export async function openReferral(
  ctx: ServiceContext,
  manager: EntityManager,
  who: { partnerOrganizationId: string; actor: ReferralActor; shop?: Organization },
  input: ReferralInputParsed,
  options: { idempotencyKey?: string; now: Date; opened?: OpenedReferral },
): Promise<string> {
  const key = options.idempotencyKey ?? null;
  const hash = key ? createHash('sha256').update(stableJson(input)).digest('hex') : null;
  const now = options.now;
  if (key) {
    // One case per key and shop, even when the same request arrives twice at once.
    await manager.query(`SELECT pg_advisory_xact_lock(hashtext($1))`, [`referral:${who.partnerOrganizationId}:${key}`]);
    const existing = await manager.findOneBy(Referral, { partnerOrganizationId: who.partnerOrganizationId, idempotencyKey: key });
    if (existing) {
      if (existing.idempotencyHash !== hash) {
        throw AppError.conflict('That idempotency key was already used for a different referral', [{ path: 'Idempotency-Key', message: 'Used before with another body' }]);
      }
      if (options.opened) options.opened.replayed = true;
      return existing.id;
    }
  }
  // A partner API key brings its shop along (read with the key, active); the app's forms do not.
  const shop = who.shop?.id === who.partnerOrganizationId ? who.shop : await shopFor(manager, who.partnerOrganizationId);
  const origin = resolveOrigin(input.origin, shop);
  const triaged = runTriage(input);
  const n = await nextReferralNumber(manager);
  const battery: StoredBattery | null = input.battery
    ? {
        installed: input.battery.installed,
        condition: input.battery.condition ?? null,
        wattHours: triaged.battery?.wattHours ?? input.battery.wattHours ?? null,
        volts: input.battery.volts ?? null,
        milliampHours: input.battery.milliampHours ?? null,
      }
    : null;

  // Written with intake's other rows at the end (server/db/appends.ts), or at once outside intake.
  const referral = await insertRow(
    manager,
    Referral,
    manager.create(Referral, {
      id: newRowId(),
      referenceNumber: n,
      reference: makeReference(BigInt(n)),
      partnerOrganizationId: shop.id,
      externalRef: input.externalRef ?? null,
      status: 'opened',
      customerName: input.customer.name,
      customerEmail: input.customer.email,
      customerPhone: input.customer.phone || null,
      mediaType: input.device.mediaType,
      capacityGb: input.device.capacityGb ?? null,
      deviceInterface: input.device.interface ?? null,
      deviceMake: input.device.make || null,
      deviceModel: input.device.model || null,
      deviceSerial: input.device.serial || null,
      memberCount: input.device.memberCount ?? null,
      symptoms: input.symptoms,
      description: input.description || null,
      priorities: input.priorities.map((p) => ({ category: p.category, note: p.note || null })),
      sensitivity: input.sensitivity,
      battery,
      originLine1: origin.line1,
      originCity: origin.city,
      originRegion: origin.region,
      originPostalCode: origin.postalCode,
      originCountry: origin.country,
      originLat: origin.lat,
      originLon: origin.lon,
      consentRecordedAt: input.consent?.accepted ? now : null,
      consentRecordedBy: input.consent?.accepted ? who.actor.name : null,
      triage: triaged,
      labOrganizationId: null,
      attentionReason: null,
      createdByType: who.actor.type,
      createdById: who.actor.id,
      createdByName: who.actor.name,
      idempotencyKey: key,
      idempotencyHash: hash,
      cancelledAt: null,
      createdAt: now,
      updatedAt: now,
    }),
  );

  await recordTimeline(manager, referral, {
    kind: 'opened',
    summary: `Opened by ${who.actor.name}${who.actor.type === 'api_key' ? ' (partner API)' : ''} for ${referral.customerName}.`,
    actor: who.actor,
    at: now,
    details: {
      via: who.actor.type,
      ...(referral.externalRef ? { externalRef: referral.externalRef } : {}),
      consent: referral.consentRecordedAt ? { recordedAt: now.toISOString(), recordedBy: referral.consentRecordedBy } : null,
    },
  });
  await recordTimeline(manager, referral, {
    kind: 'triaged',
    summary: `Needs ${triaged.requiredSkills.map((k) => labSkillLabels[k]).join(', ')}${triaged.needsCleanAir ? ' (in clean air)' : ''}; ${triaged.cautions.length} ${triaged.cautions.length === 1 ? 'caution' : 'cautions'} for the shop.`,
    actor: triageActor,
    at: now,
    details: {
      requiredSkills: triaged.requiredSkills,
      matchedRules: triaged.matchedRules.map((r) => r.ruleId),
      unmatchedSymptoms: triaged.unmatchedSymptoms,
      needsReview: triaged.needsReview,
      batteryHazard: triaged.batteryHazard,
    },
  });
  referral.partnerOrganization = shop;
  // A case opened just now has no offers yet.
  const outcome = await routeAndOffer(ctx, manager, referral, { trigger: 'intake', now, previouslyOfferedLabIds: [] });
  if (options.opened) options.opened.intake = { referral, shopName: shop.name, outcome };
  return referral.id;
}

async function loadParts(manager: EntityManager, referral: Referral) {
  const [snapshot, offers, timeline] = await readTogether(manager, [
    () => manager.findOne(RoutingSnapshot, { where: { referralId: referral.id }, order: { createdAt: 'DESC' } }),
    () => manager.find(LabOffer, { where: { referralId: referral.id }, order: { offeredAt: 'DESC', createdAt: 'DESC' } }),
    () => manager.find(TimelineEntry, { where: { referralId: referral.id }, order: { at: 'ASC', position: 'ASC' } }),
  ]);
  const labIds = [...new Set(offers.map((o) => o.labOrganizationId))];
  const labs = labIds.length ? await manager.find(Organization, { where: { id: In(labIds) } }) : [];
  return { snapshot, offers, timeline, labNames: new Map(labs.map((l) => [l.id, l.name])) };
}

/**
 * The case's labels with their tracking state, read from the shipping component's table here (SQL, not an
 * import) so that imports keep flowing one way: shipping builds on referrals.
 */
async function shipmentsOf(manager: EntityManager, referralId: string): Promise<ReferralDto['shipments']> {
  const rows: { id: string; tracking_code: string | null; status: string }[] = await manager.query(
    `SELECT id, tracking_code, status FROM shipments WHERE referral_id = $1 AND status <> 'awaiting_purchase' ORDER BY created_at`,
    [referralId],
  );
  return rows.map((r) => ({ id: r.id, trackingCode: r.tracking_code, status: r.status }));
}

/**
 * What the customer was quoted and has paid, read from the lab-work tables here (SQL, not an import) for
 * the same reason: lab work builds on referrals. Null until the lab has sent a quote.
 */
async function amountsOf(manager: EntityManager, referralId: string): Promise<ReferralDto['amounts']> {
  const rows: { currency: string; status: 'sent' | 'approved' | 'declined'; total_minor: string; service_lines_minor: string; paid_minor: string | null; paid_at: Date | null }[] =
    await manager.query(
      `SELECT q.currency, q.status, q.total_minor, q.service_lines_minor, c.amount_minor AS paid_minor, c.paid_at
       FROM lab_quotes q LEFT JOIN customer_checkouts c ON c.referral_id = q.referral_id AND c.status = 'paid'
       WHERE q.referral_id = $1 AND q.status IN ('sent', 'approved', 'declined') ORDER BY q.version DESC LIMIT 1`,
      [referralId],
    );
  const q = rows[0];
  if (!q) return null;
  return {
    currency: q.currency,
    quoteStatus: q.status,
    quotedTotalMinor: Number(q.total_minor),
    serviceLinesMinor: Number(q.service_lines_minor),
    paidMinor: q.paid_minor === null ? null : Number(q.paid_minor),
    paidAt: q.paid_at?.toISOString() ?? null,
  };
}

/** One case as its shop or lab sees it. */
export async function getReferral(ctx: ServiceContext, scope: ReferralScope, id: string): Promise<ReferralDto> {
  if (!UUID.test(id)) throw AppError.notFound('That case');
  const manager = ctx.db.manager;
  // Scoped in the query itself: another shop's case is simply not found. (find, not findOne: with
  // relations, findOne's limit costs TypeORM a second query.)
  const [referral] = await manager.find(Referral, {
    where: { id, ...scopeWhere(scope) },
    relations: { partnerOrganization: true, labOrganization: true },
  });
  if (!referral) throw AppError.notFound('That case');
  const [parts, photos, shipments, amounts] = await Promise.all([
    loadParts(manager, referral),
    listReferralPhotos(manager, referral.id),
    shipmentsOf(manager, referral.id),
    amountsOf(manager, referral.id),
  ]);
  const dto = toReferralDto({
    referral,
    partnerName: referral.partnerOrganization?.name ?? '',
    labName: referral.labOrganization?.name ?? null,
    ...parts,
  });
  return { ...dto, photos: photos.map((p) => ({ id: p.id, url: p.url, contentType: p.contentType, sizeBytes: p.sizeBytes })), shipments, amounts };
}

const CURSOR = /^(\d{1,20})\.([0-9a-f-]{36})$/;

function encodeCursor(createdMicros: string, id: string): string {
  return Buffer.from(`${createdMicros}.${id}`).toString('base64url');
}

function decodeCursor(cursor: string): { micros: string; id: string } {
  const m = CURSOR.exec(Buffer.from(cursor, 'base64url').toString('utf8'));
  if (!m || !UUID.test(m[2])) throw AppError.validation([{ path: 'cursor', message: 'Not a cursor from this list; start again without it' }]);
  return { micros: m[1], id: m[2] };
}

/** Newest first, with a keyset cursor on (created_at, id) so pages never skip or repeat a case. */
export async function listReferrals(ctx: ServiceContext, scope: ReferralScope, rawQuery: unknown) {
  const query = parseInput(referralListQuery, rawQuery);
  const qb = ctx.db.manager
    .createQueryBuilder(Referral, 'r')
    .leftJoinAndSelect('r.labOrganization', 'l')
    .addSelect(`(extract(epoch FROM r.created_at) * 1000000)::bigint::text`, 'created_micros')
    .orderBy('r.createdAt', 'DESC')
    .addOrderBy('r.id', 'DESC')
    .limit(query.limit + 1);
  if ('partnerOrganizationId' in scope) qb.andWhere('r.partnerOrganizationId = :partner', { partner: scope.partnerOrganizationId });
  if (query.status) qb.andWhere('r.status = :status', { status: query.status });
  if (query.updatedSince) qb.andWhere('r.updatedAt >= :since', { since: new Date(query.updatedSince) });
  if (query.q) {
    const asReference = parseReference(query.q);
    if (asReference.ok) {
      qb.andWhere('r.reference = :reference', { reference: asReference.reference });
    } else {
      const like = `%${query.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
      qb.andWhere('(r.reference ILIKE :like OR r.externalRef ILIKE :like OR r.customerName ILIKE :like OR r.customerEmail ILIKE :like)', { like });
    }
  }
  if (query.cursor) {
    const { micros, id } = decodeCursor(query.cursor);
    qb.andWhere(`(r.created_at, r.id) < (TIMESTAMPTZ 'epoch' + (:micros)::bigint * INTERVAL '1 microsecond', (:cursorId)::uuid)`, { micros, cursorId: id });
  }
  const { entities, raw } = await qb.getRawAndEntities();
  const page = entities.slice(0, query.limit);
  const last = page.length === query.limit && entities.length > query.limit ? page.length - 1 : -1;
  // Raw rows come back in the same order as the entities (one row per case: the join is to-one).
  return {
    data: page.map(toSummaryDto),
    nextCursor: last >= 0 ? encodeCursor((raw[last] as { created_micros: string }).created_micros, page[last].id) : null,
  };
}

export async function cancelReferral(ctx: ServiceContext, scope: ReferralScope, id: string, actor: ReferralActor): Promise<ReferralDto> {
  if (!UUID.test(id)) throw AppError.notFound('That case');
  await ctx.db.transaction(async (manager) => {
    const visible = await manager.findOneBy(Referral, { id, ...scopeWhere(scope) });
    if (!visible) throw AppError.notFound('That case');
    await cancelInTransaction(manager, (await lockReferral(manager, id))!, actor, new Date());
  });
  return getReferral(ctx, scope, id);
}

/** Cancels a locked case that has not shipped: withdraws its offer and tells the lab. */
export async function cancelInTransaction(manager: EntityManager, referral: Referral, actor: ReferralActor, now: Date): Promise<void> {
  if (referral.status === 'cancelled') throw AppError.conflict('This case is already cancelled');
  if (!CANCELLABLE_STATUSES.includes(referral.status)) {
    throw AppError.conflict(
      referral.status === 'label_issued'
        ? 'A shipping label has been issued for this case; void the label before cancelling.'
        : `The case can no longer be cancelled: it is ${caseStatusLabels[referral.status].toLowerCase()}.`,
    );
  }
  await withdrawPendingOffer(manager, referral, { reason: 'the shop cancelled the case.', actor, now });
  if (referral.status === 'accepted' && referral.labOrganizationId) {
    const lab = await manager.findOneBy(Organization, { id: referral.labOrganizationId });
    const managers: { email: string; name: string }[] = await manager.query(
      `SELECT email, name FROM users WHERE organization_id = $1 AND role = 'lab_manager' AND status = 'active'`,
      [referral.labOrganizationId],
    );
    for (const person of managers) {
      await enqueueEmailToUser(manager, { email: person.email }, 'lab_offer_withdrawn', {
        name: person.name,
        labName: lab?.name ?? 'your lab',
        reference: referral.reference,
        reason: 'the shop cancelled the case before sending the device.',
      });
    }
  }
  await manager.update(Referral, referral.id, { status: 'cancelled', cancelledAt: now, attentionReason: null });
  await recordTimeline(manager, referral, { kind: 'cancelled', summary: `Cancelled by ${actor.name}.`, actor, at: now, details: { previousStatus: referral.status } });
  referral.status = 'cancelled';
}

export async function previewRouting(ctx: ServiceContext, partnerOrganizationId: string, rawInput: unknown): Promise<RoutingPreviewDto> {
  const input = parseInput(routingPreviewInput, rawInput);
  const manager = ctx.db.manager;
  const shop = await shopFor(manager, partnerOrganizationId);
  const origin = resolveOrigin(input.origin, shop);
  const triaged = runTriage({ ...input, device: input.device });
  const ranking = await rankLabs(manager, { mediaType: input.device.mediaType, origin, triage: triaged }, { asOf: new Date() });
  return {
    triage: toTriageDto(triaged),
    routing: { origin: { lat: origin.lat, lon: origin.lon }, candidates: ranking.candidates, excluded: ranking.excluded, offeredTo: null },
  };
}

/** The network's queue: every case no lab has taken, oldest first, with its ranking as it stands now. */
export async function listAttention(ctx: ServiceContext): Promise<{ data: AttentionItemDto[] }> {
  const manager = ctx.db.manager;
  const waiting = await manager.find(Referral, { where: { status: 'needs_attention' }, relations: { labOrganization: true }, order: { updatedAt: 'ASC' } });
  if (waiting.length === 0) return { data: [] };
  // The same statements however many cases wait: each part is read for all of them at once.
  const ids = waiting.map((r) => r.id);
  const [offers, sinceRows, cases, reading] = await readTogether(manager, [
    () => manager.find(LabOffer, { where: { referralId: In(ids) }, order: { offeredAt: 'ASC' } }),
    (): Promise<{ referral_id: string; at: Date }[]> =>
      manager.query(
        `SELECT DISTINCT ON (referral_id) referral_id, at FROM referral_timeline
         WHERE referral_id = ANY($1::uuid[]) AND kind = 'needs_attention' ORDER BY referral_id, at DESC, position DESC`,
        [ids],
      ),
    () => casesForRoutingNow(manager, waiting),
    () => readDirectoryRow(manager),
  ]);
  const labIds = [...new Set(offers.map((o) => o.labOrganizationId))];
  const labs = labIds.length ? await manager.find(Organization, { where: { id: In(labIds) } }) : [];
  const names = new Map(labs.map((l) => [l.id, l.name]));
  const since = new Map(sinceRows.map((r) => [r.referral_id, r.at]));
  // Every case ranked against the one reading of the directory and the labs' open cases, on a manager
  // of this request's own (a primed reading is taken by the next ranking on that manager).
  const ranker = ctx.db.createEntityManager();
  const now = new Date();
  const data: AttentionItemDto[] = [];
  for (const referral of waiting) {
    const own = offers.filter((o) => o.referralId === referral.id);
    primeLabDirectory(ranker, reading);
    const ranking = await rankLabs(ranker, cases.get(referral.id)!, { asOf: now, previouslyOfferedLabIds: own.map((o) => o.labOrganizationId) });
    data.push({
      referral: toSummaryDto(referral),
      attentionReason: referral.attentionReason,
      since: (since.get(referral.id) ?? referral.updatedAt).toISOString(),
      requiredSkills: referral.triage.requiredSkills,
      previousOffers: own.map((o) => ({ labId: o.labOrganizationId, labName: names.get(o.labOrganizationId) ?? '', status: o.status, declineReason: o.declineReason })),
      ranking: { candidates: ranking.candidates, excluded: ranking.excluded },
    });
  }
  return { data };
}

/** Manual routing by the network admin: offers the case to the chosen lab. Audited. */
export async function assignLab(ctx: ServiceContext, actor: Actor, id: string, rawInput: unknown): Promise<ReferralDto> {
  const input = parseInput(assignLabInput, rawInput);
  if (!UUID.test(id)) throw AppError.notFound('That case');
  const now = new Date();
  await ctx.db.transaction(async (manager) => {
    const referral = await lockReferral(manager, id);
    if (!referral) throw AppError.notFound('That case');
    if (referral.status !== 'needs_attention' && referral.status !== 'offered') {
      throw AppError.conflict(`Only a case waiting for a lab can be routed by hand; this one is ${caseStatusLabels[referral.status].toLowerCase()}.`);
    }
    const [lab] = await loadLabs(manager, { labId: input.labId });
    if (!lab) throw AppError.validation([{ path: 'labId', message: 'No lab with that id' }]);
    if (!lab.active || !lab.configured || !lab.location) {
      throw AppError.validation([{ path: 'labId', message: !lab.active ? 'That lab is not active on the network' : 'That lab has not completed its profile' }]);
    }
    const admin = await userActor(manager, actor);
    const previousStatus = referral.status;
    await withdrawPendingOffer(manager, referral, { reason: 'the network routed the case by hand.', actor: admin, now });
    const outcome = await assignInTransaction(ctx, manager, referral, lab, { actor: admin, note: input.note ?? null, now });
    await recordAudit(manager, {
      action: 'referral.assigned',
      actorUserId: actor.userId,
      organizationId: lab.id,
      targetType: 'referral',
      targetId: referral.id,
      details: { reference: referral.reference, labId: lab.id, labName: lab.name, note: input.note ?? null, previousStatus, outcome: outcome.outcome },
    });
  });
  return getReferral(ctx, { network: true }, id);
}
