import { ScrollRegion } from '@/components/ui/scroll-region';
import { requireMember } from '@/lib/auth/guards';
import { getMonthSummaries, getMonthlyTrend } from '@/db/portfolio';
import { Card, PageHeader, Stat } from '@/components/ui/card';
import { ScreeningCaution } from '@/components/ui/notice';
import { ButtonLink } from '@/components/ui/button';
import { can } from '@/lib/auth/policy';
import { formatMass, formatMassIn, formatNumber, formatPercent, massColumnUnit } from '@/lib/format';
import { monthBounds } from '@/lib/clock';
import { COUNT_HINTS, COUNT_LABELS } from '@/lib/counts';
import { PeriodOverviewCard } from '@/components/periods/period-overview-card';
import { Suspense } from 'react';
import { OverviewPercentiles } from '@/components/fleets/overview-percentiles';

export default async function OverviewPage({
  params,
  searchParams,
}: {
  params: Promise<{ slug: string }>;
  searchParams: Promise<{ period?: string | string[] }>;
}) {
  const { slug } = await params;
  const { period } = await searchParams;
  const { workspace, role, user } = await requireMember(slug, 'flights:read');
  const [summaries, trend] = await Promise.all([
    getMonthSummaries({ workspaceIds: [workspace.id] }),
    getMonthlyTrend({ workspaceId: workspace.id }, 6),
  ]);
  const s = summaries.get(workspace.id);
  const peak = Math.max(1, ...trend.map((t) => t.noxTotalKg));
  // One unit per trend column, the one its largest month needs.
  const totalUnit = massColumnUnit(
    trend.map((t) => t.noxTotalKg),
    user.units,
  );
  const aboveUnit = massColumnUnit(
    trend.map((t) => t.noxAboveKg),
    user.units,
  );
  const ozoneUnit = massColumnUnit(
    trend.map((t) => t.ozoneCentralKg),
    user.units,
  );
  const { from, to } = monthBounds();
  const share = s && s.noxTotalKg > 0 ? s.noxAboveKg / s.noxTotalKg : 0;
  return (
    <>
      <PageHeader
        title={workspace.name}
        lead={`This month (${from} to ${to}): saved screenings, imported flights screened, and the NOx they put above the tropopause.`}
        actions={
          can(role, 'screenings:create') ? (
            <ButtonLink href={`/w/${slug}/screen`}>Screen a flight</ButtonLink>
          ) : undefined
        }
      />
      <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-5">
        <Stat
          label={COUNT_LABELS.savedScreenings}
          value={<span data-testid="count-saved-screenings">{formatNumber(s?.savedScreenings ?? 0)}</span>}
          sub={COUNT_HINTS.savedScreenings}
        />
        <Stat
          label={COUNT_LABELS.importedFlightsScreened}
          value={<span data-testid="count-imported-flights">{formatNumber(s?.importedFlightsScreened ?? 0)}</span>}
          sub={COUNT_HINTS.importedFlightsScreened}
        />
        <Stat label="NOx emitted" value={formatMass(s?.noxTotalKg ?? 0, user.units)} sub="as NO2" />
        <Stat
          label="NOx above tropopause"
          value={formatMass(s?.noxAboveKg ?? 0, user.units)}
          sub="as NO2"
          tone="strato"
        />
        <Stat label="Share above" value={formatPercent(share, 1)} tone="strato" />
      </div>
      <Suspense fallback={null}>
        <OverviewPercentiles workspaceId={workspace.id} from={from} to={to} units={user.units} />
      </Suspense>
      <Card title="Trend, last six months" className="mt-6">
        <ScrollRegion label="Trend, last six months">
          <table className="w-full text-sm">
            <caption className="sr-only">Saved screenings, imported flights screened and their NOx by month</caption>
            <thead className="text-left text-xs uppercase tracking-wide text-ink-soft">
              <tr>
                <th className="py-2 pr-3">Month</th>
                <th className="py-2 pl-3 text-right">{COUNT_LABELS.savedScreenings}</th>
                <th className="py-2 pl-3 text-right">{COUNT_LABELS.importedFlightsScreened}</th>
                <th className="py-2 pl-3 text-right">NOx emitted</th>
                <th className="py-2 pl-3 text-right">NOx above tropopause</th>
                <th className="py-2 pl-3 text-right">Share above</th>
                <th className="py-2 pl-3 text-right">Ozone-loss figure</th>
                <th className="w-1/4 py-2 pl-4">
                  <span className="sr-only">Bar: NOx emitted, the part above the tropopause darker</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {trend.map((t) => (
                <tr key={t.month} className="border-t border-line">
                  <td className="py-1.5 whitespace-nowrap">{t.month}</td>
                  <td className="figure py-1.5 pl-3 text-right whitespace-nowrap">{formatNumber(t.savedScreenings)}</td>
                  <td className="figure py-1.5 pl-3 text-right whitespace-nowrap">
                    {formatNumber(t.importedFlightsScreened)}
                  </td>
                  <td className="figure py-1.5 pl-3 text-right whitespace-nowrap">
                    {formatMassIn(t.noxTotalKg, totalUnit)}
                  </td>
                  <td className="figure py-1.5 pl-3 text-right whitespace-nowrap">
                    {formatMassIn(t.noxAboveKg, aboveUnit)}
                  </td>
                  <td className="figure py-1.5 pl-3 text-right whitespace-nowrap">
                    {t.noxTotalKg > 0 ? formatPercent(t.noxAboveKg / t.noxTotalKg, 1) : '–'}
                  </td>
                  <td className="figure py-1.5 pl-3 text-right whitespace-nowrap">
                    {formatMassIn(t.ozoneCentralKg, ozoneUnit)}
                  </td>
                  <td className="py-1.5 pl-4" aria-hidden="true">
                    <div className="h-3 rounded-sm bg-tropo-soft" style={{ width: `${(100 * t.noxTotalKg) / peak}%` }}>
                      <div
                        className="h-3 rounded-sm bg-strato"
                        style={{ width: `${t.noxTotalKg > 0 ? (100 * t.noxAboveKg) / t.noxTotalKg : 0}%` }}
                      />
                    </div>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </ScrollRegion>
        <p className="mt-3 text-xs text-ink-faint">
          Imported flights count in the month they flew, saved screenings in the month they were saved. The ozone-loss
          figure is the central value of a gross catalytic loss, with a wide low–high band on each screening.
        </p>
      </Card>
      <PeriodOverviewCard
        slug={slug}
        workspaceId={workspace.id}
        period={Array.isArray(period) ? period[0] : period}
        units={user.units}
      />
      <div className="mt-6">
        <ScreeningCaution />
      </div>
    </>
  );
}
