import { useState } from 'react';
import { Link } from 'react-router';
import { boardBucketLabels, boardBuckets, shipmentKindLabels, type BoardBucket, type BoardRowDto } from '@shared/schemas/shipping';
import { mediaTypeLabels } from '@shared/vocabulary';
import { PanelError } from '@/components/errors/error-panel';
import { Badge } from '@/components/ui/badge';
import { Button, buttonClasses } from '@/components/ui/button';
import { Input } from '@/components/ui/input';
import { Spinner } from '@/components/ui/spinner';
import { Table } from '@/components/ui/table';
import { paths } from '@/config/paths';
import { useCan } from '@/lib/auth';
import { cn } from '@/lib/cn';
import { formatDateTime } from '@/lib/format';
import { useInboundBoard } from '../api/get-inbound-board';

const bucketTones: Record<BoardBucket, 'info' | 'brand' | 'success' | 'danger' | 'warning' | 'neutral'> = {
  label_issued: 'info',
  in_transit: 'brand',
  out_for_delivery: 'brand',
  delivered_today: 'success',
  exception: 'danger',
  overdue: 'warning',
  awaiting_check_in: 'warning',
};

/** The shipping clerk's board: every expected and arriving box by status, with counts and a search. */
export function InboundBoard() {
  const can = useCan();
  const [bucket, setBucket] = useState<BoardBucket | undefined>(undefined);
  const [search, setSearch] = useState('');
  const [q, setQ] = useState('');
  const board = useInboundBoard({ bucket, q });
  const total = board.data ? Object.values(board.data.counts).reduce((a, b) => a + b, 0) : 0;

  const filter = (value: BoardBucket | undefined, label: string, count: number) => (
    <button
      key={value ?? 'all'}
      type="button"
      aria-pressed={bucket === value}
      onClick={() => setBucket(value)}
      className={cn(
        'focus-ring rounded-full border px-3 py-1 text-sm font-semibold',
        bucket === value ? 'border-spruce-600 bg-spruce-600 text-white' : 'border-ink-line bg-paper-raised text-ink hover:bg-paper-sunken',
      )}
    >
      {label} <span className="tabular-nums">({count})</span>
    </button>
  );

  return (
    <div className="flex flex-col gap-4">
      <form
        role="search"
        className="flex flex-wrap items-end gap-3"
        onSubmit={(e) => {
          e.preventDefault();
          setQ(search.trim());
        }}
      >
        <Input
          label="Find a box"
          hint="Tracking code, case reference or shop"
          value={search}
          onChange={(e) => setSearch(e.target.value)}
          className="min-w-64 flex-1"
        />
        <Button type="submit" variant="secondary">
          Search
        </Button>
        {q ? (
          <Button
            variant="ghost"
            onClick={() => {
              setSearch('');
              setQ('');
            }}
          >
            Clear
          </Button>
        ) : null}
      </form>
      {board.data ? (
        <div role="group" aria-label="Boxes by status" className="flex flex-wrap gap-2">
          {filter(undefined, 'All', total)}
          {boardBuckets.map((b) => filter(b, boardBucketLabels[b], board.data!.counts[b] ?? 0))}
        </div>
      ) : null}
      {board.isPending ? <Spinner label="Loading the board" /> : null}
      {board.isError ? <PanelError title="The board could not be loaded" onRetry={() => void board.refetch()} /> : null}
      {board.data ? (
        <Table<BoardRowDto>
          caption="Inbound boxes"
          rows={board.data.data}
          rowKey={(r) => r.shipmentId}
          empty={q || bucket ? 'No box matches. Clear the search or pick another status.' : 'No boxes are on their way to your lab right now.'}
          columns={[
            {
              header: 'Status',
              cell: (r) => (
                <span className="flex flex-col items-start gap-1">
                  <Badge tone={bucketTones[r.bucket]}>{boardBucketLabels[r.bucket]}</Badge>
                  {r.checkedInAt ? <span className="text-xs text-ink-muted">Checked in</span> : null}
                </span>
              ),
            },
            { header: 'Tracking code', cell: (r) => <span className="font-mono">{r.trackingCode}</span> },
            {
              header: 'Case',
              cell: (r) => (
                <span className="flex flex-col">
                  <span className="font-semibold text-ink-strong">{r.reference}</span>
                  <span className="text-xs text-ink-muted">
                    {mediaTypeLabels[r.mediaType]}
                    {r.kind === 'transfer' ? ` · ${shipmentKindLabels.transfer}` : ''}
                  </span>
                  {r.batteryWarning ? <span className="text-xs font-semibold text-brick-text">Damaged battery declared: open with care</span> : null}
                </span>
              ),
            },
            { header: 'From', cell: (r) => [r.from.name, [r.from.city, r.from.region].filter(Boolean).join(', ')].filter(Boolean).join(' · ') },
            { header: 'Carrier', cell: (r) => `${r.carrier ?? ''} ${r.service ?? ''}` },
            {
              header: 'Expected / delivered',
              cell: (r) => (r.deliveredAt ? `Delivered ${formatDateTime(r.deliveredAt)}` : r.estimatedDeliveryAt ? `By ${formatDateTime(r.estimatedDeliveryAt)}` : '—'),
            },
            { header: 'Latest scan', cell: (r) => (r.lastEvent ? `${r.lastEvent.message}${r.lastEvent.location ? `, ${r.lastEvent.location}` : ''}` : '—') },
            {
              header: <span className="sr-only">Check in</span>,
              cell: (r) =>
                !r.checkedInAt && can('inbound.check-in') && r.trackingCode ? (
                  <Link
                    to={paths.lab.checkIn.getHref(r.trackingCode)}
                    className={buttonClasses({ size: 'sm', variant: r.bucket === 'delivered_today' || r.bucket === 'awaiting_check_in' ? 'primary' : 'secondary' })}
                    aria-label={`Check in ${r.trackingCode}`}
                  >
                    Check in
                  </Link>
                ) : null,
            },
          ]}
        />
      ) : null}
    </div>
  );
}
