import { DateTime } from 'luxon';
import type { EntityManager } from 'typeorm';
import { isValidSscc } from '@shared/domain/sscc';
import { parseReference } from '@shared/domain/reference';
import {
  batteryConditionSeenLabels,
  boardBuckets,
  checkInInput,
  checkInLookupQuery,
  declineAfterArrivalInput,
  releaseHoldInput,
  inboundBoardQuery,
  type BoardBucket,
  type BoardRowDto,
  type CheckInLookupDto,
  type CheckInResultDto,
  type InboundBoardDto,
} from '@shared/schemas/shipping';
import { batteryMediaTypes, caseStatusLabels, priorityCategoryLabels, symptomLabels, type CaseStatus } from '@shared/vocabulary';
import { AppError } from '../lib/errors';
import type { Actor, ServiceContext } from '../lib/context';
import { parseInput } from '../lib/validate';
import { enqueueEmailToUser } from '../notifications';
import { Organization } from '../organizations';
import { addTimelineEntry, lockReferral, Referral, type TimelineActor } from '../referrals';
import { appendCustody, organizationPlace } from '../custody';
import { LabOffer, routeAndOffer, shopUsers } from '../routing';
import {
  checkInSummary,
  deviceLine,
  holdingLab,
  Shipment,
  shipmentDtoOf,
  statusRank,
  type Channel,
} from '../shipping';
import { contentHash, detectPhotoType, type BlobStorage } from '../uploads';
import { CheckIn, CheckInPhoto, LabTransfer } from './entities';

// The lab's shipping clerk: the inbound board (every expected and arriving box by tracking status) and the
// check-in of each box that arrives, with its condition, seal, photos, contents and battery as seen. A box
// in order makes the case "received"; a problem puts it "on hold" with the reason, for the shop to see.

const CHECK_IN_STATUSES: readonly CaseStatus[] = ['accepted', 'label_issued', 'in_transit'];
const MAX_PHOTOS = 8;
const MAX_PHOTO_BYTES = 10 * 1024 * 1024;

function labOf(actor: Actor): string {
  if (actor.organizationKind !== 'lab') throw AppError.forbidden('Only a lab receives boxes');
  return actor.organizationId;
}

async function personName(manager: EntityManager, userId: string): Promise<string> {
  const rows: { name: string }[] = await manager.query(`SELECT name FROM users WHERE id = $1`, [userId]);
  return rows[0]?.name ?? 'Lab staff';
}

// ---- the inbound board -------------------------------------------------------------------------

interface BoardRow {
  id: string;
  referral_id: string;
  reference: string;
  kind: 'inbound' | 'transfer';
  status: BoardRowDto['status'];
  bucket: BoardBucket;
  tracking_code: string | null;
  carrier: string | null;
  service: string | null;
  from_name: string;
  from_city: string | null;
  from_region: string | null;
  media_type: BoardRowDto['mediaType'];
  estimated_delivery_at: Date | null;
  delivered_at: Date | null;
  checked_in_at: Date | null;
  last_event_at: Date | null;
  last_status_detail: string | null;
  last_message: string | null;
  last_location: string | null;
  battery_mark_text: string | null;
  battery_warning: boolean;
}

/**
 * One query for the board's rows and one for its counts. The boxes not yet checked in come through the
 * partial index on open shipments, the ones checked in today through the index on delivery time, so the
 * lab's years of history are never scanned.
 */
