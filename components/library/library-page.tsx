import type { ReactNode } from 'react';
import Link from 'next/link';
import { requireMember } from '@/lib/auth/guards';
import { can, type Permission } from '@/lib/auth/policy';
import { Card, EmptyState, PageHeader } from '@/components/ui/card';
import { TableHead, type HeadColumn } from '@/components/ui/table-head';

const ASIDE_COLUMNS = {
  narrow: 'grid items-start gap-6 lg:grid-cols-[minmax(0,2fr)_minmax(18rem,1fr)]',
  wide: 'grid items-start gap-6 lg:grid-cols-[minmax(0,2fr)_minmax(20rem,1fr)]',
} as const;

/**
 * The member reading a library page (with `permission`, else not found) and whether they may write to
 * the library. The page names its permission, so the landing table's check can read it there.
 */
export async function libraryMember(params: Promise<{ slug: string }>, permission: Permission) {
  const { slug } = await params;
  const member = await requireMember(slug, permission);
  return { slug, ...member, canWrite: can(member.role, 'library:write') };
}

/** A form in a library page's side column, in a card with its title. */
export interface LibraryForm {
  title: string;
  body: ReactNode;
}

/**
 * The shape every library page shares: a header, then the list on the left and, for those who may
 * write, the forms on the right, each in a card with its title. Readers get no side column.
 */
export function LibraryPage({
  title,
  lead,
  above,
  forms,
  canWrite = false,
  asideWidth = 'wide',
  children,
}: {
  title: string;
  lead: ReactNode;
  above?: ReactNode;
  forms?: readonly LibraryForm[];
  canWrite?: boolean;
  asideWidth?: keyof typeof ASIDE_COLUMNS;
  children: ReactNode;
}) {
  const side =
    canWrite && forms?.length
      ? forms.map((f) => (
          <Card key={f.title} title={f.title}>
            {f.body}
          </Card>
        ))
      : null;
  return (
    <>
      <PageHeader title={title} lead={lead} />
      {above}
      <div className={side ? ASIDE_COLUMNS[asideWidth] : ''}>
        <div className="min-w-0 space-y-6">{children}</div>
        {side ? <div className="space-y-6">{side}</div> : null}
      </div>
    </>
  );
}

/** "1 sounding", "3 soundings". */
export function countOf(n: number, one: string, many = `${one}s`): string {
  return `${n} ${n === 1 ? one : many}`;
}

export type ListColumn = HeadColumn;

/** What an empty list says: a title, and a sentence for those who may add to it and one for readers. */
export interface LibraryEmpty {
  title: string;
  writers: ReactNode;
  readers: ReactNode;
}

/**
 * A library list: the empty state when there is nothing, else a card holding a table with these
 * columns, titled `title` or else by the count of `noun` ("3 soundings").
 */
export function LibraryList({
  title,
  noun,
  empty,
  canWrite,
  columns,
  count,
  children,
}: {
  title?: ReactNode;
  noun?: string;
  empty: LibraryEmpty;
  canWrite: boolean;
  columns: readonly ListColumn[];
  count: number;
  children: ReactNode;
}) {
  if (count === 0) return <EmptyState title={empty.title}>{canWrite ? empty.writers : empty.readers}</EmptyState>;
  return (
    <Card title={title ?? countOf(count, noun ?? 'item')}>
      <div className="overflow-x-auto">
        <table className="w-full text-sm">
          <TableHead columns={columns} />
          <tbody>{children}</tbody>
        </table>
      </div>
    </Card>
  );
}

/** A list row's first cell: the item's name linking to its page, then what goes under it. */
export function NameCell({ href, name, children }: { href: string; name: string; children?: ReactNode }) {
  return (
    <td className="py-2 pr-3">
      <Link href={href} className="font-medium text-accent hover:underline">
        {name}
      </Link>
      {children}
    </td>
  );
}
