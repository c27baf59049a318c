'use client';

import { useMemo } from 'react';
import { usePathname, useRouter, useSearchParams } from 'next/navigation';
import {
  createColumnHelper,
  getCoreRowModel,
  getPaginationRowModel,
  getSortedRowModel,
  useReactTable,
  type SortingState,
} from '@tanstack/react-table';
import type { ScreeningSegment } from '@/lib/screening';
import type { UnitSystem } from '@/lib/units';
import { formatAltitude, formatDistance, formatMass, formatNumber } from '@/lib/format';
import { Button } from '@/components/ui/button';
import { SortedTable } from '@/components/ui/sorted-table';

export const SEGMENT_PAGE_SIZE = 25;
const SORTABLE = [
  'index',
  'startKm',
  'flightLevel',
  'tropopauseM',
  'depthAboveTropopauseKm',
  'fuelKg',
  'noxKg',
  'ozoneLossKg',
] as const;

type Row = ScreeningSegment & { index: number };

/** What the tropopause column holds, for a practitioner who would read it as a geometric height. */
export const TROPOPAUSE_HEADER_TITLE =
  'The tropopause as an ISA pressure altitude, the scale flight levels use (not a height above sea level), with its pressure in hPa';

const col = createColumnHelper<Row>();

/** `seg_sort=noxKg.desc` and `seg_page=2` from the URL; anything unknown falls back to route order. */
export function readSegmentTableState(
  params: URLSearchParams,
  rowCount: number,
): { sorting: SortingState; pageIndex: number } {
  const [id, dir] = (params.get('seg_sort') ?? '').split('.');
  const sorting: SortingState = (SORTABLE as readonly string[]).includes(id) ? [{ id, desc: dir === 'desc' }] : [];
  const pages = Math.max(1, Math.ceil(rowCount / SEGMENT_PAGE_SIZE));
  const page = Number(params.get('seg_page') ?? '1');
  const pageIndex = Number.isInteger(page) && page >= 1 && page <= pages ? page - 1 : 0;
  return { sorting, pageIndex };
}

/** Every segment of the screening: sortable, paged, with the state in the URL so a link reopens the same view. */
export function SegmentTable({ segments, units }: { segments: readonly ScreeningSegment[]; units: UnitSystem }) {
  const router = useRouter();
  const pathname = usePathname();
  const params = useSearchParams();
  const data = useMemo(() => segments.map((s, index) => ({ ...s, index: index + 1 })), [segments]);
  const query = params.toString();
  // One state object per URL value: fresh objects each render would make the table recompute on every render.
  const { sorting, pageIndex } = useMemo(
    () => readSegmentTableState(new URLSearchParams(query), data.length),
    [query, data.length],
  );
  const pagination = useMemo(() => ({ pageIndex, pageSize: SEGMENT_PAGE_SIZE }), [pageIndex]);

  const push = (next: { sorting?: SortingState; pageIndex?: number }) => {
    const q = new URLSearchParams(params.toString());
    const s = next.sorting ?? sorting;
    if (s.length) q.set('seg_sort', `${s[0].id}.${s[0].desc ? 'desc' : 'asc'}`);
    else q.delete('seg_sort');
    const p = next.pageIndex ?? pageIndex;
    if (p > 0) q.set('seg_page', String(p + 1));
    else q.delete('seg_page');
    const qs = q.toString();
    router.replace(`${pathname}${qs ? `?${qs}` : ''}`, { scroll: false });
  };

  const columns = useMemo(
    () => [
      col.accessor('index', { header: '#', cell: (c) => c.getValue() }),
      col.accessor('startKm', {
        header: 'Along route',
        cell: (c) =>
          `${formatDistance(c.row.original.startKm, units)} – ${formatDistance(c.row.original.endKm, units)}`,
      }),
      col.accessor('flightLevel', { header: 'Flight level', cell: (c) => `FL${c.getValue()}` }),
      col.accessor('tropopauseM', {
        // A pressure altitude (ISA), comparable with the flight level, not a geometric height.
        header: () => <span title={TROPOPAUSE_HEADER_TITLE}>Tropopause (pressure alt.)</span>,
        cell: (c) =>
          `${formatAltitude(c.getValue(), units)} · ${formatNumber(c.row.original.tropopausePressureHpa, 0)} hPa`,
      }),
      col.accessor('depthAboveTropopauseKm', {
        header: 'Above / below',
        cell: (c) =>
          c.row.original.aboveTropopause ? (
            <span className="font-medium text-strato-strong">
              above by {formatAltitude(c.getValue() * 1000, units)}
            </span>
          ) : (
            <span className="text-tropo-strong">below</span>
          ),
      }),
      col.accessor('fuelKg', { header: 'Fuel', cell: (c) => formatMass(c.getValue(), units) }),
      col.accessor('noxKg', { header: 'NOx (as NO2)', cell: (c) => formatMass(c.getValue(), units) }),
      col.accessor('ozoneLossKg', { header: 'Ozone-loss figure', cell: (c) => formatMass(c.getValue(), units) }),
      col.display({
        id: 'position',
        header: 'Midpoint',
        cell: (c) => `${formatNumber(c.row.original.lat, 1)}°, ${formatNumber(c.row.original.lon, 1)}°`,
      }),
    ],
    [units],
  );

  const table = useReactTable({
    data,
    columns,
    state: { sorting, pagination },
    onSortingChange: (updater) =>
      push({ sorting: typeof updater === 'function' ? updater(sorting) : updater, pageIndex: 0 }),
    onPaginationChange: (updater) => {
      const next = typeof updater === 'function' ? updater({ pageIndex, pageSize: SEGMENT_PAGE_SIZE }) : updater;
      push({ pageIndex: next.pageIndex });
    },
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getPaginationRowModel: getPaginationRowModel(),
    enableSortingRemoval: true,
    manualPagination: false,
    autoResetPageIndex: false,
  });

  const first = pageIndex * SEGMENT_PAGE_SIZE + 1;
  const last = Math.min(data.length, first + SEGMENT_PAGE_SIZE - 1);
  return (
    <div>
      <SortedTable
        table={table}
        label="Segments of the route"
        testId="segment-table"
        className="w-full min-w-[760px] text-sm"
        headerClass="whitespace-nowrap py-2 pr-2.5"
        rowClass={(r) => (r.aboveTropopause ? 'bg-strato-soft/40' : '')}
        cellClass={() => 'whitespace-nowrap py-1.5 pr-2.5'}
      />
      <div className="mt-3 flex flex-wrap items-center justify-between gap-3 text-sm">
        <p className="text-ink-soft">
          Segments {first}–{last} of {data.length} (at most 50 km each)
        </p>
        <div className="flex items-center gap-2">
          <Button variant="secondary" onClick={() => table.previousPage()} disabled={!table.getCanPreviousPage()}>
            Previous
          </Button>
          <span className="text-ink-soft">
            Page {pageIndex + 1} of {table.getPageCount()}
          </span>
          <Button variant="secondary" onClick={() => table.nextPage()} disabled={!table.getCanNextPage()}>
            Next
          </Button>
        </div>
      </div>
    </div>
  );
}
