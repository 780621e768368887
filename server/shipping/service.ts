import type { EntityManager } from 'typeorm';
import { assessBattery, type BatteryAssessment } from '@shared/domain/battery';
import { findBoxPreset, packingRules, presetsFor } from '@shared/domain/box-presets';
import { makeSscc } from '@shared/domain/sscc';
import {
  buyShipmentInput,
  createShipmentInput,
  type CaseShippingDto,
  type RateDto,
  type ShipmentDto,
  type ShipmentKind,
} from '@shared/schemas/shipping';
import { caseStatusLabels, mediaTypeLabels, type BatteryCondition, type CaseStatus, type OrganizationKind } from '@shared/vocabulary';
import { AppError } from '../lib/errors';
import type { ServiceContext } from '../lib/context';
import { logger } from '../lib/logger';
import { parseInput } from '../lib/validate';
import { Organization } from '../organizations';
import { addTimelineEntry, lockReferral, Referral, type TimelineActor } from '../referrals';
import { appendCustody, organizationPlace } from '../custody';
import { CheckIn, LabTransfer } from '../receiving/entities';
import { carrierClient, classifyCarrierError, toMinorUnits, type CarrierFailure, type ProviderRate, type ProviderShipment } from './carrier';
import { isVoidable, statusRank, toShipmentDto, type Channel } from './dto';
import { Shipment, ShipmentScan, type StoredAddress } from './entities';
import { packingSlipPdf } from './slip';
import { readTogether } from '../db/reads';

// Prepaid labels. The network pays; the cost is kept on the shipment in integer cents. Rates come from the
// shipping service for the box the shop (or the lab's clerk) describes, filtered by the lithium battery
// rules; buying is safe to retry: the rate asked for and the carrier's shipment id are stored before the
// call, and a retry first reads the carrier's shipment back to see whether the earlier call bought it.

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** Who reads or changes shipments: an organisation, through the app or the partner API. */
export interface ShippingViewer {
  organizationId: string;
  organizationKind: OrganizationKind;
}

export interface ShippingActor {
  type: 'user' | 'api_key';
  id: string;
  name: string;
}

export const NETWORK_PAYS = 'Prepaid by the Platterpost network';

const timelineActor = (a: ShippingActor): TimelineActor => ({ type: a.type, id: a.id, name: a.name });

function money(minor: number, currency = 'USD'): string {
  return new Intl.NumberFormat('en-US', { style: 'currency', currency }).format(minor / 100);
}

export function deviceLine(r: Pick<Referral, 'mediaType' | 'deviceMake' | 'deviceModel' | 'deviceSerial'>): string {
  const name = [r.deviceMake, r.deviceModel].filter(Boolean).join(' ');
  return `${mediaTypeLabels[r.mediaType]}${name ? `, ${name}` : ''}${r.deviceSerial ? ` (S/N ${r.deviceSerial})` : ''}`;
}

// ---- addresses --------------------------------------------------------------------------------

export function organizationAddress(org: Organization, name: string): StoredAddress {
  return {
    name,
    company: org.name,
    street1: org.addressLine1,
    street2: null,
    city: org.city,
    state: org.region,
    zip: org.postalCode ?? '',
    country: org.country ?? 'US',
    phone: org.phone,
  };
}

export function originAddress(referral: Referral, shop: Organization): StoredAddress {
  return {
    name: shop.name,
    company: null,
    street1: referral.originLine1 ?? shop.addressLine1,
    street2: null,
    city: referral.originCity ?? shop.city,
    state: referral.originRegion ?? shop.region,
    zip: referral.originPostalCode,
    country: referral.originCountry,
    phone: shop.phone,
  };
}

const toWire = (a: StoredAddress) => ({
  name: a.name,
  company: a.company ?? undefined,
  street1: a.street1 ?? undefined,
  street2: a.street2 ?? undefined,
  city: a.city ?? undefined,
  state: a.state ?? undefined,
  zip: a.zip,
  country: a.country,
  phone: a.phone ?? undefined,
});

// ---- battery --------------------------------------------------------------------------------

/** The battery rules for a box: the intake declaration, or the condition the lab saw at check-in. */
export function batteryFor(referral: Referral, seen?: BatteryCondition | 'no_battery' | null): BatteryAssessment | null {
  const b = referral.battery;
  if (seen === 'no_battery') return null;
  if (seen) return assessBattery({ installed: true, condition: seen, ...(b?.wattHours ? { wattHours: b.wattHours } : {}) });
  if (!b || !b.installed) return null;
  return assessBattery({
    installed: true,
    condition: b.condition ?? 'intact',
    ...(b.wattHours ? { wattHours: b.wattHours } : b.volts && b.milliampHours ? { volts: b.volts, milliampHours: b.milliampHours } : {}),
  });
}

