import 'server-only';
import { mixedEngineVersionCaution } from './units';
import {
  aggregateFlights,
  noxAboveByLevels,
  type FlightAggregate,
  type FlightFilters,
  countFlightsByEngineVersion,
} from '@/db/fleets';
import { findAirport, flightLevelToMetres, fleetOzoneColumnContext, geometricFromGeopotentialM } from '@/lib/screening';
import { CO2_PER_KG_FUEL } from '@/lib/screening/screen-flight';
import { todayIso } from '@/lib/clock';
import { invalidFields } from '@/lib/errors';
import { MAX_PERIOD_MONTHS, monthsSpanned, type FleetCompareQuery } from '@/lib/validation/fleets';
import { fleetPercentiles } from './percentiles';
import type { CompareRow, FleetComparison, FleetContextRow, FleetSeries } from './types';

export const NO_FLEET_NAME = 'No fleet';

/** Cautions shown beside every fleet figure. */
export const FLEET_CAUTIONS: readonly string[] = Object.freeze([
  'Screening estimates for planning and reporting support: not a certified emissions inventory and not a regulatory method.',
  'The ozone figure is a gross catalytic loss by the added NOx, not a net change of the ozone column; below about 13-20 km the same NOx also makes ozone.',
  'Fuel-flow correlations (BFFM2, DLR) are calibrated on subsonic engines; above Mach 1 prefer a measured cruise EI NOx.',
  'Each flight is screened at cruise along its entered track: climb, descent and the LTO cycle are not included.',
  "Follow the operator's approved methods and the applicable regulation; these figures do not replace them.",
]);

export const COMPARE_NOTES: FleetComparison['notes'] = {
  co2: `CO2 = ${CO2_PER_KG_FUEL} kg per kg of fuel (ICAO CORSIA conversion factor for Jet A/A-1).`,
  ratios:
    'Share above and NOx above per 1000 km are recomputed from the summed masses and distances, never averaged over flights.',
  ozone:
    'Ozone-loss figure: gross catalytic loss, central value with the low-high screening band (all inputs at their low or high values together).',
  levelBand: 'The level band keeps flights whose cruise, from the first to the highest flight level, touches the band.',
};

const CONTEXT_METHOD =
  "The period's NOx above the tropopause is scaled to a year (x 365.25 / days in the period) and placed, by geometric altitude of its cruise levels (ISA pressure altitude converted with r0 = 6 356 766 m; a flight's NOx split evenly between its first and highest level), against published supersonic-fleet model results, scaled linearly with a +/-50 % band and only inside the altitudes each study covers.";

const addDays = (iso: string, n: number) =>
  new Date(Date.parse(`${iso}T00:00:00Z`) + n * 86_400_000).toISOString().slice(0, 10);

function firstOfMonthBefore(iso: string, monthsBack: number): string {
  const [y, m] = iso.split('-').map(Number);
  const d = new Date(Date.UTC(y, m - 1 - monthsBack, 1));
  return d.toISOString().slice(0, 10);
}

/** The period asked for, with defaults: the current month and the two before it, up to today. */
export function resolvePeriod(
  q: { from?: string; to?: string },
  today = todayIso(),
): { from: string; to: string; days: number } {
  let to = q.to;
  let from = q.from;
  if (!to) to = from && from > today ? addDays(from, 30) : today;
  if (!from) from = firstOfMonthBefore(to, 2);
  if (from > to) throw invalidFields([{ path: 'to', message: 'The end of the period is before its start.' }]);
  if (monthsSpanned(from, to) > MAX_PERIOD_MONTHS)
    throw invalidFields([{ path: 'to', message: `Compare at most ${MAX_PERIOD_MONTHS} months at a time.` }]);
  const days = Math.round((Date.parse(`${to}T00:00:00Z`) - Date.parse(`${from}T00:00:00Z`)) / 86_400_000) + 1;
  return { from, to, days };
}

/** Every YYYY-MM from the period's first month to its last. */
export function monthsOf(from: string, to: string): string[] {
  const out: string[] = [];
  let [y, m] = from.split('-').map(Number);
  const [ty, tm] = to.split('-').map(Number);
  while (y < ty || (y === ty && m <= tm)) {
    out.push(`${y}-${String(m).padStart(2, '0')}`);
    m += 1;
    if (m > 12) {
      m = 1;
      y += 1;
    }
  }
  return out;
}

/**
 * Route text -> groups of airport codes. Each word (EGLL, LHR, "EGLL-KSFO") must match the origin
 * or the destination; an airport's ICAO and IATA codes both count.
 */
