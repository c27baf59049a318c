'use client';

import { useMemo, useState, type FormEvent, type ReactNode } from 'react';
import Link from 'next/link';
import { usePathname, useSearchParams } from 'next/navigation';
import { keepPreviousData, useQuery } from '@tanstack/react-query';
import {
  getCoreRowModel,
  getSortedRowModel,
  useReactTable,
  type ColumnDef,
  type SortingState,
  type Table,
  type VisibilityState,
} from '@tanstack/react-table';
import type { UnitSystem } from '@/db/users';
import type { CompareRow, FleetComparison as Comparison } from '@/lib/fleets/types';
import { compareQueryObject, compareQueryString } from '@/lib/fleets/url';
import { engineVersionsText, monthLabel } from '@/lib/fleets/units';
import { FLIGHT_BASES, fleetCompareQuerySchema, GROUP_BY, type GroupBy } from '@/lib/validation/fleets';
import { formatDistance, formatMass, formatMassRange, formatNumber, formatPercent } from '@/lib/format';
import { Button, ButtonLink } from '@/components/ui/button';
import { Field, SelectInput, TextInput } from '@/components/ui/field';
import { Card, EmptyState } from '@/components/ui/card';
import { ScrollRegion } from '@/components/ui/scroll-region';
import { Notice, ScreeningCaution } from '@/components/ui/notice';
import { FleetNoxChart } from '@/components/charts/fleet-nox-chart';
import { FleetShareChart } from '@/components/charts/fleet-share-chart';
import { FleetContext } from './fleet-context';
import { FleetPercentiles } from './fleet-percentiles';
import { SortableHeader } from '@/components/ui/sortable-header';

interface Props {
  slug: string;
  units: UnitSystem;
  initial: Comparison | null;
  initialQuery: string;
  aircraftCodes: string[];
  fleets: { id: number; name: string }[];
  canReport: boolean;
}

interface ApiError {
  message: string;
  fields: { path: string; message: string }[];
}

class CompareError extends Error {
  constructor(readonly detail: ApiError) {
    super(detail.message);
  }
}

const NO_ROWS: CompareRow[] = [];

const GROUP_LABELS: Record<GroupBy, string> = {
  fleet: 'Fleet',
  month: 'Fleet and month',
  aircraft: 'Fleet and aircraft type',
};

/** Column ids the chooser may hide, in display order. */
const HIDEABLE = [
  'flights',
  'distanceKm',
  'fuelKg',
  'co2Kg',
  'noxTotalKg',
  'noxAboveKg',
  'shareAbove',
  'noxAbovePer1000KmKg',
  'ozone',
] as const;
type FigureColumn = (typeof HIDEABLE)[number];

const COLUMN_LABELS: Record<FigureColumn, string> = {
  flights: 'Flights',
  distanceKm: 'Distance',
  fuelKg: 'Fuel',
  co2Kg: 'CO2',
  noxTotalKg: 'NOx',
  noxAboveKg: 'NOx above tropopause',
  shareAbove: 'Share above',
  noxAbovePer1000KmKg: 'NOx above per 1000 km',
  ozone: 'Ozone-loss figure',
};

function render(col: FigureColumn, r: CompareRow, units: UnitSystem): ReactNode {
  switch (col) {
    case 'flights':
      return formatNumber(r.flights);
    case 'distanceKm':
      return formatDistance(r.distanceKm, units);
    case 'fuelKg':
      return formatMass(r.fuelKg, units);
    case 'co2Kg':
      return formatMass(r.co2Kg, units);
    case 'noxTotalKg':
      return formatMass(r.noxTotalKg, units);
    case 'noxAboveKg':
      return formatMass(r.noxAboveKg, units);
    case 'shareAbove':
      return r.shareAbove === null ? '–' : formatPercent(r.shareAbove, 1);
    case 'noxAbovePer1000KmKg':
      return r.noxAbovePer1000KmKg === null ? '–' : formatMass(r.noxAbovePer1000KmKg, units, 2);
    case 'ozone':
      return (
        <>
          {formatMass(r.ozone.centralKg, units)}
          <span className="block text-xs font-normal text-ink-faint">
            {formatMassRange(r.ozone.lowKg, r.ozone.highKg, units)}
          </span>
        </>
      );
  }
}

