import type { ImagingDto } from '@shared/schemas/lab-work';
import { formatBytes } from '@shared/domain/imaging';
import { formatDateTime } from '@/lib/format';
import { formatRate, formatRemaining } from '../utils/durations';

/** The imaging bar with the time left and the expected finish; the same for the lab, the shop and the customer. */
export function ImagingProgress({ imaging, detail = 'full' }: { imaging: ImagingDto; detail?: 'full' | 'simple' }) {
  const percent = Math.min(100, imaging.percent);
  const shown = percent >= 99.95 && !imaging.finished ? '99.9' : percent.toFixed(percent >= 10 ? 0 : 1);
  return (
    <div className="flex flex-col gap-2">
      <div className="flex flex-wrap items-baseline justify-between gap-2 text-sm">
        <span className="font-semibold text-ink-strong">{imaging.finished ? 'Copy complete' : `${shown} % copied`}</span>
        <span className="text-ink-muted">
          {imaging.finished
            ? `finished ${formatDateTime(imaging.reportedAt)}`
            : imaging.remainingSeconds === null
              ? 'paused or retrying a weak area: no estimate right now'
              : new Date(imaging.eta!).getTime() < Date.now()
                ? `the estimate from the report of ${formatDateTime(imaging.reportedAt)} has passed; waiting for the next report`
                : `${formatRemaining(imaging.remainingSeconds)} left · expected ${formatDateTime(imaging.eta!)}`}
        </span>
      </div>
      <div
        role="progressbar"
        aria-label="Imaging progress"
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={Math.round(percent)}
        aria-valuetext={imaging.finished ? 'Copy complete' : `${shown} percent copied`}
        className="h-3 overflow-hidden rounded-full bg-paper-sunken ring-1 ring-ink-hairline"
      >
        <div className="h-full rounded-full bg-spruce-500 transition-[width]" style={{ width: `${percent}%` }} />
      </div>
      <p className="text-xs text-ink-muted">
        {formatBytes(imaging.bytesRead)} of {formatBytes(imaging.totalBytes)} read
        {detail === 'full' ? (
          <>
            {' '}
            · {imaging.unreadableSectors.toLocaleString('en-US')} unreadable {imaging.unreadableSectors === 1 ? 'sector' : 'sectors'} · {formatRate(imaging.rateBytesPerSec)} · reported{' '}
            {formatDateTime(imaging.reportedAt)} by {imaging.reportedBy}
          </>
        ) : null}
      </p>
    </div>
  );
}
