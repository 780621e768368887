import { caseStatusLabels, type CaseStatus } from '@shared/vocabulary';
import { Badge, type BadgeTone } from '@/components/ui/badge';

const tones: Record<CaseStatus, BadgeTone> = {
  opened: 'info',
  needs_attention: 'warning',
  offered: 'info',
  accepted: 'brand',
  label_issued: 'brand',
  in_transit: 'brand',
  received: 'brand',
  evaluating: 'brand',
  quote_sent: 'warning',
  quote_declined: 'neutral',
  approved: 'brand',
  recovering: 'brand',
  ready_for_review: 'warning',
  paid: 'success',
  returned: 'success',
  closed: 'success',
  no_recovery: 'neutral',
  cancelled: 'neutral',
  on_hold: 'danger',
};

/** A case's status in words (the colour only repeats them). */
export function CaseStatusBadge({ status }: { status: CaseStatus }) {
  return <Badge tone={tones[status]}>{caseStatusLabels[status]}</Badge>;
}
