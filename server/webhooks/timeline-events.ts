import type { EntityManager } from 'typeorm';
import type { PartnerEventType } from '@shared/schemas/webhooks';
import { emitPartnerEvent } from './service';

// Every change to a case is one timeline entry; the entries a shop's systems care about are also
// partner events. One table, so no component has to remember to emit.
export const partnerEventForTimelineKind: Record<string, PartnerEventType> = {
  opened: 'referral.created',
  offered: 'referral.offered',
  offer_accepted: 'referral.accepted',
  offer_declined: 'referral.declined',
  label_issued: 'shipment.label_issued',
  in_transit: 'shipment.in_transit',
  delivered: 'shipment.delivered',
  received: 'referral.received',
  quote_sent: 'quote.sent',
  quote_approved: 'quote.approved',
  payment_succeeded: 'payment.succeeded',
  ready_for_review: 'recovery.ready_for_review',
  // The lab-work component's names for the same steps.
  payment_received: 'payment.succeeded',
  files_ready: 'recovery.ready_for_review',
  returned: 'referral.returned',
  closed: 'referral.closed',
};

/** What a partner event says about its case: the case as its caller holds it, current status included. */
export interface CaseForEvent {
  id: string;
  partnerOrganizationId: string;
  reference: string;
  externalRef: string | null;
  status: string;
}

export async function emitForTimelineEntry(
  manager: EntityManager,
  referral: string | CaseForEvent,
  entry: { kind: string; summary: string; at: Date; actorName: string; details?: Record<string, unknown> },
): Promise<void> {
  const type = partnerEventForTimelineKind[entry.kind];
  if (!type) return;
  let kase: CaseForEvent | undefined;
  if (typeof referral === 'string') {
    const [row]: { partner_organization_id: string; reference: string; external_ref: string | null; status: string }[] = await manager.query(
      `SELECT partner_organization_id, reference, external_ref, status FROM referrals WHERE id = $1`,
      [referral],
    );
    if (row) kase = { id: referral, partnerOrganizationId: row.partner_organization_id, reference: row.reference, externalRef: row.external_ref, status: row.status };
  } else {
    kase = referral;
  }
  if (!kase) return;
  await emitPartnerEvent(manager, kase.partnerOrganizationId, type, {
    referral: { id: kase.id, reference: kase.reference, externalRef: kase.externalRef, status: kase.status },
    change: { kind: entry.kind, summary: entry.summary, at: entry.at.toISOString(), actor: entry.actorName, details: entry.details ?? {} },
  });
}