export function routeTerms(text: string | undefined): string[][] | undefined {
  if (!text) return undefined;
  const words = text
    .toUpperCase()
    .split(/[^A-Z0-9]+/)
    .filter(Boolean)
    .slice(0, 4);
  if (!words.length) return undefined;
  return words.map((w) => {
    const a = findAirport(w);
    return [...new Set([w, ...(a?.icao ? [a.icao] : []), ...(a?.iata ? [a.iata] : [])])];
  });
}

export function toFlightFilters(q: FleetCompareQuery, period: { from: string; to: string }): FlightFilters {
  return {
    from: period.from,
    to: period.to,
    aircraft: q.aircraft,
    routeTerms: routeTerms(q.route),
    minFl: q.minFl,
    maxFl: q.maxFl,
    fleetIds: q.fleets,
    basis: q.basis,
  };
}

type Sums = Omit<FlightAggregate, 'fleetId' | 'fleetName' | 'month' | 'aircraftCode'>;

const zero = (): Sums => ({
  flights: 0,
  distanceKm: 0,
  fuelKg: 0,
  noxTotalKg: 0,
  noxAboveKg: 0,
  ozoneCentralKg: 0,
  ozoneLowKg: 0,
  ozoneHighKg: 0,
});

function add(a: Sums, b: Sums): Sums {
  return {
    flights: a.flights + b.flights,
    distanceKm: a.distanceKm + b.distanceKm,
    fuelKg: a.fuelKg + b.fuelKg,
    noxTotalKg: a.noxTotalKg + b.noxTotalKg,
    noxAboveKg: a.noxAboveKg + b.noxAboveKg,
    ozoneCentralKg: a.ozoneCentralKg + b.ozoneCentralKg,
    ozoneLowKg: a.ozoneLowKg + b.ozoneLowKg,
    ozoneHighKg: a.ozoneHighKg + b.ozoneHighKg,
  };
}

/** A row's derived figures, always from its sums. */
export function rowOf(
  s: Sums,
  id: { key: string; fleetId: number | null; fleetName: string; month?: string | null; aircraftCode?: string | null },
): CompareRow {
  return {
    key: id.key,
    fleetId: id.fleetId,
    fleetName: id.fleetName,
    month: id.month ?? null,
    aircraftCode: id.aircraftCode ?? null,
    flights: s.flights,
    distanceKm: s.distanceKm,
    fuelKg: s.fuelKg,
    co2Kg: s.fuelKg * CO2_PER_KG_FUEL,
    noxTotalKg: s.noxTotalKg,
    noxAboveKg: s.noxAboveKg,
    shareAbove: s.noxTotalKg > 0 ? s.noxAboveKg / s.noxTotalKg : null,
    noxAbovePer1000KmKg: s.distanceKm > 0 ? (s.noxAboveKg / s.distanceKm) * 1000 : null,
    ozone: { centralKg: s.ozoneCentralKg, lowKg: s.ozoneLowKg, highKg: s.ozoneHighKg },
  };
}

const fleetKey = (id: number | null) => (id === null ? 'none' : String(id));
const nameOf = (a: { fleetName: string | null }) => a.fleetName ?? NO_FLEET_NAME;

function geometricKm(flightLevel: number): number {
  return geometricFromGeopotentialM(flightLevelToMetres(flightLevel)) / 1000;
}

function contextRow(
  fleetId: number | null,
  fleetName: string,
  levels: { cruiseFl: number; maxFl: number; noxAboveKg: number }[],
  days: number,
): FleetContextRow {
  const perYear = 365.25 / days;
  const byAltitude: { geometricAltitudeKm: number; noxKgPerYear: number }[] = [];
  let annual = 0;
  for (const l of levels) {
    const yearly = l.noxAboveKg * perYear;
    annual += yearly;
    if (l.cruiseFl === l.maxFl) byAltitude.push({ geometricAltitudeKm: geometricKm(l.cruiseFl), noxKgPerYear: yearly });
    else {
      byAltitude.push({ geometricAltitudeKm: geometricKm(l.cruiseFl), noxKgPerYear: yearly / 2 });
      byAltitude.push({ geometricAltitudeKm: geometricKm(l.maxFl), noxKgPerYear: yearly / 2 });
    }
  }
  return { fleetId, fleetName, annualNoxAboveKg: annual, studies: fleetOzoneColumnContext(byAltitude) };
}

