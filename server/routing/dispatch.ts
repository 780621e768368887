import type { EntityManager } from 'typeorm';
import { offerDeadline } from '@shared/domain/business-hours';
import { geodesicDistanceKm, type LatLon } from '@shared/domain/geo';
import { declineReasonLabels, type DeclineOfferInput } from '@shared/schemas/referrals';
import type { AutoAcceptRule } from '@shared/schemas/labs';
import type { LabSkill } from '@shared/vocabulary';
import { appendBufferOf, collectRowsOf, insertRow, newRowId, updateRow } from '../db/appends';
import { enqueueJob, queues } from '../jobs';
import { AppError } from '../lib/errors';
import type { ServiceContext } from '../lib/context';
import { enqueueEmailToUser } from '../notifications';
import { Referral } from '../referrals/entities';
import { LabOffer, RoutingSnapshot, type RoutingTrigger } from './entities';
import type { LoadedLab } from './labs';
import { deviceLabel, formatLocal, labManagers, networkAdmins, shopUsers, skillList } from './notify';
import { noCandidateReason, rankLabs, type Ranking } from './ranking';
import { autoAcceptActor, deadlineActor, recordTimeline, routingActor, type TimelineActor } from './timeline';

// Moving a case between labs: rank, offer to the best candidate (or accept at once by the lab's rule),
// and when an offer is declined or runs out, offer to the next. Every function here runs inside the
// caller's transaction with the case row locked, and writes its timeline, e-mails and jobs there too.

collectRowsOf(LabOffer);

export type DispatchOutcome = (
  | { outcome: 'offered'; offer: LabOffer; labName: string }
  | { outcome: 'accepted'; offer: LabOffer; labName: string }
  | { outcome: 'needs_attention'; reason: string }
) & {
  /** The ranking the decision was made on, when this step ranked the labs. */
  snapshot?: RoutingSnapshot;
};

/** Locks the case row: every change to a case's offers goes through this lock, in this order (case, then offer). */
export async function lockReferral(manager: EntityManager, referralId: string): Promise<Referral | null> {
  return manager.findOne(Referral, { where: { id: referralId }, lock: { mode: 'pessimistic_write' } });
}

export function caseForRouting(referral: Referral) {
  return { mediaType: referral.mediaType, origin: { lat: referral.originLat, lon: referral.originLon }, triage: referral.triage };
}

/**
 * The case as routing sees it now. The device is at the shop until a lab that examined it declines it;
 * then it is at that lab, which ships it on (an open lab transfer), so distances and transit days are
 * counted from there. (SQL rather than an import: receiving builds on routing.)
 */
export async function caseForRoutingNow(manager: EntityManager, referral: Referral): Promise<CaseForRoutingNow> {
  return (await casesForRoutingNow(manager, [referral])).get(referral.id)!;
}

export type CaseForRoutingNow = ReturnType<typeof caseForRouting> & { heldBy: string | null };

/** caseForRoutingNow for several cases, in one statement; by case id. */
export async function casesForRoutingNow(manager: EntityManager, referrals: readonly Referral[]): Promise<Map<string, CaseForRoutingNow>> {
  const held: { referral_id: string; name: string; lat: number; lon: number }[] = await manager.query(
    `SELECT DISTINCT ON (t.referral_id) t.referral_id, o.name, o.lat, o.lon FROM lab_transfers t JOIN organizations o ON o.id = t.from_lab_organization_id
     WHERE t.referral_id = ANY($1::uuid[]) AND t.status = 'open' AND o.lat IS NOT NULL AND o.lon IS NOT NULL ORDER BY t.referral_id`,
    [referrals.map((r) => r.id)],
  );
  const byCase = new Map(held.map((h) => [h.referral_id, h]));
  return new Map(
    referrals.map((referral) => {
      const kase = caseForRouting(referral);
      const from = byCase.get(referral.id);
      return [referral.id, from ? { ...kase, origin: { lat: Number(from.lat), lon: Number(from.lon) }, heldBy: from.name } : { ...kase, heldBy: null }];
    }),
  );
}

/** The first rule of the lab that covers every required skill and the distance, if any. */
export function matchingAutoAcceptRule(rules: readonly AutoAcceptRule[], requiredSkills: readonly LabSkill[], distanceKm: number): AutoAcceptRule | null {
  return rules.find((rule) => requiredSkills.every((s) => rule.skills.includes(s)) && distanceKm <= rule.maxDistanceKm) ?? null;
}

