import type { CruiseLevelRow } from '@/lib/screening';
import type { UnitSystem } from '@/lib/units';
import { formatMass, formatMassRange, formatNumber } from '@/lib/format';
import { ScrollRegion } from '@/components/ui/scroll-region';

function levelsLabel(row: Pick<CruiseLevelRow, 'flightLevels'>): string {
  return row.flightLevels.map((fl) => `FL${fl}`).join(' → ');
}

function deltaLabel(deltaFt: number): string {
  if (deltaFt === 0) return 'as planned';
  return `${deltaFt > 0 ? '+' : '−'}${formatNumber(Math.abs(deltaFt))} ft`;
}

function signedMass(kg: number, units: UnitSystem): string {
  if (kg === 0) return '±0';
  return `${kg > 0 ? '+' : '−'}${formatMass(Math.abs(kg), units)}`;
}

/**
 * Other cruise levels for the same flight: fuel with the penalty for leaving the planned level and its
 * CO2, the NOx above the tropopause and the ozone figure; the level within the limit with the least
 * of what the planner chose to minimise marked, the mark named after it.
 */
export function WhatIfTable({
  rows,
  units,
  limitPct,
  ratePctPer1000Ft,
  compact = false,
}: {
  rows: readonly CruiseLevelRow[];
  units: UnitSystem;
  limitPct: number;
  ratePctPer1000Ft: number;
  /** Fewer columns for a narrow panel: change and fuel go under the level, the limit shows as shading. */
  compact?: boolean;
}) {
  const best = rows.find((r) => r.lowestImpact);
  const markName = rows[0]?.markName ?? 'Least ozone figure';
  const what = rows[0]?.minimise === 'nox-above-tropopause' ? 'NOx above the tropopause' : 'gross ozone-loss figure';
  const badge = (
    <span
      className={`${compact ? 'mt-0.5 block w-fit' : 'ml-2'} whitespace-nowrap rounded bg-tropo-strong px-1.5 py-0.5 text-[11px] font-semibold uppercase tracking-wide text-white`}
    >
      {markName}
    </span>
  );
  return (
    <div>
      <ScrollRegion label="Other cruise levels">
        <table className={`w-full text-sm ${compact ? '' : 'min-w-[640px]'}`} data-testid="what-if-table">
          <caption className="sr-only">
            Cruise levels compared, with a fuel-penalty limit of {formatNumber(limitPct, 1)} %
          </caption>
          <thead className="text-left text-xs uppercase tracking-wide text-ink-soft">
            <tr>
              <th scope="col" className="py-2 pr-3">
                Cruise
              </th>
              {compact ? null : (
                <th scope="col" className="py-2 pr-3">
                  Change
                </th>
              )}
              {compact ? null : (
                <th scope="col" className="py-2 pr-3 text-right">
                  Fuel
                </th>
              )}
              <th scope="col" className="py-2 pr-3 text-right">
                Fuel penalty
              </th>
              {compact ? null : (
                <th scope="col" className="py-2 pr-3 text-right">
                  Fuel / CO2 change
                </th>
              )}
              <th scope="col" className="py-2 pr-3 text-right">
                NOx above tropopause
              </th>
              <th scope="col" className="py-2 pr-3 text-right">
                Ozone-loss figure
              </th>
              {compact ? null : (
                <th scope="col" className="py-2">
                  Within limit
                </th>
              )}
            </tr>
          </thead>
          <tbody className="figure">
            {rows.map((r) => (
              <tr
                key={r.deltaFt}
                data-lowest-impact={r.lowestImpact ? 'true' : undefined}
                className={`border-t border-line ${r.lowestImpact ? 'bg-tropo-soft font-medium' : ''} ${r.withinLimit ? '' : 'text-ink-faint'}`}
              >
                <th scope="row" className="py-2 pr-3 text-left font-medium">
                  {/* Step climbs list several levels: each stays whole, the row wraps between them. */}
                  {r.flightLevels.map((fl, i) => (
                    <span key={i} className="whitespace-nowrap">
                      {i ? ' → ' : ''}FL{fl}{' '}
                    </span>
                  ))}
                  {r.lowestImpact ? badge : null}
                  {compact ? (
                    <span className="block text-xs font-normal text-ink-faint">
                      {deltaLabel(r.deltaFt)}, fuel {formatMass(r.fuelKg, units)} ({signedMass(r.fuelChangeKg, units)},
                      CO2 {signedMass(r.co2ChangeKg, units)}){r.withinLimit ? '' : ', over the limit'}
                    </span>
                  ) : null}
                </th>
                {compact ? null : <td className="whitespace-nowrap py-2 pr-3">{deltaLabel(r.deltaFt)}</td>}
                {compact ? null : (
                  <td className="whitespace-nowrap py-2 pr-3 text-right">{formatMass(r.fuelKg, units)}</td>
                )}
                <td className="whitespace-nowrap py-2 pr-3 text-right">{formatNumber(r.fuelPenaltyPct, 1)} %</td>
                {compact ? null : (
                  <td className="whitespace-nowrap py-2 pr-3 text-right">
                    {signedMass(r.fuelChangeKg, units)}
                    <span className="block text-xs font-normal text-ink-faint">
                      CO2 {signedMass(r.co2ChangeKg, units)}
                    </span>
                  </td>
                )}
                <td className="whitespace-nowrap py-2 pr-3 text-right">{formatMass(r.noxAboveTropopauseKg, units)}</td>
                <td className="py-2 pr-3 text-right">
                  <span className="whitespace-nowrap">{formatMass(r.ozoneLoss.centralKg, units)}</span>
                  <span className="block text-xs font-normal text-ink-faint">
                    {formatMassRange(r.ozoneLoss.lowKg, r.ozoneLoss.highKg, units)}
                  </span>
                </td>
                {compact ? null : <td className="py-2">{r.withinLimit ? 'yes' : 'no'}</td>}
              </tr>
            ))}
          </tbody>
        </table>
      </ScrollRegion>
      <p className="mt-2 text-xs text-ink-soft">
        {best
          ? `${markName}: within a ${formatNumber(limitPct, 1)} % fuel penalty, ${levelsLabel(best)} gives the least ${what}, at the fuel and CO2 change shown beside it.`
          : `No level stays within a ${formatNumber(limitPct, 1)} % fuel penalty.`}{' '}
        The ozone figure is a gross catalytic loss: below about 13-20 km the same NOx likely makes more ozone than it
        destroys (net production), so a lower level is not an ozone gain by itself. The fuel penalty (
        {formatNumber(ratePctPer1000Ft, 1)} % per 1000 ft away from the planned level) is a rule of thumb (common
        practice), not a performance calculation: check any level against the flight plan, performance data and ATC
        constraints.
      </p>
    </div>
  );
}