export const BOARD_SQL = `
  WITH candidates AS (
      SELECT s.id, s.referral_id, s.kind, s.status, s.tracking_code, s.carrier, s.service, s.from_organization_id, s.estimated_delivery_at, s.delivered_at, s.checked_in_at, s.last_event_at, s.last_status_detail, s.last_message, s.last_location, s.battery_mark_text, s.overdue_at FROM shipments s
       WHERE s.to_organization_id = $1 AND s.kind IN ('inbound', 'transfer')
         AND s.checked_in_at IS NULL AND s.status NOT IN ('awaiting_purchase', 'voided')
    UNION ALL
      SELECT s.id, s.referral_id, s.kind, s.status, s.tracking_code, s.carrier, s.service, s.from_organization_id, s.estimated_delivery_at, s.delivered_at, s.checked_in_at, s.last_event_at, s.last_status_detail, s.last_message, s.last_location, s.battery_mark_text, s.overdue_at FROM shipments s
       WHERE s.to_organization_id = $1 AND s.kind IN ('inbound', 'transfer')
         AND s.delivered_at IS NOT NULL AND s.delivered_at >= $2 AND s.checked_in_at IS NOT NULL
  ), board AS (
    SELECT c.id, c.referral_id, r.reference, c.kind, c.status, c.tracking_code, c.carrier, c.service,
           o.name AS from_name, o.city AS from_city, o.region AS from_region, r.media_type,
           c.estimated_delivery_at, c.delivered_at, c.checked_in_at, c.last_event_at, c.last_status_detail,
           c.last_message, c.last_location, c.battery_mark_text,
           COALESCE((r.battery->>'installed')::boolean AND r.battery->>'condition' IN ('swollen', 'damaged', 'leaking'), false) AS battery_warning,
           CASE
             WHEN c.status IN ('exception', 'returned') THEN 'exception'
             WHEN c.status = 'delivered' AND c.delivered_at >= $2 THEN 'delivered_today'
             WHEN c.status = 'delivered' THEN 'awaiting_check_in'
             WHEN c.overdue_at IS NOT NULL THEN 'overdue'
             WHEN c.status = 'label_issued' THEN 'label_issued'
             WHEN c.status = 'out_for_delivery' THEN 'out_for_delivery'
             ELSE 'in_transit'
           END AS bucket
      FROM candidates c
      -- Lateral look-ups by primary key: the board is a few hundred boxes, the tables are large.
      JOIN LATERAL (SELECT reference, media_type, battery FROM referrals WHERE id = c.referral_id) r ON true
      LEFT JOIN LATERAL (SELECT name, city, region FROM organizations WHERE id = c.from_organization_id) o ON true
     WHERE ($3::text IS NULL
            OR c.tracking_code = $3
            OR r.reference = $4
            OR o.name ILIKE $5
            OR c.tracking_code ILIKE $6)
  )`;

export async function inboundBoard(ctx: ServiceContext, actor: Actor, rawQuery: unknown, now: Date = new Date()): Promise<InboundBoardDto> {
  const query = parseInput(inboundBoardQuery, rawQuery);
  const labId = labOf(actor);
  const manager = ctx.db.manager;
  const lab = await manager.findOneByOrFail(Organization, { id: labId });
  const timeZone = lab.timeZone || 'UTC';
  const todayStart = DateTime.fromJSDate(now).setZone(timeZone).startOf('day').toJSDate();
  const params = boardParams(labId, todayStart, query.q);

  // One pass: the board is the lab's open boxes and today's deliveries, so counting in memory is cheap.
  const rows: BoardRow[] = await ctx.db.transaction(async (tx) => {
    // A few hundred rows by index: starting parallel workers would cost more than the query itself.
    await tx.query(`SET LOCAL max_parallel_workers_per_gather = 0`);
    return tx.query(
      `${BOARD_SQL}
       SELECT * FROM board
        ORDER BY array_position(ARRAY['exception','overdue','delivered_today','awaiting_check_in','out_for_delivery','in_transit','label_issued'], bucket),
                 estimated_delivery_at NULLS LAST, id`,
      params,
    );
  });
  const countMap = Object.fromEntries(boardBuckets.map((b) => [b, 0])) as Record<BoardBucket, number>;
  for (const r of rows) countMap[r.bucket] += 1;
  const shown = rows.filter((r) => !query.bucket || r.bucket === query.bucket).slice(0, query.limit);
  return { asOf: now.toISOString(), timeZone, counts: countMap, data: shown.map(toBoardRow) };
}