function sortValue(col: FigureColumn, r: CompareRow): number {
  switch (col) {
    case 'shareAbove':
      return r.shareAbove ?? -1;
    case 'noxAbovePer1000KmKg':
      return r.noxAbovePer1000KmKg ?? -1;
    case 'ozone':
      return r.ozone.centralKg;
    default:
      return r[col];
  }
}

function parseSort(v: string | null): SortingState {
  if (!v) return [];
  const [id, dir] = v.split(':');
  return id ? [{ id, desc: dir !== 'asc' }] : [];
}

async function fetchComparison(slug: string, query: string): Promise<Comparison> {
  const res = await fetch(`/api/v1/workspaces/${slug}/fleets/compare${query ? `?${query}` : ''}`, {
    headers: { accept: 'application/json' },
  });
  const body = (await res.json().catch(() => null)) as
    (Comparison & { error?: { message: string; fields?: ApiError['fields'] } }) | null;
  if (!res.ok || !body) {
    throw new CompareError({
      message: body?.error?.message ?? 'The comparison could not be loaded. Try again.',
      fields: body?.error?.fields ?? [],
    });
  }
  return body;
}

/** The fleet comparison: filters, the sortable table with totals, monthly charts and fleet-scale context. */
export function FleetComparison({ slug, units, initial, initialQuery, aircraftCodes, fleets, canReport }: Props) {
  const params = useSearchParams();
  const pathname = usePathname();
  const apiQuery = compareQueryString(params);
  const [formErrors, setFormErrors] = useState<Record<string, string>>({});

  const query = useQuery({
    queryKey: ['fleet-compare', slug, apiQuery],
    queryFn: () => fetchComparison(slug, apiQuery),
    initialData: apiQuery === initialQuery && initial ? initial : undefined,
    placeholderData: keepPreviousData,
  });
  const data = query.data;
  const apiError =
    query.error instanceof CompareError
      ? query.error.detail
      : query.error
        ? { message: 'The comparison could not be loaded. Try again.', fields: [] }
        : null;
  const fieldErrors: Record<string, string> = {
    ...Object.fromEntries((apiError?.fields ?? []).map((f) => [f.path, f.message])),
    ...formErrors,
  };

  /** Writes the given keys into the URL without a server round trip (Next syncs useSearchParams). */
  const setParams = (patch: Record<string, string | null>) => {
    const next = new URLSearchParams(params.toString());
    for (const [k, v] of Object.entries(patch)) {
      if (v === null || v === '') next.delete(k);
      else next.set(k, v);
    }
    const qs = next.toString();
    window.history.replaceState(null, '', qs ? `${pathname}?${qs}` : pathname);
  };

  const basis = (FLIGHT_BASES as readonly string[]).includes(params.get('basis') ?? '')
    ? (params.get('basis') as string)
    : 'planned';
  const groupBy: GroupBy = (GROUP_BY as readonly string[]).includes(params.get('groupBy') ?? '')
    ? (params.get('groupBy') as GroupBy)
    : 'fleet';
  // Table state must keep its identity between renders: a fresh array each render makes TanStack's
  // sorted-row memo fire its page-index reset, which re-renders, forever.
  const sortParam = params.get('sort');
  const hideParam = params.get('hide') ?? '';
  const sorting = useMemo(() => parseSort(sortParam), [sortParam]);
  const hidden = useMemo(() => new Set(hideParam.split(',').filter(Boolean)), [hideParam]);
  const visibility = useMemo<VisibilityState>(
    () => Object.fromEntries(HIDEABLE.map((c) => [c, !hidden.has(c)])),
    [hidden],
  );
  const stacked = params.get('stack') === '1';
  const selectedFleets = new Set((params.get('fleets') ?? '').split(',').filter(Boolean));

  const columns = useMemo<ColumnDef<CompareRow>[]>(() => {
    const cols: ColumnDef<CompareRow>[] = [
      { id: 'fleetName', accessorKey: 'fleetName', header: 'Fleet', enableHiding: false },
    ];
    if (groupBy === 'month')
      cols.push({ id: 'month', accessorFn: (r) => r.month ?? '', header: 'Month', enableHiding: false });
    if (groupBy === 'aircraft')
      cols.push({
        id: 'aircraftCode',
        accessorFn: (r) => r.aircraftCode ?? '',
        header: 'Aircraft type',
        enableHiding: false,
      });
    for (const c of HIDEABLE)
      cols.push({ id: c, accessorFn: (r) => sortValue(c, r), header: COLUMN_LABELS[c], sortDescFirst: true });
    return cols;
  }, [groupBy]);

  const table = useReactTable({
    data: data?.rows ?? NO_ROWS,
    columns,
    state: { sorting, columnVisibility: visibility },
    onSortingChange: (updater) => {
      const next = typeof updater === 'function' ? updater(sorting) : updater;
      setParams({ sort: next[0] ? `${next[0].id}:${next[0].desc ? 'desc' : 'asc'}` : null });
    },
    onColumnVisibilityChange: (updater) => {
      const next = typeof updater === 'function' ? updater(visibility) : updater;
      setParams({ hide: HIDEABLE.filter((c) => next[c] === false).join(',') || null });
    },
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getRowId: (r) => r.key,
    autoResetPageIndex: false,
  });

  const onFilter = (e: FormEvent<HTMLFormElement>) => {
    e.preventDefault();
    const fd = new FormData(e.currentTarget);
    const text = (k: string) => String(fd.get(k) ?? '').trim();
    const values = {
      from: text('from'),
      to: text('to'),
      aircraft: text('aircraft'),
      route: text('route'),
      minFl: text('minFl'),
      maxFl: text('maxFl'),
      fleets: fd.getAll('fleet').map(String).join(','),
    };
    const parsed = fleetCompareQuerySchema.safeParse({ ...values, groupBy });
    if (!parsed.success) {
      setFormErrors(Object.fromEntries(parsed.error.issues.map((i) => [i.path.join('.'), i.message])));
      return;
    }
    setFormErrors({});
    setParams(values);
  };

  const clearFilters = () => {
    setFormErrors({});
    setParams({ from: null, to: null, aircraft: null, route: null, minFl: null, maxFl: null, fleets: null });
  };

  const current = compareQueryObject(params);
  const visibleFigures = HIDEABLE.filter((c) => !hidden.has(c));

  return (
    <div className="space-y-6">
      <CompareFilters
        formKey={apiQuery}
        onSubmit={onFilter}
        onClear={clearFilters}
        fieldErrors={fieldErrors}
        current={current}
        period={data?.period}
        aircraftCodes={aircraftCodes}
        fleets={fleets}
        selectedFleets={selectedFleets}
        fetching={query.isFetching}
      />

      {apiError ? (
        <Notice tone="danger" role="alert" title="The comparison could not be shown">
          {apiError.fields.length ? apiError.fields.map((f) => f.message).join(' ') : apiError.message}
        </Notice>
      ) : null}

      <Card title={data ? `Comparison, ${data.period.from} to ${data.period.to}` : 'Comparison'}>
        <CompareToolbar
          basis={basis}
          groupBy={groupBy}
          table={table}
          visibleCount={visibleFigures.length}
          setParams={setParams}
        />
        {!data ? (
          <div className="h-40 animate-pulse rounded-md bg-paper-sunk" aria-label="Loading the comparison" />
        ) : data.totals.flights === 0 ? (
          <EmptyState
            title="No screened flights match these filters"
            action={
              <div className="flex gap-2">
                <Button variant="secondary" onClick={clearFilters}>
                  Clear the filters
                </Button>
                <ButtonLink href={`/w/${slug}/imports`} variant="secondary">
                  Import a schedule
                </ButtonLink>
              </div>
            }
          >
            Widen the period or clear a filter. Flights count once their import has been screened.
          </EmptyState>
        ) : (
          <CompareTable table={table} totals={data.totals} notes={data.notes} units={units} />
        )}
        {data && data.engineVersions.length ? (
          <div className="mt-4" data-testid="compare-engine-versions">
            {data.mixedEngineVersions ? (
              <Notice tone="caution" title="Mixed engine versions">
                {data.cautions[0]}
              </Notice>
            ) : (
              <p className="text-xs text-ink-soft">Engine version: {engineVersionsText(data.engineVersions)}.</p>
            )}
          </div>
        ) : null}
        <div className="mt-4">
          <ScreeningCaution />
        </div>
        {canReport && data && data.totals.flights > 0 ? (
          <p className="mt-3 text-sm">
            <Link
              className="text-accent underline"
              href={`/w/${slug}/reports?from=${data.period.from}&to=${data.period.to}${selectedFleets.size ? `&fleets=${[...selectedFleets].join(',')}` : ''}`}
            >
              Build a report for this period
            </Link>
          </p>
        ) : null}
      </Card>

      {data && data.totals.flights > 0 ? (
        <div className="grid gap-6 xl:grid-cols-2">
          <Card
            title="NOx above the tropopause by month"
            actions={
              <label className="inline-flex items-center gap-1.5 text-sm text-ink-soft">
                <input
                  type="checkbox"
                  checked={stacked}
                  onChange={(e) => setParams({ stack: e.target.checked ? '1' : null })}
                  className="accent-accent"
                />
                Stack fleets
              </label>
            }
          >
            <FleetNoxChart months={data.months} series={data.series} units={units} stacked={stacked} />
          </Card>
          <Card title="Share of NOx above the tropopause by month">
            <FleetShareChart months={data.months} series={data.series} />
          </Card>
        </div>
      ) : null}

      {data && data.totals.flights > 0 && data.percentiles ? (
        <FleetPercentiles percentiles={data.percentiles} names={data.series} units={units} />
      ) : null}

      {data && data.totals.flights > 0 ? (
        <FleetContext context={data.context} cautions={data.cautions} units={units} />
      ) : null}
    </div>
  );
}

