import type { TimelineEntryDto } from '@shared/schemas/referrals';
import { formatDateTime } from '@/lib/format';

const actorWords: Record<TimelineEntryDto['actor']['type'], (name: string) => string> = {
  user: (name) => name,
  api_key: (name) => `Your system (API key “${name}”)`,
  system: () => 'Platterpost',
  customer: () => 'The customer',
  carrier: (name) => name || 'The carrier',
};

/** Every change of the case, oldest first, each with who made it and when. */
export function CaseTimeline({ entries }: { entries: readonly TimelineEntryDto[] }) {
  if (entries.length === 0) return <p className="text-sm text-ink-muted">Nothing has happened yet.</p>;
  const ordered = [...entries].sort((a, b) => a.at.localeCompare(b.at));
  return (
    <ol aria-label="Timeline" className="relative flex flex-col gap-4 border-l-2 border-spruce-100 pl-5">
      {ordered.map((entry) => (
        <li key={entry.id} className="relative">
          <span aria-hidden="true" className="absolute top-1.5 -left-[27px] size-3 rounded-full border-2 border-paper-raised bg-spruce-500" />
          <p className="text-sm font-semibold text-ink-strong">{entry.summary}</p>
          <p className="text-xs text-ink-muted">
            <time dateTime={entry.at}>{formatDateTime(entry.at)}</time> · {actorWords[entry.actor.type](entry.actor.name)}
          </p>
        </li>
      ))}
    </ol>
  );
}
