import Link from 'next/link';
import type { UnitSystem } from '@/db/users';
import { formatMassIn, formatNumber, formatPercent, massColumnUnit } from '@/lib/format';
import type { PeriodFigureSet, TrendPoint } from '@/lib/periods/service';
import { TARGET_METRIC_LABELS } from '@/lib/validation/periods';
import { Card } from '@/components/ui/card';
import { ScrollRegion } from '@/components/ui/scroll-region';
import { metricText, per1000, TARGET_STATUS } from './period-figures';
import { StateBadge } from './state-badge';

/** The period's figures per fleet; nothing when no fleet has a flight in it. */
export function PeriodFleetsCard({ fleets, units }: { fleets: PeriodFigureSet['fleets']; units: UnitSystem }) {
  if (!fleets.length) return null;
  // One unit per column, the one its largest value needs.
  const noxUnit = massColumnUnit(
    fleets.map((f) => f.noxAboveKg),
    units,
  );
  const perUnit = massColumnUnit(
    fleets.map((f) => f.noxAbovePer1000KmKg),
    units,
  );
  return (
    <Card title="By fleet" className="mt-6">
      <ScrollRegion label="Figures by fleet">
        <table className="w-full text-sm">
          <caption className="sr-only">The period&apos;s figures per fleet</caption>
          <thead className="text-left text-xs uppercase tracking-wide text-ink-soft">
            <tr>
              <th className="py-2 pr-3">Fleet</th>
              <th className="py-2 pl-3 text-right">Flights</th>
              <th className="py-2 pl-3 text-right">NOx above tropopause</th>
              <th className="py-2 pl-3 text-right">Share above</th>
              <th className="py-2 pl-3 text-right">Per 1000 km</th>
            </tr>
          </thead>
          <tbody>
            {fleets.map((f) => (
              <tr key={f.fleetId ?? 'none'} className="border-t border-line">
                <td className="py-1.5 pr-3">{f.fleetName}</td>
                <td className="figure py-1.5 pl-3 text-right whitespace-nowrap">{formatNumber(f.flights)}</td>
                <td className="figure py-1.5 pl-3 text-right whitespace-nowrap">
                  {formatMassIn(f.noxAboveKg, noxUnit)}
                </td>
                <td className="figure py-1.5 pl-3 text-right whitespace-nowrap">
                  {f.shareAbove === null ? '–' : formatPercent(f.shareAbove, 1)}
                </td>
                <td className="figure py-1.5 pl-3 text-right whitespace-nowrap">{per1000(f, units, perUnit)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </ScrollRegion>
    </Card>
  );
}

/** One past period's figures against its workspace-wide targets, as one line of text. */
function trendTargetsText(targets: TrendPoint['targets']): string {
  if (!targets.length) return '–';
  return targets
    .map((x) => {
      const { label, unit } = TARGET_METRIC_LABELS[x.metric];
      return `${label}: ${metricText(x.actual, unit)} of ${metricText(x.target, unit)} (${TARGET_STATUS[x.status].label.toLowerCase()})`;
    })
    .join('; ');
}

interface TrendProps {
  slug: string;
  /** The period the page shows, set in bold among the others. */
  current: string;
  trend: TrendPoint[];
  units: UnitSystem;
}

/** This period and the ones before it, each against its workspace-wide targets; nothing without a trend. */
export function PeriodTrendCard({ slug, current, trend, units }: TrendProps) {
  if (!trend.length) return null;
  // One unit per column, the one its largest value needs.
  const noxUnit = massColumnUnit(
    trend.map((r) => r.figures.noxAboveKg),
    units,
  );
  const perUnit = massColumnUnit(
    trend.map((r) => r.figures.noxAbovePer1000KmKg),
    units,
  );
  return (
    <Card title="Trend over past periods" className="mt-6">
      <ScrollRegion label="Trend over past periods">
        <table className="w-full text-sm">
          <caption className="sr-only">
            This period and the four before it, against their workspace-wide targets
          </caption>
          <thead className="text-left text-xs uppercase tracking-wide text-ink-soft">
            <tr>
              <th className="py-2 pr-3">Period</th>
              <th className="py-2 pr-3">State</th>
              <th className="py-2 pl-3 text-right">Flights</th>
              <th className="py-2 pl-3 text-right">NOx above tropopause</th>
              <th className="py-2 pl-3 text-right">Share above</th>
              <th className="py-2 pl-3 text-right">Per 1000 km</th>
              <th className="py-2 pl-3">Against workspace targets</th>
            </tr>
          </thead>
          <tbody>
            {trend.map((r) => (
              <tr key={r.ref} className={`border-t border-line ${r.ref === current ? 'font-medium' : ''}`}>
                <td className="py-1.5 pr-3 whitespace-nowrap">
                  <Link href={`/w/${slug}/periods/${r.ref}`} className="text-accent underline-offset-2 hover:underline">
                    {r.name}
                  </Link>
                </td>
                <td className="py-1.5 pr-3">
                  <StateBadge state={r.state} />
                </td>
                <td className="figure py-1.5 pl-3 text-right whitespace-nowrap">{formatNumber(r.figures.flights)}</td>
                <td className="figure py-1.5 pl-3 text-right whitespace-nowrap">
                  {formatMassIn(r.figures.noxAboveKg, noxUnit)}
                </td>
                <td className="figure py-1.5 pl-3 text-right whitespace-nowrap">
                  {r.figures.shareAbove === null ? '–' : formatPercent(r.figures.shareAbove, 1)}
                </td>
                <td className="figure py-1.5 pl-3 text-right whitespace-nowrap">
                  {per1000(r.figures, units, perUnit)}
                </td>
                <td className="py-1.5 pl-3 text-xs">{trendTargetsText(r.targets)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </ScrollRegion>
    </Card>
  );
}
