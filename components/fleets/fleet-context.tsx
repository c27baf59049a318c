import { ScrollRegion } from '@/components/ui/scroll-region';
import type { UnitSystem } from '@/db/users';
import type { FleetComparison } from '@/lib/fleets/types';
import { formatMass } from '@/lib/format';
import { Card } from '@/components/ui/card';

export function pctChange(v: number): string {
  const abs = Math.abs(v);
  const text = abs >= 0.01 ? v.toFixed(3) : abs === 0 ? '0' : v.toPrecision(2);
  return `${text} %`;
}

/** Annualised NOx above the tropopause per fleet, set against published fleet-scale model results. */
export function FleetContext({
  context,
  cautions,
  units,
}: {
  context: FleetComparison['context'];
  cautions: string[];
  units: UnitSystem;
}) {
  const rows = [...context.fleets, context.total];
  return (
    <Card title="Fleet-scale context">
      <p className="text-sm text-ink-soft">{context.method}</p>
      <ScrollRegion label="Fleet-scale context table" className="mt-4">
        <table className="figure w-full min-w-[680px] text-sm">
          <thead className="border-b border-line-strong text-left text-xs uppercase tracking-wide text-ink-soft">
            <tr>
              <th scope="col" className="px-2 py-2 font-medium">
                Fleet
              </th>
              <th scope="col" className="px-2 py-2 text-right font-medium">
                NOx above tropopause per year
              </th>
              {context.total.studies.map((s) => (
                <th key={s.study} scope="col" className="px-2 py-2 font-medium">
                  {s.citation.split(',')[0]} ({s.altitudeKm[0]}–{s.altitudeKm[1]} km)
                  <span className="block normal-case tracking-normal text-ink-faint">
                    global column ozone, scaled, ±50 %
                  </span>
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {rows.map((c, i) => (
              <tr
                key={`${c.fleetId ?? 'none'}-${i}`}
                className={`border-b border-line align-top ${i === rows.length - 1 ? 'bg-paper-sunk font-semibold' : ''}`}
              >
                <td className="whitespace-nowrap px-2 py-2">{c.fleetName}</td>
                <td className="whitespace-nowrap px-2 py-2 text-right">{formatMass(c.annualNoxAboveKg, units)}</td>
                {c.studies.map((s) => (
                  <td key={s.study} className="px-2 py-2">
                    {s.applicable && s.columnChangePct ? (
                      <>
                        {pctChange(s.columnChangePct.central)}
                        <span className="block text-xs font-normal text-ink-faint">
                          {pctChange(s.columnChangePct.low)} to {pctChange(s.columnChangePct.high)};{' '}
                          {formatMass(s.noxInBandKgPerYear, units)}/yr in band
                        </span>
                      </>
                    ) : (
                      <span className="font-normal text-ink-soft">
                        Not applicable
                        <span className="block text-xs text-ink-faint">
                          No NOx above the tropopause at {s.altitudeKm[0]}–{s.altitudeKm[1]} km; never extrapolated.
                        </span>
                      </span>
                    )}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </ScrollRegion>
      <p className="mt-3 text-xs text-ink-soft">
        Sources: {context.total.studies.map((s) => s.citation).join('; ')}. These are fleet-scale model results scaled
        linearly, not a property of these flights; check each study&apos;s NOx mass basis before quoting a figure.
      </p>
      <ul className="mt-3 list-disc space-y-0.5 pl-5 text-xs text-ink-soft">
        {cautions.map((c) => (
          <li key={c}>{c}</li>
        ))}
      </ul>
    </Card>
  );
}
