import { useEffect, useState } from 'react';
import { Badge, type BadgeTone } from '@/components/ui/badge';
import { formatDateTime, formatTimeLeft } from '@/lib/format';

/** The current time, renewed every `intervalMs`. */
export function useNow(intervalMs: number): number {
  const [now, setNow] = useState(() => Date.now());
  useEffect(() => {
    const timer = window.setInterval(() => setNow(Date.now()), intervalMs);
    return () => window.clearInterval(timer);
  }, [intervalMs]);
  return now;
}

const HOUR = 3_600_000;

function toneFor(left: number): BadgeTone {
  if (left <= 0) return 'neutral';
  if (left < HOUR) return 'danger';
  if (left < 4 * HOUR) return 'warning';
  return 'info';
}

/**
 * Time left to answer an offer, counting down while the page is open. It is not a live
 * region: a screen reader hears it when it reaches it, not every few seconds.
 */
export function DeadlineCountdown({ deadline, timeZone }: { deadline: string; timeZone?: string }) {
  const due = new Date(deadline).getTime();
  // Once a minute is enough far off; in the last hour the minutes matter.
  const now = useNow(due - Date.now() < HOUR ? 5_000 : 30_000);
  const left = due - now;
  return (
    <Badge tone={toneFor(left)}>
      <time dateTime={deadline} title={`Answer by ${formatDateTime(deadline, timeZone)}`}>
        {formatTimeLeft(left)}
      </time>
    </Badge>
  );
}
