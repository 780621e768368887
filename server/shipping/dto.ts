import type { ScanDto, ShipmentDto, ShipmentStatus } from '@shared/schemas/shipping';
import type { Shipment, ShipmentScan, StoredAddress } from './entities';

// Shipments as the shop, the lab and the partner API read them.

/** Which door the reader came through: links answer to the same credentials. */
export type Channel = { kind: 'app' } | { kind: 'api'; appUrl: string };

/** Rank of each status: events may arrive in any order, and a status never moves backwards. */
export const statusRank: Record<ShipmentStatus, number> = {
  awaiting_purchase: 0,
  voided: 0,
  label_issued: 1,
  in_transit: 2,
  exception: 2,
  out_for_delivery: 3,
  delivered: 4,
  returned: 4,
};

/** Until the carrier's first scan a label can be voided and refunded. */
export function isVoidable(s: Pick<Shipment, 'status' | 'historical' | 'checkedInAt'>): boolean {
  return s.status === 'label_issued' && !s.historical && !s.checkedInAt;
}

export function addressLines(a: StoredAddress): string[] {
  const cityLine = [a.city, [a.state, a.zip].filter(Boolean).join(' ')].filter(Boolean).join(', ');
  return [a.company, a.street1, a.street2, cityLine].filter((l): l is string => Boolean(l && l.trim()));
}

export function addressSummary(a: StoredAddress) {
  return { name: a.name, lines: addressLines(a), postalCode: a.zip };
}

export function toScanDto(s: Pick<ShipmentScan, 'occurredAt' | 'status' | 'statusDetail' | 'message' | 'location'>): ScanDto {
  return { at: s.occurredAt.toISOString(), status: s.status, statusDetail: s.statusDetail, message: s.message, location: s.location };
}

export function lastEventOf(s: Shipment): ScanDto | null {
  if (!s.lastEventAt || !s.lastMessage) return null;
  return { at: s.lastEventAt.toISOString(), status: s.status, statusDetail: s.lastStatusDetail, message: s.lastMessage, location: s.lastLocation };
}

const round2 = (n: number) => Math.round(n * 100) / 100;

export function toShipmentDto(s: Shipment, reference: string, scans: ShipmentScan[], channel: Channel): ShipmentDto {
  const bought = s.trackingCode !== null && s.status !== 'awaiting_purchase';
  const base = channel.kind === 'app' ? `/api/shipments/${s.id}` : `${channel.appUrl}/api/v1/shipments/${s.id}`;
  return {
    id: s.id,
    referralId: s.referralId,
    reference,
    kind: s.kind,
    status: s.status,
    trackingCode: s.trackingCode,
    carrier: s.carrier,
    service: s.service,
    mode: s.mode,
    amount: s.amountMinor,
    currency: s.currency,
    labelUrl: bought && !s.historical && s.labelPdfUrl ? (channel.kind === 'app' ? `${base}/label.pdf` : `${base}/label`) : null,
    packingSlipUrl: bought ? (channel.kind === 'app' ? `${base}/packing-slip.pdf` : `${base}/packing-slip`) : null,
    publicTrackingUrl: s.historical ? null : s.publicTrackingUrl,
    rates: s.status === 'awaiting_purchase' ? s.rates : [],
    parcel: {
      boxPreset: s.boxPreset,
      lengthIn: s.lengthIn,
      widthIn: s.widthIn,
      heightIn: s.heightIn,
      weightLb: round2(s.weightOz / 16),
      billableLb: s.billableLb,
    },
    from: addressSummary(s.fromAddress),
    to: addressSummary(s.toAddress),
    estimatedDeliveryAt: s.estimatedDeliveryAt?.toISOString() ?? null,
    deliveredAt: s.deliveredAt?.toISOString() ?? null,
    checkedInAt: s.checkedInAt?.toISOString() ?? null,
    overdue: s.overdueAt !== null && !['delivered', 'returned', 'voided'].includes(s.status) && !s.checkedInAt,
    lastEvent: lastEventOf(s),
    signatureRequired: s.signatureRequired,
    declaredValue: s.declaredValueMinor,
    batteryMarkText: s.batteryMarkText,
    sscc: s.sscc,
    voidable: isVoidable(s),
    historical: s.historical,
    createdAt: s.createdAt.toISOString(),
    boughtAt: s.boughtAt?.toISOString() ?? null,
    scans: [...scans].sort((a, b) => b.occurredAt.getTime() - a.occurredAt.getTime()).map(toScanDto),
  };
}