/** Orders fleets by name with "No fleet" last. */
function byFleetName(
  a: { fleetId: number | null; fleetName: string },
  b: { fleetId: number | null; fleetName: string },
): number {
  if (a.fleetId === null) return 1;
  if (b.fleetId === null) return -1;
  return a.fleetName.localeCompare(b.fleetName);
}

/**
 * The fleet comparison: rows per fleet (and month or aircraft type), the totals row, monthly series
 * per fleet for the charts, and the fleet-scale context. Figures are SI (kg, km); display converts.
 */
export async function compareFleets(
  scope: { workspaceId: number },
  q: FleetCompareQuery,
  today = todayIso(),
  options: { percentiles?: boolean } = {},
): Promise<FleetComparison> {
  const period = resolvePeriod(q, today);
  const filters = toFlightFilters(q, period);
  const [grouped, monthly, levels, engineVersions, percentiles] = await Promise.all([
    q.groupBy === 'fleet'
      ? Promise.resolve(null)
      : aggregateFlights(scope, filters, { month: q.groupBy === 'month', aircraft: q.groupBy === 'aircraft' }),
    aggregateFlights(scope, filters, { month: true }),
    noxAboveByLevels(scope, filters),
    countFlightsByEngineVersion(scope, filters),
    options.percentiles === false ? Promise.resolve(null) : fleetPercentiles(scope, filters),
  ]);

  const fleets = new Map<
    string,
    { fleetId: number | null; fleetName: string; sums: Sums; byMonth: Map<string, Sums> }
  >();
  for (const a of monthly) {
    const k = fleetKey(a.fleetId);
    const f = fleets.get(k) ?? {
      fleetId: a.fleetId,
      fleetName: nameOf(a),
      sums: zero(),
      byMonth: new Map<string, Sums>(),
    };
    f.sums = add(f.sums, a);
    f.byMonth.set(a.month ?? '', add(f.byMonth.get(a.month ?? '') ?? zero(), a));
    fleets.set(k, f);
  }
  const fleetList = [...fleets.values()].sort(byFleetName);
  const totalSums = fleetList.reduce((acc, f) => add(acc, f.sums), zero());

  let rows: CompareRow[];
  if (grouped === null) {
    rows = fleetList.map((f) =>
      rowOf(f.sums, { key: fleetKey(f.fleetId), fleetId: f.fleetId, fleetName: f.fleetName }),
    );
  } else {
    rows = grouped
      .map((a) =>
        rowOf(a, {
          key: `${fleetKey(a.fleetId)}:${a.month ?? a.aircraftCode ?? ''}`,
          fleetId: a.fleetId,
          fleetName: nameOf(a),
          month: a.month ?? null,
          aircraftCode: a.aircraftCode ?? null,
        }),
      )
      .sort(
        (x, y) => byFleetName(x, y) || (x.month ?? x.aircraftCode ?? '').localeCompare(y.month ?? y.aircraftCode ?? ''),
      );
  }

  const months = monthsOf(period.from, period.to);
  const series: FleetSeries[] = fleetList.map((f) => ({
    fleetId: f.fleetId,
    fleetName: f.fleetName,
    noxAboveKg: months.map((m) => f.byMonth.get(m)?.noxAboveKg ?? 0),
    shareAbove: months.map((m) => {
      const s = f.byMonth.get(m);
      return s && s.noxTotalKg > 0 ? s.noxAboveKg / s.noxTotalKg : null;
    }),
  }));

  const levelsOf = (k: string) => levels.filter((l) => fleetKey(l.fleetId) === k);
  const context = {
    fleets: fleetList.map((f) => contextRow(f.fleetId, f.fleetName, levelsOf(fleetKey(f.fleetId)), period.days)),
    total: contextRow(null, 'All fleets', levels, period.days),
    method: CONTEXT_METHOD,
  };

  return {
    period,
    groupBy: q.groupBy,
    filters: {
      aircraft: q.aircraft ?? null,
      route: q.route ?? null,
      minFl: q.minFl ?? null,
      maxFl: q.maxFl ?? null,
      fleets: q.fleets ?? null,
      basis: q.basis ?? 'planned',
    },
    rows,
    totals: rowOf(totalSums, { key: 'total', fleetId: null, fleetName: 'All fleets' }),
    months,
    series,
    context,
    notes: COMPARE_NOTES,
    cautions: [...mixedEngineVersionCaution(engineVersions), ...FLEET_CAUTIONS],
    engineVersions,
    mixedEngineVersions: engineVersions.length > 1,
    percentiles,
  };
}