const caseUrl = (ctx: ServiceContext, referralId: string) => `${ctx.config.appUrl}/partner/cases/${referralId}`;
const offersUrl = (ctx: ServiceContext) => `${ctx.config.appUrl}/lab/offers`;

async function partnerName(manager: EntityManager, referral: Referral): Promise<string> {
  if (referral.partnerOrganization?.name) return referral.partnerOrganization.name;
  const rows: { name: string }[] = await manager.query(`SELECT name FROM organizations WHERE id = $1`, [referral.partnerOrganizationId]);
  return rows[0]?.name ?? 'the shop';
}

async function saveSnapshot(manager: EntityManager, referral: Referral, ranking: Ranking, trigger: RoutingTrigger, origin: LatLon): Promise<RoutingSnapshot> {
  const buffer = appendBufferOf(manager);
  if (buffer) {
    const row = { id: newRowId(), referralId: referral.id, trigger, originLat: origin.lat, originLon: origin.lon, candidates: ranking.candidates, excluded: ranking.excluded };
    buffer.snapshots.push(row);
    return Object.assign(new RoutingSnapshot(), row);
  }
  return manager.save(
    manager.create(RoutingSnapshot, {
      referralId: referral.id,
      trigger,
      originLat: origin.lat,
      originLon: origin.lon,
      candidates: ranking.candidates,
      excluded: ranking.excluded,
    }),
  );
}

interface OfferTerms {
  snapshotId: string | null;
  rank: number | null;
  distanceKm: number;
  estimatedDays: number | null;
  actor: TimelineActor;
  assignedByUserId?: string | null;
  /** The case was opened in this transaction: no device is at any lab yet. */
  newCase?: boolean;
  now: Date;
}

/** Accepts an offer in the caller's transaction: the case is now the lab's. */
export async function acceptInTransaction(
  ctx: ServiceContext,
  manager: EntityManager,
  referral: Referral,
  offer: LabOffer,
  lab: { id: string; name: string },
  how: { actor: TimelineActor; rule?: AutoAcceptRule; now: Date; /** Opened in this transaction: no transfer to look for. */ newCase?: boolean },
): Promise<void> {
  const auto = how.rule !== undefined;
  // A case declined after arrival moves lab to lab: the lab holding the device ships it on, not the shop.
  // (Read with SQL, not an import: receiving builds on routing.)
  const fromLab: string | null = how.newCase
    ? null
    : ((
        await manager.query(
          `SELECT o.name FROM lab_transfers t JOIN organizations o ON o.id = t.from_lab_organization_id WHERE t.referral_id = $1 AND t.status = 'open' LIMIT 1`,
          [referral.id],
        )
      )[0]?.name ?? null);
  await updateRow(manager, LabOffer, offer, {
    status: 'accepted',
    respondedAt: how.now,
    respondedByUserId: how.actor.type === 'user' ? (how.actor.id ?? null) : null,
    respondedByName: how.actor.name,
    autoAccepted: auto,
  });
  Object.assign(offer, {
    status: 'accepted',
    respondedAt: how.now,
    respondedByUserId: how.actor.type === 'user' ? (how.actor.id ?? null) : null,
    respondedByName: how.actor.name,
    autoAccepted: auto,
  });
  await updateRow(manager, Referral, referral, { status: 'accepted', labOrganizationId: lab.id, attentionReason: null });
  Object.assign(referral, { status: 'accepted', labOrganizationId: lab.id, attentionReason: null });
  await recordTimeline(manager, referral, {
    kind: 'offer_accepted',
    summary: auto
      ? `Accepted for ${lab.name} by its auto-accept rule (${skillList(how.rule!.skills)} within ${how.rule!.maxDistanceKm} km).`
      : `Accepted by ${lab.name} (${how.actor.name}).`,
    actor: how.actor,
    at: how.now,
    details: { offerId: offer.id, labId: lab.id, autoAccepted: auto, ...(auto ? { rule: how.rule } : {}) },
  });
  for (const person of await shopUsers(manager, referral.partnerOrganizationId)) {
    await enqueueEmailToUser(manager, { known: person }, 'referral_accepted', {
      name: person.name,
      reference: referral.reference,
      customerName: referral.customerName,
      labName: lab.name,
      url: caseUrl(ctx, referral.id),
      fromLab,
    });
  }
  if (auto) {
    const shop = await partnerName(manager, referral);
    for (const person of await labManagers(manager, lab.id)) {
      await enqueueEmailToUser(manager, { known: person }, 'lab_case_auto_accepted', {
        name: person.name,
        labName: lab.name,
        reference: referral.reference,
        device: deviceLabel(referral),
        skills: skillList(referral.triage.requiredSkills),
        shop,
        url: offersUrl(ctx),
      });
    }
  }
}