export function boardParams(labId: string, todayStart: Date, q: string | undefined): unknown[] {
  if (!q) return [labId, todayStart, null, null, null, null];
  const compact = q.toUpperCase().replace(/\s+/g, '');
  const ref = parseReference(q);
  const escaped = q.replace(/[\\%_]/g, (c) => `\\${c}`);
  return [labId, todayStart, compact, ref.ok ? ref.reference : null, `%${escaped}%`, `${compact.replace(/[\\%_]/g, (c) => `\\${c}`)}%`];
}

function toBoardRow(r: BoardRow): BoardRowDto {
  return {
    shipmentId: r.id,
    referralId: r.referral_id,
    reference: r.reference,
    kind: r.kind,
    bucket: r.bucket,
    status: r.status,
    trackingCode: r.tracking_code,
    carrier: r.carrier,
    service: r.service,
    from: { name: r.from_name ?? '', city: r.from_city, region: r.from_region },
    mediaType: r.media_type,
    estimatedDeliveryAt: r.estimated_delivery_at?.toISOString() ?? null,
    deliveredAt: r.delivered_at?.toISOString() ?? null,
    checkedInAt: r.checked_in_at?.toISOString() ?? null,
    lastEvent:
      r.last_event_at && r.last_message
        ? { at: r.last_event_at.toISOString(), status: r.status, statusDetail: r.last_status_detail, message: r.last_message, location: r.last_location }
        : null,
    batteryMarkText: r.battery_mark_text,
    batteryWarning: r.battery_warning,
  };
}

// ---- looking a box up --------------------------------------------------------------------------

export type ParsedCode =
  | { kind: 'reference'; reference: string }
  | { kind: 'sscc'; sscc: string }
  | { kind: 'tracking_code'; trackingCode: string };

/**
 * What the clerk scanned or typed. A case reference with a wrong check symbol, or an SSCC with a wrong
 * check digit, is refused here, before anything is looked up.
 */
export function parseScannedCode(raw: string): ParsedCode {
  const compact = raw.trim().toUpperCase().replace(/[\s]+/g, '');
  if (compact.replace(/-/g, '').startsWith('PP')) {
    const ref = parseReference(compact);
    if (!ref.ok) throw AppError.validation([{ path: 'code', message: ref.message }], 'That is not a valid case reference');
    return { kind: 'reference', reference: ref.reference };
  }
  const sscc = /^(?:\(00\)|00)?(\d{18})$/.exec(compact.replace(/-/g, ''))?.[1];
  if (sscc) {
    if (!isValidSscc(sscc)) throw AppError.validation([{ path: 'code', message: 'The SSCC’s check digit does not match; scan it again.' }], 'That is not a valid box code');
    return { kind: 'sscc', sscc };
  }
  if (!/^[A-Z0-9-]{6,40}$/.test(compact)) {
    throw AppError.validation([{ path: 'code', message: 'Scan or type a tracking code (letters and digits) or a case reference (PP-…)' }]);
  }
  return { kind: 'tracking_code', trackingCode: compact.replace(/-/g, '') };
}

/** Why this lab cannot check this case in now, or null. */
function checkInBlocked(referral: Referral, labId: string, shipment: Shipment | null): string | null {
  if (shipment?.checkedInAt) return 'This box has already been checked in.';
  if (referral.labOrganizationId !== labId) return 'Your lab no longer has this case.';
  if (!CHECK_IN_STATUSES.includes(referral.status)) return `The case is ${caseStatusLabels[referral.status].toLowerCase()}; it is not waiting for a box.`;
  return null;
}

