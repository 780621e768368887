import { statementStatusLabels, type StatementStatus } from '@shared/schemas/money';
import { Badge, type BadgeTone } from '@/components/ui/badge';

const tones: Record<StatementStatus, BadgeTone> = {
  pending: 'info',
  paying: 'info',
  paid: 'success',
  failed: 'danger',
  carried_forward: 'warning',
  nothing_due: 'neutral',
  no_account: 'warning',
};

export function StatementStatusBadge({ status }: { status: StatementStatus }) {
  return <Badge tone={tones[status]}>{statementStatusLabels[status]}</Badge>;
}
