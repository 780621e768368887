import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { formatPeriod } from '@shared/domain/commission';
import { PanelError } from '@/components/errors/error-panel';
import { ErrorBoundary } from '@/components/errors/error-boundary';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Spinner } from '@/components/ui/spinner';
import { getEarningsQueryOptions } from '../api/get-earnings';
import { useEarningLines } from '../api/get-earning-lines';
import { EarningLines } from './earning-lines';
import { EarningsChart, lastTwelveMonths } from './earnings-chart';
import { EarningsTotals } from './earnings-totals';
import { PayoutAccountPanel } from './payout-account-panel';
import { StatementList } from './statement-list';
import { usePayee } from '../payee';

function MonthLines({ period }: { period: string }) {
  const { payee, words } = usePayee();
  const lines = useEarningLines(payee, period);
  if (lines.isPending) return <Spinner label={`Loading ${formatPeriod(period)}`} />;
  if (lines.isError) return <PanelError title="The month’s lines could not be loaded" onRetry={() => void lines.refetch()} />;
  return <EarningLines lines={lines.data.lines} caption={`${words.earning} lines of ${formatPeriod(period)}`} empty={`No ${words.earningInText} in ${formatPeriod(period)}.`} />;
}

/**
 * A payee's earnings (a shop admin's commission, a lab manager's lab share; see PayeeProvider): accrued, pending and paid; twelve months as a chart; the lines of a month;
 * the monthly statements to download; the payout account. `returned` is set when the person comes back
 * from the payment provider's set-up page, and the page then watches for the account's new state.
 */
export function EarningsOverview({ returned }: { returned: 'returned' | 'refresh' | null }) {
  const [selected, setSelected] = useState<string | null>(null);
  const { payee, words } = usePayee();
  const earnings = useQuery(getEarningsQueryOptions(payee));
  if (earnings.isPending) return <Spinner label="Loading your earnings" />;
  if (earnings.isError) return <PanelError title="Your earnings could not be loaded" onRetry={() => void earnings.refetch()} />;
  const data = earnings.data;
  const currency = data.totals[0]?.currency ?? 'USD';
  return (
    <div className="flex flex-col gap-6">
      <EarningsTotals totals={data.totals} />
      <div className="grid gap-6 lg:grid-cols-[minmax(0,2fr)_minmax(0,1fr)]">
        <Card title="By month" description={`${words.earning} in ${currency}, by the month its cases were paid. Choose a month to see its lines.`}>
          <ErrorBoundary fallback={({ reset }) => <PanelError title="The chart could not be drawn" onRetry={reset} />}>
            <EarningsChart months={lastTwelveMonths(data.months, currency)} currency={currency} onSelect={setSelected} selected={selected} />
          </ErrorBoundary>
        </Card>
        <PayoutAccountPanel account={data.payoutAccount} returned={returned} />
      </div>
      <Card
        title={selected ? `Lines of ${formatPeriod(selected)}` : 'Latest lines'}
        description={`Each line is one case: the ${words.earningInText} when the customer paid, a negative line when they were refunded.`}
        actions={
          selected ? (
            <Button size="sm" variant="secondary" onClick={() => setSelected(null)}>
              Show the latest lines
            </Button>
          ) : null
        }
      >
        {selected ? (
          <MonthLines period={selected} />
        ) : (
          <EarningLines lines={data.recentLines} caption={`Latest ${words.earningInText} lines`} empty={`No ${words.earningInText} lines yet.`} />
        )}
      </Card>
      <Card title="Statements" description="One per month once it is settled, with every line linked to its case. A negative month pays nothing and is set against the next.">
        <StatementList statements={data.statements} />
      </Card>
    </div>
  );
}
