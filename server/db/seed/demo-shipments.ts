import type { EntityManager } from 'typeorm';
import { gs1CheckDigit, makeSscc } from '@shared/domain/sscc';
import type { ShipmentStatus } from '@shared/schemas/shipping';
import { Organization } from '../../organizations';
import { recordTimeline } from '../../routing';
import { Referral } from '../../referrals/entities';
import { CheckIn } from '../../receiving/entities';
import { Shipment } from '../../shipping/entities';
import { organizationAddress, originAddress } from '../../shipping/service';

// Demo shipments for demo cases, in several tracking states. The shipping fake keeps its state in memory
// and is not running while the seed runs, so these are marked `historical`: their scans are written here,
// the board, the case page and check-in work with them, but the carrier holds no label (the label link is
// not offered) and the reconcile job leaves them alone. Labels bought in the running demo are real fake
// purchases and are tracked live. One accepted Juniper Lane case is left without a label, for the demo.

type DemoState = Exclude<ShipmentStatus, 'awaiting_purchase' | 'voided' | 'returned'> | 'overdue' | 'received';

const H = 3_600_000;
const D = 24 * H;

/** A tracking code in the fake's format (carrier prefix, 15 digits, GS1 check digit); the fake never issued it. */
function demoTrackingCode(prefix: string, n: number): string {
  const body = String(900_000_000_000_000 + n * 7919).slice(0, 15);
  return `${prefix}${body}${gs1CheckDigit(body)}`;
}

const plans: { state: DemoState; boughtDaysAgo: number; scans: [hoursAfter: number, status: string, detail: string, message: string][] }[] = [
  { state: 'delivered', boughtDaysAgo: 3, scans: [[4, 'in_transit', 'received_at_origin_facility', 'Received at origin facility'], [40, 'in_transit', 'arrived_at_destination', 'Arrived at destination facility'], [66, 'out_for_delivery', 'out_for_delivery', 'Out for delivery'], [70, 'delivered', 'arrived_at_destination', 'Delivered']] },
  { state: 'in_transit', boughtDaysAgo: 1, scans: [[4, 'in_transit', 'received_at_origin_facility', 'Received at origin facility'], [14, 'in_transit', 'arrived_at_facility', 'Arrived at hub']] },
  { state: 'exception', boughtDaysAgo: 2, scans: [[4, 'in_transit', 'received_at_origin_facility', 'Received at origin facility'], [10, 'in_transit', 'transit_exception', 'Exception: parcel held at facility, delivery delayed one day']] },
  { state: 'out_for_delivery', boughtDaysAgo: 2, scans: [[4, 'in_transit', 'received_at_origin_facility', 'Received at origin facility'], [42, 'out_for_delivery', 'out_for_delivery', 'Out for delivery']] },
  { state: 'overdue', boughtDaysAgo: 9, scans: [[4, 'in_transit', 'received_at_origin_facility', 'Received at origin facility'], [30, 'in_transit', 'arrived_at_facility', 'Arrived at hub']] },
  { state: 'received', boughtDaysAgo: 5, scans: [[4, 'in_transit', 'received_at_origin_facility', 'Received at origin facility'], [44, 'delivered', 'arrived_at_destination', 'Delivered']] },
  { state: 'label_issued', boughtDaysAgo: 0, scans: [] },
];

const rank: Record<string, number> = { label_issued: 1, in_transit: 2, exception: 2, out_for_delivery: 3, delivered: 4 };