export async function lookupBox(ctx: ServiceContext, actor: Actor, rawQuery: unknown, channel: Channel): Promise<CheckInLookupDto> {
  const { code } = parseInput(checkInLookupQuery, rawQuery);
  const labId = labOf(actor);
  const parsed = parseScannedCode(code);
  const manager = ctx.db.manager;

  let shipment: Shipment | null = null;
  let referral: Referral | null = null;
  if (parsed.kind === 'reference') {
    referral = await manager.findOneBy(Referral, { reference: parsed.reference });
    if (referral) {
      shipment = await manager.findOne(Shipment, {
        where: [
          { referralId: referral.id, toOrganizationId: labId, kind: 'inbound' },
          { referralId: referral.id, toOrganizationId: labId, kind: 'transfer' },
        ],
        order: { createdAt: 'DESC' },
      });
      if (shipment?.status === 'voided' || shipment?.status === 'awaiting_purchase') shipment = null;
      // Another lab's case is not found here.
      if (referral.labOrganizationId !== labId && !shipment) referral = null;
    }
  } else {
    const where = parsed.kind === 'sscc' ? { sscc: parsed.sscc, toOrganizationId: labId } : { trackingCode: parsed.trackingCode, toOrganizationId: labId };
    shipment = await manager.findOneBy(Shipment, where);
    if (shipment && !['inbound', 'transfer'].includes(shipment.kind)) shipment = null;
    referral = shipment ? await manager.findOneBy(Referral, { id: shipment.referralId }) : null;
  }
  if (!referral) throw AppError.notFound(parsed.kind === 'reference' ? 'A case with that reference for your lab' : 'A box with that code for your lab');

  const shop = await manager.findOneByOrFail(Organization, { id: referral.partnerOrganizationId });
  const lastCheckIn = await manager.findOne(CheckIn, { where: { referralId: referral.id, labOrganizationId: labId }, order: { checkedInAt: 'DESC' } });
  const blocked = checkInBlocked(referral, labId, shipment) ?? (lastCheckIn && (!shipment || lastCheckIn.checkedInAt > shipment.createdAt) ? 'This case has already been checked in.' : null);
  return {
    matchedBy: parsed.kind,
    referral: {
      id: referral.id,
      reference: referral.reference,
      status: referral.status,
      shopName: shop.name,
      mediaType: referral.mediaType,
      device: deviceLine(referral),
      serial: referral.deviceSerial,
      symptoms: referral.symptoms.map((s) => symptomLabels[s]),
      priorities: referral.priorities.map((p) => `${priorityCategoryLabels[p.category]}${p.note ? `: ${p.note}` : ''}`),
      battery: referral.battery ? { installed: referral.battery.installed, condition: referral.battery.condition, wattHours: referral.battery.wattHours } : null,
      askBattery: Boolean(referral.battery?.installed) || batteryMediaTypes.includes(referral.mediaType),
      cautions: referral.triage.cautions,
    },
    shipment: shipment ? await shipmentDtoOf(manager, shipment, channel, referral.reference) : null,
    checkIn: lastCheckIn ? checkInSummary(lastCheckIn, (await manager.findOneBy(Organization, { id: labId }))?.name ?? '', await photoCount(manager, lastCheckIn.id)) : null,
    canCheckIn: blocked === null,
    blockedReason: blocked,
  };
}

async function photoCount(manager: EntityManager, checkInId: string): Promise<number> {
  return Number((await manager.query(`SELECT count(*)::int AS n FROM check_in_photos WHERE check_in_id = $1`, [checkInId]))[0].n);
}

// ---- check-in ----------------------------------------------------------------------------------

export interface IncomingCheckInPhoto {
  originalName: string;
  bytes: Buffer;
}

