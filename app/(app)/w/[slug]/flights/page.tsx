import Form from 'next/form';
import Link from 'next/link';
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
import { listFlightFilterOptions, listFlights, summariseFlights, type FlightFilters } from '@/db/flights';
import { flightListQuerySchema } from '@/lib/validation/imports';
import { formatDistance, formatMass, formatMassRange, formatNumber, formatPercent } from '@/lib/format';
import { Card, EmptyState, PageHeader, Stat } from '@/components/ui/card';
import { ButtonLink } from '@/components/ui/button';
import { Field, SelectInput, TextInput } from '@/components/ui/field';
import { ScreeningCaution } from '@/components/ui/notice';
import { FlightsTable } from '@/components/flights/flights-table';
import { FilterActions } from '@/components/ui/filter-actions';
import { COUNT_LABELS } from '@/lib/counts';

export const metadata = { title: 'Flights' };

const PAGE_SIZE = 50;
const FILTER_KEYS = ['import', 'from', 'to', 'fleet', 'aircraft'] as const;
type FilterKey = (typeof FILTER_KEYS)[number];

/** The URL's filters; a bad one is named beside its field and left out. */
function readFilters(search: SearchParams): {
  text: Record<FilterKey, string>;
  filters: FlightFilters;
  problems: Partial<Record<FilterKey, string>>;
} {
  const text = Object.fromEntries(FILTER_KEYS.map((k) => [k, firstParam(search[k])])) as Record<FilterKey, string>;
  const shape = flightListQuerySchema.shape;
  const filters: FlightFilters = {};
  const problems: Partial<Record<FilterKey, string>> = {};
  for (const key of FILTER_KEYS) {
    if (!text[key]) continue;
    const r = shape[key].safeParse(text[key]);
    if (!r.success) problems[key] = r.error.issues[0]?.message ?? 'Check this filter.';
    else if (r.data !== undefined) (filters as Record<string, unknown>)[key] = r.data;
  }
  checkDateOrder(filters, problems);
  return { text, filters, problems };
}