/** Offers the case to one lab until its deadline, or accepts it at once when the lab's rule says so. */
export async function makeOffer(ctx: ServiceContext, manager: EntityManager, referral: Referral, lab: LoadedLab, terms: OfferTerms): Promise<DispatchOutcome> {
  const deadline = offerDeadline(terms.now, lab.calendar, ctx.config.offerResponseBusinessHours);
  const offer = await insertRow(
    manager,
    LabOffer,
    manager.create(LabOffer, {
      id: newRowId(),
      referralId: referral.id,
      labOrganizationId: lab.id,
      routingSnapshotId: terms.snapshotId,
      status: 'pending',
      rank: terms.rank,
      distanceKm: Math.round(terms.distanceKm * 10) / 10,
      estimatedDays: terms.estimatedDays,
      offeredAt: terms.now,
      deadline,
      respondedAt: null,
      respondedByUserId: null,
      respondedByName: null,
      autoAccepted: false,
      declineReason: null,
      declineNote: null,
      assignedByUserId: terms.assignedByUserId ?? null,
      createdAt: terms.now,
      updatedAt: terms.now,
    }),
  );
  await recordTimeline(manager, referral, {
    kind: 'offered',
    summary: `Offered to ${lab.name} until ${formatLocal(deadline, lab.timeZone)}.`,
    actor: terms.actor,
    at: terms.now,
    details: { offerId: offer.id, labId: lab.id, labName: lab.name, deadline: deadline.toISOString(), rank: terms.rank, estimatedDays: terms.estimatedDays },
  });

  const rule = matchingAutoAcceptRule(lab.autoAcceptRules, referral.triage.requiredSkills, terms.distanceKm);
  if (rule) {
    await acceptInTransaction(ctx, manager, referral, offer, lab, { actor: autoAcceptActor, rule, now: terms.now, newCase: terms.newCase });
    return { outcome: 'accepted', offer, labName: lab.name };
  }

  await updateRow(manager, Referral, referral, { status: 'offered', attentionReason: null });
  Object.assign(referral, { status: 'offered', attentionReason: null });
  // The deadline job commits with the offer (job outbox), so an offer never lacks its expiry.
  await enqueueJob(manager, queues.offerExpire, { offerId: offer.id }, { startAfter: deadline, singletonKey: offer.id });
  const shop = await partnerName(manager, referral);
  for (const person of await labManagers(manager, lab.id)) {
    await enqueueEmailToUser(manager, { known: person }, 'lab_offer_new', {
      name: person.name,
      labName: lab.name,
      reference: referral.reference,
      device: deviceLabel(referral),
      skills: skillList(referral.triage.requiredSkills),
      shop,
      deadline: formatLocal(deadline, lab.timeZone),
      url: offersUrl(ctx),
    });
  }
  return { outcome: 'offered', offer, labName: lab.name };
}

async function markNeedsAttention(ctx: ServiceContext, manager: EntityManager, referral: Referral, reason: string, now: Date): Promise<DispatchOutcome> {
  await updateRow(manager, Referral, referral, { status: 'needs_attention', attentionReason: reason });
  Object.assign(referral, { status: 'needs_attention', attentionReason: reason });
  await recordTimeline(manager, referral, { kind: 'needs_attention', summary: `Waiting for the network to route it by hand. ${reason}`, actor: routingActor, at: now, details: { reason } });
  const shop = await partnerName(manager, referral);
  for (const person of await networkAdmins(manager)) {
    await enqueueEmailToUser(manager, { known: person }, 'referral_needs_attention', {
      name: person.name,
      reference: referral.reference,
      shop,
      reason,
      url: `${ctx.config.appUrl}/admin/attention`,
    });
  }
  return { outcome: 'needs_attention', reason };
}

