import type { ReactNode } from 'react';

export type HeadColumn = string | { label: ReactNode; right?: boolean; className?: string };

/**
 * A table's header row: one `th scope="col"` a column, left-aligned unless `right`, padded with
 * `pad` and a right gap between columns (`gap`, left off the last one unless `gapOnLast`).
 */
export function TableHead({
  columns,
  pad = 'py-2',
  gap = 'pr-3',
  gapOnLast = false,
  className = 'text-left text-xs uppercase tracking-wide text-ink-soft',
  rowClassName,
  cellClassName,
}: {
  columns: readonly HeadColumn[];
  pad?: string;
  gap?: string;
  gapOnLast?: boolean;
  className?: string;
  /** Classes of the header row itself (a border under it, say). */
  rowClassName?: string;
  /** Classes every header cell carries after its alignment (a weight, say). */
  cellClassName?: string;
}) {
  return (
    <thead className={className || undefined}>
      <tr className={rowClassName}>
        {columns.map((c, i) => {
          const col = typeof c === 'string' ? { label: c } : c;
          const classes = [
            pad,
            gapOnLast || i < columns.length - 1 ? gap : '',
            col.right ? 'text-right' : '',
            cellClassName,
            col.className,
          ];
          return (
            <th key={i} scope="col" className={classes.filter(Boolean).join(' ')}>
              {col.label}
            </th>
          );
        })}
      </tr>
    </thead>
  );
}