export default async function FlightsPage({ params, searchParams }: ListPageProps) {
  const [{ slug }, search] = await Promise.all([params, searchParams]);
  const { workspace, user, role } = await requireMember(slug, 'flights:read');
  const { text, filters, problems } = readFilters(search);
  const cursorText = firstParam(search.cursor);
  const cursor = /^\d{4}-\d{2}-\d{2}~\d{1,12}$/.test(cursorText) ? cursorText : undefined;
  const trail = firstParam(search.trail)
    .split(',')
    .filter((c) => c === '0' || /^\d{4}-\d{2}-\d{2}~\d{1,12}$/.test(c))
    .slice(-40);
  const scope = { workspaceId: workspace.id };
  const [page, totals, options] = await Promise.all([
    listFlights(scope, { ...filters, cursor, limit: PAGE_SIZE }),
    summariseFlights(scope, filters),
    listFlightFilterOptions(scope),
  ]);
  const filtered = Object.keys(filters).length > 0;
  const units = user.units;

  const {
    href: link,
    olderHref,
    newerHref,
  } = cursorPageLinks(`/w/${slug}/flights`, Object.fromEntries(FILTER_KEYS.map((k) => [k, text[k]])), {
    cursor,
    nextCursor: page.nextCursor,
    trail,
  });
  const share = totals.noxTotalKg > 0 ? totals.noxAboveTropopauseKg / totals.noxTotalKg : 0;
  const importName =
    filters.import !== undefined ? options.imports.find((i) => i.id === filters.import)?.fileName : undefined;

  return (
    <>
      <PageHeader
        title="Flights"
        lead={
          importName
            ? `Flights of import #${filters.import} (${importName}), newest first, with the NOx each put above the tropopause.`
            : 'Flights from schedule imports, newest first, with the NOx each put above the tropopause.'
        }
        actions={
          can(role, 'imports:create') ? (
            <ButtonLink href={`/w/${slug}/imports`}>Import a schedule</ButtonLink>
          ) : undefined
        }
      />
      <Card className="mb-6">
        <Form
          action={`/w/${slug}/flights`}
          className="grid items-start gap-3 sm:grid-cols-2 lg:grid-cols-3 xl:grid-cols-6"
          aria-label="Filter the flights"
        >
          <Field id="import" label="Import" error={problems.import}>
            <SelectInput id="import" name="import" defaultValue={text.import} invalid={!!problems.import}>
              <option value="">Any</option>
              {options.imports.map((i) => (
                <option key={i.id} value={String(i.id)}>
                  #{i.id} {i.fileName}
                </option>
              ))}
            </SelectInput>
          </Field>
          <Field id="from" label="Flown from" error={problems.from}>
            <TextInput id="from" name="from" type="date" defaultValue={text.from} invalid={!!problems.from} />
          </Field>
          <Field id="to" label="Flown until" error={problems.to}>
            <TextInput id="to" name="to" type="date" defaultValue={text.to} invalid={!!problems.to} />
          </Field>
          <Field id="fleet" label="Fleet" error={problems.fleet}>
            <SelectInput id="fleet" name="fleet" defaultValue={text.fleet} invalid={!!problems.fleet}>
              <option value="">Any</option>
              {options.fleets.map((f) => (
                <option key={f.id} value={String(f.id)}>
                  {f.name}
                </option>
              ))}
            </SelectInput>
          </Field>
          <Field id="aircraft" label="Aircraft type" error={problems.aircraft}>
            <SelectInput id="aircraft" name="aircraft" defaultValue={text.aircraft} invalid={!!problems.aircraft}>
              <option value="">Any</option>
              {options.aircraft.map((code) => (
                <option key={code} value={code}>
                  {code}
                </option>
              ))}
            </SelectInput>
          </Field>
          <FilterActions
            clearHref={`/w/${slug}/flights`}
            showClear={filtered || Object.keys(problems).length > 0}
            className="pt-6"
          />
        </Form>
      </Card>

      {totals.flights === 0 ? (
        filtered ? (
          <EmptyState
            title="No flight matches these filters"
            action={
              <ButtonLink href={`/w/${slug}/flights`} variant="secondary">
                Show all flights
              </ButtonLink>
            }
          >
            Widen the dates, or choose another import, fleet or aircraft type.
          </EmptyState>
        ) : (
          <EmptyState
            title="No flights yet"
            action={
              can(role, 'imports:create') ? (
                <ButtonLink href={`/w/${slug}/imports`}>Import a schedule</ButtonLink>
              ) : undefined
            }
          >
            Flights arrive from schedule imports: upload a CSV of flights and they are screened here in the background.
          </EmptyState>
        )
      ) : (
        <>
          <div className="mb-6 grid gap-3 sm:grid-cols-2 lg:grid-cols-3 xl:grid-cols-6">
            <Stat
              label={COUNT_LABELS.importedFlightsScreened}
              value={formatNumber(totals.screened)}
              sub={
                totals.pending || totals.failed
                  ? `${formatNumber(totals.pending)} waiting · ${formatNumber(totals.failed)} not screened`
                  : `of ${formatNumber(totals.flights)}`
              }
            />
            <Stat label="Distance" value={formatDistance(totals.distanceKm, units)} />
            <Stat label="Cruise fuel" value={formatMass(totals.fuelKg, units)} sub="screened flights" />
            <Stat label="NOx emitted" value={formatMass(totals.noxTotalKg, units)} sub="as NO2" />
            <Stat
              label="NOx above tropopause"
              value={formatMass(totals.noxAboveTropopauseKg, units)}
              sub={`${formatPercent(share, 1)} of the NOx`}
              tone="strato"
            />
            <Stat
              label="Ozone figure"
              value={formatMass(totals.ozoneCentralKg, units)}
              sub={
                <span data-testid="flights-ozone-range">
                  gross loss; screening range {formatMassRange(totals.ozoneLowKg, totals.ozoneHighKg, units)}
                </span>
              }
            />
          </div>
          <div className="mb-6">
            <ScreeningCaution />
          </div>
          <Card>
            {page.items.length === 0 ? (
              <p className="text-sm text-ink-soft">
                No more flights on this page.{' '}
                <Link href={link({})} className="text-accent hover:underline">
                  Back to the newest
                </Link>
              </p>
            ) : (
              <FlightsTable flights={page.items} units={units} slug={slug} />
            )}
            <div className="mt-4 flex flex-wrap items-center justify-between gap-3 text-sm">
              <p className="text-ink-soft">
                {formatNumber(page.items.length)} of {formatNumber(totals.flights)} flight
                {totals.flights === 1 ? '' : 's'} on this page. The ozone figure is a gross catalytic loss, not a net
                column change.
              </p>
              <PagerLinks newerHref={newerHref} olderHref={olderHref} />
            </div>
          </Card>
        </>
      )}
    </>
  );
}