/** Ranks the labs now (leaving out those already offered the case) and offers it to the best one. */
export async function routeAndOffer(
  ctx: ServiceContext,
  manager: EntityManager,
  referral: Referral,
  options: { trigger: RoutingTrigger; now: Date; /** When the caller knows them (none, at intake). */ previouslyOfferedLabIds?: readonly string[] },
): Promise<DispatchOutcome> {
  const previouslyOfferedLabIds =
    options.previouslyOfferedLabIds ?? [...new Set((await manager.find(LabOffer, { where: { referralId: referral.id } })).map((o) => o.labOrganizationId))];
  // At intake the device is at the shop; later it may be at a lab that declined it after examining it.
  const kase = options.trigger === 'intake' ? { ...caseForRouting(referral), heldBy: null } : await caseForRoutingNow(manager, referral);
  const ranking = await rankLabs(manager, kase, { asOf: options.now, previouslyOfferedLabIds });
  const snapshot = await saveSnapshot(manager, referral, ranking, options.trigger, kase.origin);
  const n = ranking.candidateCount;
  const from = kase.heldBy ? `Ranked from ${kase.heldBy}, which holds the device. ` : '';
  await recordTimeline(manager, referral, {
    kind: 'routed',
    summary:
      n === 0
        ? `${from}No lab qualifies (${ranking.excluded.length} excluded).`
        : `${from}${n} ${n === 1 ? 'lab qualifies' : 'labs qualify'}; best: ${ranking.candidates[0].labName}, about ${ranking.candidates[0].estimatedDays} business days to data (${ranking.excluded.length} excluded).`,
    actor: routingActor,
    at: options.now,
    details: { snapshotId: snapshot.id, trigger: options.trigger, candidates: n, excluded: ranking.excluded.length },
  });
  if (n === 0) return { ...(await markNeedsAttention(ctx, manager, referral, noCandidateReason(ranking.excluded), options.now)), snapshot };
  const top = ranking.candidates[0];
  const offered = await makeOffer(ctx, manager, referral, ranking.labs.get(top.labId)!, {
    snapshotId: snapshot.id,
    rank: 1,
    distanceKm: top.distanceKm,
    estimatedDays: top.estimatedDays,
    actor: routingActor,
    now: options.now,
    newCase: options.trigger === 'intake',
  });
  return { ...offered, snapshot };
}

/** Withdraws the case's pending offer, if there is one, and tells the lab. */
export async function withdrawPendingOffer(manager: EntityManager, referral: Referral, why: { reason: string; actor: TimelineActor; now: Date }): Promise<LabOffer | null> {
  const offer = await manager.findOne(LabOffer, { where: { referralId: referral.id, status: 'pending' }, lock: { mode: 'pessimistic_write' } });
  if (!offer) return null;
  await manager.update(LabOffer, offer.id, { status: 'withdrawn', respondedAt: why.now });
  offer.status = 'withdrawn';
  const labName: string = (await manager.query(`SELECT name FROM organizations WHERE id = $1`, [offer.labOrganizationId]))[0]?.name ?? 'the lab';
  await recordTimeline(manager, referral, {
    kind: 'offer_withdrawn',
    summary: `Offer to ${labName} withdrawn: ${why.reason}`,
    actor: why.actor,
    at: why.now,
    details: { offerId: offer.id, labId: offer.labOrganizationId },
  });
  for (const person of await labManagers(manager, offer.labOrganizationId)) {
    await enqueueEmailToUser(manager, { known: person }, 'lab_offer_withdrawn', { name: person.name, labName, reference: referral.reference, reason: why.reason });
  }
  return offer;
}

export async function declineInTransaction(
  ctx: ServiceContext,
  manager: EntityManager,
  referral: Referral,
  offer: LabOffer,
  labName: string,
  how: { actor: TimelineActor; input: DeclineOfferInput; now: Date },
): Promise<DispatchOutcome> {
  await manager.update(LabOffer, offer.id, {
    status: 'declined',
    respondedAt: how.now,
    respondedByUserId: how.actor.type === 'user' ? (how.actor.id ?? null) : null,
    respondedByName: how.actor.name,
    declineReason: how.input.reason,
    declineNote: how.input.note ?? null,
  });
  await recordTimeline(manager, referral, {
    kind: 'offer_declined',
    summary: `Declined by ${labName}: ${declineReasonLabels[how.input.reason]}${how.input.note ? ` (${how.input.note})` : ''}.`,
    actor: how.actor,
    at: how.now,
    details: { offerId: offer.id, labId: offer.labOrganizationId, reason: how.input.reason, note: how.input.note ?? null },
  });
  return routeAndOffer(ctx, manager, referral, { trigger: 'reoffer', now: how.now });
}