export function batteryDto(a: BatteryAssessment | null) {
  if (!a) return null;
  return { airAllowed: a.airAllowed, shippable: a.shippable, markText: a.markText, contactLabFirst: a.contactLabFirst, cautions: a.cautions, reasons: a.reasons };
}

// ---- reading --------------------------------------------------------------------------------

async function referenceOf(manager: EntityManager, referralId: string): Promise<string> {
  const rows: { reference: string }[] = await manager.query(`SELECT reference FROM referrals WHERE id = $1`, [referralId]);
  return rows[0]?.reference ?? '';
}

export async function shipmentDtoOf(manager: EntityManager, shipment: Shipment, channel: Channel, reference?: string): Promise<ShipmentDto> {
  const scans = await manager.find(ShipmentScan, { where: { shipmentId: shipment.id }, order: { occurredAt: 'DESC' } });
  return toShipmentDto(shipment, reference ?? (await referenceOf(manager, shipment.referralId)), scans, channel);
}

/** A shipment the viewer may see: the shop of its case, the lab it comes from or goes to, or the network. */
export async function findVisibleShipment(manager: EntityManager, viewer: ShippingViewer, id: string, lock = false): Promise<Shipment | null> {
  if (!UUID.test(id)) return null;
  const qb = manager.createQueryBuilder(Shipment, 's').innerJoin(Referral, 'r', 'r.id = s.referral_id').where('s.id = :id', { id });
  if (viewer.organizationKind === 'partner') qb.andWhere('r.partner_organization_id = :org', { org: viewer.organizationId });
  else if (viewer.organizationKind === 'lab') qb.andWhere('(s.from_organization_id = :org OR s.to_organization_id = :org)', { org: viewer.organizationId });
  if (lock) qb.setLock('pessimistic_write', undefined, ['s']);
  return qb.getOne();
}

export async function getShipment(ctx: ServiceContext, viewer: ShippingViewer, id: string, channel: Channel): Promise<ShipmentDto> {
  const shipment = await findVisibleShipment(ctx.db.manager, viewer, id);
  if (!shipment) throw AppError.notFound('That shipment');
  return shipmentDtoOf(ctx.db.manager, shipment, channel);
}

/** For the case DTO: every shipment with a label, oldest first. */
export async function shipmentSummaries(manager: EntityManager, referralId: string) {
  const rows: { id: string; tracking_code: string | null; status: string }[] = await manager.query(
    `SELECT id, tracking_code, status FROM shipments WHERE referral_id = $1 AND status <> 'awaiting_purchase' ORDER BY created_at`,
    [referralId],
  );
  return rows.map((r) => ({ id: r.id, trackingCode: r.tracking_code, status: r.status }));
}

// ---- who may ship what ----------------------------------------------------------------------

/** The lab that has the device now: the latest check-in, unless a label out of that lab was bought since. */
export async function holdingLab(manager: EntityManager, referralId: string): Promise<{ labId: string; checkIn: CheckIn } | null> {
  const checkIn = await manager.findOne(CheckIn, { where: { referralId }, order: { checkedInAt: 'DESC' } });
  if (!checkIn) return null;
  const left: unknown[] = await manager.query(
    `SELECT 1 FROM shipments WHERE referral_id = $1 AND from_organization_id = $2 AND kind IN ('return', 'transfer')
       AND status NOT IN ('awaiting_purchase', 'voided') AND created_at > $3 LIMIT 1`,
    [referralId, checkIn.labOrganizationId, checkIn.checkedInAt],
  );
  return left.length ? null : { labId: checkIn.labOrganizationId, checkIn };
}

const statusWords = (s: CaseStatus) => caseStatusLabels[s].toLowerCase();

/** Why the shop cannot buy the label to the lab now, or null when it can. */
export async function inboundBlockedReason(manager: EntityManager, referral: Referral): Promise<string | null> {
  if (await manager.findOneBy(LabTransfer, { referralId: referral.id, status: 'open' })) {
    return 'The device is at a lab, which ships it on to the next lab itself.';
  }
  if (await manager.existsBy(CheckIn, { referralId: referral.id })) return 'The lab has the device.';
  const bought: unknown[] = await manager.query(
    `SELECT 1 FROM shipments WHERE referral_id = $1 AND kind = 'inbound' AND status NOT IN ('awaiting_purchase', 'voided') LIMIT 1`,
    [referral.id],
  );
  if (bought.length) return 'A label has been bought for this case. Void it first to buy another.';
  if (referral.status !== 'accepted' || !referral.labOrganizationId) {
    if (['opened', 'offered', 'needs_attention'].includes(referral.status)) return 'A lab has not accepted the case yet; the label can be bought once one has.';
    return `The case is ${statusWords(referral.status)}; no label is needed.`;
  }
  return null;
}