export async function checkInBox(
  ctx: ServiceContext,
  storage: BlobStorage,
  actor: Actor,
  rawInput: unknown,
  photos: IncomingCheckInPhoto[],
): Promise<CheckInResultDto> {
  const input = parseInput(checkInInput, rawInput);
  const labId = labOf(actor);
  if (photos.length > MAX_PHOTOS) throw AppError.validation([{ path: 'photos', message: `At most ${MAX_PHOTOS} photos per check-in` }]);
  const accepted: { hash: string; type: string; bytes: Buffer }[] = [];
  for (const [i, p] of photos.entries()) {
    const type = p.bytes.length > 0 && p.bytes.length <= MAX_PHOTO_BYTES ? await detectPhotoType(p.bytes) : null;
    if (!type) throw AppError.validation([{ path: `photos.${i}`, message: `“${p.originalName.slice(0, 80)}” is not a JPEG, PNG, WebP or HEIC photo of at most 10 MB` }]);
    accepted.push({ hash: contentHash(p.bytes), type, bytes: p.bytes });
  }
  // The bytes first (content-addressed): a blob without a row, should the transaction fail, is harmless.
  for (const p of accepted) await storage.put(p.bytes);

  const now = new Date();
  const result = await ctx.db.transaction(async (manager) => {
    const referral = await lockReferral(manager, input.referralId);
    if (!referral) throw AppError.notFound('That case');
    let shipment: Shipment | null = null;
    if (input.shipmentId) {
      shipment = await manager.findOne(Shipment, { where: { id: input.shipmentId, referralId: referral.id, toOrganizationId: labId }, lock: { mode: 'pessimistic_write' } });
      if (!shipment) throw AppError.notFound('That box');
    } else {
      shipment = await manager.findOne(Shipment, {
        where: [
          { referralId: referral.id, toOrganizationId: labId, kind: 'inbound' },
          { referralId: referral.id, toOrganizationId: labId, kind: 'transfer' },
        ],
        order: { createdAt: 'DESC' },
      });
      if (shipment && (shipment.status === 'voided' || shipment.status === 'awaiting_purchase' || shipment.checkedInAt)) shipment = null;
    }
    if (referral.labOrganizationId !== labId && !shipment) throw AppError.notFound('That case');
    const blocked = checkInBlocked(referral, labId, shipment);
    if (blocked) throw AppError.conflict(blocked);

    const battery = input.batteryCondition ?? null;
    const problems: string[] = [];
    if (input.boxCondition === 'damaged') problems.push('the box arrived damaged');
    if (input.seal.present && input.seal.intact === false) problems.push(`seal ${input.seal.number} was broken`);
    if (!input.contentsMatch) problems.push(`the contents do not match the intake (${input.contentsNote})`);
    if (battery === 'swollen' || battery === 'damaged' || battery === 'leaking') {
      problems.push(`the battery is ${battery}: a fire risk, kept isolated in a non-combustible container; the lab will contact you`);
    }
    const outcome = problems.length ? ('on_hold' as const) : ('received' as const);
    const holdReason = problems.length ? `On arrival, ${problems.join('; ')}.` : null;
    const name = await personName(manager, actor.userId);
    const lab = await manager.findOneByOrFail(Organization, { id: labId });

    const checkIn = await manager.save(
      manager.create(CheckIn, {
        referralId: referral.id,
        shipmentId: shipment?.id ?? null,
        labOrganizationId: labId,
        boxCondition: input.boxCondition,
        sealPresent: input.seal.present,
        sealNumber: input.seal.present ? (input.seal.number ?? null) : null,
        sealIntact: input.seal.present ? (input.seal.intact ?? null) : null,
        contentsMatch: input.contentsMatch,
        contentsNote: input.contentsNote ?? null,
        batteryCondition: battery,
        note: input.note ?? null,
        outcome,
        holdReason,
        checkedInByUserId: actor.userId,
        checkedInByName: name,
        checkedInAt: now,
      }),
    );
    for (const p of accepted.filter((x, i) => accepted.findIndex((y) => y.hash === x.hash) === i)) {
      await manager.insert(CheckInPhoto, { checkInId: checkIn.id, contentHash: p.hash, contentType: p.type, sizeBytes: p.bytes.length });
    }
    if (shipment) {
      // The box is here, whatever the carrier has said so far; a late "delivered" changes nothing.
      const arrived = shipment.status === 'delivered' ? {} : { status: 'delivered' as const, statusRank: statusRank.delivered, lastMessage: `Checked in at ${lab.name}`, lastEventAt: now, lastStatusDetail: 'checked_in' };
      await manager.update(Shipment, shipment.id, { checkedInAt: now, checkInId: checkIn.id, deliveredAt: shipment.deliveredAt ?? now, ...arrived });
    }
    await manager.update(Referral, referral.id, { status: outcome });

    const who: TimelineActor = { type: 'user', id: actor.userId, name };
    const seal = input.seal.present ? `seal ${input.seal.number} ${input.seal.intact ? 'intact' : 'broken'}` : 'no seal';
    const batteryWords = battery ? `; battery: ${batteryConditionSeenLabels[battery].toLowerCase()}` : '';
    await addTimelineEntry(manager, referral.id, {
      kind: 'received',
      summary: `Box checked in at ${lab.name} by ${name}: box ${input.boxCondition}, ${seal}, contents ${input.contentsMatch ? 'match the intake' : 'differ from the intake'}${batteryWords}${accepted.length ? `; ${accepted.length} ${accepted.length === 1 ? 'photo' : 'photos'}` : ''}.`,
      actor: who,
      at: now,
      details: { checkInId: checkIn.id, shipmentId: shipment?.id ?? null, outcome, boxCondition: input.boxCondition, seal: input.seal, contentsMatch: input.contentsMatch, batteryCondition: battery },
    });
    await appendCustody(manager, referral.id, { action: 'checked_in', actor: who, location: await organizationPlace(manager, labId), at: now, details: { checkInId: checkIn.id, boxCondition: input.boxCondition, seal, contentsMatch: input.contentsMatch, outcome } });
    if (holdReason) {
      await addTimelineEntry(manager, referral.id, { kind: 'on_hold', summary: `On hold at ${lab.name}: ${holdReason}`, actor: who, at: now, details: { checkInId: checkIn.id, reason: holdReason } });
    }
    const shopPeople: { email: string; name: string }[] = await manager.query(
      `SELECT email, name FROM users WHERE organization_id = $1 AND role IN ('partner_admin', 'partner_staff') AND status = 'active' ORDER BY email`,
      [referral.partnerOrganizationId],
    );
    const url = `${ctx.config.appUrl}/partner/cases/${referral.id}`;
    for (const person of shopPeople) {
      if (holdReason) await enqueueEmailToUser(manager, { email: person.email }, 'case_on_hold', { name: person.name, reference: referral.reference, labName: lab.name, reason: holdReason, url });
      else await enqueueEmailToUser(manager, { email: person.email }, 'box_checked_in', { name: person.name, reference: referral.reference, labName: lab.name, customerName: referral.customerName, url });
    }
    return { checkIn: checkInSummary(checkIn, lab.name, accepted.length), caseStatus: outcome };
  });
  return result;
}

