'use client';

import type { ReactNode } from 'react';
import { flexRender, type Header } from '@tanstack/react-table';

/**
 * A column header of a TanStack table: a button that toggles the column's sort, with `aria-sort`
 * and a ▲ / ▼ / ↕ mark; a column that cannot sort shows its plain header. `after` goes right after
 * the label (a footnote mark, say).
 */
export function SortableHeader<T>({
  header,
  className,
  after,
}: {
  header: Header<T, unknown>;
  className?: string;
  after?: ReactNode;
}) {
  const column = header.column;
  const sorted = column.getIsSorted();
  const label = flexRender(column.columnDef.header, header.getContext());
  const canSort = column.getCanSort();
  return (
    <th
      scope="col"
      className={className}
      aria-sort={sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : canSort ? 'none' : undefined}
    >
      {canSort ? (
        <button
          type="button"
          onClick={column.getToggleSortingHandler()}
          className="inline-flex items-center gap-1 uppercase hover:text-ink"
        >
          {label}
          {after}
          <span aria-hidden className="text-ink-faint">
            {sorted === 'asc' ? '▲' : sorted === 'desc' ? '▼' : '↕'}
          </span>
        </button>
      ) : (
        <>
          {label}
          {after}
        </>
      )}
    </th>
  );
}