// ---- rates ----------------------------------------------------------------------------------

interface QuoteSpec {
  referral: Referral;
  kind: ShipmentKind;
  fromOrganizationId: string | null;
  toOrganizationId: string | null;
  from: StoredAddress;
  to: StoredAddress;
  parcel: { boxPreset?: string; lengthIn?: number; widthIn?: number; heightIn?: number; weightLb: number };
  battery: BatteryAssessment | null;
  signatureRequired: boolean;
  declaredValueMinor: number | null;
  actor: { type: 'user' | 'api_key' | 'system'; id: string | null; name: string };
}

function carrierUnavailable(failure: CarrierFailure, doing: string): AppError {
  return new AppError(
    'unavailable',
    503,
    `The shipping service did not answer while ${doing} (${failure.status ? `it answered ${failure.status}` : 'no answer in time'}). Nothing was bought; try again in a moment.`,
    undefined,
    { headers: { 'Retry-After': '5' } },
  );
}

function toRate(r: ProviderRate): RateDto {
  return {
    id: r.id,
    carrier: r.carrier,
    service: r.service,
    mode: r.shipping_mode ?? (/air/i.test(r.service) ? 'air' : 'ground'),
    amount: toMinorUnits(r.rate),
    currency: r.currency ?? 'USD',
    transitDays: r.delivery_days ?? r.est_delivery_days ?? 0,
    zone: r.zone ?? null,
  };
}

/** Asks the shipping service for rates and stores the shipment with them (not bought yet). */
export async function createQuote(ctx: ServiceContext, spec: QuoteSpec, channel: Channel): Promise<ShipmentDto> {
  if (spec.battery && !spec.battery.shippable) {
    throw AppError.validation([{ path: 'battery', message: spec.battery.reasons[0] ?? 'This battery cannot ship through the network.' }], 'This box cannot ship with its battery');
  }
  const preset = spec.parcel.boxPreset ? findBoxPreset(spec.parcel.boxPreset) : undefined;
  const dims = preset ? preset.outer : { lengthIn: spec.parcel.lengthIn!, widthIn: spec.parcel.widthIn!, heightIn: spec.parcel.heightIn! };
  const weightOz = Math.round(spec.parcel.weightLb * 16 * 10) / 10;
  if (!spec.to.zip || !spec.to.street1) throw AppError.conflict('The destination has no full address on file yet, so no label can be made.');

  let provider: ProviderShipment;
  try {
    provider = (await carrierClient(ctx.config.shipping).Shipment.create({
      from_address: toWire(spec.from),
      to_address: toWire(spec.to),
      parcel: { length: dims.lengthIn, width: dims.widthIn, height: dims.heightIn, weight: weightOz },
      reference: spec.referral.reference,
      is_return: spec.kind === 'return',
      options: {
        label_format: 'PDF',
        label_size: '4x6',
        ...(spec.signatureRequired ? { delivery_confirmation: 'SIGNATURE' } : {}),
      },
    })) as unknown as ProviderShipment;
  } catch (error) {
    const failure = classifyCarrierError(error);
    if (failure.kind === 'unavailable') throw carrierUnavailable(failure, 'rating the box');
    throw AppError.validation([{ path: 'parcel', message: failure.message }], 'The shipping service could not rate this box');
  }

  const all = provider.rates.map(toRate);
  const rates = all.filter((r) => r.mode === 'ground' || !spec.battery || spec.battery.airAllowed).sort((a, b) => a.amount - b.amount);
  if (rates.length === 0) {
    const why = provider.messages?.map((m) => m.message)[0] ?? 'No service is offered for this box.';
    throw AppError.validation([{ path: 'parcel', message: why }], 'No carrier offers a service for this box');
  }
  const billableLb = provider.rates[0]?.billable_weight_lb ?? null;

  const saved = await ctx.db.transaction(async (manager) => {
    // An earlier quote for the same box that nobody tried to buy is simply replaced.
    await manager.query(
      `DELETE FROM shipments WHERE referral_id = $1 AND kind = $2 AND status = 'awaiting_purchase' AND purchase_attempted_at IS NULL`,
      [spec.referral.id, spec.kind],
    );
    return manager.save(
      manager.create(Shipment, {
        referralId: spec.referral.id,
        kind: spec.kind,
        fromOrganizationId: spec.fromOrganizationId,
        toOrganizationId: spec.toOrganizationId,
        fromAddress: spec.from,
        toAddress: spec.to,
        boxPreset: preset?.id ?? null,
        lengthIn: dims.lengthIn,
        widthIn: dims.widthIn,
        heightIn: dims.heightIn,
        weightOz,
        billableLb,
        zone: provider.rates[0]?.zone ?? null,
        providerShipmentId: provider.id,
        rates,
        status: 'awaiting_purchase',
        statusRank: 0,
        signatureRequired: spec.signatureRequired,
        declaredValueMinor: spec.declaredValueMinor,
        batteryMarkText: spec.battery?.markText ?? null,
        createdByType: spec.actor.type,
        createdById: spec.actor.id,
        createdByName: spec.actor.name,
      }),
    );
  });
  return shipmentDtoOf(ctx.db.manager, saved, channel, spec.referral.reference);
}

