'use client';

import { useMemo, useState } from 'react';
import Link from 'next/link';
import { usePathname, useRouter, useSearchParams } from 'next/navigation';
import {
  createColumnHelper,
  getCoreRowModel,
  getSortedRowModel,
  useReactTable,
  type SortingState,
} from '@tanstack/react-table';
import type { UnitSystem } from '@/lib/units';
import { formatDate, formatDateTime, formatDistance, formatMass, formatPercent } from '@/lib/format';
import { ButtonLink } from '@/components/ui/button';
import { SortedTable } from '@/components/ui/sorted-table';

export interface HistoryRow {
  id: number;
  name: string;
  createdAt: string;
  routeLabel: string;
  aircraftCode: string | null;
  flightLevel: number | null;
  flightDate: string | null;
  distanceKm: number;
  noxAboveTropopauseKg: number;
  fractionAboveTropopause: number;
  ozoneCentralKg: number;
  /** Set when the figures were made with an engine version older than the current one. */
  olderEngineVersion?: string | null;
}

const SORTABLE = [
  'name',
  'createdAt',
  'routeLabel',
  'flightLevel',
  'distanceKm',
  'noxAboveTropopauseKg',
  'fractionAboveTropopause',
  'ozoneCentralKg',
];
const col = createColumnHelper<HistoryRow>();

/**
 * Saved screenings of one page of results: sortable (the order in the URL as `sort=`), with two
 * picked for a side-by-side comparison.
 */
export function HistoryTable({ slug, rows, units }: { slug: string; rows: HistoryRow[]; units: UnitSystem }) {
  const router = useRouter();
  const pathname = usePathname();
  const params = useSearchParams();
  const [picked, setPicked] = useState<number[]>([]);
  const sortParam = params.get('sort') ?? '';
  // One array per URL value: a fresh array each render would make the table recompute and reset on every render.
  const sorting: SortingState = useMemo(() => {
    const [id, dir] = sortParam.split('.');
    return SORTABLE.includes(id) ? [{ id, desc: dir === 'desc' }] : [];
  }, [sortParam]);

  const toggle = (rowId: number) =>
    setPicked((p) =>
      p.includes(rowId) ? p.filter((x) => x !== rowId) : p.length >= 2 ? [p[1], rowId] : [...p, rowId],
    );

  const columns = useMemo(
    () => [
      col.display({
        id: 'pick',
        header: () => <span className="sr-only">Pick to compare</span>,
        cell: (c) => (
          <input
            type="checkbox"
            className="h-4 w-4 accent-accent"
            aria-label={`Pick ${c.row.original.name} to compare`}
            checked={picked.includes(c.row.original.id)}
            onChange={() => toggle(c.row.original.id)}
          />
        ),
      }),
      col.accessor('name', {
        header: 'Screening',
        cell: (c) => (
          <>
            <Link
              href={`/w/${slug}/screenings/${c.row.original.id}`}
              className="font-medium text-accent hover:underline"
            >
              {c.getValue()}
            </Link>
            {c.row.original.olderEngineVersion ? (
              <span
                className="ml-2 rounded border border-caution/40 bg-caution-soft px-1.5 py-0.5 text-xs text-ink"
                data-testid="older-engine-version"
              >
                engine {c.row.original.olderEngineVersion} (older)
              </span>
            ) : null}
          </>
        ),
      }),
      col.accessor('routeLabel', { header: 'Route' }),
      col.accessor('flightLevel', {
        header: 'Aircraft, cruise',
        cell: (c) => `${c.row.original.aircraftCode ?? '–'} · ${c.getValue() === null ? '–' : `FL${c.getValue()}`}`,
      }),
      col.accessor('flightDate', {
        header: 'Flight date',
        cell: (c) => formatDate(c.getValue()),
        enableSorting: false,
      }),
      col.accessor('distanceKm', { header: 'Distance', cell: (c) => formatDistance(c.getValue(), units) }),
      col.accessor('noxAboveTropopauseKg', { header: 'NOx above', cell: (c) => formatMass(c.getValue(), units) }),
      col.accessor('fractionAboveTropopause', { header: 'Share above', cell: (c) => formatPercent(c.getValue(), 1) }),
      col.accessor('ozoneCentralKg', { header: 'Ozone figure', cell: (c) => formatMass(c.getValue(), units) }),
      col.accessor('createdAt', {
        header: 'Saved',
        cell: (c) => (
          <time dateTime={c.getValue()} title={formatDateTime(c.getValue())}>
            {formatDate(c.getValue())}
          </time>
        ),
      }),
    ],
    [picked, slug, units],
  );

  const table = useReactTable({
    data: rows,
    columns,
    state: { sorting },
    onSortingChange: (updater) => {
      const next = typeof updater === 'function' ? updater(sorting) : updater;
      const q = new URLSearchParams(params.toString());
      if (next.length) q.set('sort', `${next[0].id}.${next[0].desc ? 'desc' : 'asc'}`);
      else q.delete('sort');
      router.replace(`${pathname}?${q.toString()}`, { scroll: false });
    },
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getRowId: (r) => String(r.id),
    autoResetPageIndex: false,
  });

  return (
    <div>
      <div className="mb-3 flex flex-wrap items-center justify-between gap-3 text-sm">
        <p className="text-ink-soft" aria-live="polite">
          {picked.length === 2
            ? 'Two screenings picked.'
            : picked.length === 1
              ? 'Pick one more to compare.'
              : 'Pick two screenings to compare them side by side.'}
        </p>
        {picked.length === 2 ? (
          <ButtonLink href={`/w/${slug}/screenings/compare?a=${picked[0]}&b=${picked[1]}`} variant="secondary">
            Compare the two picked
          </ButtonLink>
        ) : (
          <span className="rounded-md border border-line px-3.5 py-2 text-sm text-ink-faint" aria-disabled="true">
            Compare the two picked
          </span>
        )}
      </div>
      <SortedTable
        table={table}
        label="Saved screenings"
        testId="history-table"
        className="w-full min-w-[840px] text-sm"
        headerClass="whitespace-nowrap py-2 pr-3"
        rowClass={(r) => (picked.includes(r.id) ? 'bg-accent-soft' : '')}
        cellClass={(id) => `py-2 pr-3 align-top ${id === 'name' ? 'min-w-[12rem]' : 'whitespace-nowrap'}`}
      />
    </div>
  );
}