type SetParams = (patch: Record<string, string | null>) => void;

/** The filter form: period, aircraft type, route, level band and fleets. */
function CompareFilters({
  formKey,
  onSubmit,
  onClear,
  fieldErrors,
  current,
  period,
  aircraftCodes,
  fleets,
  selectedFleets,
  fetching,
}: {
  formKey: string;
  onSubmit: (e: FormEvent<HTMLFormElement>) => void;
  onClear: () => void;
  fieldErrors: Record<string, string>;
  current: ReturnType<typeof compareQueryObject>;
  period: { from: string; to: string } | undefined;
  aircraftCodes: string[];
  fleets: { id: number; name: string }[];
  selectedFleets: Set<string>;
  fetching: boolean;
}) {
  return (
    <Card title="Filters">
      <form key={formKey} onSubmit={onSubmit} noValidate className="space-y-4" aria-label="Comparison filters">
        <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
          <Field id="f-from" label="From" error={fieldErrors.from}>
            <TextInput
              id="f-from"
              name="from"
              type="date"
              defaultValue={current.from ?? period?.from ?? ''}
              invalid={!!fieldErrors.from}
            />
          </Field>
          <Field id="f-to" label="To" error={fieldErrors.to}>
            <TextInput
              id="f-to"
              name="to"
              type="date"
              defaultValue={current.to ?? period?.to ?? ''}
              invalid={!!fieldErrors.to}
            />
          </Field>
          <Field id="f-aircraft" label="Aircraft type" error={fieldErrors.aircraft}>
            <SelectInput
              id="f-aircraft"
              name="aircraft"
              defaultValue={current.aircraft ?? ''}
              invalid={!!fieldErrors.aircraft}
            >
              <option value="">All types</option>
              {aircraftCodes.map((c) => (
                <option key={c} value={c}>
                  {c}
                </option>
              ))}
            </SelectInput>
          </Field>
          <Field
            id="f-route"
            label="Route"
            error={fieldErrors.route}
            hint="Airport codes: EGLL, LHR or EGLL-KSFO (origin or destination)"
          >
            <TextInput
              id="f-route"
              name="route"
              defaultValue={current.route ?? ''}
              placeholder="EGLL-KSFO"
              invalid={!!fieldErrors.route}
            />
          </Field>
          <Field id="f-minfl" label="Level band from (FL)" error={fieldErrors.minFl}>
            <TextInput
              id="f-minfl"
              name="minFl"
              inputMode="numeric"
              defaultValue={current.minFl ?? ''}
              placeholder="e.g. 350"
              invalid={!!fieldErrors.minFl}
            />
          </Field>
          <Field
            id="f-maxfl"
            label="Level band to (FL)"
            error={fieldErrors.maxFl}
            hint="Keeps flights whose cruise, first to highest level, touches the band"
          >
            <TextInput
              id="f-maxfl"
              name="maxFl"
              inputMode="numeric"
              defaultValue={current.maxFl ?? ''}
              placeholder="e.g. 410"
              invalid={!!fieldErrors.maxFl}
            />
          </Field>
          <fieldset className="sm:col-span-2">
            <legend className="text-sm font-medium text-ink">Fleets</legend>
            <div className="mt-1 flex flex-wrap gap-x-4 gap-y-1">
              {fleets.length === 0 ? <span className="text-sm text-ink-faint">No fleets yet.</span> : null}
              {fleets.map((f) => (
                <label key={f.id} className="inline-flex items-center gap-1.5 text-sm text-ink">
                  <input
                    type="checkbox"
                    name="fleet"
                    value={f.id}
                    defaultChecked={selectedFleets.has(String(f.id))}
                    className="accent-accent"
                  />
                  {f.name}
                </label>
              ))}
            </div>
            <p className="mt-1 text-xs text-ink-faint">None ticked: every fleet, and flights without one.</p>
            {fieldErrors.fleets ? (
              <p role="alert" className="text-xs font-medium text-danger">
                {fieldErrors.fleets}
              </p>
            ) : null}
          </fieldset>
        </div>
        <div className="flex flex-wrap items-center gap-2">
          <Button type="submit">Apply filters</Button>
          <Button variant="ghost" onClick={onClear}>
            Clear
          </Button>
          <span role="status" aria-live="polite" className="text-sm text-ink-faint">
            {fetching ? 'Updating the comparison…' : ''}
          </span>
        </div>
      </form>
    </Card>
  );
}

