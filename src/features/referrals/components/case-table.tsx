import { useState, type ReactNode } from 'react';
import { useSearchParams } from 'react-router';
import type { ReferralSummaryDto } from '@shared/schemas/referrals';
import { caseStatuses, caseStatusLabels, mediaTypeLabels, type CaseStatus } from '@shared/vocabulary';
import { PanelError } from '@/components/errors/error-panel';
import { Button } from '@/components/ui/button';
import { Input } from '@/components/ui/input';
import { TextLink } from '@/components/ui/link';
import { Select } from '@/components/ui/select';
import { Spinner } from '@/components/ui/spinner';
import { Table, type TableColumn } from '@/components/ui/table';
import { paths } from '@/config/paths';
import { formatDateTime } from '@/lib/format';
import { useReferrals, type ReferralListQuery } from '../api/get-referrals';
import { CaseStatusBadge } from './case-status-badge';

export const CASES_PAGE_SIZE = 25;

type SortKey = 'updated' | 'reference' | 'customer' | 'status';
type SortState = { key: SortKey; direction: 'ascending' | 'descending' };

const statusOrder = new Map(caseStatuses.map((status, index) => [status, index]));
const compare: Record<SortKey, (a: ReferralSummaryDto, b: ReferralSummaryDto) => number> = {
  updated: (a, b) => a.updatedAt.localeCompare(b.updatedAt),
  reference: (a, b) => a.reference.localeCompare(b.reference),
  customer: (a, b) => a.customer.name.localeCompare(b.customer.name, 'en-US', { sensitivity: 'base' }),
  status: (a, b) => (statusOrder.get(a.status) ?? 0) - (statusOrder.get(b.status) ?? 0),
};

function sortRows(rows: readonly ReferralSummaryDto[], sort: SortState): ReferralSummaryDto[] {
  const sign = sort.direction === 'ascending' ? 1 : -1;
  return [...rows].sort((a, b) => sign * compare[sort.key](a, b));
}

/** Reads the table's filters from the address, so a filtered list can be bookmarked or shared. */
export function casesQueryFrom(search: URLSearchParams): ReferralListQuery {
  const status = search.get('status');
  const q = search.get('q')?.trim();
  return {
    status: status && (caseStatuses as readonly string[]).includes(status) ? (status as CaseStatus) : undefined,
    q: q || undefined,
    limit: CASES_PAGE_SIZE,
  };
}

function SortButton({ label, sortKey, sort, onSort }: { label: string; sortKey: SortKey; sort: SortState; onSort: (key: SortKey) => void }) {
  const active = sort.key === sortKey;
  return (
    <button type="button" onClick={() => onSort(sortKey)} className="focus-ring inline-flex items-center gap-1 rounded-sm uppercase hover:text-ink-strong">
      {label}
      <span aria-hidden="true" className={active ? 'text-spruce-700' : 'text-ink-faint'}>
        {active ? (sort.direction === 'ascending' ? '▲' : '▼') : '↕'}
      </span>
    </button>
  );
}

function columns(sort: SortState, onSort: (key: SortKey) => void): TableColumn<ReferralSummaryDto>[] {
  const header = (label: string, key: SortKey): { header: ReactNode; sort: TableColumn<ReferralSummaryDto>['sort'] } => ({
    header: <SortButton label={label} sortKey={key} sort={sort} onSort={onSort} />,
    sort: sort.key === key ? sort.direction : 'none',
  });
  return [
    {
      ...header('Case', 'reference'),
      cell: (row) => (
        <>
          <TextLink to={paths.partner.case.getHref(row.id)} className="font-mono whitespace-nowrap">
            {row.reference}
          </TextLink>
          {row.externalRef ? <span className="block text-xs text-ink-muted">Your ticket {row.externalRef}</span> : null}
        </>
      ),
    },
    { ...header('Customer', 'customer'), cell: (row) => <span className="font-semibold text-ink-strong">{row.customer.name}</span> },
    { header: 'Device', cell: (row) => mediaTypeLabels[row.mediaType] },
    { ...header('Status', 'status'), cell: (row) => <CaseStatusBadge status={row.status} /> },
    { header: 'Lab', cell: (row) => row.lab?.name ?? <span className="text-ink-muted">Not yet</span> },
    { ...header('Last change', 'updated'), cell: (row) => formatDateTime(row.updatedAt), className: 'whitespace-nowrap' },
  ];
}

