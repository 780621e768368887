import { formatPeriod } from '@shared/domain/commission';
import { formatMoney } from '@shared/domain/money';
import type { StatementDto } from '@shared/schemas/money';
import { Button } from '@/components/ui/button';
import { Table, type TableColumn } from '@/components/ui/table';
import { toast } from '@/components/ui/toast';
import { StatementStatusBadge } from '@/features/earnings';
import { formatDateTime } from '@/lib/format';
import { useDownloadNetworkStatement } from '../api/download-statement';
import { useRetryPayout } from '../api/retry-payout';

function Actions({ statement }: { statement: StatementDto }) {
  const retry = useRetryPayout();
  const download = useDownloadNetworkStatement();
  const canRetry = ['failed', 'no_account', 'paying', 'pending'].includes(statement.status);
  return (
    <div className="flex justify-end gap-2">
      {canRetry ? (
        <Button
          size="sm"
          variant="secondary"
          isLoading={retry.isPending}
          aria-label={`Retry the payout to ${statement.organizationName} for ${formatPeriod(statement.period)}`}
          onClick={() =>
            retry.mutate(statement.id, {
              onSuccess: (r) =>
                r.outcome.outcome === 'paid'
                  ? toast.success(`Paid ${statement.organizationName}`)
                  : toast.info(`Not paid yet: ${r.statement.lastError ?? r.outcome.outcome.replace('_', ' ')}`),
              onError: (error) => toast.error('The retry did not run', error.message),
            })
          }
        >
          Retry now
        </Button>
      ) : null}
      <Button
        size="sm"
        variant="secondary"
        aria-label={`Download the statement of ${statement.organizationName} for ${formatPeriod(statement.period)} as CSV`}
        onClick={() =>
          download.mutate(
            { statementId: statement.id, fileName: `platterpost-statement-${statement.organizationName.toLowerCase().replace(/[^a-z0-9]+/g, '-')}-${statement.period}.csv` },
            { onError: () => toast.error('The statement could not be downloaded') },
          )
        }
      >
        CSV
      </Button>
    </div>
  );
}

const columns: TableColumn<StatementDto>[] = [
  {
    header: 'Payee',
    cell: (s) => (
      <span>
        <span className="font-semibold text-ink-strong">{s.organizationName}</span>
        <span className="block text-xs text-ink-muted">
          {s.payeeKind === 'partner' ? 'Shop' : 'Lab'} · {formatPeriod(s.period)}
        </span>
      </span>
    ),
  },
  { header: 'Lines', cell: (s) => s.lineCount, className: 'text-right tabular-nums' },
  { header: 'Total', cell: (s) => formatMoney(s.totalMinor, s.currency), className: 'text-right tabular-nums' },
  { header: 'Payout', cell: (s) => formatMoney(s.payoutMinor, s.currency), className: 'text-right tabular-nums' },
  {
    header: 'Status',
    cell: (s) => (
      <span className="flex flex-col items-start gap-1">
        <StatementStatusBadge status={s.status} />
        {s.lastError && s.status !== 'paid' ? <span className="max-w-72 text-xs text-ink-muted">{s.lastError}</span> : null}
        {s.status === 'failed' ? (
          <span className="text-xs text-ink-muted">
            {s.attempts} {s.attempts === 1 ? 'attempt' : 'attempts'}
            {s.nextAttemptAt ? `; next ${formatDateTime(s.nextAttemptAt)}` : '; no more automatic retries'}
          </span>
        ) : null}
      </span>
    ),
  },
  { header: <span className="sr-only">Actions</span>, cell: (s) => <Actions statement={s} />, className: 'text-right' },
];

export function StatementsTable({ statements, caption, empty }: { statements: StatementDto[]; caption: string; empty: string }) {
  return <Table caption={caption} columns={columns} rows={statements} rowKey={(s) => s.id} empty={empty} />;
}