/** The shop's rates for the box to the lab that accepted the case. */
export async function quoteInbound(
  ctx: ServiceContext,
  who: { partnerOrganizationId: string; actor: ShippingActor },
  referralId: string,
  rawInput: unknown,
  channel: Channel,
): Promise<ShipmentDto> {
  const input = parseInput(createShipmentInput, rawInput);
  if (!UUID.test(referralId)) throw AppError.notFound('That case');
  const manager = ctx.db.manager;
  const referral = await manager.findOneBy(Referral, { id: referralId, partnerOrganizationId: who.partnerOrganizationId });
  if (!referral) throw AppError.notFound('That case');
  const blocked = await inboundBlockedReason(manager, referral);
  if (blocked) throw AppError.conflict(blocked);
  const [shop, lab] = await readTogether(manager, [
    () => manager.findOneByOrFail(Organization, { id: referral.partnerOrganizationId }),
    () => manager.findOneByOrFail(Organization, { id: referral.labOrganizationId! }),
  ]);
  await assertNoUnresolvedPurchase(ctx, referral.id, 'inbound');
  return createQuote(
    ctx,
    {
      referral,
      kind: 'inbound',
      fromOrganizationId: shop.id,
      toOrganizationId: lab.id,
      from: originAddress(referral, shop),
      to: organizationAddress(lab, 'Receiving'),
      parcel: input.parcel,
      battery: batteryFor(referral),
      signatureRequired: false,
      declaredValueMinor: null,
      actor: who.actor,
    },
    channel,
  );
}

/** A purchase whose outcome we do not know yet is settled (read back from the carrier) before a new quote. */
async function assertNoUnresolvedPurchase(ctx: ServiceContext, referralId: string, kind: ShipmentKind): Promise<void> {
  const pending = await ctx.db.manager.find(Shipment, { where: { referralId, kind, status: 'awaiting_purchase' } });
  for (const s of pending.filter((p) => p.purchaseAttemptedAt)) {
    const settled = await settlePurchase(ctx, s.id);
    if (settled === 'bought') throw AppError.conflict('A label has been bought for this case. Void it first to buy another.');
    if (settled === 'unknown') throw carrierUnavailable({ kind: 'unavailable', status: null, code: null, message: '' }, 'checking an earlier purchase');
  }
}

// ---- buying ---------------------------------------------------------------------------------

type BuyCheck = (manager: EntityManager, shipment: Shipment, referral: Referral) => Promise<string | null>;

/** Who may buy which kind: the shop its inbound labels; the lab that sends a return or a transfer. */
function buyerMayBuy(viewer: ShippingViewer, s: Shipment): boolean {
  if (viewer.organizationKind === 'partner') return s.kind === 'inbound';
  if (viewer.organizationKind === 'lab') return s.kind !== 'inbound' && s.fromOrganizationId === viewer.organizationId;
  return false;
}

const stillAllowed: BuyCheck = async (manager, shipment, referral) => {
  if (shipment.kind === 'inbound') {
    const others: unknown[] = await manager.query(
      `SELECT 1 FROM shipments WHERE referral_id = $1 AND kind = 'inbound' AND id <> $2 AND status NOT IN ('awaiting_purchase', 'voided') LIMIT 1`,
      [referral.id, shipment.id],
    );
    if (others.length) return 'A label has been bought for this case. Void it first to buy another.';
    if (referral.status !== 'accepted' || referral.labOrganizationId !== shipment.toOrganizationId) {
      return `The case is ${statusWords(referral.status)}; this label is no longer needed.`;
    }
    return null;
  }
  const holder = await holdingLab(manager, referral.id);
  if (!holder || holder.labId !== shipment.fromOrganizationId) return 'Your lab does not have the device any more.';
  if (shipment.kind === 'transfer' && (referral.status !== 'accepted' || referral.labOrganizationId !== shipment.toOrganizationId)) {
    return 'The lab this transfer was rated for no longer has the case; rate it again.';
  }
  return null;
};