export async function expireInTransaction(ctx: ServiceContext, manager: EntityManager, referral: Referral, offer: LabOffer, now: Date): Promise<DispatchOutcome> {
  await manager.update(LabOffer, offer.id, { status: 'expired' });
  offer.status = 'expired';
  const lab: { name: string; time_zone: string } | undefined = (await manager.query(`SELECT name, time_zone FROM organizations WHERE id = $1`, [offer.labOrganizationId]))[0];
  await recordTimeline(manager, referral, {
    kind: 'offer_expired',
    summary: `${lab?.name ?? 'The lab'} did not answer by ${formatLocal(offer.deadline, lab?.time_zone ?? 'UTC')}; offering it to the next lab.`,
    actor: deadlineActor,
    at: now,
    details: { offerId: offer.id, labId: offer.labOrganizationId, deadline: offer.deadline.toISOString() },
  });
  return routeAndOffer(ctx, manager, referral, { trigger: 'reoffer', now });
}

export type ExpiryResult = 'expired' | 'not_pending' | 'not_due' | 'missing';

/**
 * The offer-deadline job. Idempotent: only a still-pending offer whose deadline has passed expires; a job
 * that runs twice, late, or after the lab answered changes nothing.
 */
export async function expireOffer(ctx: ServiceContext, offerId: string, now: Date = new Date()): Promise<ExpiryResult> {
  return ctx.db.transaction(async (manager) => {
    const first = await manager.findOneBy(LabOffer, { id: offerId });
    if (!first) return 'missing';
    if (first.status !== 'pending') return 'not_pending';
    if (first.deadline > now) return 'not_due';
    const referral = await lockReferral(manager, first.referralId);
    const offer = await manager.findOne(LabOffer, { where: { id: offerId }, lock: { mode: 'pessimistic_write' } });
    if (!referral || !offer) return 'missing';
    if (offer.status !== 'pending') return 'not_pending';
    if (offer.deadline > now) return 'not_due';
    await expireInTransaction(ctx, manager, referral, offer, now);
    return 'expired';
  });
}

/** The backstop sweep: expires every pending offer past its deadline. */
export async function expireOverdueOffers(ctx: ServiceContext, now: Date = new Date(), limit = 100): Promise<number> {
  const due: { id: string }[] = await ctx.db.query(`SELECT id FROM lab_offers WHERE status = 'pending' AND deadline <= $1 ORDER BY deadline LIMIT $2`, [now, limit]);
  let expired = 0;
  for (const { id } of due) if ((await expireOffer(ctx, id, now)) === 'expired') expired++;
  return expired;
}

/** Offers a case to a lab the network admin chose, whatever the ranking says. */
export async function assignInTransaction(
  ctx: ServiceContext,
  manager: EntityManager,
  referral: Referral,
  lab: LoadedLab,
  how: { actor: TimelineActor & { id: string }; note: string | null; now: Date },
): Promise<DispatchOutcome> {
  const previous = await manager.find(LabOffer, { where: { referralId: referral.id } });
  // Every candidate, so that the chosen lab's place in the ranking is known wherever it stands.
  const kase = await caseForRoutingNow(manager, referral);
  const ranking = await rankLabs(manager, kase, {
    asOf: how.now,
    previouslyOfferedLabIds: [...new Set(previous.map((o) => o.labOrganizationId))],
    limit: null,
  });
  const snapshot = await saveSnapshot(manager, referral, ranking, 'manual', kase.origin);
  const candidate = ranking.candidates.find((c) => c.labId === lab.id);
  if (!lab.location) throw AppError.validation([{ path: 'labId', message: 'That lab has no location on file' }]);
  await recordTimeline(manager, referral, {
    kind: 'assigned',
    summary: `${how.actor.name} routed the case to ${lab.name} by hand${how.note ? `: ${how.note}` : '.'}`,
    actor: how.actor,
    at: how.now,
    details: { labId: lab.id, note: how.note, snapshotId: snapshot.id, inRanking: candidate !== undefined },
  });
  return makeOffer(ctx, manager, referral, lab, {
    snapshotId: snapshot.id,
    rank: candidate ? ranking.candidates.indexOf(candidate) + 1 : null,
    distanceKm: candidate?.distanceKm ?? geodesicDistanceKm(kase.origin, lab.location),
    estimatedDays: candidate?.estimatedDays ?? null,
    actor: how.actor,
    assignedByUserId: how.actor.id,
    now: how.now,
  });
}
