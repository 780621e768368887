import { formatMoney } from '@shared/domain/money';
import type { EarningsDto } from '@shared/schemas/money';
import { usePayee } from '../payee';

function Figure({ label, value, hint }: { label: string; value: string; hint: string }) {
  return (
    <div className="rounded-panel border border-ink-hairline bg-paper-raised px-5 py-4 shadow-panel">
      <dt className="text-sm font-semibold text-ink-muted">{label}</dt>
      <dd className="mt-1 text-2xl font-bold tracking-tight text-ink-strong tabular-nums">{value}</dd>
      <dd className="mt-1 text-xs text-ink-muted">{hint}</dd>
    </div>
  );
}

/** Accrued, pending and paid, per currency the payee has earned in. */
export function EarningsTotals({ totals }: { totals: EarningsDto['totals'] }) {
  const { words } = usePayee();
  if (totals.length === 0) {
    return <p className="text-sm text-ink-muted">
        No {words.earningInText} yet. {words.howItAccrues}
      </p>;
  }
  return (
    <div className="flex flex-col gap-4">
      {totals.map((t) => (
        <dl key={t.currency} aria-label={`${words.earning} in ${t.currency}`} className="grid gap-4 sm:grid-cols-3">
          <Figure label="Accrued" value={formatMoney(t.accruedMinor, t.currency)} hint="Earned on paid recoveries, less refunds" />
          <Figure
            label="Pending"
            value={formatMoney(t.pendingMinor, t.currency)}
            hint={
              t.carriedForwardMinor < 0
                ? `Includes ${formatMoney(t.carriedForwardMinor, t.currency)} carried forward from refunds`
                : `${formatMoney(t.unsettledMinor, t.currency)} not on a statement yet`
            }
          />
          <Figure label="Paid" value={formatMoney(t.paidMinor, t.currency)} hint="Sent to your payout account" />
        </dl>
      ))}
    </div>
  );
}
