import type { OfferDto, ReferralDto, ReferralSummaryDto, TimelineEntryDto, TriageDto } from '@shared/schemas/referrals';
import type { LabOffer, RoutingSnapshot } from '../routing';
import type { Referral, StoredTriage, TimelineEntry } from './entities';

// The case as every reader sees it (shop, partner API, network admin): the shared referralDto.

export function toTriageDto(t: StoredTriage): TriageDto {
  return { requiredSkills: t.requiredSkills, needsCleanAir: t.needsCleanAir, needsHealthDataAgreement: t.needsHealthDataAgreement, cautions: t.cautions };
}

export function toOfferDto(offer: LabOffer, labName: string): OfferDto {
  return {
    id: offer.id,
    labId: offer.labOrganizationId,
    labName,
    status: offer.status,
    offeredAt: offer.offeredAt.toISOString(),
    deadline: offer.deadline.toISOString(),
    respondedAt: offer.respondedAt?.toISOString() ?? null,
    autoAccepted: offer.autoAccepted,
    declineReason: offer.declineReason,
    declineNote: offer.declineNote,
  };
}

export function toTimelineDto(e: TimelineEntry): TimelineEntryDto {
  return {
    id: e.id,
    at: e.at.toISOString(),
    kind: e.kind,
    summary: e.summary,
    actor: { type: e.actorType, name: e.actorName },
    ...(Object.keys(e.details ?? {}).length ? { details: e.details } : {}),
  };
}

export function toSummaryDto(r: Referral): ReferralSummaryDto {
  return {
    id: r.id,
    reference: r.reference,
    externalRef: r.externalRef,
    status: r.status,
    createdAt: r.createdAt.toISOString(),
    updatedAt: r.updatedAt.toISOString(),
    customer: { name: r.customerName, email: r.customerEmail, phone: r.customerPhone },
    lab: r.labOrganization ? { id: r.labOrganization.id, name: r.labOrganization.name } : null,
    mediaType: r.mediaType,
  };
}

export interface ReferralParts {
  referral: Referral;
  partnerName: string;
  labName: string | null;
  snapshot: RoutingSnapshot | null;
  /** Newest first. */
  offers: LabOffer[];
  labNames: Map<string, string>;
  timeline: TimelineEntry[];
}

export function toReferralDto({ referral: r, partnerName, labName, snapshot, offers, labNames, timeline }: ReferralParts): ReferralDto {
  const current = offers[0] ?? null;
  const pending = offers.find((o) => o.status === 'pending');
  const offeredTo = pending
    ? { labId: pending.labOrganizationId, labName: labNames.get(pending.labOrganizationId) ?? '' }
    : r.labOrganizationId && labName
      ? { labId: r.labOrganizationId, labName }
      : null;
  return {
    id: r.id,
    reference: r.reference,
    externalRef: r.externalRef,
    status: r.status,
    createdAt: r.createdAt.toISOString(),
    updatedAt: r.updatedAt.toISOString(),
    partner: { id: r.partnerOrganizationId, name: partnerName },
    customer: { name: r.customerName, email: r.customerEmail, phone: r.customerPhone },
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
    origin: {
      ...(r.originLine1 ? { line1: r.originLine1 } : {}),
      ...(r.originCity ? { city: r.originCity } : {}),
      ...(r.originRegion ? { region: r.originRegion } : {}),
      postalCode: r.originPostalCode,
      country: r.originCountry,
      location: { lat: r.originLat, lon: r.originLon },
    },
    consent: r.consentRecordedAt ? { recordedAt: r.consentRecordedAt.toISOString(), recordedBy: r.consentRecordedBy ?? '' } : null,
    triage: toTriageDto(r.triage),
    routing: {
      origin: { lat: r.originLat, lon: r.originLon },
      candidates: snapshot?.candidates ?? [],
      excluded: snapshot?.excluded ?? [],
      offeredTo,
    },
    offer: current ? toOfferDto(current, labNames.get(current.labOrganizationId) ?? '') : null,
    lab: r.labOrganizationId && labName ? { id: r.labOrganizationId, name: labName } : null,
    attentionReason: r.attentionReason,
    // Filled in by getReferral from the uploads component; shipments arrive with shipping.
    photos: [],
    timeline: timeline.map(toTimelineDto),
    shipments: [],
    amounts: null,
  };
}
