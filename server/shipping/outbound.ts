import { In } from 'typeorm';
import {
  returnShipmentInput,
  transferShipmentInput,
  type OutboundItemDto,
  type ShipmentDto,
} from '@shared/schemas/shipping';
import { AppError } from '../lib/errors';
import type { ServiceContext } from '../lib/context';
import { parseInput } from '../lib/validate';
import { Organization } from '../organizations';
import { Referral } from '../referrals';
import { LabTransfer } from '../receiving/entities';
import type { Channel } from './dto';
import { Shipment } from './entities';
import {
  batteryFor,
  createQuote,
  holdingLab,
  organizationAddress,
  shipmentDtoOf,
  type ShippingActor,
} from './service';

// The lab's outgoing boxes: the return of a device (to the shop, or to the customer's address) with a
// signature on delivery and a declared value, and the transfer to the next lab when this one declined the
// case after its box arrived. Same rates, labels and tracking as the shop's labels.

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

async function heldCase(ctx: ServiceContext, labId: string, referralId: string) {
  if (!UUID.test(referralId)) throw AppError.notFound('That case');
  const manager = ctx.db.manager;
  const referral = await manager.findOneBy(Referral, { id: referralId });
  const holder = referral ? await holdingLab(manager, referral.id) : null;
  // A case this lab does not hold is another organisation's record here: not found.
  if (!referral || !holder || holder.labId !== labId) throw AppError.notFound('That case');
  const lab = await manager.findOneByOrFail(Organization, { id: labId });
  const transfer = await manager.findOneBy(LabTransfer, { referralId, status: 'open' });
  return { referral, holder, lab, transfer };
}

export async function quoteReturn(ctx: ServiceContext, labId: string, actor: ShippingActor, referralId: string, rawInput: unknown, channel: Channel): Promise<ShipmentDto> {
  const input = parseInput(returnShipmentInput, rawInput);
  const { referral, holder, lab, transfer } = await heldCase(ctx, labId, referralId);
  if (transfer) throw AppError.conflict('This case is being transferred to another lab; ship the transfer instead of a return.');
  const shop = await ctx.db.manager.findOneByOrFail(Organization, { id: referral.partnerOrganizationId });
  const to =
    input.destination === 'shop'
      ? organizationAddress(shop, referral.customerName ? `For ${referral.customerName}` : 'Front desk')
      : {
          name: input.address!.name,
          company: input.address!.company ?? null,
          street1: input.address!.street1,
          street2: input.address!.street2 ?? null,
          city: input.address!.city,
          state: input.address!.state,
          zip: input.address!.zip,
          country: 'US',
          phone: input.address!.phone ?? null,
        };
  return createQuote(
    ctx,
    {
      referral,
      kind: 'return',
      fromOrganizationId: lab.id,
      toOrganizationId: input.destination === 'shop' ? shop.id : null,
      from: organizationAddress(lab, 'Shipping desk'),
      to,
      parcel: input.parcel,
      battery: batteryFor(referral, holder.checkIn.batteryCondition),
      signatureRequired: input.signatureRequired,
      declaredValueMinor: input.declaredValue ?? null,
      actor,
    },
    channel,
  );
}

export async function quoteTransfer(ctx: ServiceContext, labId: string, actor: ShippingActor, referralId: string, rawInput: unknown, channel: Channel): Promise<ShipmentDto> {
  const input = parseInput(transferShipmentInput, rawInput);
  const { referral, holder, lab, transfer } = await heldCase(ctx, labId, referralId);
  if (!transfer) throw AppError.conflict('There is no transfer to ship for this case.');
  if (referral.status !== 'accepted' || !referral.labOrganizationId || referral.labOrganizationId === labId) {
    throw AppError.conflict('No other lab has accepted the case yet; the transfer can be shipped once one has.');
  }
  const next = await ctx.db.manager.findOneByOrFail(Organization, { id: referral.labOrganizationId });
  return createQuote(
    ctx,
    {
      referral,
      kind: 'transfer',
      fromOrganizationId: lab.id,
      toOrganizationId: next.id,
      from: organizationAddress(lab, 'Shipping desk'),
      to: organizationAddress(next, 'Receiving'),
      parcel: input.parcel,
      battery: batteryFor(referral, holder.checkIn.batteryCondition),
      signatureRequired: true,
      declaredValueMinor: input.declaredValue ?? null,
      actor,
    },
    channel,
  );
}

