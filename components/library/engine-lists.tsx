import Link from 'next/link';
import { Notice } from '@/components/ui/notice';
import { formatNumber } from '@/lib/format';
import type { UnitSystem } from '@/db/users';
import type { AircraftTypeDto, EngineDto } from '@/db/engines';
import { LTO_MODES } from '@/lib/validation/library';
import { DemoBadge } from '@/components/library/badges';
import { CruiseCheckTag } from '@/components/library/cruise-check-tag';
import { CRUISE_CHECK, cruiseEiCheck } from '@/lib/library/cruise-ei-check';
import { formatFuelFlow, fuelFlowUnit } from '@/components/library/format';

const th = 'py-2 pr-3 text-left text-xs font-medium uppercase tracking-wide text-ink-soft';

/** The workspace's aircraft types: code, emission source, typical cruise, default fleet. */
export function AircraftTypeTable({ slug, types }: { slug: string; types: AircraftTypeDto[] }) {
  return (
    <div className="overflow-x-auto">
      <table className="w-full text-sm">
        <thead>
          <tr>
            <th scope="col" className={th}>
              Code
            </th>
            <th scope="col" className={th}>
              Name
            </th>
            <th scope="col" className={th}>
              Emission
            </th>
            <th scope="col" className={`${th} text-right`}>
              Typical cruise
            </th>
            <th scope="col" className={th}>
              Default fleet
            </th>
          </tr>
        </thead>
        <tbody>
          {types.map((t) => (
            <tr key={t.id} className="border-t border-line">
              <td className="py-2 pr-3 font-mono text-xs whitespace-nowrap">
                <Link
                  href={`/w/${slug}/engines/aircraft/${t.id}`}
                  className="font-semibold text-accent hover:underline"
                >
                  {t.code}
                </Link>
              </td>
              <td className="py-2 pr-3">{t.name || <span className="text-ink-faint">—</span>}</td>
              <td className="py-2 pr-3">
                {t.engineName ? (
                  <>
                    {t.engineCount} × {t.engineName}
                  </>
                ) : t.directEiGPerKg !== null ? (
                  <>
                    Direct EI NOx {formatNumber(t.directEiGPerKg, 1)} g/kg ({t.engineCount} engines)
                  </>
                ) : (
                  <span className="text-caution">No emission data</span>
                )}
              </td>
              <td className="figure py-2 pr-3 text-right whitespace-nowrap">
                FL{String(t.typicalFlightLevel).padStart(3, '0')}, M{formatNumber(t.typicalMach, 2)}
              </td>
              <td className="py-2 pr-3">{t.defaultFleetName ?? <span className="text-ink-faint">—</span>}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

/** One engine on a narrow screen: its LTO table, the cruise check and the types that use it. */
function EngineCard({ slug, e, usedBy, units }: { slug: string; e: EngineDto; usedBy: string[]; units: UnitSystem }) {
  return (
    <li className="py-3">
      <Link href={`/w/${slug}/engines/${e.id}`} className="font-medium text-accent hover:underline">
        {e.name}
      </Link>
      {e.isDemo ? <DemoBadge /> : null}
      {e.source ? <div className="mt-0.5 text-xs text-ink-soft">{e.source}</div> : null}
      <table className="mt-2 w-full max-w-md text-sm">
        <thead className="text-left text-xs text-ink-soft">
          <tr>
            <th scope="col" className="py-0.5 pr-3 font-medium">
              Mode
            </th>
            <th scope="col" className="py-0.5 pr-3 text-right font-medium">
              Fuel flow, {fuelFlowUnit(units)}
            </th>
            <th scope="col" className="py-0.5 text-right font-medium">
              EI NOx, g/kg
            </th>
          </tr>
        </thead>
        <tbody>
          {LTO_MODES.map((m, i) => (
            <tr key={m.key}>
              <td className="py-0.5 pr-3">{m.label}</td>
              <td className="figure py-0.5 pr-3 text-right">{formatFuelFlow(e.fuelFlowKgS[i], units)}</td>
              <td className="figure py-0.5 text-right">{formatNumber(e.eiNoxGPerKg[i], 1)}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <div className="mt-2 flex flex-wrap items-center gap-x-4 gap-y-1 text-sm">
        <span>
          <span className="text-ink-soft">
            Cruise check (FL{CRUISE_CHECK.flightLevel}, M{CRUISE_CHECK.mach.toFixed(2)}, ISA):
          </span>{' '}
          <CruiseCheckTag check={cruiseEiCheck(e)} />
        </span>
        <span>
          <span className="text-ink-soft">Used by:</span>{' '}
          <span className="font-mono text-xs">{usedBy.length ? usedBy.join(', ') : '—'}</span>
        </span>
      </div>
    </li>
  );
}

/** The workspace's engines: cards on narrow screens, one table on wide ones. */
export function EngineTable({
  slug,
  engines,
  types,
  units,
}: {
  slug: string;
  engines: EngineDto[];
  types: AircraftTypeDto[];
  units: UnitSystem;
}) {
  const usedByOf = (id: number) => types.filter((t) => t.engineId === id).map((t) => t.code);
  return (
    <>
      <ul className="divide-y divide-line lg:hidden">
        {engines.map((e) => (
          <EngineCard key={e.id} slug={slug} e={e} usedBy={usedByOf(e.id)} units={units} />
        ))}
      </ul>
      <div className="hidden overflow-x-auto lg:block">
        <table className="w-full text-sm">
          <thead>
            <tr>
              <th scope="col" className={`${th} min-w-[11rem]`}>
                Engine
              </th>
              <th scope="col" className={`${th} text-right`}>
                Fuel flow per engine, {fuelFlowUnit(units)}
                <span className="block font-normal normal-case tracking-normal text-ink-faint">
                  idle · app · c/o · t/o
                </span>
              </th>
              <th scope="col" className={`${th} text-right`}>
                EI NOx, g/kg
                <span className="block font-normal normal-case tracking-normal text-ink-faint">
                  idle · app · c/o · t/o
                </span>
              </th>
              <th scope="col" className={th}>
                Cruise check
                <span className="block font-normal normal-case tracking-normal text-ink-faint">
                  FL{CRUISE_CHECK.flightLevel}, M{CRUISE_CHECK.mach.toFixed(2)}, ISA
                </span>
              </th>
              <th scope="col" className={`${th} whitespace-nowrap`}>
                Used by
              </th>
            </tr>
          </thead>
          <tbody>
            {engines.map((e) => {
              const usedBy = usedByOf(e.id);
              return (
                <tr key={e.id} id={`engine-${e.id}`} className="border-t border-line align-top">
                  <td className="py-2 pr-3">
                    <Link href={`/w/${slug}/engines/${e.id}`} className="font-medium text-accent hover:underline">
                      {e.name}
                    </Link>
                    {e.isDemo ? <DemoBadge /> : null}
                    {e.source ? <div className="mt-0.5 max-w-xs text-xs text-ink-soft">{e.source}</div> : null}
                  </td>
                  <td className="figure py-2 pr-3 text-right whitespace-nowrap">
                    {e.fuelFlowKgS.map((v) => formatFuelFlow(v, units)).join(' · ')}
                  </td>
                  <td className="figure py-2 pr-3 text-right whitespace-nowrap">
                    {e.eiNoxGPerKg.map((v) => formatNumber(v, 1)).join(' · ')}
                  </td>
                  <td className="py-2 pr-3">
                    <CruiseCheckTag check={cruiseEiCheck(e)} />
                  </td>
                  <td className="py-2 pr-3 font-mono text-xs whitespace-nowrap">
                    {usedBy.length ? usedBy.join(', ') : <span className="font-sans text-ink-faint">—</span>}
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
    </>
  );
}

/** What the cruise check is, and what it is not. */
export function CruiseCheckNotice() {
  return (
    <div className="mt-4">
      <Notice tone="caution" title="About the cruise check">
        Boeing Fuel Flow Method 2 at FL{CRUISE_CHECK.flightLevel}, Mach {CRUISE_CHECK.mach.toFixed(2)}, ISA and 60 %
        relative humidity, at a cruise fuel flow of {Math.round(CRUISE_CHECK.takeOffFraction * 100)} % of the take-off
        fuel flow (our rule of thumb for this check only). Modern subsonic turbofans usually sit near 10–20 g/kg at
        cruise (common practice). It tells you whether the numbers look plausible, not what a flight emits: fuel-flow
        correlations are calibrated on subsonic engines, so at Mach above 1 prefer a measured cruise EI. A screening is
        an estimate for planning and reporting support, not a certified inventory.
      </Notice>
    </div>
  );
}