/** The shop's cases: filter by status, search, sort the page shown, and page on with the cursor. */
export function CaseTable() {
  const [search, setSearch] = useSearchParams();
  const base = casesQueryFrom(search);
  // The cursors of the pages before this one; the first page has none.
  const [cursors, setCursors] = useState<(string | undefined)[]>([undefined]);
  const cursor = cursors[cursors.length - 1];
  const [sort, setSort] = useState<SortState>({ key: 'updated', direction: 'descending' });
  const list = useReferrals({ ...base, cursor });
  const [draft, setDraft] = useState(base.q ?? '');

  const setFilter = (name: 'status' | 'q', value: string | undefined) => {
    const next = new URLSearchParams(search);
    if (value) next.set(name, value);
    else next.delete(name);
    setSearch(next, { replace: true });
    setCursors([undefined]);
  };

  const onSort = (key: SortKey) =>
    setSort((current) =>
      current.key === key
        ? { key, direction: current.direction === 'ascending' ? 'descending' : 'ascending' }
        : { key, direction: key === 'updated' ? 'descending' : 'ascending' },
    );

  const filtered = Boolean(base.status || base.q);
  const page = cursors.length;

  return (
    <div className="flex flex-col gap-4">
      <div className="flex flex-wrap items-end gap-3">
        <Select
          label="Status"
          className="w-60"
          value={base.status ?? ''}
          onChange={(event) => setFilter('status', event.target.value || undefined)}
          placeholder="All statuses"
          options={caseStatuses.map((status) => ({ value: status, label: caseStatusLabels[status] }))}
        />
        <form
          role="search"
          aria-label="Search cases"
          className="flex flex-1 flex-wrap items-end gap-2"
          onSubmit={(event) => {
            event.preventDefault();
            setFilter('q', draft.trim() || undefined);
          }}
        >
          <Input
            label="Search"
            type="search"
            className="min-w-60 flex-1"
            hint="Case reference, your ticket number, or the customer’s name or e-mail"
            value={draft}
            onChange={(event) => setDraft(event.target.value)}
          />
          <Button type="submit" variant="secondary">
            Search
          </Button>
          {filtered ? (
            <Button
              variant="ghost"
              onClick={() => {
                setDraft('');
                setSearch(new URLSearchParams(), { replace: true });
                setCursors([undefined]);
              }}
            >
              Show all cases
            </Button>
          ) : null}
        </form>
      </div>

      {list.isPending ? (
        <Spinner label="Loading cases" />
      ) : list.isError && !list.data ? (
        <PanelError title="Your cases could not be loaded" onRetry={() => void list.refetch()} />
      ) : (
        <>
          <div aria-busy={list.isPlaceholderData || undefined}>
            <Table
              caption={filtered ? 'Cases matching your filters' : 'Your shop’s cases'}
              columns={columns(sort, onSort)}
              rows={sortRows(list.data.data, sort)}
              rowKey={(row) => row.id}
              empty={
                filtered
                  ? 'No case matches. Check the reference, or show all cases.'
                  : 'No cases yet. Open a referral when a customer brings in a device whose data needs a lab.'
              }
            />
          </div>
          <nav aria-label="Pages of cases" className="flex flex-wrap items-center justify-between gap-3 text-sm text-ink-muted">
            <p>
              Page {page}
              {sort.key !== 'updated' || sort.direction !== 'descending' ? ' · sorting applies to the cases on this page' : ' · newest change first'}
            </p>
            <div className="flex gap-2">
              <Button variant="secondary" size="sm" disabled={page === 1} onClick={() => setCursors((c) => c.slice(0, -1))}>
                Previous page
              </Button>
              <Button
                variant="secondary"
                size="sm"
                disabled={!list.data.nextCursor || list.isPlaceholderData}
                onClick={() => setCursors((c) => [...c, list.data.nextCursor ?? undefined])}
              >
                Next page
              </Button>
            </div>
          </nav>
        </>
      )}
    </div>
  );
}