/** Cases the lab holds (to return or transfer) and the boxes it sent lately. */
export async function listOutbound(ctx: ServiceContext, labId: string, channel: Channel): Promise<{ data: OutboundItemDto[] }> {
  const manager = ctx.db.manager;
  // Cases checked in here whose device has not left since, and the lab's recent outgoing boxes.
  const held: { referral_id: string; checked_in_at: Date }[] = await manager.query(
    `SELECT DISTINCT ON (c.referral_id) c.referral_id, c.checked_in_at
       FROM check_ins c
      WHERE c.lab_organization_id = $1
        AND c.checked_in_at = (SELECT max(c2.checked_in_at) FROM check_ins c2 WHERE c2.referral_id = c.referral_id)
        AND NOT EXISTS (SELECT 1 FROM shipments s WHERE s.referral_id = c.referral_id AND s.from_organization_id = $1
                          AND s.kind IN ('return', 'transfer') AND s.status NOT IN ('awaiting_purchase', 'voided') AND s.created_at > c.checked_in_at)
      ORDER BY c.referral_id, c.checked_in_at DESC
      LIMIT 500`,
    [labId],
  );
  const recent = await manager.query(
    `SELECT s.id, s.referral_id FROM shipments s
      WHERE s.from_organization_id = $1 AND s.kind IN ('return', 'transfer') AND s.status NOT IN ('awaiting_purchase', 'voided')
        AND (s.delivered_at IS NULL OR s.delivered_at > now() - interval '7 days')
      ORDER BY s.created_at DESC LIMIT 200`,
    [labId],
  ) as { id: string; referral_id: string }[];
  const referralIds = [...new Set([...held.map((h) => h.referral_id), ...recent.map((r) => r.referral_id)])];
  if (referralIds.length === 0) return { data: [] };
  const referrals = await manager.find(Referral, { where: { id: In(referralIds) } });
  const byId = new Map(referrals.map((r) => [r.id, r]));
  const orgIds = [...new Set(referrals.flatMap((r) => [r.partnerOrganizationId, r.labOrganizationId].filter((x): x is string => Boolean(x))))];
  const orgs = new Map((await manager.find(Organization, { where: { id: In(orgIds) } })).map((o) => [o.id, o]));
  const transfers = new Map(
    (await manager.find(LabTransfer, { where: { referralId: In(referralIds), fromLabOrganizationId: labId } })).map((t) => [t.referralId, t]),
  );
  const checkIns = new Map<string, Date>(
    (
      (await manager.query(`SELECT referral_id, max(checked_in_at) AS at FROM check_ins WHERE lab_organization_id = $1 AND referral_id = ANY($2) GROUP BY referral_id`, [
        labId,
        referralIds,
      ])) as { referral_id: string; at: Date }[]
    ).map((r) => [r.referral_id, r.at]),
  );

  const data: OutboundItemDto[] = [];
  const heldIds = new Set(held.map((h) => h.referral_id));
  for (const id of referralIds) {
    const r = byId.get(id);
    if (!r) continue;
    const transfer = transfers.get(id);
    const purpose = transfer && (transfer.status === 'open' || transfer.shipmentId) ? 'transfer' : 'return';
    const sent = recent.find((x) => x.referral_id === id);
    const shipment = sent ? await manager.findOneByOrFail(Shipment, { id: sent.id }) : null;
    const nextLab = purpose === 'transfer' && r.labOrganizationId && r.labOrganizationId !== labId ? orgs.get(r.labOrganizationId) ?? null : null;
    const waitingFor =
      heldIds.has(id) && purpose === 'transfer' && !(r.status === 'accepted' && nextLab) ? 'Waiting for another lab to accept the case.' : null;
    data.push({
      referralId: id,
      reference: r.reference,
      caseStatus: r.status,
      mediaType: r.mediaType,
      shopName: orgs.get(r.partnerOrganizationId)?.name ?? '',
      purpose,
      toLabName: nextLab?.name ?? null,
      ready: heldIds.has(id) && !waitingFor,
      waitingFor,
      shipment: shipment ? await shipmentDtoOf(manager, shipment, channel, r.reference) : null,
      checkedInAt: (checkIns.get(id) ?? r.updatedAt).toISOString(),
    });
  }
  data.sort((a, b) => Number(b.ready) - Number(a.ready) || b.checkedInAt.localeCompare(a.checkedInAt));
  return { data };
}
