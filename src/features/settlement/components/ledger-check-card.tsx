import { formatMoney } from '@shared/domain/money';
import type { LedgerCheckDto } from '@shared/schemas/money';
import { PanelError } from '@/components/errors/error-panel';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Spinner } from '@/components/ui/spinner';
import { Table, type TableColumn } from '@/components/ui/table';
import { formatDateTime } from '@/lib/format';
import { useLedgerCheck } from '../api/get-ledger-check';

const accountLabels: Record<string, string> = {
  processor_clearing: 'Customer payments at the processor',
  processor_fees: 'Processor fees',
  lab_payable: 'Owed to labs',
  network_revenue: 'Network revenue',
  partner_commission_payable: 'Commission owed to shops',
  transfers_out: 'Sent to connected accounts',
  refunds: 'Refunded to customers',
};

type AccountRow = LedgerCheckDto['accounts'][number];

const accountColumns: TableColumn<AccountRow>[] = [
  { header: 'Account', cell: (a) => accountLabels[a.kind] ?? a.kind },
  { header: 'Accounts', cell: (a) => a.accounts, className: 'text-right tabular-nums' },
  // Debits are positive, credits negative: the column adds up to zero per currency.
  { header: 'Balance (debit +, credit −)', cell: (a) => formatMoney(a.balanceMinor, a.currency), className: 'text-right tabular-nums' },
];

/** The books' own check: every entry sums to zero per currency and per transaction; sub-ledgers agree. */
export function LedgerCheckCard() {
  const check = useLedgerCheck();
  return (
    <Card
      title="Ledger balance check"
      description="Every ledger transaction’s entries sum to zero, so all entries of a currency do too."
      actions={
        <>
          {check.data ? <Badge tone={check.data.balanced ? 'success' : 'danger'}>{check.data.balanced ? 'Balanced' : 'Out of balance'}</Badge> : null}
          <Button size="sm" variant="secondary" onClick={() => void check.refetch()} isLoading={check.isFetching}>
            Check again
          </Button>
        </>
      }
    >
      {check.isPending ? (
        <Spinner label="Checking the ledger" />
      ) : check.isError ? (
        <PanelError title="The ledger could not be checked" onRetry={() => void check.refetch()} />
      ) : (
        <div className="flex flex-col gap-4">
          <dl className="grid gap-3 sm:grid-cols-3">
            {check.data.currencies.map((c) => (
              <div key={c.currency} className="rounded-control border border-ink-hairline bg-paper px-4 py-3">
                <dt className="text-sm text-ink-muted">Sum of all {c.currency} entries</dt>
                <dd className="text-xl font-bold tabular-nums text-ink-strong">{formatMoney(c.sumMinor, c.currency)}</dd>
                <dd className="text-xs text-ink-muted">{c.entries} entries</dd>
              </div>
            ))}
            <div className="rounded-control border border-ink-hairline bg-paper px-4 py-3">
              <dt className="text-sm text-ink-muted">Transactions out of balance</dt>
              <dd className="text-xl font-bold tabular-nums text-ink-strong">{check.data.unbalancedTransactions.length}</dd>
              <dd className="text-xs text-ink-muted">of {check.data.transactionCount}</dd>
            </div>
            <div className="rounded-control border border-ink-hairline bg-paper px-4 py-3">
              <dt className="text-sm text-ink-muted">Payables that disagree with their lines</dt>
              <dd className="text-xl font-bold tabular-nums text-ink-strong">{check.data.subledgerMismatches.length}</dd>
              <dd className="text-xs text-ink-muted">checked {formatDateTime(check.data.checkedAt)}</dd>
            </div>
          </dl>
          <Table caption="Ledger accounts by kind" columns={accountColumns} rows={check.data.accounts} rowKey={(a) => `${a.kind}-${a.currency}`} empty="No ledger entries yet." />
        </div>
      )}
    </Card>
  );
}
