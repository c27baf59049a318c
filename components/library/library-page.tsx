import type { ReactNode } from 'react';
import { Card, EmptyState, PageHeader } from '@/components/ui/card';

const ASIDE_COLUMNS = {
  narrow: 'grid items-start gap-6 lg:grid-cols-[minmax(0,2fr)_minmax(18rem,1fr)]',
  wide: 'grid items-start gap-6 lg:grid-cols-[minmax(0,2fr)_minmax(20rem,1fr)]',
} as const;

/**
 * The shape every library page shares: a header, then the list on the left and, for those who may
 * write, the forms on the right. `aside` is left out (or null) for readers.
 */
export function LibraryPage({
  title,
  lead,
  above,
  aside,
  asideWidth = 'wide',
  children,
}: {
  title: string;
  lead: ReactNode;
  above?: ReactNode;
  aside?: ReactNode;
  asideWidth?: keyof typeof ASIDE_COLUMNS;
  children: ReactNode;
}) {
  return (
    <>
      <PageHeader title={title} lead={lead} />
      {above}
      <div className={aside ? ASIDE_COLUMNS[asideWidth] : ''}>
        <div className="min-w-0 space-y-6">{children}</div>
        {aside ? <div className="space-y-6">{aside}</div> : null}
      </div>
    </>
  );
}

/** "1 sounding", "3 soundings". */
export function countOf(n: number, one: string, many = `${one}s`): string {
  return `${n} ${n === 1 ? one : many}`;
}

export type ListColumn = { label: ReactNode; right?: boolean; className?: string };

/** A library list: the empty state when there is nothing, else a card holding a table with these columns. */
export function LibraryList({
  title,
  empty,
  emptyTitle,
  columns,
  count,
  children,
}: {
  title: ReactNode;
  emptyTitle: string;
  empty: ReactNode;
  columns: ListColumn[];
  count: number;
  children: ReactNode;
}) {
  if (count === 0) return <EmptyState title={emptyTitle}>{empty}</EmptyState>;
  return (
    <Card title={title}>
      <div className="overflow-x-auto">
        <table className="w-full text-sm">
          <thead className="text-left text-xs uppercase tracking-wide text-ink-soft">
            <tr>
              {columns.map((c, i) => (
                <th
                  key={i}
                  scope="col"
                  className={[
                    'py-2',
                    i < columns.length - 1 ? 'pr-3' : '',
                    c.right ? 'text-right' : '',
                    c.className ?? '',
                  ]
                    .filter(Boolean)
                    .join(' ')}
                >
                  {c.label}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>{children}</tbody>
        </table>
      </div>
    </Card>
  );
}
