import type { ReactNode } from 'react';
import { Card, EmptyState, PageHeader } from '@/components/ui/card';
import { TableHead, type HeadColumn } from '@/components/ui/table-head';

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

export type ListColumn = HeadColumn;

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
  columns: readonly ListColumn[];
  count: number;
  children: ReactNode;
}) {
  if (count === 0) return <EmptyState title={emptyTitle}>{empty}</EmptyState>;
  return (
    <Card title={title}>
      <div className="overflow-x-auto">
        <table className="w-full text-sm">
          <TableHead columns={columns} />
          <tbody>{children}</tbody>
        </table>
      </div>
    </Card>
  );
}