export type SettleResult = 'bought' | 'not_bought' | 'unknown';

/**
 * Reads the carrier's shipment back for a purchase whose answer we never got (a 500, a timeout, a crash)
 * and records what really happened. Used by the retry and by the reconcile job.
 */
export async function settlePurchase(ctx: ServiceContext, shipmentId: string): Promise<SettleResult> {
  const shipment = await ctx.db.manager.findOneBy(Shipment, { id: shipmentId });
  if (!shipment) return 'not_bought';
  if (shipment.status !== 'awaiting_purchase') return shipment.status === 'voided' ? 'not_bought' : 'bought';
  if (!shipment.providerShipmentId) return 'not_bought';
  let provider: ProviderShipment;
  try {
    provider = (await carrierClient(ctx.config.shipping).Shipment.retrieve(shipment.providerShipmentId)) as unknown as ProviderShipment;
  } catch (error) {
    const failure = classifyCarrierError(error);
    if (failure.kind === 'not_found') {
      await ctx.db.manager.update(Shipment, shipment.id, { purchaseAttemptedAt: null });
      return 'not_bought';
    }
    return 'unknown';
  }
  if (provider.tracking_code) {
    await recordPurchase(ctx, shipment.id, provider);
    return 'bought';
  }
  await ctx.db.manager.update(Shipment, { id: shipment.id, status: 'awaiting_purchase' }, { purchaseAttemptedAt: null });
  return 'not_bought';
}

export async function buyShipment(ctx: ServiceContext, viewer: ShippingViewer, actor: ShippingActor, id: string, rawInput: unknown, channel: Channel): Promise<ShipmentDto> {
  const { rateId } = parseInput(buyShipmentInput, rawInput);
  // 1. Decide, and write down the rate asked for before calling the carrier.
  const decision = await ctx.db.transaction(async (manager) => {
    const visible = await findVisibleShipment(manager, viewer, id);
    if (!visible) throw AppError.notFound('That shipment');
    if (!buyerMayBuy(viewer, visible)) throw AppError.forbidden('Your organisation does not buy this label');
    const referral = (await lockReferral(manager, visible.referralId))!;
    const shipment = await manager.findOneOrFail(Shipment, { where: { id }, lock: { mode: 'pessimistic_write' } });
    if (shipment.status === 'voided') throw AppError.conflict('This label was voided; get new rates to buy another.');
    if (shipment.status !== 'awaiting_purchase') {
      // Bought already (a retry after the answer was lost): the same label, not a second one.
      if (shipment.selectedRateId && shipment.selectedRateId !== rateId) {
        throw AppError.conflict('A label with another rate has already been bought for this box.');
      }
      return { kind: 'done' as const };
    }
    if (!shipment.rates.some((r) => r.id === rateId)) throw AppError.validation([{ path: 'rateId', message: 'That rate is not one of this box’s rates' }]);
    const blocked = await stillAllowed(manager, shipment, referral);
    if (blocked) throw AppError.conflict(blocked);
    const earlierAttempt = shipment.purchaseAttemptedAt !== null;
    await manager.update(Shipment, shipment.id, { selectedRateId: rateId, purchaseAttemptedAt: new Date(), purchaseAttempts: shipment.purchaseAttempts + 1 });
    return { kind: 'buy' as const, providerShipmentId: shipment.providerShipmentId!, earlierAttempt, insurance: shipment.declaredValueMinor };
  });
  if (decision.kind === 'done') return getShipment(ctx, viewer, id, channel);

  // 2. A retry after an unanswered attempt: did that one buy the label?
  if (decision.earlierAttempt) {
    const settled = await settlePurchase(ctx, id);
    if (settled === 'bought') return getShipment(ctx, viewer, id, channel);
    if (settled === 'unknown') throw carrierUnavailable({ kind: 'unavailable', status: null, code: null, message: '' }, 'checking the earlier purchase');
    await ctx.db.manager.update(Shipment, id, { selectedRateId: rateId, purchaseAttemptedAt: new Date() });
  }

  // 3. Buy.
  const client = carrierClient(ctx.config.shipping);
  try {
    const bought = (await client.Shipment.buy(
      decision.providerShipmentId,
      rateId,
      // The declared value is bought as the carrier's insurance, in dollars.
      decision.insurance ? decision.insurance / 100 : undefined,
    )) as unknown as ProviderShipment;
    await recordPurchase(ctx, id, bought);
  } catch (error) {
    if (error instanceof AppError) throw error;
    const failure = classifyCarrierError(error);
    if (failure.kind === 'postage_exists') {
      const settled = await settlePurchase(ctx, id);
      if (settled !== 'bought') throw carrierUnavailable(failure, 'buying the label');
    } else if (failure.kind === 'unavailable') {
      // The call may or may not have bought it; ask once, and otherwise leave it for the retry to settle.
      logger.warn({ shipmentId: id, failure }, 'label purchase unanswered; will settle on retry');
      // 'unknown' keeps the attempt on record, so the retry reads the carrier's shipment before buying.
      const settled = await settlePurchase(ctx, id).catch(() => 'unknown' as const);
      if (settled !== 'bought') throw carrierUnavailable(failure, 'buying the label');
    } else if (failure.kind === 'not_found') {
      await ctx.db.manager.update(Shipment, id, { purchaseAttemptedAt: null });
      throw AppError.conflict('These rates have expired at the shipping service; get new rates.');
    } else {
      await ctx.db.manager.update(Shipment, id, { purchaseAttemptedAt: null });
      throw AppError.validation([{ path: 'rateId', message: failure.message }], 'The shipping service refused the purchase');
    }
  }
  return getShipment(ctx, viewer, id, channel);
}

