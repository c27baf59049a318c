import { ScrollRegion } from '@/components/ui/scroll-region';
import { Card } from '@/components/ui/card';
import type { UnitSystem } from '@/db/users';
import type { FleetPercentiles as Percentiles, FleetPercentilesPending, PercentileBand } from '@/lib/fleets/types';
import { formatMass, formatMassRange, formatNumber } from '@/lib/format';

/**
 * 5-95 % of each fleet's total NOx above the tropopause and ozone figure, from sampling every flight
 * of a fleet together (not a sum of the flights' own bands), with how the inputs are correlated.
 */
export function FleetPercentiles({
  percentiles,
  names,
  units,
}: {
  percentiles: Percentiles | FleetPercentilesPending;
  names: { fleetId: number | null; fleetName: string }[];
  units: UnitSystem;
}) {
  if ('pending' in percentiles)
    return (
      <Card title="How sure: 5–95 % of each fleet's totals">
        <p className="text-sm text-ink-soft" data-testid="fleet-percentiles-pending">
          The band is being prepared: the background worker is still building the sampling data of{' '}
          {formatNumber(percentiles.flightsPending)} of these {formatNumber(percentiles.flights)} flights. Reload in a
          minute or two.
        </p>
      </Card>
    );
  const nameOf = (id: number | null) => names.find((n) => n.fleetId === id)?.fleetName ?? 'No fleet';
  const band = (b: PercentileBand) => (
    <>
      {formatMassRange(b.p5, b.p95, units)}
      <span className="block text-xs text-ink-faint">median {formatMass(b.p50, units)}</span>
    </>
  );
  const rows = [
    ...percentiles.fleets.map((f) => ({ ...f, name: nameOf(f.fleetId) })),
    ...(percentiles.fleets.length > 1 ? [{ ...percentiles.total, name: 'All fleets' }] : []),
  ];
  return (
    <Card title="How sure: 5–95 % of each fleet's totals">
      <ScrollRegion label="Fleet percentiles table">
        <table className="figure w-full min-w-[560px] text-sm" data-testid="fleet-percentiles">
          <caption className="sr-only">
            5th to 95th percentile of each fleet&apos;s total NOx above the tropopause and ozone-loss figure
          </caption>
          <thead className="border-b border-line-strong text-left text-xs uppercase tracking-wide text-ink-soft">
            <tr>
              <th className="px-2 py-2 font-medium">Fleet</th>
              <th className="px-2 py-2 text-right font-medium">Flights</th>
              <th className="px-2 py-2 text-right font-medium">NOx above tropopause, 5–95 %</th>
              <th className="px-2 py-2 text-right font-medium">Ozone-loss figure, 5–95 %</th>
            </tr>
          </thead>
          <tbody>
            {rows.map((r) => (
              <tr key={r.name} className="border-b border-line">
                <td className="px-2 py-2 align-top">{r.name}</td>
                <td className="px-2 py-2 text-right align-top">{formatNumber(r.flightsSampled)}</td>
                <td className="whitespace-nowrap px-2 py-2 text-right align-top text-strato-strong">
                  {band(r.noxAboveTropopauseKg)}
                </td>
                <td className="whitespace-nowrap px-2 py-2 text-right align-top">{band(r.ozoneLossKg)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </ScrollRegion>
      <p className="mt-3 text-xs text-ink-soft">{percentiles.note}</p>
      {percentiles.flightsLeftOut > 0 ? (
        <p className="mt-1 text-xs text-ink-soft">
          {formatNumber(percentiles.flightsLeftOut)} flights screened by an older engine version are not in the
          sampling; re-screen their imports to include them.
        </p>
      ) : null}
    </Card>
  );
}
