import Link from 'next/link';
import { notFound } from 'next/navigation';
import { requireMember } from '@/lib/auth/guards';
import { AppError } from '@/lib/errors';
import { getFlightView, type FlightSide, type FlightView } from '@/lib/flights/view';
import { ENGINE_VERSION } from '@/lib/screening';
import { formatDistance, formatMass, formatMassRange, formatPercent } from '@/lib/format';
import type { UnitSystem } from '@/lib/units';
import { Card, PageHeader } from '@/components/ui/card';
import { ButtonLink } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { ScreeningCautions } from '@/components/screening/cautions';
import { profileSeries, thinSegments } from '@/components/screening/profile-series';
import { VerticalProfileChart } from '@/components/charts/vertical-profile-chart';
import { TableHead } from '@/components/ui/table-head';

export const metadata = { title: 'Flight' };

const BASIS_LABEL = { planned: 'Planned (schedule)', flown: 'Flown (track)' } as const;

function cruise(f: FlightSide['flight']): string {
  return f.cruiseFl === f.maxFl ? `FL${f.cruiseFl}` : `FL${f.cruiseFl}–${f.maxFl}`;
}

function Facts({ side, slug, units }: { side: FlightSide; slug: string; units: UnitSystem }) {
  const f = side.flight;
  const rows: [string, React.ReactNode][] = [
    ['Basis', BASIS_LABEL[f.basis]],
    ['Aircraft · fleet', `${f.aircraft}${f.fleet ? ` · ${f.fleet}` : ''}`],
    ['Cruise', cruise(f)],
    ['Fuel', formatMass(f.fuelKg, units)],
    ...(side.trackPoints !== null
      ? ([['Track points', side.trackPoints.toLocaleString('en-GB')]] as [string, string][])
      : []),
    ['Status', f.status === 'failed' ? `Not screened: ${f.failureReason ?? ''}` : f.status],
    ['Engine version', f.engineVersion ?? '—'],
    [
      'Import',
      f.importId !== null ? (
        <Link href={`/w/${slug}/imports`} className="text-accent hover:underline">
          #{f.importId} {f.importFileName ?? ''}
          {f.sourceLine !== null ? `, line ${f.sourceLine}` : ''}
        </Link>
      ) : (
        '—'
      ),
    ],
  ];
  return (
    <dl className="grid grid-cols-[max-content_1fr] gap-x-4 gap-y-1 text-sm">
      {rows.map(([k, v]) => (
        <div key={k} className="contents">
          <dt className="text-ink-soft">{k}</dt>
          <dd>{v}</dd>
        </div>
      ))}
    </dl>
  );
}

function Figures({ side, units }: { side: FlightSide; units: UnitSystem }) {
  const f = side.flight;
  if (f.status !== 'screened')
    return <p className="text-sm text-ink-soft">Figures appear once the flight is screened.</p>;
  return (
    <dl className="grid grid-cols-[max-content_1fr] gap-x-4 gap-y-1 text-sm" data-testid={`figures-${f.basis}`}>
      <dt className="text-ink-soft">Distance</dt>
      <dd className="figure">{formatDistance(f.distanceKm ?? 0, units)}</dd>
      <dt className="text-ink-soft">NOx</dt>
      <dd className="figure">{formatMass(f.noxTotalKg ?? 0, units)}</dd>
      <dt className="text-ink-soft">NOx above the tropopause</dt>
      <dd className="figure">{formatMass(f.noxAboveTropopauseKg ?? 0, units)}</dd>
      <dt className="text-ink-soft">Share above</dt>
      <dd className="figure">{formatPercent(f.fractionAboveTropopause ?? 0, 1)}</dd>
      <dt className="text-ink-soft">Ozone-loss figure (range)</dt>
      <dd className="figure">
        {f.ozoneLoss
          ? `${formatMass(f.ozoneLoss.centralKg, units)} (${formatMassRange(f.ozoneLoss.lowKg, f.ozoneLoss.highKg, units)}), gross catalytic loss`
          : '—'}
      </dd>
    </dl>
  );
}

