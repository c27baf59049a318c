import { requireMember } from '@/lib/auth/guards';
import { listAircraftTypes, listEngines } from '@/db/engines';
import { listAircraftForScreening } from '@/db/aircraft-lookup';
import { listRoutes } from '@/db/routes';
import { listSoundings } from '@/db/soundings';
import {
  DAYLIGHT_FACTOR_EQUINOX,
  DEFAULT_FUEL_PENALTY_PCT_PER_1000_FT,
  DEFAULT_MAX_FUEL_PENALTY_PCT,
  DEFAULT_OZONE_INPUTS,
  findAirport,
} from '@/lib/screening';
import { todayIso } from '@/lib/clock';
import type { AssumptionDefaults } from '@/components/screening/screen-form-adapter';
import { PageHeader } from '@/components/ui/card';
import { ScreeningCaution } from '@/components/ui/notice';
import { Suspense } from 'react';
import { FormSkeleton } from '@/components/screening/skeletons';
import type { UnitSystem } from '@/lib/units';
import { ScreenFormIsland } from './screen-form-island';

export const metadata = { title: 'Screen a flight' };

const band = (b: { low: number; central: number; high: number }) => ({ low: b.low, central: b.central, high: b.high });

export default async function ScreenPage({ params }: { params: Promise<{ slug: string }> }) {
  const { slug } = await params;
  const { workspace, user } = await requireMember(slug, 'screenings:create');
  return (
    <>
      <PageHeader
        title="Screen a flight"
        lead="How much of this flight's NOx goes above the tropopause, and the ozone-loss screening figure. The preview updates as you type; Save keeps the screening."
      />
      <div className="mb-6">
        <ScreeningCaution />
      </div>
      <Suspense fallback={<FormSkeleton />}>
        <ScreenFormLoader slug={slug} workspaceId={workspace.id} units={user.units} />
      </Suspense>
    </>
  );
}

/** The workspace's aircraft, engines, routes and soundings for the form, read after the permission check. */
async function ScreenFormLoader({
  slug,
  workspaceId,
  units,
}: {
  slug: string;
  workspaceId: number;
  units: UnitSystem;
}) {
  const scope = { workspaceId };
  const [types, lookup, engines, routes, soundings] = await Promise.all([
    listAircraftTypes(scope),
    listAircraftForScreening(scope),
    listEngines(scope),
    listRoutes(scope),
    listSoundings(scope),
  ]);
  const d = DEFAULT_OZONE_INPUTS;
  const defaults: AssumptionDefaults = {
    jO3NoonPerS: band(d.jO3NoonPerS),
    jNo2NoonPerS: band(d.jNo2NoonPerS),
    daylightFactor: band(d.daylightFactor ?? DAYLIGHT_FACTOR_EQUINOX),
    noxToNoyFraction: band(d.noxToNoyFraction),
    ohCm3: d.ohCm3,
    ho2Cm3: d.ho2Cm3,
    relativeHumidity: d.relativeHumidity,
    residenceTime: {
      depthKm: [...d.residenceTime.depthKm],
      years: [...d.residenceTime.years],
      lowFactor: d.residenceTime.lowFactor,
      highFactor: d.residenceTime.highFactor,
    },
  };
  return (
    <ScreenFormIsland
      slug={slug}
      units={units}
      defaults={defaults}
      defaultDate={todayIso()}
      whatIfDefaults={{ limitPct: DEFAULT_MAX_FUEL_PENALTY_PCT, ratePct: DEFAULT_FUEL_PENALTY_PCT_PER_1000_FT }}
      aircraft={types.map((t) => ({
        code: t.code,
        name: t.name,
        engineName: t.engineName,
        engineCount: t.engineCount,
        typicalMach: t.typicalMach,
        typicalFlightLevel: t.typicalFlightLevel,
        directEiGPerKg: t.directEiGPerKg,
        emission: lookup.get(t.code.toUpperCase())?.emission ?? null,
      }))}
      engines={engines.map((e) => ({ id: e.id, name: e.name, fuelFlowKgS: e.fuelFlowKgS, eiNoxGPerKg: e.eiNoxGPerKg }))}
      routes={routes.map((r) => ({
        id: r.id,
        name: r.name,
        notes: r.notes,
        waypoints: r.waypoints,
        coordinates: r.waypoints.map((w) => {
          if (!('airport' in w)) return { lat: w.lat, lon: w.lon };
          const a = findAirport(w.airport);
          return a ? { lat: a.lat, lon: a.lon } : null;
        }),
      }))}
      soundings={soundings.map((s) => ({
        id: s.id,
        name: s.name,
        station: s.station,
        observedAt: s.observedAt,
        levels: s.levels,
        tropopause: s.tropopause,
      }))}
    />
  );
}
