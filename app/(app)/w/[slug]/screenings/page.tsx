import { Suspense } from 'react';
import Form from 'next/form';
import { PagerLinks } from '@/components/ui/pager-links';
import { requireMember } from '@/lib/auth/guards';
import {
  checkDateOrder,
  firstParam,
  type ListPageProps,
  type SearchParams,
  cursorPageLinks,
} from '@/lib/search-params';
import { can } from '@/lib/auth/policy';
import { listScreenings, type ScreeningFilters } from '@/db/screenings';
import { listAircraftTypes } from '@/db/engines';
import { screeningListQuerySchema } from '@/lib/validation/screening-api';
import { Card, EmptyState, PageHeader } from '@/components/ui/card';
import { ButtonLink } from '@/components/ui/button';
import { Field, SelectInput, TextInput } from '@/components/ui/field';
import { ScreeningCaution } from '@/components/ui/notice';
import { HistoryTable, type HistoryRow } from '@/components/screening/history-table';
import { CardSkeleton } from '@/components/screening/skeletons';
import type { UnitSystem } from '@/lib/units';
import { FilterActions } from '@/components/ui/filter-actions';
import Link from 'next/link';
import { countImportedFlightsScreened } from '@/db/portfolio';
import { COUNT_LABELS } from '@/lib/counts';
import { ENGINE_VERSION } from '@/lib/screening';
import { formatNumber } from '@/lib/format';

export const metadata = { title: 'Screenings' };

const PAGE_SIZE = 25;

interface FilterText {
  from: string;
  to: string;
  route: string;
  aircraft: string;
  minAbove: string;
  maxAbove: string;
}

/** Filters as typed (share in per cent) -> the list query; a bad filter is named and left out. */
function readFilters(search: SearchParams): {
  text: FilterText;
  filters: ScreeningFilters;
  problems: Partial<Record<keyof FilterText, string>>;
} {
  const text: FilterText = {
    from: firstParam(search.from),
    to: firstParam(search.to),
    route: firstParam(search.route),
    aircraft: firstParam(search.aircraft),
    minAbove: firstParam(search.minAbove),
    maxAbove: firstParam(search.maxAbove),
  };
  const problems: Partial<Record<keyof FilterText, string>> = {};
  const filters: ScreeningFilters = {};
  const day = screeningListQuerySchema.shape.from;
  for (const key of ['from', 'to'] as const) {
    if (!text[key]) continue;
    const r = day.safeParse(text[key]);
    if (r.success && r.data && !Number.isNaN(Date.parse(r.data))) filters[key] = r.data;
    else problems[key] = 'Use a date as YYYY-MM-DD.';
  }
  checkDateOrder(filters, problems);
  if (text.route) {
    if (text.route.length > 60) problems.route = 'Use at most 60 characters.';
    else filters.route = text.route;
  }
  if (text.aircraft) filters.aircraft = text.aircraft.slice(0, 16);
  for (const [key, target] of [
    ['minAbove', 'minShareAbove'],
    ['maxAbove', 'maxShareAbove'],
  ] as const) {
    if (!text[key]) continue;
    const pct = Number(text[key].replace(',', '.').replace('%', ''));
    if (!Number.isFinite(pct) || pct < 0 || pct > 100) problems[key] = 'Give a share between 0 and 100 %.';
    else filters[target] = pct / 100;
  }
  if (
    filters.minShareAbove !== undefined &&
    filters.maxShareAbove !== undefined &&
    filters.minShareAbove > filters.maxShareAbove
  ) {
    problems.maxAbove = 'The largest share is below the smallest.';
    delete filters.maxShareAbove;
  }
  return { text, filters, problems };
}

export default async function ScreeningsPage({ params, searchParams }: ListPageProps) {
  const [{ slug }, search] = await Promise.all([params, searchParams]);
  const { workspace, user, role } = await requireMember(slug, 'flights:read');
  const { text, filters, problems } = readFilters(search);
  const types = await listAircraftTypes({ workspaceId: workspace.id });
  const canScreen = can(role, 'screenings:create');
  const filtered = Object.keys(filters).length > 0;
  return (
    <>
      <PageHeader
        title="Screenings"
        lead="Every screening saved in this workspace, newest first. Filter, sort, and pick two to compare side by side."
        actions={canScreen ? <ButtonLink href={`/w/${slug}/screen`}>Screen a flight</ButtonLink> : undefined}
      />
      <Card className="mb-6">
        <Form
          action={`/w/${slug}/screenings`}
          className="grid items-start gap-3 sm:grid-cols-2 md:grid-cols-3 xl:grid-cols-6"
          aria-label="Filter the screenings"
        >
          <Field id="from" label="Saved from" error={problems.from}>
            <TextInput id="from" name="from" type="date" defaultValue={text.from} invalid={!!problems.from} />
          </Field>
          <Field id="to" label="Saved until" error={problems.to}>
            <TextInput id="to" name="to" type="date" defaultValue={text.to} invalid={!!problems.to} />
          </Field>
          <Field id="route" label="Route contains" error={problems.route}>
            <TextInput
              id="route"
              name="route"
              placeholder="EGLL"
              defaultValue={text.route}
              invalid={!!problems.route}
            />
          </Field>
          <Field id="aircraft" label="Aircraft type">
            <SelectInput id="aircraft" name="aircraft" defaultValue={text.aircraft}>
              <option value="">Any</option>
              {types.map((t) => (
                <option key={t.id} value={t.code}>
                  {t.code}
                </option>
              ))}
            </SelectInput>
          </Field>
          <Field id="minAbove" label="Min. share above (%)" error={problems.minAbove}>
            <TextInput
              id="minAbove"
              name="minAbove"
              inputMode="decimal"
              defaultValue={text.minAbove}
              invalid={!!problems.minAbove}
            />
          </Field>
          <Field id="maxAbove" label="Max. share above (%)" error={problems.maxAbove}>
            <TextInput
              id="maxAbove"
              name="maxAbove"
              inputMode="decimal"
              defaultValue={text.maxAbove}
              invalid={!!problems.maxAbove}
            />
          </Field>
          <FilterActions
            clearHref={`/w/${slug}/screenings`}
            showClear={filtered || Object.keys(problems).length > 0}
            className="sm:col-span-2 md:col-span-3 xl:col-span-6"
          />
        </Form>
      </Card>
      <Suspense
        key={JSON.stringify([filters, firstParam(search.cursor)])}
        fallback={<CardSkeleton label="the screenings" height="h-96" />}
      >
        <HistoryResults
          slug={slug}
          workspaceId={workspace.id}
          units={user.units}
          canScreen={canScreen}
          search={search}
          text={text}
          filters={filters}
        />
      </Suspense>
      <div className="mt-6">
        <ScreeningCaution />
      </div>
    </>
  );
}