async function nextSscc(ctx: ServiceContext, manager: EntityManager): Promise<string> {
  const [{ n }]: { n: string }[] = await manager.query(`SELECT nextval('shipment_sscc_seq')::text AS n`);
  return makeSscc({ extensionDigit: 0, companyPrefix: ctx.config.shipping.ssccCompanyPrefix, serialReference: n });
}

/** Records a bought label (once, whoever gets here first): cost, tracking, the case's step, the timeline. */
export async function recordPurchase(ctx: ServiceContext, shipmentId: string, provider: ProviderShipment): Promise<void> {
  await ctx.db.transaction(async (manager) => {
    const first = await manager.findOneByOrFail(Shipment, { id: shipmentId });
    const referral = (await lockReferral(manager, first.referralId))!;
    const shipment = await manager.findOneOrFail(Shipment, { where: { id: shipmentId }, lock: { mode: 'pessimistic_write' } });
    if (shipment.status !== 'awaiting_purchase') return;
    const rate = provider.selected_rate;
    if (!rate || !provider.tracking_code) throw new Error(`shipment ${provider.id} has no selected rate or tracking code`);
    const now = new Date();
    const tracker = provider.tracker;
    const transitDays = rate.delivery_days ?? rate.est_delivery_days ?? 0;
    const estimated = tracker?.est_delivery_date ? new Date(tracker.est_delivery_date) : new Date(now.getTime() + transitDays * 86_400_000);
    const amountMinor = toMinorUnits(rate.rate);
    const currency = rate.currency ?? 'USD';
    await manager.update(Shipment, shipment.id, {
      status: 'label_issued',
      statusRank: statusRank.label_issued,
      selectedRateId: rate.id,
      purchaseAttemptedAt: null,
      carrier: rate.carrier,
      service: rate.service,
      mode: rate.shipping_mode ?? (/air/i.test(rate.service) ? 'air' : 'ground'),
      amountMinor,
      currency,
      trackingCode: provider.tracking_code,
      providerTrackerId: tracker?.id ?? null,
      labelPdfUrl: provider.postage_label?.label_pdf_url ?? provider.postage_label?.label_url ?? null,
      publicTrackingUrl: tracker?.public_url ?? null,
      estimatedDeliveryAt: estimated,
      lastEventAt: tracker?.updated_at ? new Date(tracker.updated_at) : now,
      lastStatusDetail: tracker?.status_detail ?? 'label_created',
      lastMessage: 'Shipping label created',
      sscc: await nextSscc(ctx, manager),
      boughtAt: now,
    });
    const who: TimelineActor = { type: shipment.createdByType === 'system' ? 'system' : shipment.createdByType, id: shipment.createdById, name: shipment.createdByName };
    const paid = `${money(amountMinor, currency)} ${NETWORK_PAYS.toLowerCase()}`;
    if (shipment.kind === 'return') {
      await addTimelineEntry(manager, referral.id, {
        kind: 'return_label_issued',
        summary: `Return label bought: ${rate.carrier} ${rate.service}, tracking ${provider.tracking_code} (${paid})${shipment.signatureRequired ? ', signature on delivery' : ''}.`,
        actor: who,
        at: now,
        details: { shipmentId: shipment.id, trackingCode: provider.tracking_code, amount: amountMinor, currency },
      });
      return;
    }
    if (referral.status === 'accepted') await manager.update(Referral, referral.id, { status: 'label_issued' });
    await appendCustody(manager, referral.id, { action: shipment.kind === 'transfer' ? 'transferred' : 'packed_by_shop', actor: who, location: shipment.fromOrganizationId ? await organizationPlace(manager, shipment.fromOrganizationId) : null, at: now, details: { shipmentId: shipment.id, trackingCode: provider.tracking_code } });
    if (shipment.kind === 'transfer') {
      await manager.update(LabTransfer, { referralId: referral.id, status: 'open' }, { status: 'shipped', shipmentId: shipment.id });
    }
    await addTimelineEntry(manager, referral.id, {
      kind: shipment.kind === 'transfer' ? 'transfer_label_issued' : 'label_issued',
      summary: `${shipment.kind === 'transfer' ? 'Transfer label' : 'Prepaid label'} bought: ${rate.carrier} ${rate.service}, tracking ${provider.tracking_code} (${paid}).`,
      actor: who,
      at: now,
      details: { shipmentId: shipment.id, trackingCode: provider.tracking_code, amount: amountMinor, currency, carrier: rate.carrier, service: rate.service },
    });
  });
}

