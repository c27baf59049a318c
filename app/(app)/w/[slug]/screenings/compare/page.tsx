import { Suspense } from 'react';
import Link from 'next/link';
import { requireMember } from '@/lib/auth/guards';
import { getScreening, routeLabel, type ScreeningRecord } from '@/lib/screening-service/saved';
import { AppError } from '@/lib/errors';
import { formatAltitude, formatDistance, formatMass, formatNumber, formatPercent, formatDate } from '@/lib/format';
import type { UnitSystem } from '@/lib/units';
import { Card, EmptyState, PageHeader } from '@/components/ui/card';
import { ButtonLink } from '@/components/ui/button';
import { ScreeningCautions } from '@/components/screening/cautions';
import { EI_METHOD_LABELS } from '@/components/screening/headline-figures';
import { profileSeries } from '@/components/screening/profile-series';
import { cruiseLabel } from '@/components/screening/describe';
import { VerticalProfileChart } from '@/components/charts/vertical-profile-chart';
import { PageSkeleton } from '@/components/screening/skeletons';
import { ScrollRegion } from '@/components/ui/scroll-region';

export const metadata = { title: 'Compare screenings' };

type Search = Record<string, string | string[] | undefined>;
const one = (v: string | string[] | undefined): string => (Array.isArray(v) ? (v[0] ?? '') : (v ?? '')).trim();

async function load(workspaceId: number, id: string): Promise<ScreeningRecord | null> {
  if (!/^\d{1,12}$/.test(id)) return null;
  try {
    return await getScreening({ workspaceId }, Number(id));
  } catch (err) {
    if (err instanceof AppError && err.status === 404) return null;
    throw err;
  }
}

interface FigureRow {
  label: string;
  a: number;
  b: number;
  show: (v: number) => string;
  /** How to write the difference (b - a); null when a difference means nothing. */
  diff: ((d: number) => string) | null;
}

function signed(text: string, d: number): string {
  return d > 0 ? `+${text}` : d < 0 ? `−${text.replace(/^-/, '')}` : text;
}

function rowsFor(a: ScreeningRecord, b: ScreeningRecord, units: UnitSystem): FigureRow[] {
  const ra = a.result;
  const rb = b.result;
  const mass = (v: number) => formatMass(v, units);
  return [
    {
      label: 'Distance',
      a: ra.distanceKm,
      b: rb.distanceKm,
      show: (v) => formatDistance(v, units),
      diff: (d) => signed(formatDistance(Math.abs(d), units), d),
    },
    { label: 'Cruise fuel', a: ra.fuelKg, b: rb.fuelKg, show: mass, diff: (d) => signed(mass(Math.abs(d)), d) },
    {
      label: 'NOx emitted (as NO2)',
      a: ra.noxTotalKg,
      b: rb.noxTotalKg,
      show: mass,
      diff: (d) => signed(mass(Math.abs(d)), d),
    },
    {
      label: 'NOx above the tropopause (as NO2)',
      a: ra.noxAboveTropopauseKg,
      b: rb.noxAboveTropopauseKg,
      show: mass,
      diff: (d) => signed(mass(Math.abs(d)), d),
    },
    {
      label: 'NOx above the tropopause (as N)',
      a: ra.noxAboveTropopauseKgN,
      b: rb.noxAboveTropopauseKgN,
      show: mass,
      diff: (d) => signed(mass(Math.abs(d)), d),
    },
    {
      label: 'Share above',
      a: ra.fractionAboveTropopause,
      b: rb.fractionAboveTropopause,
      show: (v) => formatPercent(v, 1),
      diff: (d) => signed(`${formatNumber(Math.abs(d) * 100, 1)} points`, d),
    },
    {
      label: 'Mean depth above',
      a: ra.meanDepthAboveTropopauseKm * 1000,
      b: rb.meanDepthAboveTropopauseKm * 1000,
      show: (v) => formatAltitude(v, units),
      diff: (d) => signed(formatAltitude(Math.abs(d), units), d),
    },
    {
      label: 'Ozone-loss figure, central',
      a: ra.ozoneLoss.centralKg,
      b: rb.ozoneLoss.centralKg,
      show: mass,
      diff: (d) => signed(mass(Math.abs(d)), d),
    },
    { label: 'Ozone-loss figure, low', a: ra.ozoneLoss.lowKg, b: rb.ozoneLoss.lowKg, show: mass, diff: null },
    { label: 'Ozone-loss figure, high', a: ra.ozoneLoss.highKg, b: rb.ozoneLoss.highKg, show: mass, diff: null },
    {
      label: 'Mean cruise EI NOx (g/kg)',
      a: ra.meanCruiseEiNoxGPerKg,
      b: rb.meanCruiseEiNoxGPerKg,
      show: (v) => formatNumber(v, 1),
      diff: (d) => signed(formatNumber(Math.abs(d), 1), d),
    },
  ];
}

