import type { LabOfferDto } from '@shared/schemas/labs';
import { Badge, type BadgeTone } from '@/components/ui/badge';

const look: Record<LabOfferDto['status'], { tone: BadgeTone; label: string }> = {
  pending: { tone: 'warning', label: 'Waiting for your answer' },
  accepted: { tone: 'success', label: 'Accepted' },
  declined: { tone: 'neutral', label: 'Declined' },
  expired: { tone: 'neutral', label: 'Deadline passed' },
  withdrawn: { tone: 'neutral', label: 'Withdrawn' },
};

export function OfferStatusBadge({ status }: { status: LabOfferDto['status'] }) {
  return <Badge tone={look[status].tone}>{look[status].label}</Badge>;
}