function PlannedVsFlown({ view, units }: { view: FlightView; units: UnitSystem }) {
  const c = view.comparison;
  if (!c || !view.paired) return null;
  const planned = view.main.flight.basis === 'planned' ? view.main : view.paired;
  const flown = view.main.flight.basis === 'flown' ? view.main : view.paired;
  const signed = (v: number, text: string) => (v > 0 ? `+${text}` : v < 0 ? `−${text}` : text);
  const ps = planned.result ? profileSeries(thinSegments(planned.result.segments), units) : null;
  const fs = flown.result ? profileSeries(thinSegments(flown.result.segments), units) : null;
  return (
    <Card title="Planned vs flown" className="mt-6">
      <section aria-label="Planned vs flown" data-testid="planned-vs-flown">
        <table className="w-full text-sm">
          <caption className="sr-only">Planned and flown figures of this flight</caption>
          <TableHead
            pad="py-1.5"
            rowClassName="border-b border-line"
            columns={[
              'Figure',
              { label: 'Planned', right: true },
              { label: 'Flown', right: true },
              { label: 'Flown − planned', right: true },
            ]}
          />
          <tbody>
            <tr className="border-b border-line">
              <th scope="row" className="py-1.5 pr-3 text-left font-normal">
                NOx above the tropopause
              </th>
              <td className="figure py-1.5 pr-3 text-right">
                {c.planned.noxAboveTropopauseKg === null ? '—' : formatMass(c.planned.noxAboveTropopauseKg, units)}
              </td>
              <td className="figure py-1.5 pr-3 text-right">
                {c.flown.noxAboveTropopauseKg === null ? '—' : formatMass(c.flown.noxAboveTropopauseKg, units)}
              </td>
              <td className="figure py-1.5 text-right">
                {c.noxAboveDeltaKg === null
                  ? '—'
                  : signed(c.noxAboveDeltaKg, formatMass(Math.abs(c.noxAboveDeltaKg), units))}
              </td>
            </tr>
            <tr className="border-b border-line">
              <th scope="row" className="py-1.5 pr-3 text-left font-normal">
                Share of NOx above
              </th>
              <td className="figure py-1.5 pr-3 text-right">
                {c.planned.fractionAboveTropopause === null ? '—' : formatPercent(c.planned.fractionAboveTropopause, 1)}
              </td>
              <td className="figure py-1.5 pr-3 text-right">
                {c.flown.fractionAboveTropopause === null ? '—' : formatPercent(c.flown.fractionAboveTropopause, 1)}
              </td>
              <td className="figure py-1.5 text-right">
                {c.shareAboveDelta === null
                  ? '—'
                  : `${signed(c.shareAboveDelta, formatPercent(Math.abs(c.shareAboveDelta), 1))} points`}
              </td>
            </tr>
            <tr>
              <th scope="row" className="py-1.5 pr-3 text-left font-normal">
                Fuel
              </th>
              <td className="figure py-1.5 pr-3 text-right">{formatMass(c.planned.fuelKg, units)}</td>
              <td className="figure py-1.5 pr-3 text-right">{formatMass(c.flown.fuelKg, units)}</td>
              <td className="figure py-1.5 text-right">
                {signed(
                  c.flown.fuelKg - c.planned.fuelKg,
                  formatMass(Math.abs(c.flown.fuelKg - c.planned.fuelKg), units),
                )}
              </td>
            </tr>
          </tbody>
        </table>
        {fs && ps ? (
          <div className="mt-4">
            <VerticalProfileChart
              series={fs}
              overlay={{ series: ps, label: 'Planned cruise' }}
              label="Vertical profile of the flown track with the planned cruise over it"
              height={300}
            />
          </div>
        ) : null}
        <p className="mt-3 text-xs text-ink-soft">
          Both sides are screening estimates with the same method; the flown side follows the track&apos;s own levels,
          climb and descent included, while the plan is flown at its cruise levels only.
        </p>
      </section>
    </Card>
  );
}

export default async function FlightPage({ params }: { params: Promise<{ slug: string; id: string }> }) {
  const { slug, id } = await params;
  const { workspace, user } = await requireMember(slug, 'flights:read');
  if (!/^\d{1,12}$/.test(id)) notFound();
  let view: FlightView;
  try {
    view = await getFlightView({ workspaceId: workspace.id }, Number(id));
  } catch (err) {
    if (err instanceof AppError && err.status === 404) notFound();
    throw err;
  }
  const units = user.units;
  const f = view.main.flight;
  const result = view.main.result;
  const series = result ? profileSeries(thinSegments(result.segments), units) : null;
  return (
    <>
      <PageHeader
        title={`${f.flight} · ${f.origin} → ${f.destination}`}
        lead={`${f.date} · ${BASIS_LABEL[f.basis]}${view.paired ? ` · also ${view.paired.flight.basis} (see below)` : ''}`}
        actions={
          <>
            {view.paired ? (
              <ButtonLink href={`/w/${slug}/flights/${view.paired.flight.id}`} variant="secondary">
                Open the {view.paired.flight.basis} flight
              </ButtonLink>
            ) : null}
            <ButtonLink href={`/w/${slug}/flights`} variant="secondary">
              Flights
            </ButtonLink>
          </>
        }
      />
      <div className="grid gap-6 md:grid-cols-2">
        <Card title="Inputs">
          <Facts side={view.main} slug={slug} units={units} />
        </Card>
        <Card title="Figures">
          <Figures side={view.main} units={units} />
          {f.engineVersion !== null && f.engineVersion !== ENGINE_VERSION ? (
            <p className="mt-3 text-xs text-ink-soft">
              Screened with engine {f.engineVersion}; the profile below is drawn with the current engine (
              {ENGINE_VERSION}). Re-screen the import to bring the figures up to date.
            </p>
          ) : null}
        </Card>
      </div>
      <Card title="Vertical profile" className="mt-6">
        {series ? (
          <VerticalProfileChart series={series} label={`Vertical profile of ${f.flight} on ${f.date}`} />
        ) : (
          <Notice tone="caution" title="No profile">
            {view.main.resultError ?? 'This flight could not be screened again.'}
          </Notice>
        )}
      </Card>
      <PlannedVsFlown view={view} units={units} />
      {result ? (
        <div className="mt-6">
          <ScreeningCautions cautions={result.cautions} />
        </div>
      ) : null}
    </>
  );
}
