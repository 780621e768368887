import type { ReactNode } from 'react';
import { cn } from '@/lib/cn';

export interface TableColumn<Row> {
  header: ReactNode;
  cell: (row: Row) => ReactNode;
  /** Extra classes for this column's cells, e.g. "text-right tabular-nums". */
  className?: string;
  /** For a sortable column: how the rows are sorted by it now (put a sort button in `header`). */
  sort?: 'ascending' | 'descending' | 'none';
}

export interface TableProps<Row> {
  /** Names the table for screen readers; shown unless `captionHidden`. */
  caption: string;
  captionHidden?: boolean;
  columns: readonly TableColumn<Row>[];
  rows: readonly Row[];
  rowKey: (row: Row) => string;
  /** What to say when there are no rows, in words that tell the person what to do next. */
  empty: ReactNode;
}

export function Table<Row>({ caption, captionHidden = true, columns, rows, rowKey, empty }: TableProps<Row>) {
  if (rows.length === 0) {
    return <div className="rounded-panel border border-dashed border-ink-line bg-paper px-5 py-8 text-center text-sm text-ink-muted">{empty}</div>;
  }
  return (
    // A table wider than the screen scrolls sideways; keyboard users reach that scroll by focusing it.
    <div role="region" aria-label={caption} tabIndex={0} className="overflow-x-auto rounded-panel border border-ink-hairline bg-paper-raised">
      <table className="w-full border-collapse text-left text-sm">
        <caption className={captionHidden ? 'sr-only' : 'px-4 py-3 text-left font-semibold text-ink-strong'}>{caption}</caption>
        <thead className="bg-paper-sunken/60">
          <tr>
            {columns.map((column, index) => (
              <th key={index} scope="col" aria-sort={column.sort} className={cn('px-4 py-2.5 text-xs font-semibold tracking-wide text-ink-muted uppercase', column.className)}>
                {column.header}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {rows.map((row) => (
            <tr key={rowKey(row)} className="border-t border-ink-hairline hover:bg-paper/70">
              {columns.map((column, index) => (
                <td key={index} className={cn('px-4 py-3 align-top text-ink', column.className)}>
                  {column.cell(row)}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