// ---- voiding --------------------------------------------------------------------------------

export async function voidShipment(ctx: ServiceContext, viewer: ShippingViewer, actor: ShippingActor, id: string, channel: Channel): Promise<ShipmentDto> {
  const shipment = await findVisibleShipment(ctx.db.manager, viewer, id);
  if (!shipment) throw AppError.notFound('That shipment');
  if (!buyerMayBuy(viewer, shipment)) throw AppError.forbidden('Your organisation did not buy this label');
  if (shipment.status === 'voided') return shipmentDtoOf(ctx.db.manager, shipment, channel);
  if (!isVoidable(shipment)) {
    throw AppError.conflict(
      shipment.status === 'awaiting_purchase'
        ? 'No label has been bought for this box yet.'
        : 'The carrier has scanned this box already, so its label can no longer be voided.',
    );
  }
  try {
    await carrierClient(ctx.config.shipping).Shipment.refund(shipment.providerShipmentId!);
  } catch (error) {
    const failure = classifyCarrierError(error);
    if (failure.kind === 'unavailable') throw carrierUnavailable(failure, 'voiding the label');
    throw AppError.conflict(`The carrier refused to void the label: ${failure.message}`);
  }
  await ctx.db.transaction(async (manager) => {
    const referral = (await lockReferral(manager, shipment.referralId))!;
    const locked = await manager.findOneOrFail(Shipment, { where: { id }, lock: { mode: 'pessimistic_write' } });
    if (locked.status === 'voided') return;
    const now = new Date();
    await manager.update(Shipment, id, { status: 'voided', statusRank: 0, voidedAt: now, lastMessage: 'Label voided', lastEventAt: now, lastStatusDetail: 'cancelled' });
    if (locked.kind !== 'return' && referral.status === 'label_issued') await manager.update(Referral, referral.id, { status: 'accepted' });
    if (locked.kind === 'transfer') await manager.update(LabTransfer, { referralId: referral.id, shipmentId: id }, { status: 'open', shipmentId: null });
    await addTimelineEntry(manager, referral.id, {
      kind: 'label_voided',
      summary: `Label ${locked.trackingCode} voided by ${actor.name}; the network is refunded ${money(locked.amountMinor ?? 0, locked.currency ?? 'USD')}.`,
      actor: timelineActor(actor),
      at: now,
      details: { shipmentId: id, trackingCode: locked.trackingCode },
    });
  });
  return getShipment(ctx, viewer, id, channel);
}

// ---- documents ------------------------------------------------------------------------------

/** The carrier's 4 × 6 in PDF label, fetched from the shipping service for whoever may see the shipment. */
export async function labelPdf(ctx: ServiceContext, viewer: ShippingViewer, id: string): Promise<{ pdf: Buffer; fileName: string }> {
  const shipment = await findVisibleShipment(ctx.db.manager, viewer, id);
  if (!shipment || !shipment.trackingCode) throw AppError.notFound('That label');
  if (shipment.historical || !shipment.labelPdfUrl) throw AppError.notFound('The carrier holds no label for this demo shipment; that label');
  if (shipment.status === 'voided') throw AppError.conflict('This label was voided; do not use it.');
  let response: Response;
  try {
    response = await fetch(shipment.labelPdfUrl, { signal: AbortSignal.timeout(ctx.config.shipping.timeoutMs) });
  } catch {
    throw carrierUnavailable({ kind: 'unavailable', status: null, code: null, message: '' }, 'fetching the label');
  }
  if (!response.ok) throw carrierUnavailable({ kind: 'unavailable', status: response.status, code: null, message: '' }, 'fetching the label');
  return { pdf: Buffer.from(await response.arrayBuffer()), fileName: `label-${shipment.trackingCode}.pdf` };
}