/** A check-in photo for the lab that took it, the shop of the case, or the network. */
export async function openCheckInPhoto(ctx: ServiceContext, storage: BlobStorage, actor: Actor, photoId: string) {
  if (!/^[0-9a-f-]{36}$/i.test(photoId)) throw AppError.notFound('That photo');
  const rows: { content_hash: string; content_type: string; size_bytes: number; lab_organization_id: string; partner_organization_id: string }[] = await ctx.db.query(
    `SELECT p.content_hash, p.content_type, p.size_bytes, c.lab_organization_id, r.partner_organization_id
       FROM check_in_photos p JOIN check_ins c ON c.id = p.check_in_id JOIN referrals r ON r.id = c.referral_id WHERE p.id = $1`,
    [photoId],
  );
  const row = rows[0];
  const allowed = row && (actor.organizationKind === 'network' || row.lab_organization_id === actor.organizationId || row.partner_organization_id === actor.organizationId);
  if (!row || !allowed) throw AppError.notFound('That photo');
  const stream = await storage.get(row.content_hash);
  if (!stream) throw AppError.notFound('That photo');
  return { stream, contentType: row.content_type, sizeBytes: row.size_bytes, etag: `"${row.content_hash}"` };
}

// ---- declining after arrival: the case moves on, the device follows by transfer -----------------

