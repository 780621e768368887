import { useState } from 'react';
import { benchStatuses, type BenchRowDto } from '@shared/schemas/lab-work';
import { caseStatusLabels, labSkillLabels, priorityCategoryLabels } from '@shared/vocabulary';
import { PanelError } from '@/components/errors/error-panel';
import { Badge } from '@/components/ui/badge';
import { TextLink } from '@/components/ui/link';
import { Select } from '@/components/ui/select';
import { Spinner } from '@/components/ui/spinner';
import { Table, type TableColumn } from '@/components/ui/table';
import { paths } from '@/config/paths';
import { formatDate } from '@/lib/format';
import { CaseStatusBadge, PhotoGallery } from '@/features/referrals';
import { useBench, type BenchStatusFilter } from '../api/get-bench';

function PromisedBy({ row }: { row: BenchRowDto }) {
  if (!row.promisedBy) return <span className="text-ink-muted">No promise recorded</span>;
  const late = new Date(row.promisedBy).getTime() < Date.now();
  return (
    <span className="flex flex-col items-start gap-1">
      <span className="whitespace-nowrap">{formatDate(row.promisedBy)}</span>
      {late ? <Badge tone="danger">Past the promise</Badge> : null}
    </span>
  );
}

function Stage({ row }: { row: BenchRowDto }) {
  return (
    <span className="flex flex-col items-start gap-1">
      <CaseStatusBadge status={row.status} />
      {row.status === 'recovering' && row.imagingPercent !== null ? <span className="text-xs text-ink-muted">{Math.floor(row.imagingPercent)} % imaged</span> : null}
      {row.reviewStatus === 'disputed' ? <Badge tone="warning">Customer disputes the files</Badge> : null}
      {row.reviewStatus === 'confirmed' ? <Badge tone="success">Files confirmed</Badge> : null}
    </span>
  );
}

const columns: TableColumn<BenchRowDto>[] = [
  {
    header: 'Case',
    cell: (row) => (
      <>
        <TextLink to={paths.lab.case.getHref(row.id)} className="font-mono whitespace-nowrap">
          {row.reference}
        </TextLink>
        <span className="block text-xs text-ink-muted">{row.shopName}</span>
      </>
    ),
  },
  { header: 'Promised by', cell: (row) => <PromisedBy row={row} /> },
  { header: 'Stage', cell: (row) => <Stage row={row} /> },
  {
    header: 'Device and triage',
    cell: (row) => {
      const stops = row.cautions.filter((c) => c.severity === 'danger').length;
      return (
        <>
          <span className="block font-semibold text-ink-strong">{row.device}</span>
          <span className="block text-ink-muted">
            {row.capacityGb ? `${row.capacityGb.toLocaleString('en-US')} GB · ` : ''}
            {row.requiredSkills.map((s) => labSkillLabels[s]).join(', ')}
          </span>
          {stops > 0 ? <Badge tone="danger">{stops === 1 ? '1 stop caution' : `${stops} stop cautions`}</Badge> : null}
        </>
      );
    },
  },
  {
    header: 'What matters to the customer',
    cell: (row) =>
      row.priorities.length === 0 ? (
        <span className="text-ink-muted">Everything</span>
      ) : (
        <ol className="list-decimal pl-4">
          {row.priorities.slice(0, 3).map((p) => (
            <li key={p.category}>
              {priorityCategoryLabels[p.category]}
              {p.note ? <span className="text-ink-muted"> — {p.note}</span> : null}
            </li>
          ))}
        </ol>
      ),
  },
  {
    header: 'Intake photos',
    // The gallery's thumbnails, made small for the queue.
    cell: (row) => (row.photos.length ? <div className="[&_li]:w-14"><PhotoGallery photos={row.photos} /></div> : <span className="text-ink-muted">None</span>),
  },
];

const filters = [{ value: '', label: 'Everything on the bench' }, ...benchStatuses.map((s) => ({ value: s, label: caseStatusLabels[s] }))];

/** The lab's received cases, the soonest promise first. */
export function BenchTable() {
  const [status, setStatus] = useState('');
  const bench = useBench((status || undefined) as BenchStatusFilter);
  return (
    <div className="flex flex-col gap-4">
      <Select label="Show" className="w-64" value={status} onChange={(event) => setStatus(event.target.value)} options={filters} />
      {bench.isPending ? (
        <Spinner label="Loading the bench queue" />
      ) : bench.isError && !bench.data ? (
        <PanelError title="The bench queue could not be loaded" onRetry={() => void bench.refetch()} />
      ) : (
        <Table
          caption="Cases on the bench, soonest promise first"
          columns={columns}
          rows={bench.data}
          rowKey={(row) => row.id}
          empty={status ? 'No case at this stage.' : 'Nothing on the bench. Cases appear here once the shipping clerk checks their box in.'}
        />
      )}
    </div>
  );
}
