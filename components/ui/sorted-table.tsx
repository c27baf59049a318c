'use client';

import { flexRender, type Table } from '@tanstack/react-table';
import { ScrollRegion } from '@/components/ui/scroll-region';
import { SortableHeader } from '@/components/ui/sortable-header';

/**
 * A TanStack table drawn as a scrollable region: sortable headers, then the current rows with their
 * figures. `rowClass` adds to a row's top border (a highlight); `cellClass` is a cell's whole class.
 */
export function SortedTable<T>({
  table,
  label,
  testId,
  className,
  headerClass,
  rowClass,
  cellClass,
}: {
  table: Table<T>;
  label: string;
  testId: string;
  className: string;
  headerClass: string;
  rowClass: (row: T) => string;
  cellClass: (columnId: string) => string;
}) {
  return (
    <ScrollRegion label={label}>
      <table className={className} data-testid={testId}>
        <thead className="text-left text-xs uppercase tracking-wide text-ink-soft">
          {table.getHeaderGroups().map((hg) => (
            <tr key={hg.id}>
              {hg.headers.map((h) => (
                <SortableHeader key={h.id} header={h} className={headerClass} />
              ))}
            </tr>
          ))}
        </thead>
        <tbody className="figure">
          {table.getRowModel().rows.map((row) => (
            <tr key={row.id} className={`border-t border-line ${rowClass(row.original)}`}>
              {row.getVisibleCells().map((cell) => (
                <td key={cell.id} className={cellClass(cell.column.id)}>
                  {flexRender(cell.column.columnDef.cell, cell.getContext())}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </ScrollRegion>
  );
}