/**
 * Basis, rows per group and the column chooser. A row of its own under the card's title (not squeezed
 * beside it), so on a phone it wraps under the title instead of leaving the title column tall and empty.
 */
function CompareToolbar({
  basis,
  groupBy,
  table,
  visibleCount,
  setParams,
}: {
  basis: string;
  groupBy: GroupBy;
  table: Table<CompareRow>;
  visibleCount: number;
  setParams: SetParams;
}) {
  return (
    <div className="mb-4 flex flex-wrap items-center justify-end gap-2" aria-label="Table options" role="group">
      <label className="inline-flex items-center gap-1.5 text-sm text-ink-soft">
        Basis
        <select
          value={basis}
          onChange={(e) => setParams({ basis: e.target.value === 'planned' ? null : e.target.value })}
          className="rounded-md border border-line-strong bg-paper-raised px-2 py-1.5 text-sm text-ink"
        >
          <option value="planned">Planned</option>
          <option value="flown">Flown</option>
          <option value="flown-where-available">Flown where available</option>
        </select>
      </label>
      <div
        role="radiogroup"
        aria-label="Rows per"
        className="inline-flex overflow-hidden rounded-md border border-line-strong"
      >
        {GROUP_BY.map((g) => (
          <button
            key={g}
            type="button"
            role="radio"
            aria-checked={groupBy === g}
            onClick={() => setParams({ groupBy: g === 'fleet' ? null : g, sort: null })}
            className={`px-3 py-1.5 text-sm ${groupBy === g ? 'bg-accent text-white' : 'bg-paper-raised text-ink hover:bg-paper-sunk'}`}
          >
            {GROUP_LABELS[g]}
          </button>
        ))}
      </div>
      <details className="relative">
        <summary className="cursor-pointer list-none rounded-md border border-line-strong bg-paper-raised px-3 py-1.5 text-sm text-ink hover:bg-paper-sunk">
          Columns ({visibleCount} of {HIDEABLE.length})
        </summary>
        <div className="absolute right-0 z-10 mt-1 w-64 rounded-md border border-line bg-paper-raised p-3 shadow-lg">
          <p className="mb-2 text-xs font-medium uppercase tracking-wide text-ink-soft">Show columns</p>
          {table
            .getAllLeafColumns()
            .filter((c) => c.getCanHide())
            .map((c) => (
              <label key={c.id} className="flex items-center gap-2 py-0.5 text-sm text-ink">
                <input
                  type="checkbox"
                  checked={c.getIsVisible()}
                  onChange={c.getToggleVisibilityHandler()}
                  className="accent-accent"
                />
                {COLUMN_LABELS[c.id as FigureColumn]}
              </label>
            ))}
        </div>
      </details>
    </div>
  );
}

