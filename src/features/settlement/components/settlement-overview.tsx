import { useState } from 'react';
import { formatPeriod } from '@shared/domain/commission';
import { formatMoney } from '@shared/domain/money';
import type { SettlementOverviewDto } from '@shared/schemas/money';
import { PanelError } from '@/components/errors/error-panel';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Spinner } from '@/components/ui/spinner';
import { Table, type TableColumn } from '@/components/ui/table';
import { useSettlementOverview } from '../api/get-settlement-overview';
import { useSettlementPeriod } from '../api/get-settlement-period';
import { LedgerCheckCard } from './ledger-check-card';
import { RunSettlementCard } from './run-settlement-card';
import { RunsTable } from './runs-table';
import { StatementsTable } from './statements-table';

type PeriodRow = SettlementOverviewDto['periods'][number];

function PeriodStatements({ period }: { period: string }) {
  const data = useSettlementPeriod(period);
  if (data.isPending) return <Spinner label={`Loading the statements of ${formatPeriod(period)}`} />;
  if (data.isError) return <PanelError title="The statements could not be loaded" onRetry={() => void data.refetch()} />;
  return <StatementsTable statements={data.data.statements} caption={`Statements of ${formatPeriod(period)}`} empty="No statements for this month." />;
}

/** The network admin's settlement: run a month, see runs and totals, handle failed payouts, check the books. */
export function SettlementOverview() {
  const overview = useSettlementOverview();
  const [selected, setSelected] = useState<string | null>(null);
  if (overview.isPending) return <Spinner label="Loading the settlement" />;
  if (overview.isError) return <PanelError title="The settlement could not be loaded" onRetry={() => void overview.refetch()} />;
  const data = overview.data;
  const periodColumns: TableColumn<PeriodRow>[] = [
    {
      header: 'Month',
      cell: (p) => (
        <Button size="sm" variant="ghost" onClick={() => setSelected(p.period)} aria-label={`Show the statements of ${formatPeriod(p.period)}`}>
          {formatPeriod(p.period)}
        </Button>
      ),
    },
    { header: 'Statements', cell: (p) => p.statements, className: 'text-right tabular-nums' },
    { header: 'Paid', cell: (p) => formatMoney(p.paidMinor, p.currency), className: 'text-right tabular-nums' },
    { header: 'Still due', cell: (p) => formatMoney(p.dueMinor, p.currency), className: 'text-right tabular-nums' },
    { header: 'Failed', cell: (p) => p.failed, className: 'text-right tabular-nums' },
    { header: 'Waiting for account', cell: (p) => p.waitingForAccount, className: 'text-right tabular-nums' },
    { header: 'Carried forward', cell: (p) => formatMoney(p.carriedForwardMinor, p.currency), className: 'text-right tabular-nums' },
  ];
  return (
    <div className="flex flex-col gap-6">
      <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_minmax(0,1fr)]">
        <RunSettlementCard suggestedPeriod={data.suggestedPeriod} />
        <Card title="Not settled yet" description="Lines accrued and not on any statement: this month’s, and any of an ended month not run yet.">
          {data.unsettled.length === 0 ? (
            <p className="text-sm text-ink-muted">Everything accrued is on a statement.</p>
          ) : (
            <dl className="grid gap-2 text-sm">
              {data.unsettled.map((u) => (
                <div key={u.currency} className="flex flex-wrap justify-between gap-2">
                  <dt className="text-ink-muted">{u.lineCount} lines</dt>
                  <dd className="tabular-nums">
                    Shops {formatMoney(u.partnerMinor, u.currency)} · Labs {formatMoney(u.labMinor, u.currency)}
                  </dd>
                </div>
              ))}
            </dl>
          )}
        </Card>
      </div>
      <Card title="Payouts that need attention" description="Failed transfers (retried by themselves with back-off) and payees without a ready payout account.">
        <StatementsTable statements={data.failures} caption="Payouts that need attention" empty="Every payout went through." />
      </Card>
      <Card title="Totals by month">
        <Table caption="Settlement totals by month" columns={periodColumns} rows={data.periods} rowKey={(p) => `${p.period}-${p.currency}`} empty="No month has been settled yet." />
      </Card>
      {selected ? (
        <Card
          title={`Statements of ${formatPeriod(selected)}`}
          actions={
            <Button size="sm" variant="secondary" onClick={() => setSelected(null)}>
              Close
            </Button>
          }
        >
          <PeriodStatements period={selected} />
        </Card>
      ) : null}
      <Card title="Runs">
        <RunsTable runs={data.runs} />
      </Card>
      <LedgerCheckCard />
    </div>
  );
}
