import type { PartnerEventType } from '@shared/schemas/webhooks';

export const partnerEventLabels: Record<PartnerEventType, string> = {
  'referral.created': 'Referral opened',
  'referral.offered': 'Offered to a lab',
  'referral.accepted': 'Accepted by a lab',
  'referral.declined': 'Declined by a lab',
  'shipment.label_issued': 'Label issued',
  'shipment.in_transit': 'Box in transit',
  'shipment.delivered': 'Box delivered',
  'referral.received': 'Checked in at the lab',
  'quote.sent': 'Quote sent',
  'quote.approved': 'Quote approved',
  'payment.succeeded': 'Payment received',
  'recovery.ready_for_review': 'Recovered files ready for review',
  'referral.returned': 'Data shipped back',
  'referral.closed': 'Case closed',
  'commission.settled': 'Commission settled',
};