/** The sortable table with its totals row and notes. */
function CompareTable({
  table,
  totals,
  notes,
  units,
}: {
  table: Table<CompareRow>;
  totals: CompareRow;
  notes: Comparison['notes'];
  units: UnitSystem;
}) {
  return (
    <ScrollRegion label="Fleet comparison table">
      <table className="figure w-full min-w-[760px] text-sm">
        <thead className="border-b border-line-strong text-left text-xs uppercase tracking-wide text-ink-soft">
          <tr>
            {(table.getHeaderGroups()[0]?.headers ?? []).map((h) => (
              <SortableHeader
                key={h.id}
                header={h}
                className={`px-2 py-2 align-bottom font-medium ${(HIDEABLE as readonly string[]).includes(h.column.id) ? 'text-right' : ''} ${h.column.id === 'fleetName' ? 'sticky left-0 bg-paper-raised' : ''}`}
                after={h.column.id === 'co2Kg' ? <sup aria-hidden>1</sup> : null}
              />
            ))}
          </tr>
        </thead>
        <tbody>
          {table.getRowModel().rows.map((row) => (
            <tr key={row.id} className="border-b border-line">
              {row.getVisibleCells().map((cell) => {
                const id = cell.column.id;
                const r = row.original;
                const isFigure = (HIDEABLE as readonly string[]).includes(id);
                return (
                  <td
                    key={cell.id}
                    className={`px-2 py-2 align-top ${id === 'fleetName' ? 'sticky left-0 bg-paper-raised' : ''} ${isFigure ? 'whitespace-nowrap text-right' : 'whitespace-nowrap'} ${id === 'noxAboveKg' || id === 'shareAbove' ? 'text-strato-strong' : ''}`}
                  >
                    {id === 'fleetName' ? (
                      <span
                        className={`whitespace-nowrap ${r.fleetId === null ? 'italic text-ink-soft' : 'font-medium text-ink'}`}
                      >
                        {r.fleetName}
                      </span>
                    ) : id === 'month' ? (
                      r.month ? (
                        monthLabel(r.month)
                      ) : (
                        '–'
                      )
                    ) : id === 'aircraftCode' ? (
                      r.aircraftCode
                    ) : (
                      render(id as FigureColumn, r, units)
                    )}
                  </td>
                );
              })}
            </tr>
          ))}
        </tbody>
        <tfoot>
          <tr className="border-t-2 border-line-strong bg-paper-sunk font-semibold">
            {table.getVisibleLeafColumns().map((c, i) => {
              const isFigure = (HIDEABLE as readonly string[]).includes(c.id);
              return (
                <td
                  key={c.id}
                  className={`px-2 py-2 align-top ${i === 0 ? 'sticky left-0 bg-paper-sunk' : ''} ${isFigure ? 'whitespace-nowrap text-right' : 'whitespace-nowrap'}`}
                >
                  {i === 0 ? 'All fleets' : isFigure ? render(c.id as FigureColumn, totals, units) : ''}
                </td>
              );
            })}
          </tr>
        </tfoot>
      </table>
      <ul className="mt-3 space-y-0.5 text-xs text-ink-soft">
        <li>
          <sup>1</sup> {notes.co2}
        </li>
        <li>{notes.ratios}</li>
        <li>{notes.ozone}</li>
        <li>
          NOx is NO2-equivalent mass. Screened flights only; a flight counts in the fleet named in its schedule row,
          else in its aircraft type&apos;s default fleet.
        </li>
      </ul>
    </ScrollRegion>
  );
}