export async function seedDemoShipments(manager: EntityManager, options: { now: Date; ssccCompanyPrefix: string }): Promise<number> {
  const accepted = await manager.find(Referral, { where: { status: 'accepted' }, order: { createdAt: 'ASC' } });
  const juniper = await manager.findOneBy(Organization, { slug: 'juniper-lane' });
  const live = [...accepted].reverse().find((r) => r.partnerOrganizationId === juniper?.id);
  let made = 0;
  for (const [i, referral] of accepted.filter((r) => r.id !== live?.id && r.labOrganizationId).entries()) {
    const plan = plans[i % plans.length]!;
    const [shop, lab] = await Promise.all([
      manager.findOneByOrFail(Organization, { id: referral.partnerOrganizationId }),
      manager.findOneByOrFail(Organization, { id: referral.labOrganizationId! }),
    ]);
    const bought = new Date(options.now.getTime() - plan.boughtDaysAgo * D - 2 * H);
    const last = plan.scans[plan.scans.length - 1];
    const status: ShipmentStatus =
      plan.state === 'received' ? 'delivered' : plan.state === 'overdue' ? 'in_transit' : last?.[2] === 'transit_exception' ? 'exception' : ((last?.[1] as ShipmentStatus) ?? 'label_issued');
    const lastAt = last ? new Date(bought.getTime() + last[0] * H) : bought;
    const trackingCode = demoTrackingCode(i % 2 ? 'OL' : 'BW', i + 1);
    const [{ n }]: { n: string }[] = await manager.query(`SELECT nextval('shipment_sscc_seq')::text AS n`);
    const shipment = await manager.save(
      manager.create(Shipment, {
        referralId: referral.id,
        kind: 'inbound',
        fromOrganizationId: shop.id,
        toOrganizationId: lab.id,
        fromAddress: originAddress(referral, shop),
        toAddress: organizationAddress(lab, 'Receiving'),
        boxPreset: 'drive',
        lengthIn: 10.5,
        widthIn: 8.5,
        heightIn: 6.5,
        weightOz: 48,
        billableLb: 5,
        zone: 4,
        providerShipmentId: null,
        rates: [],
        status,
        statusRank: rank[status] ?? 1,
        carrier: i % 2 ? 'Otterline' : 'Brambleway',
        service: i % 2 ? 'Standard' : 'Ground',
        mode: 'ground',
        amountMinor: 1185 + i * 37,
        currency: 'USD',
        trackingCode,
        estimatedDeliveryAt: new Date(bought.getTime() + (plan.state === 'overdue' ? 3 : 4) * D),
        deliveredAt: status === 'delivered' ? lastAt : null,
        lastEventAt: lastAt,
        lastStatusDetail: last?.[2] ?? 'label_created',
        lastMessage: last?.[3] ?? 'Shipping label created',
        lastLocation: last ? [lab.city, lab.region].filter(Boolean).join(', ') : [shop.city, shop.region].filter(Boolean).join(', '),
        overdueAt: plan.state === 'overdue' ? new Date(options.now.getTime() - 6 * H) : null,
        sscc: makeSscc({ extensionDigit: 0, companyPrefix: options.ssccCompanyPrefix, serialReference: n }),
        historical: true,
        createdByType: 'system',
        createdById: null,
        createdByName: 'Demo data',
        boughtAt: bought,
        createdAt: bought,
      }),
    );
    for (const [hours, st, detail, message] of plan.scans) {
      await manager.query(`INSERT INTO shipment_scans (shipment_id, occurred_at, status, status_detail, message, location) VALUES ($1, $2, $3, $4, $5, $6)`, [
        shipment.id,
        new Date(bought.getTime() + hours * H),
        st,
        detail,
        message,
        hours < 8 ? [shop.city, shop.region].filter(Boolean).join(', ') : [lab.city, lab.region].filter(Boolean).join(', '),
      ]);
    }
    const carrier = { type: 'carrier' as const, id: null, name: shipment.carrier! };
    await recordTimeline(manager, referral.id, {
      kind: 'label_issued',
      summary: `Prepaid label bought: ${shipment.carrier} ${shipment.service}, tracking ${trackingCode} ($${(shipment.amountMinor! / 100).toFixed(2)} prepaid by the Platterpost network).`,
      actor: { type: 'system', id: null, name: 'Demo data' },
      at: bought,
      details: { shipmentId: shipment.id, trackingCode, historical: true },
    });
    let caseStatus: Referral['status'] = 'label_issued';
    if (plan.scans.length) {
      caseStatus = 'in_transit';
      await recordTimeline(manager, referral.id, { kind: 'in_transit', summary: `Box picked up by ${carrier.name} (tracking ${trackingCode}).`, actor: carrier, at: new Date(bought.getTime() + 4 * H), details: { shipmentId: shipment.id } });
    }
    if (status === 'delivered') {
      await recordTimeline(manager, referral.id, { kind: 'delivered', summary: 'Box delivered to the lab; waiting for check-in.', actor: carrier, at: lastAt, details: { shipmentId: shipment.id } });
    }
    if (plan.state === 'received') {
      const clerk: { id: string; name: string }[] = await manager.query(`SELECT id, name FROM users WHERE organization_id = $1 AND role IN ('shipping_clerk', 'lab_manager') ORDER BY role DESC LIMIT 1`, [lab.id]);
      const checkedInAt = new Date(lastAt.getTime() + 2 * H);
      const checkIn = await manager.save(
        manager.create(CheckIn, {
          referralId: referral.id,
          shipmentId: shipment.id,
          labOrganizationId: lab.id,
          boxCondition: 'intact',
          sealPresent: true,
          sealNumber: `DS-${1000 + i}`,
          sealIntact: true,
          contentsMatch: true,
          outcome: 'received',
          checkedInByUserId: clerk[0]?.id ?? null,
          checkedInByName: clerk[0]?.name ?? 'Lab staff',
          checkedInAt,
        }),
      );
      await manager.update(Shipment, shipment.id, { checkedInAt, checkInId: checkIn.id });
      caseStatus = 'received';
      await recordTimeline(manager, referral.id, {
        kind: 'received',
        summary: `Box checked in at ${lab.name} by ${checkIn.checkedInByName}: box intact, seal DS-${1000 + i} intact, contents match the intake.`,
        actor: { type: 'user', id: checkIn.checkedInByUserId, name: checkIn.checkedInByName },
        at: checkedInAt,
        details: { checkInId: checkIn.id, shipmentId: shipment.id },
      });
    }
    await manager.update(Referral, referral.id, { status: caseStatus });
    made++;
  }
  return made;
}
