import { useState } from 'react';
import { formatPeriod, periodOf } from '@shared/domain/commission';
import { formatMoney } from '@shared/domain/money';
import type { SettlementRunDto } from '@shared/schemas/money';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Select } from '@/components/ui/select';
import { isApiError } from '@/lib/api-client';
import { useRunSettlement } from '../api/run-settlement';

/** The newest ended month and the eleven before it. */
function periodsUpTo(suggested: string): string[] {
  const [y, m] = suggested.split('-').map(Number) as [number, number];
  return Array.from({ length: 12 }, (_, i) => periodOf(new Date(Date.UTC(y, m - 1 - i, 1))));
}

function RunResult({ run }: { run: SettlementRunDto }) {
  const s = run.summary;
  const paid = Object.entries(s.paidMinorByCurrency).map(([currency, minor]) => formatMoney(minor, currency));
  const tone = s.failed > 0 ? 'warning' : 'success';
  return (
    <Alert tone={tone} live="polite" title={`${formatPeriod(run.period)} settled`}>
      <ul className="list-disc pl-5">
        <li>{s.statementsCreated === 1 ? '1 new statement' : `${s.statementsCreated} new statements`}</li>
        <li>
          {s.paid === 1 ? '1 payout sent' : `${s.paid} payouts sent`}
          {paid.length ? ` (${paid.join(', ')})` : ''}
        </li>
        {s.failed ? <li>{s.failed === 1 ? '1 payout failed; it is retried by itself' : `${s.failed} payouts failed; they are retried by themselves`}</li> : null}
        {s.waitingForAccount ? <li>{`${s.waitingForAccount} waiting for a payout account`}</li> : null}
        {s.carriedForward ? <li>{`${s.carriedForward} negative, carried forward`}</li> : null}
      </ul>
    </Alert>
  );
}

/**
 * Runs the settlement of a month that has ended. Safe to run again: statements already paid are left
 * alone, and what failed or waited is tried again.
 */
export function RunSettlementCard({ suggestedPeriod }: { suggestedPeriod: string }) {
  const periods = periodsUpTo(suggestedPeriod);
  const [period, setPeriod] = useState(suggestedPeriod);
  const run = useRunSettlement();
  const error = run.error;
  return (
    <Card title="Run the settlement" description="Pays every shop its commission and every lab its share for the month, one transfer each.">
      <form
        className="flex flex-col gap-4"
        onSubmit={(event) => {
          event.preventDefault();
          run.mutate({ period });
        }}
      >
        <div className="flex flex-wrap items-end gap-3">
          <Select
            label="Month"
            value={period}
            onChange={(event) => setPeriod(event.target.value)}
            options={periods.map((p) => ({ value: p, label: formatPeriod(p) }))}
            className="min-w-56"
          />
          <Button type="submit" isLoading={run.isPending}>
            Run settlement
          </Button>
        </div>
        {run.isSuccess ? <RunResult run={run.data} /> : null}
        {error ? (
          <Alert tone="danger" live="assertive" title="The settlement did not run">
            {isApiError(error) ? error.message : 'Try again in a moment.'}
          </Alert>
        ) : null}
      </form>
    </Card>
  );
}
