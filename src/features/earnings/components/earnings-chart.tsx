import { formatPeriod } from '@shared/domain/commission';
import { formatMoney } from '@shared/domain/money';
import type { EarningsDto } from '@shared/schemas/money';
import { usePayee } from '../payee';

interface Month {
  period: string;
  accruedMinor: number;
  paidMinor: number;
}

/** The twelve months up to `now`'s, oldest first (months without lines show as empty bars). */
export function lastTwelveMonths(months: EarningsDto['months'], currency: string, now = new Date()): Month[] {
  const out: Month[] = [];
  for (let i = 11; i >= 0; i--) {
    const d = new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth() - i, 1));
    const period = `${d.getUTCFullYear()}-${String(d.getUTCMonth() + 1).padStart(2, '0')}`;
    const found = months.find((m) => m.period === period && m.currency === currency);
    out.push({ period, accruedMinor: found?.accruedMinor ?? 0, paidMinor: found?.paidMinor ?? 0 });
  }
  return out;
}

const WIDTH = 720;
const HEIGHT = 220;
const PAD = { top: 16, right: 8, bottom: 28, left: 8 };

/**
 * Earnings by month as pairs of bars: earned in the month (the month its cases were paid) and paid out
 * for it. Our own drawing in SVG; the numbers are also in the month list below, for screen readers.
 */
export function EarningsChart({ months, currency, onSelect, selected }: { months: Month[]; currency: string; onSelect?: (period: string) => void; selected?: string | null }) {
  const max = Math.max(1, ...months.map((m) => Math.max(m.accruedMinor, m.paidMinor)));
  const slot = (WIDTH - PAD.left - PAD.right) / months.length;
  const barWidth = Math.max(6, slot / 2 - 6);
  const plotHeight = HEIGHT - PAD.top - PAD.bottom;
  const y = (v: number) => PAD.top + plotHeight - (Math.max(v, 0) / max) * plotHeight;
  const total = months.reduce((s, m) => s + m.accruedMinor, 0);
  const { words } = usePayee();
  return (
    <figure className="flex flex-col gap-3">
      <svg
        viewBox={`0 0 ${WIDTH} ${HEIGHT}`}
        role="img"
        aria-label={`${words.earning} earned over the last twelve months: ${formatMoney(total, currency)} in all`}
        className="h-auto w-full"
      >
        <line x1={PAD.left} x2={WIDTH - PAD.right} y1={PAD.top + plotHeight} y2={PAD.top + plotHeight} className="stroke-ink-line" strokeWidth={1} />
        {months.map((m, i) => {
          const x = PAD.left + i * slot + (slot - 2 * barWidth - 4) / 2;
          const isSelected = selected === m.period;
          return (
            <g key={m.period} onClick={onSelect ? () => onSelect(m.period) : undefined} className={onSelect ? 'cursor-pointer' : undefined}>
              <title>{`${formatPeriod(m.period)}: earned ${formatMoney(m.accruedMinor, currency)}, paid ${formatMoney(m.paidMinor, currency)}`}</title>
              {isSelected ? <rect x={PAD.left + i * slot + 1} y={PAD.top - 8} width={slot - 2} height={plotHeight + 8} rx={6} className="fill-copper-100" /> : null}
              <rect x={x} y={y(m.accruedMinor)} width={barWidth} height={PAD.top + plotHeight - y(m.accruedMinor)} rx={3} className="fill-spruce-500" />
              <rect x={x + barWidth + 4} y={y(m.paidMinor)} width={barWidth} height={PAD.top + plotHeight - y(m.paidMinor)} rx={3} className="fill-copper-400" />
              <text x={PAD.left + i * slot + slot / 2} y={HEIGHT - 8} textAnchor="middle" className="fill-ink-muted text-[11px]">
                {formatPeriod(m.period, 'short')}
              </text>
            </g>
          );
        })}
      </svg>
      <figcaption className="flex flex-wrap gap-4 text-sm text-ink-muted">
        <span className="inline-flex items-center gap-2">
          <span aria-hidden="true" className="size-3 rounded-sm bg-spruce-500" /> Earned in the month
        </span>
        <span className="inline-flex items-center gap-2">
          <span aria-hidden="true" className="size-3 rounded-sm bg-copper-400" /> Paid out for the month
        </span>
      </figcaption>
    </figure>
  );
}