/**
 * The lab's manager releases a case held at check-in (damaged box, broken seal, contents that differ,
 * a battery to isolate) once it is settled: the case is received and goes on to the bench.
 */
export async function releaseHold(ctx: ServiceContext, actor: Actor, referralId: string, rawInput: unknown): Promise<{ referralId: string; status: CaseStatus }> {
  const input = parseInput(releaseHoldInput, rawInput);
  const labId = labOf(actor);
  if (!/^[0-9a-f-]{36}$/i.test(referralId)) throw AppError.notFound('That case');
  return ctx.db.transaction(async (manager) => {
    const referral = await lockReferral(manager, referralId);
    if (!referral || referral.labOrganizationId !== labId) throw AppError.notFound('That case');
    if (referral.status !== 'on_hold') throw AppError.conflict(`The case is not on hold: it is ${caseStatusLabels[referral.status].toLowerCase()}.`);
    const now = new Date();
    const name = await personName(manager, actor.userId);
    await manager.update(Referral, referralId, { status: 'received' });
    await addTimelineEntry(manager, referralId, {
      kind: 'hold_released',
      summary: `Hold released by ${name}: ${input.note}`,
      actor: { type: 'user', id: actor.userId, name },
      at: now,
      details: { note: input.note },
    });
    return { referralId, status: 'received' as const };
  });
}

export async function declineAfterArrival(ctx: ServiceContext, actor: Actor, referralId: string, rawInput: unknown): Promise<{ referralId: string; status: CaseStatus; transferId: string }> {
  const input = parseInput(declineAfterArrivalInput, rawInput);
  const labId = labOf(actor);
  if (!/^[0-9a-f-]{36}$/i.test(referralId)) throw AppError.notFound('That case');
  return ctx.db.transaction(async (manager) => {
    const referral = await lockReferral(manager, referralId);
    if (!referral || referral.labOrganizationId !== labId) throw AppError.notFound('That case');
    const holder = await holdingLab(manager, referral.id);
    if (!holder || holder.labId !== labId) throw AppError.conflict('The device is not at your lab; decline the offer instead, or wait for the box.');
    if (await manager.findOneBy(LabTransfer, { referralId, status: 'open' })) throw AppError.conflict('This case is already being transferred.');
    const now = new Date();
    const name = await personName(manager, actor.userId);
    const who: TimelineActor = { type: 'user', id: actor.userId, name };
    const lab = await manager.findOneByOrFail(Organization, { id: labId });

    await manager.update(
      LabOffer,
      { referralId, labOrganizationId: labId, status: 'accepted' },
      { status: 'declined', respondedAt: now, respondedByUserId: actor.userId, respondedByName: name, declineReason: input.reason, declineNote: input.note ?? null },
    );
    const transfer = await manager.save(
      manager.create(LabTransfer, { referralId, fromLabOrganizationId: labId, reason: input.reason, note: input.note ?? null, status: 'open', shipmentId: null, createdByName: name }),
    );
    await manager.update(Referral, referralId, { labOrganizationId: null });
    referral.labOrganizationId = null;
    await addTimelineEntry(manager, referralId, {
      kind: 'declined_after_arrival',
      summary: `${lab.name} declined the case after examining the device${input.note ? ` (${input.note})` : ''}; it goes to the next lab, and ${lab.name} ships the device there.`,
      actor: who,
      at: now,
      details: { transferId: transfer.id, reason: input.reason, note: input.note ?? null },
    });
    const outcome = await routeAndOffer(ctx, manager, referral, { trigger: 'reoffer', now });
    for (const person of await shopUsers(manager, referral.partnerOrganizationId)) {
      await enqueueEmailToUser(manager, { known: person }, 'case_transfer', {
        name: person.name,
        reference: referral.reference,
        fromLab: lab.name,
        url: `${ctx.config.appUrl}/partner/cases/${referralId}`,
      });
    }
    return { referralId, status: outcome.outcome === 'needs_attention' ? 'needs_attention' : referral.status, transferId: transfer.id };
  });
}