/** One page of saved screenings for the filters, with links to newer and older pages (keyset by id). */
async function HistoryResults({
  slug,
  workspaceId,
  units,
  canScreen,
  search,
  text,
  filters,
}: {
  slug: string;
  workspaceId: number;
  units: UnitSystem;
  canScreen: boolean;
  search: SearchParams;
  text: FilterText;
  filters: ScreeningFilters;
}) {
  const cursorText = firstParam(search.cursor);
  const cursor = /^\d{1,12}$/.test(cursorText) ? Number(cursorText) : undefined;
  const trail = firstParam(search.trail)
    .split(',')
    .filter((c) => /^\d{1,12}$/.test(c) || c === '0')
    .slice(-50);
  const page = await listScreenings({ workspaceId }, { cursor, limit: PAGE_SIZE, filters });
  const imported = page.items.length === 0 ? await countImportedFlightsScreened({ workspaceId }) : 0;
  const filtered = Object.keys(filters).length > 0;

  const { olderHref, newerHref } = cursorPageLinks(
    `/w/${slug}/screenings`,
    { ...text, sort: firstParam(search.sort) },
    { cursor: cursor ? String(cursor) : undefined, nextCursor: page.nextCursor, trail },
  );

  const rows: HistoryRow[] = page.items.map((s) => ({
    id: s.id,
    name: s.name,
    createdAt: s.createdAt,
    routeLabel: s.routeLabel,
    aircraftCode: s.aircraftCode,
    flightLevel: s.flightLevel,
    flightDate: s.flightDate,
    distanceKm: s.distanceKm,
    noxAboveTropopauseKg: s.noxAboveTropopauseKg,
    fractionAboveTropopause: s.fractionAboveTropopause,
    olderEngineVersion: s.engineVersion !== ENGINE_VERSION ? s.engineVersion : null,
    ozoneCentralKg: s.ozoneLoss.centralKg,
  }));

  return (
    <>
      {rows.length === 0 ? (
        filtered || cursor ? (
          <EmptyState
            title="No screening matches these filters"
            action={
              <ButtonLink href={`/w/${slug}/screenings`} variant="secondary">
                Show all screenings
              </ButtonLink>
            }
          >
            Widen the dates or the share above the tropopause, or clear the filters.
          </EmptyState>
        ) : (
          <EmptyState
            title={`No ${COUNT_LABELS.savedScreenings.toLowerCase()} yet`}
            action={canScreen ? <ButtonLink href={`/w/${slug}/screen`}>Screen a flight</ButtonLink> : undefined}
          >
            {canScreen
              ? 'Screen a flight and save it: its figures are kept here.'
              : 'No flight has been screened and saved one at a time here yet. A planner or analyst saves screenings; they appear here.'}
            {imported > 0 ? (
              <span data-testid="imported-flights-elsewhere">
                {' '}
                This list holds {COUNT_LABELS.savedScreenings.toLowerCase()} only; the workspace&apos;s{' '}
                {formatNumber(imported)} {COUNT_LABELS.importedFlightsScreened.toLowerCase()} are under{' '}
                <Link className="underline" href={`/w/${slug}/flights`}>
                  Flights
                </Link>
                .
              </span>
            ) : null}
          </EmptyState>
        )
      ) : (
        <Card>
          <HistoryTable slug={slug} rows={rows} units={units} />
          <div className="mt-4 flex flex-wrap items-center justify-between gap-3 text-sm">
            <p className="text-ink-soft">
              {rows.length} screening{rows.length === 1 ? '' : 's'} on this page
              {firstParam(search.sort) ? '; sorting orders this page' : ''}.
            </p>
            <PagerLinks newerHref={newerHref} olderHref={olderHref} />
          </div>
        </Card>
      )}
    </>
  );
}
