import { formatPeriod } from '@shared/domain/commission';
import { formatMoney } from '@shared/domain/money';
import type { StatementDto } from '@shared/schemas/money';
import { Button } from '@/components/ui/button';
import { Table, type TableColumn } from '@/components/ui/table';
import { toast } from '@/components/ui/toast';
import { formatDate } from '@/lib/format';
import { useDownloadStatement } from '../api/download-statement';
import { usePayee } from '../payee';
import { StatementStatusBadge } from './statement-status-badge';

function fileName(s: StatementDto, format: 'csv' | 'pdf') {
  return `platterpost-statement-${s.period}${s.currency === 'USD' ? '' : `-${s.currency.toLowerCase()}`}.${format}`;
}

function Downloads({ statement }: { statement: StatementDto }) {
  const { payee } = usePayee();
  const download = useDownloadStatement();
  const get = (format: 'csv' | 'pdf') =>
    download.mutate(
      { payee, statementId: statement.id, format, fileName: fileName(statement, format) },
      { onError: () => toast.error('The statement could not be downloaded. Try again in a moment.') },
    );
  const label = formatPeriod(statement.period);
  return (
    <div className="flex justify-end gap-2">
      <Button size="sm" variant="secondary" onClick={() => get('csv')} aria-label={`Download the ${label} statement as CSV`} isLoading={download.isPending && download.variables?.format === 'csv'}>
        CSV
      </Button>
      <Button size="sm" variant="secondary" onClick={() => get('pdf')} aria-label={`Download the ${label} statement as PDF`} isLoading={download.isPending && download.variables?.format === 'pdf'}>
        PDF
      </Button>
    </div>
  );
}

const columns: TableColumn<StatementDto>[] = [
  { header: 'Month', cell: (s) => <span className="font-semibold text-ink-strong">{formatPeriod(s.period)}</span>, className: 'whitespace-nowrap' },
  { header: 'Lines', cell: (s) => s.lineCount, className: 'text-right tabular-nums' },
  {
    header: 'Total',
    cell: (s) => (
      <span>
        {formatMoney(s.totalMinor, s.currency)}
        {s.openingCarryMinor < 0 ? <span className="block text-xs text-ink-muted">incl. {formatMoney(s.openingCarryMinor, s.currency)} carried in</span> : null}
      </span>
    ),
    className: 'text-right tabular-nums',
  },
  { header: 'Paid out', cell: (s) => (s.status === 'paid' ? formatMoney(s.payoutMinor, s.currency) : '—'), className: 'text-right tabular-nums' },
  {
    header: 'Status',
    cell: (s) => (
      <span className="flex flex-col items-start gap-1">
        <StatementStatusBadge status={s.status} />
        {s.paidAt ? <span className="text-xs text-ink-muted">{formatDate(s.paidAt)}</span> : null}
      </span>
    ),
  },
  { header: <span className="sr-only">Download</span>, cell: (s) => <Downloads statement={s} />, className: 'text-right' },
];

/** Monthly statements, newest first, each downloadable as CSV and PDF with every line linked to its case. */
export function StatementList({ statements }: { statements: StatementDto[] }) {
  return (
    <Table
      caption="Monthly statements"
      columns={columns}
      rows={statements}
      rowKey={(s) => s.id}
      empty="No statements yet. The first one is made when the month of your first paid referral has been settled."
    />
  );
}
