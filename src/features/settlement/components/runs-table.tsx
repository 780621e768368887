import { formatPeriod } from '@shared/domain/commission';
import { formatMoney } from '@shared/domain/money';
import type { SettlementRunDto } from '@shared/schemas/money';
import { Badge, type BadgeTone } from '@/components/ui/badge';
import { Table, type TableColumn } from '@/components/ui/table';
import { formatDateTime } from '@/lib/format';

const statusTone: Record<SettlementRunDto['status'], { tone: BadgeTone; label: string }> = {
  running: { tone: 'info', label: 'Running' },
  completed: { tone: 'success', label: 'Completed' },
  completed_with_failures: { tone: 'warning', label: 'Completed with failures' },
  interrupted: { tone: 'danger', label: 'Interrupted' },
};

const triggerLabel: Record<SettlementRunDto['trigger'], string> = { manual: 'By hand', schedule: 'Scheduled (1st of the month)', retry: 'Retry' };

const columns: TableColumn<SettlementRunDto>[] = [
  { header: 'Month', cell: (r) => <span className="font-semibold text-ink-strong">{formatPeriod(r.period)}</span>, className: 'whitespace-nowrap' },
  { header: 'Started', cell: (r) => formatDateTime(r.startedAt), className: 'whitespace-nowrap' },
  { header: 'By', cell: (r) => r.startedByName ?? triggerLabel[r.trigger] },
  { header: 'New statements', cell: (r) => r.summary.statementsCreated, className: 'text-right tabular-nums' },
  {
    header: 'Paid',
    cell: (r) => (
      <span>
        {r.summary.paid}
        {Object.entries(r.summary.paidMinorByCurrency).map(([currency, minor]) => (
          <span key={currency} className="block text-xs text-ink-muted">
            {formatMoney(minor, currency)}
          </span>
        ))}
      </span>
    ),
    className: 'text-right tabular-nums',
  },
  { header: 'Failed', cell: (r) => r.summary.failed, className: 'text-right tabular-nums' },
  { header: 'Waiting', cell: (r) => r.summary.waitingForAccount, className: 'text-right tabular-nums' },
  { header: 'Status', cell: (r) => <Badge tone={statusTone[r.status].tone}>{statusTone[r.status].label}</Badge> },
];

export function RunsTable({ runs }: { runs: SettlementRunDto[] }) {
  return <Table caption="Settlement runs" columns={columns} rows={runs} rowKey={(r) => r.id} empty="No settlement has run yet." />;
}