export async function packingSlip(ctx: ServiceContext, viewer: ShippingViewer, id: string): Promise<{ pdf: Buffer; fileName: string }> {
  const manager = ctx.db.manager;
  const shipment = await findVisibleShipment(manager, viewer, id);
  if (!shipment || !shipment.trackingCode) throw AppError.notFound('That packing slip');
  const referral = await manager.findOneByOrFail(Referral, { id: shipment.referralId });
  const battery = batteryFor(referral);
  const pdf = await packingSlipPdf({
    reference: referral.reference,
    title: shipment.kind === 'inbound' ? 'Packing slip — device for recovery' : shipment.kind === 'transfer' ? 'Packing slip — lab-to-lab transfer' : 'Packing slip — return',
    shipTo: { name: shipment.toAddress.company ? `${shipment.toAddress.company} — ${shipment.toAddress.name}` : shipment.toAddress.name, lines: toLines(shipment.toAddress) },
    from: { name: shipment.fromAddress.company ?? shipment.fromAddress.name, lines: toLines(shipment.fromAddress) },
    device: deviceLine(referral),
    trackingCode: shipment.trackingCode,
    carrierService: shipment.carrier ? `${shipment.carrier} ${shipment.service}` : null,
    batteryMarkText: shipment.batteryMarkText,
    batteryCaution: battery?.contactLabFirst ? battery.cautions.find((c) => c.code === 'battery_fire_risk')?.message ?? null : null,
    sscc: shipment.sscc,
    signatureRequired: shipment.signatureRequired,
    declaredValue: shipment.declaredValueMinor !== null ? money(shipment.declaredValueMinor, shipment.currency ?? 'USD') : null,
  });
  return { pdf, fileName: `packing-slip-${referral.reference}.pdf` };
}

function toLines(a: StoredAddress): string[] {
  const cityLine = [a.city, [a.state, a.zip].filter(Boolean).join(' ')].filter(Boolean).join(', ');
  return [a.street1, a.street2, cityLine].filter((l): l is string => Boolean(l && l.trim()));
}

// ---- the shop's view of one case --------------------------------------------------------------

export async function caseShipping(ctx: ServiceContext, viewer: ShippingViewer, referralId: string, channel: Channel): Promise<CaseShippingDto> {
  if (!UUID.test(referralId)) throw AppError.notFound('That case');
  const manager = ctx.db.manager;
  const where = viewer.organizationKind === 'network' ? { id: referralId } : { id: referralId, partnerOrganizationId: viewer.organizationId };
  const referral = await manager.findOneBy(Referral, where);
  if (!referral) throw AppError.notFound('That case');
  const lab = referral.labOrganizationId ? await manager.findOneBy(Organization, { id: referral.labOrganizationId }) : null;
  const shipments = await manager.find(Shipment, { where: { referralId }, order: { createdAt: 'DESC' } });
  const visible = shipments.filter((s) => s.status !== 'awaiting_purchase' || s.kind === 'inbound');
  const blocked = await inboundBlockedReason(manager, referral);
  const battery = batteryFor(referral);
  const checkIn = await manager.findOne(CheckIn, { where: { referralId }, order: { checkedInAt: 'DESC' } });
  const checkInLab = checkIn ? await manager.findOneBy(Organization, { id: checkIn.labOrganizationId }) : null;
  const photoCount = checkIn ? Number((await manager.query(`SELECT count(*)::int AS n FROM check_in_photos WHERE check_in_id = $1`, [checkIn.id]))[0].n) : 0;
  return {
    referralId,
    reference: referral.reference,
    caseStatus: referral.status,
    canCreateLabel: blocked === null && (!battery || battery.shippable),
    blockedReason: blocked ?? (battery && !battery.shippable ? battery.reasons[0] ?? null : null),
    battery: batteryDto(battery),
    packingRules: [...packingRules],
    destination: lab ? { name: lab.name, lines: toLines(organizationAddress(lab, 'Receiving')), postalCode: lab.postalCode ?? '' } : null,
    suggestedPresets: presetsFor(referral.mediaType).map((p) => p.id),
    shipments: await Promise.all(visible.map((s) => shipmentDtoOf(manager, s, channel, referral.reference))),
    checkIn: checkIn ? checkInSummary(checkIn, checkInLab?.name ?? '', photoCount) : null,
  };
}

export function checkInSummary(c: CheckIn, labName: string, photoCount: number) {
  return {
    id: c.id,
    at: c.checkedInAt.toISOString(),
    by: c.checkedInByName,
    labName,
    outcome: c.outcome,
    holdReason: c.holdReason,
    boxCondition: c.boxCondition,
    sealNumber: c.sealNumber,
    sealIntact: c.sealIntact,
    contentsMatch: c.contentsMatch,
    batteryCondition: c.batteryCondition,
    photoCount,
  };
}
