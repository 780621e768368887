import type { AttentionItemDto } from '@shared/schemas/labs';
import { declineReasonLabels } from '@shared/schemas/referrals';
import { labSkillLabels, mediaTypeLabels } from '@shared/vocabulary';
import { PanelError } from '@/components/errors/error-panel';
import { Spinner } from '@/components/ui/spinner';
import { Table, type TableColumn } from '@/components/ui/table';
import { formatBusinessDays, formatDateTime, formatMiles } from '@/lib/format';
import { CaseStatusBadge } from '@/features/referrals';
import { useAttention } from '../api/get-attention';
import { AssignLabDialog } from './assign-lab-dialog';

const offerWords: Record<AttentionItemDto['previousOffers'][number]['status'], string> = {
  pending: 'waiting',
  accepted: 'accepted',
  declined: 'declined',
  expired: 'did not answer',
  withdrawn: 'withdrawn',
};

function RankingNow({ item }: { item: AttentionItemDto }) {
  const { candidates, excluded } = item.ranking;
  if (candidates.length === 0) {
    return (
      <div className="text-sm">
        <p className="font-semibold text-brick-text">No lab qualifies now</p>
        <p className="text-ink-muted">{excluded.length} left out</p>
      </div>
    );
  }
  return (
    <div className="text-sm">
      <ol className="list-decimal pl-4" aria-label={`Labs ranked now for ${item.referral.reference}`}>
        {candidates.slice(0, 3).map((c) => (
          <li key={c.labId}>
            <span className="font-semibold text-ink-strong">{c.labName}</span>
            <span className="text-ink-muted">
              {' '}
              · {formatBusinessDays(c.estimatedDays)} · {formatMiles(c.distanceKm)}
            </span>
          </li>
        ))}
      </ol>
      {candidates.length > 3 ? <p className="text-ink-muted">and {candidates.length - 3} more</p> : null}
    </div>
  );
}

const columns: TableColumn<AttentionItemDto>[] = [
  {
    header: 'Case',
    cell: (item) => (
      <>
        <span className="block font-mono font-semibold whitespace-nowrap text-ink-strong">{item.referral.reference}</span>
        <span className="block text-ink-muted">{mediaTypeLabels[item.referral.mediaType]}</span>
        <span className="mt-1 block">
          <CaseStatusBadge status={item.referral.status} />
        </span>
      </>
    ),
  },
  {
    header: 'Why it waits',
    cell: (item) => (
      <div className="max-w-sm text-sm">
        <p className="text-ink-strong">{item.attentionReason ?? 'No lab could be offered the case.'}</p>
        <p className="text-ink-muted">Since {formatDateTime(item.since)}</p>
        {item.previousOffers.length > 0 ? (
          <ul className="mt-1 text-xs text-ink-muted" aria-label={`Earlier offers for ${item.referral.reference}`}>
            {item.previousOffers.map((o, index) => (
              <li key={`${o.labId}-${index}`}>
                {o.labName}: {offerWords[o.status]}
                {o.declineReason && o.declineReason in declineReasonLabels ? ` (${declineReasonLabels[o.declineReason as keyof typeof declineReasonLabels]})` : ''}
              </li>
            ))}
          </ul>
        ) : null}
      </div>
    ),
  },
  { header: 'Needs', cell: (item) => <span className="text-sm">{item.requiredSkills.map((s) => labSkillLabels[s]).join(', ')}</span> },
  { header: 'Ranking now', cell: (item) => <RankingNow item={item} /> },
  { header: <span className="sr-only">Actions</span>, cell: (item) => <AssignLabDialog item={item} />, className: 'text-right' },
];

export function AttentionQueue() {
  const queue = useAttention();
  if (queue.isPending) return <Spinner label="Loading the cases that need attention" />;
  if (queue.isError && !queue.data) return <PanelError title="The queue could not be loaded" onRetry={() => void queue.refetch()} />;
  return (
    <Table
      caption="Cases waiting for the network"
      columns={columns}
      rows={queue.data}
      rowKey={(item) => item.referral.id}
      empty="Nothing waits for the network: every open case has a lab or an offer out."
    />
  );
}
