import { useState, type FormEvent } from 'react';
import { useSearchParams } from 'react-router';
import { auditFamilyLabels, type AuditEventDto } from '@shared/schemas/audit';
import { PanelError } from '@/components/errors/error-panel';
import { Button } from '@/components/ui/button';
import { Input } from '@/components/ui/input';
import { Select, type SelectOption } from '@/components/ui/select';
import { Spinner } from '@/components/ui/spinner';
import { Table, type TableColumn } from '@/components/ui/table';
import { formatDateTime } from '@/lib/format';
import type { AuditFilters } from '@/lib/query-keys';
import { useAuditEvents } from '../api/get-audit-events';
import { useAuditFacets } from '../api/get-audit-facets';

export const AUDIT_PAGE_SIZE = 50;
const DATE = /^\d{4}-\d{2}-\d{2}$/;

/** A calendar day in the admin's own time zone, as the instant it starts. */
function startOfLocalDay(date: string, plusDays = 0): string {
  const [y, m, d] = date.split('-').map(Number);
  return new Date(y!, m! - 1, d! + plusDays).toISOString();
}

/** The filters as the address holds them (bookmarkable), and as the API takes them. */
export function auditQueryFrom(search: URLSearchParams): AuditFilters {
  const from = search.get('from');
  const to = search.get('to');
  return {
    action: search.get('action') || undefined,
    actor: search.get('actor')?.trim() || undefined,
    organization: search.get('organization') || undefined,
    // "To" includes its whole day: the range ends where the next day starts.
    from: from && DATE.test(from) ? startOfLocalDay(from) : undefined,
    to: to && DATE.test(to) ? startOfLocalDay(to, 1) : undefined,
    limit: String(AUDIT_PAGE_SIZE),
  };
}

const familyOf = (action: string) => action.split('.')[0] ?? action;

function detailsText(details: Record<string, unknown>): string {
  const text = Object.entries(details)
    .map(([k, v]) => `${k}: ${typeof v === 'string' ? v : JSON.stringify(v)}`)
    .join(' · ');
  return text.length > 160 ? `${text.slice(0, 157)}…` : text;
}

const columns: TableColumn<AuditEventDto>[] = [
  { header: 'When', cell: (e) => <time dateTime={e.at}>{formatDateTime(e.at)}</time>, className: 'whitespace-nowrap' },
  {
    header: 'Action',
    cell: (e) => (
      <>
        <code className="font-mono text-xs text-ink-strong">{e.action}</code>
        <span className="block text-xs text-ink-muted">{auditFamilyLabels[familyOf(e.action)] ?? familyOf(e.action)}</span>
      </>
    ),
  },
  {
    header: 'Who',
    cell: (e) =>
      e.actor ? (
        <>
          <span className="font-semibold text-ink-strong">{e.actor.name}</span>
          <span className="block text-xs break-all text-ink-muted">{e.actor.email}</span>
        </>
      ) : (
        <span className="text-ink-muted">System or unknown</span>
      ),
  },
  { header: 'Organisation', cell: (e) => (e.organization ? e.organization.name : <span className="text-ink-muted">—</span>) },
  {
    header: 'Details',
    cell: (e) => (
      <span className="text-xs text-ink">
        {e.target ? (
          <span className="block text-ink-muted">
            {e.target.type} {e.target.id}
          </span>
        ) : null}
        {detailsText(e.details)}
        {e.ip ? <span className="block text-ink-faint">from {e.ip}</span> : null}
      </span>
    ),
  },
];

function actionOptions(actions: { action: string; count: number }[]): SelectOption[] {
  const families = [...new Set(actions.map((a) => familyOf(a.action)))];
  return families.flatMap((family) => [
    { value: family, label: `${auditFamilyLabels[family] ?? family}: all` },
    ...actions.filter((a) => familyOf(a.action) === family).map((a) => ({ value: a.action, label: `  ${a.action} (${a.count})` })),
  ]);
}

/** The network's audit log: security and money actions, filterable, newest first, paged by cursor. */
export function AuditLog() {
  const [search, setSearch] = useSearchParams();
  const base = auditQueryFrom(search);
  const [cursors, setCursors] = useState<(string | undefined)[]>([undefined]);
  const cursor = cursors[cursors.length - 1];
  const list = useAuditEvents({ ...base, cursor });
  const facets = useAuditFacets();
  const [actor, setActor] = useState(search.get('actor') ?? '');

  const set = (changes: Record<string, string | undefined>) => {
    const next = new URLSearchParams(search);
    for (const [name, value] of Object.entries(changes)) {
      if (value) next.set(name, value);
      else next.delete(name);
    }
    setSearch(next, { replace: true });
    setCursors([undefined]);
  };
  const applyActor = (event: FormEvent) => {
    event.preventDefault();
    set({ actor: actor.trim() || undefined });
  };

  return (
    <div className="flex flex-col gap-4">
      <div className="flex flex-wrap items-end gap-3">
        <Select
          label="Action"
          className="w-72"
          placeholder="All actions"
          value={search.get('action') ?? ''}
          onChange={(e) => set({ action: e.target.value || undefined })}
          options={facets.data ? actionOptions(facets.data.actions) : []}
        />
        <Select
          label="Organisation"
          className="w-64"
          placeholder="All organisations"
          value={search.get('organization') ?? ''}
          onChange={(e) => set({ organization: e.target.value || undefined })}
          options={(facets.data?.organizations ?? []).map((o) => ({ value: o.id, label: `${o.name} (${o.kind})` }))}
        />
        <Input label="From" type="date" className="w-44" value={search.get('from') ?? ''} onChange={(e) => set({ from: e.target.value || undefined })} />
        <Input label="To" type="date" className="w-44" value={search.get('to') ?? ''} onChange={(e) => set({ to: e.target.value || undefined })} />
        <form role="search" aria-label="Search by person" className="flex items-end gap-2" onSubmit={applyActor}>
          <Input label="Person" type="search" className="w-60" hint="Name or e-mail" value={actor} onChange={(e) => setActor(e.target.value)} />
          <Button type="submit" variant="secondary">
            Search
          </Button>
        </form>
      </div>

      {list.isPending ? (
        <Spinner label="Loading the audit log" />
      ) : list.isError ? (
        <PanelError title="The audit log could not be loaded" onRetry={() => void list.refetch()}>
          {list.error.message}
        </PanelError>
      ) : (
        <>
          <Table
            caption="Audit log"
            columns={columns}
            rows={list.data.data}
            rowKey={(e) => e.id}
            empty="No entries match these filters. Widen the date range or clear a filter."
          />
          <div className="flex items-center justify-between gap-3">
            <Button variant="secondary" size="sm" disabled={cursors.length === 1} onClick={() => setCursors((c) => c.slice(0, -1))}>
              Newer entries
            </Button>
            <span className="text-sm text-ink-muted" aria-live="polite">
              Page {cursors.length}
              {list.isFetching ? ' · updating…' : ''}
            </span>
            <Button variant="secondary" size="sm" disabled={!list.data.nextCursor} onClick={() => setCursors((c) => [...c, list.data.nextCursor ?? undefined])}>
              Older entries
            </Button>
          </div>
        </>
      )}
    </div>
  );
}