export default async function CompareScreeningsPage({
  params,
  searchParams,
}: {
  params: Promise<{ slug: string }>;
  searchParams: Promise<Search>;
}) {
  const [{ slug }, search] = await Promise.all([params, searchParams]);
  const { workspace, user } = await requireMember(slug, 'flights:read');
  return (
    <Suspense fallback={<PageSkeleton title="the comparison" />}>
      <ComparePanel slug={slug} workspaceId={workspace.id} units={user.units} a={one(search.a)} b={one(search.b)} />
    </Suspense>
  );
}

/** Both screenings read and laid side by side; a missing or repeated one gets a way back instead. */
async function ComparePanel({
  slug,
  workspaceId,
  units,
  ...ids
}: {
  slug: string;
  workspaceId: number;
  units: UnitSystem;
  a: string;
  b: string;
}) {
  const [a, b] = await Promise.all([load(workspaceId, ids.a), load(workspaceId, ids.b)]);
  if (!a || !b || a.id === b.id) {
    return (
      <>
        <PageHeader title="Compare screenings" />
        <EmptyState
          title={a && b ? 'Pick two different screenings' : 'One of the two screenings was not found in this workspace'}
          action={<ButtonLink href={`/w/${slug}/screenings`}>Back to the screenings</ButtonLink>}
        >
          On the screenings list, tick two screenings and choose “Compare the two picked”.
        </EmptyState>
      </>
    );
  }
  const sa = profileSeries(a.result.segments, units);
  const sb = profileSeries(b.result.segments, units);
  const yMax = Math.max(sa.maxAltitude, sb.maxAltitude);
  const rows = rowsFor(a, b, units);
  const cautions = [...new Set([...a.result.cautions, ...b.result.cautions])];
  const describe = (r: ScreeningRecord) =>
    [
      routeLabel(r.input),
      r.aircraftCode,
      cruiseLabel(r.input),
      r.input.flightDate ? formatDate(r.input.flightDate) : null,
    ]
      .filter(Boolean)
      .join(' · ');
  return (
    <>
      <PageHeader
        title="Compare screenings"
        lead="Two saved screenings side by side: B minus A in the last column."
        actions={
          <ButtonLink href={`/w/${slug}/screenings`} variant="secondary">
            Back to the screenings
          </ButtonLink>
        }
      />
      <div className="space-y-6">
        <ScreeningCautions cautions={cautions} />
        <Card title="Headline figures">
          <ScrollRegion label="Headline figures of both screenings">
            <table className="w-full min-w-[640px] text-sm" data-testid="compare-table">
              <thead className="text-left text-xs uppercase tracking-wide text-ink-soft">
                <tr>
                  <th scope="col" className="py-2 pr-3">
                    Figure
                  </th>
                  <th scope="col" className="py-2 pr-3 text-right">
                    A:{' '}
                    <Link href={`/w/${slug}/screenings/${a.id}`} className="normal-case text-accent hover:underline">
                      {a.name}
                    </Link>
                  </th>
                  <th scope="col" className="py-2 pr-3 text-right">
                    B:{' '}
                    <Link href={`/w/${slug}/screenings/${b.id}`} className="normal-case text-accent hover:underline">
                      {b.name}
                    </Link>
                  </th>
                  <th scope="col" className="py-2 text-right">
                    B − A
                  </th>
                </tr>
              </thead>
              <tbody className="figure">
                <tr className="border-t border-line">
                  <th scope="row" className="py-2 pr-3 text-left font-normal">
                    Flight
                  </th>
                  <td className="py-2 pr-3 text-right text-ink-soft">{describe(a)}</td>
                  <td className="py-2 pr-3 text-right text-ink-soft">{describe(b)}</td>
                  <td />
                </tr>
                <tr className="border-t border-line">
                  <th scope="row" className="py-2 pr-3 text-left font-normal">
                    EI method
                  </th>
                  <td className="py-2 pr-3 text-right">{EI_METHOD_LABELS[a.result.eiMethod]}</td>
                  <td className="py-2 pr-3 text-right">{EI_METHOD_LABELS[b.result.eiMethod]}</td>
                  <td />
                </tr>
                {rows.map((r) => (
                  <tr key={r.label} className="border-t border-line">
                    <th scope="row" className="py-2 pr-3 text-left font-normal">
                      {r.label}
                    </th>
                    <td className="py-2 pr-3 text-right">{r.show(r.a)}</td>
                    <td className="py-2 pr-3 text-right">{r.show(r.b)}</td>
                    <td className="whitespace-nowrap py-2 text-right text-ink-soft">
                      {r.diff ? r.diff(r.b - r.a) : ''}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </ScrollRegion>
        </Card>
        <div className="grid gap-6 xl:grid-cols-2">
          <Card title={`A: ${a.name}`}>
            <VerticalProfileChart series={sa} label={`Vertical profile of ${a.name}`} height={260} yMax={yMax} />
          </Card>
          <Card title={`B: ${b.name}`}>
            <VerticalProfileChart series={sb} label={`Vertical profile of ${b.name}`} height={260} yMax={yMax} />
          </Card>
        </div>
      </div>
    </>
  );
}
