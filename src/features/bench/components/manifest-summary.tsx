import type { ManifestCategoryDto, ManifestDto } from '@shared/schemas/lab-work';
import { fileStateLabels } from '@shared/schemas/lab-work';
import { formatBytes } from '@shared/domain/imaging';
import { priorityCategoryLabels } from '@shared/vocabulary';
import { Badge } from '@/components/ui/badge';
import { Table, type TableColumn } from '@/components/ui/table';

type Category = Omit<ManifestCategoryDto, 'examples'> & { examples?: ManifestCategoryDto['examples'] };

const count = (n: number) => n.toLocaleString('en-US');

const columns = (withExamples: boolean): TableColumn<Category>[] => [
  {
    header: 'Kind of file',
    cell: (c) => (
      <>
        <span className="block font-semibold text-ink-strong">{priorityCategoryLabels[c.category]}</span>
        {c.priority !== null ? <span className="block text-xs text-copper-600">Priority {c.priority + 1}{c.note ? `: ${c.note}` : ''}</span> : null}
        {withExamples && c.examples?.length ? (
          <ul className="mt-1 flex flex-col text-xs text-ink-muted">
            {c.examples.map((e) => (
              <li key={e.path} className="truncate font-mono" title={e.path}>
                {e.path} <span className="font-sans">({fileStateLabels[e.state].toLowerCase()})</span>
              </li>
            ))}
          </ul>
        ) : null}
      </>
    ),
  },
  { header: 'Files', cell: (c) => (c.files === 0 ? <Badge tone="warning">None found</Badge> : count(c.files)), className: 'tabular-nums' },
  { header: 'Intact', cell: (c) => count(c.intact), className: 'tabular-nums' },
  { header: 'Partly readable', cell: (c) => count(c.partial), className: 'tabular-nums' },
  { header: 'Unreadable', cell: (c) => count(c.unreadable), className: 'tabular-nums' },
  { header: 'Size', cell: (c) => formatBytes(c.bytes), className: 'tabular-nums whitespace-nowrap' },
];

/** The recovered files per kind, the customer's priorities first: how many came back, and in what state. */
export function ManifestSummary({ manifest, withExamples = false }: { manifest: Omit<ManifestDto, 'categories'> & { categories: Category[] }; withExamples?: boolean }) {
  return (
    <div className="flex flex-col gap-3">
      <p className="text-sm text-ink">
        {count(manifest.fileCount)} {manifest.fileCount === 1 ? 'file' : 'files'}, {formatBytes(manifest.totalBytes)} in all
        {manifest.version > 1 ? ` · list version ${manifest.version}` : ''}
      </p>
      <Table caption="Recovered files by kind" columns={columns(withExamples)} rows={manifest.categories} rowKey={(c) => c.category} empty="The list holds no files." />
    </div>
  );
}
