import 'server-only';
import type { Knex } from 'knex';
import { db } from './client';
import { splitByWholeMonths } from './flight-rollups';

export type FlightStatus = 'pending' | 'screened' | 'failed';
/** A schedule row (planned) or an imported track (flown). */
export type FlightBasis = 'planned' | 'flown';

/** A flight as the flights list and the API show it; figures are null until it is screened. */
export interface FlightDto {
  id: number;
  importId: number | null;
  basis: FlightBasis;
  flight: string;
  date: string;
  origin: string;
  destination: string;
  aircraft: string;
  fleet: string | null;
  fleetId: number | null;
  cruiseFl: number;
  maxFl: number;
  status: FlightStatus;
  failureReason: string | null;
  distanceKm: number | null;
  fuelKg: number;
  noxTotalKg: number | null;
  noxAboveTropopauseKg: number | null;
  fractionAboveTropopause: number | null;
  ozoneLoss: { centralKg: number; lowKg: number; highKg: number } | null;
  screenedAt: string | null;
  engineVersion: string | null;
  /** The import's warning when the fuel is unusual for the distance, else null. */
  fuelWarning: string | null;
}

/** The flight list's filters and page, as `flightListQuerySchema` gives them. */
export interface FlightListQuery {
  import?: number;
  from?: string;
  to?: string;
  fleet?: number;
  aircraft?: string;
  /** planned (schedule) or flown (imported track); both when absent. */
  basis?: FlightBasis;
  cursor?: string;
  limit?: number;
}

export type FlightFilters = Omit<FlightListQuery, 'cursor' | 'limit'>;

type Row = Record<string, unknown>;

const num = (v: unknown): number | null => (v === null || v === undefined ? null : Number(v));

function toDto(r: Row): FlightDto {
  const screened = r.status === 'screened';
  return {
    id: Number(r.id),
    importId: num(r.import_id),
    basis: r.basis === 'flown' ? 'flown' : 'planned',
    flight: String(r.flight),
    date: String(r.date),
    origin: String(r.origin),
    destination: String(r.destination),
    aircraft: String(r.aircraft_code),
    fleet: (r.fleet_name as string | null) ?? null,
    fleetId: num(r.fleet_id),
    cruiseFl: Number(r.cruise_fl),
    maxFl: Number(r.max_fl),
    status: r.status as FlightStatus,
    failureReason: (r.failure_reason as string | null) ?? null,
    distanceKm: num(r.distance_km),
    fuelKg: Number(r.fuel_kg),
    noxTotalKg: num(r.nox_total_kg),
    noxAboveTropopauseKg: num(r.nox_above_kg),
    fractionAboveTropopause: num(r.fraction_above),
    ozoneLoss: screened
      ? { centralKg: Number(r.ozone_central_kg), lowKg: Number(r.ozone_low_kg), highKg: Number(r.ozone_high_kg) }
      : null,
    screenedAt: (r.screened_at as string | null) ?? null,
    engineVersion: (r.engine_version as string | null) ?? null,
    fuelWarning: (r.fuel_warning as string | null) ?? null,
  };
}

function applyFilters(q: Knex.QueryBuilder, scope: { workspaceId: number }, f: FlightFilters): Knex.QueryBuilder {
  q.where('f.workspace_id', scope.workspaceId);
  if (f.import !== undefined) q.andWhere('f.import_id', f.import);
  if (f.from) q.andWhere('f.date', '>=', f.from);
  if (f.to) q.andWhere('f.date', '<=', f.to);
  if (f.fleet !== undefined) q.andWhere('f.fleet_id', f.fleet);
  if (f.basis !== undefined) q.andWhere('f.basis', f.basis);
  if (f.aircraft) q.andWhere('f.aircraft_code', f.aircraft.toUpperCase());
  return q;
}

/** Newest date first; keyset-paged: `cursor` is `date~id` of the last flight of the previous page. */
export async function listFlights(
  scope: { workspaceId: number },
  query: FlightListQuery = {},
): Promise<{ items: FlightDto[]; nextCursor: string | null }> {
  const { cursor, limit: rawLimit, ...filters } = query;
  const limit = Math.min(Math.max(rawLimit ?? 50, 1), 200);
  const q = applyFilters(db()('flights as f').leftJoin('fleets as fl', 'fl.id', 'f.fleet_id'), scope, filters)
    .select('f.*', 'fl.name as fleet_name')
    .orderBy([
      { column: 'f.date', order: 'desc' },
      { column: 'f.id', order: 'desc' },
    ])
    .limit(limit + 1);
  if (cursor) {
    const [date, id] = cursor.split('~');
    // `date <= d` first, so the index on (workspace_id, date, id) starts a deep page at its place.
    q.andWhere('f.date', '<=', date).andWhere((w) => w.where('f.date', '<', date).orWhere('f.id', '<', Number(id)));
  }
  const rows = (await q) as Row[];
  const items = rows.slice(0, limit).map(toDto);
  const last = items[items.length - 1];
  return { items, nextCursor: rows.length > limit && last ? `${last.date}~${last.id}` : null };
}

export interface FlightTotals {
  flights: number;
  screened: number;
  pending: number;
  failed: number;
  distanceKm: number;
  fuelKg: number;
  noxTotalKg: number;
  noxAboveTropopauseKg: number;
  ozoneCentralKg: number;
  ozoneLowKg: number;
  ozoneHighKg: number;
}

/** Counts by status and the sums of the screened flights that match the filters. */
export async function summariseFlights(
  scope: { workspaceId: number },
  filters: FlightFilters = {},
): Promise<FlightTotals> {
  const k = db();
  const sums = {
    distance: 'f.distance_km',
    fuel: 'f.fuel_kg',
    nox: 'f.nox_total_kg',
    above: 'f.nox_above_kg',
    o3: 'f.ozone_central_kg',
    o3low: 'f.ozone_low_kg',
    o3high: 'f.ozone_high_kg',
  };
  let rows: Row[];
  if (filters.import !== undefined) {
    rows = (await applyFilters(k('flights as f'), scope, filters)
      .groupBy('f.status')
      .select('f.status')
      .count({ n: '*' })
      .sum(sums)) as Row[];
  } else {
    // Screened flights of whole months come from the monthly roll-ups (the same columns, aliased f),
    // part-months and the flights not yet screened from the rows.
    const parts = splitByWholeMonths(filters.from, filters.to).map((src) => {
      if (!src.rollup)
        return applyFilters(k('flights as f'), scope, { ...filters, from: src.from, to: src.to })
          .groupBy('f.status')
          .select('f.status')
          .count({ n: '*' })
          .sum(sums) as Promise<Row[]>;
      const q = k('flight_month_rollups as f')
        .where('f.workspace_id', scope.workspaceId)
        .whereBetween('f.month', [src.fromMonth, src.toMonth]);
      if (filters.fleet !== undefined) q.andWhere('f.fleet_id', filters.fleet);
      if (filters.aircraft) q.andWhere('f.aircraft_code', filters.aircraft.toUpperCase());
      if (filters.basis !== undefined) q.andWhere('f.basis', filters.basis);
      const unscreened = applyFilters(k('flights as f'), scope, {
        ...filters,
        from: `${src.fromMonth}-01`,
        to: `${src.toMonth}-31`,
      })
        .whereIn('f.status', ['pending', 'failed'])
        .groupBy('f.status')
        .select('f.status')
        .count({ n: '*' }) as Promise<Row[]>;
      const screened = q.select(k.raw("'screened' as status")).sum({ n: 'f.flights', ...sums }) as Promise<Row[]>;
      return Promise.all([screened, unscreened]).then(([a, b]) => [...a, ...b]);
    });
    rows = (await Promise.all(parts)).flat();
  }
  const t: FlightTotals = {
    flights: 0,
    screened: 0,
    pending: 0,
    failed: 0,
    distanceKm: 0,
    fuelKg: 0,
    noxTotalKg: 0,
    noxAboveTropopauseKg: 0,
    ozoneCentralKg: 0,
    ozoneLowKg: 0,
    ozoneHighKg: 0,
  };
  for (const r of rows) {
    const n = Number(r.n ?? 0);
    t.flights += n;
    if (r.status === 'screened') {
      t.screened += n;
      t.distanceKm += Number(r.distance ?? 0);
      t.fuelKg += Number(r.fuel ?? 0);
      t.noxTotalKg += Number(r.nox ?? 0);
      t.noxAboveTropopauseKg += Number(r.above ?? 0);
      t.ozoneCentralKg += Number(r.o3 ?? 0);
      t.ozoneLowKg += Number(r.o3low ?? 0);
      t.ozoneHighKg += Number(r.o3high ?? 0);
    } else if (r.status === 'pending') t.pending += n;
    else if (r.status === 'failed') t.failed += n;
  }
  return t;
}

/**
 * Keys (date|flight|origin|destination) of the workspace's flights dated between `from` and `to`
 * inclusive: an import refuses rows that would repeat one of them.
 */
export async function listFlightKeys(
  scope: { workspaceId: number },
  range: { from: string; to: string; basis?: FlightBasis },
  trx: Knex | Knex.Transaction = db(),
): Promise<Map<string, number | null>> {
  const rows = (await trx('flights')
    .where('workspace_id', scope.workspaceId)
    .where('basis', range.basis ?? 'planned')
    .whereBetween('date', [range.from, range.to])
    .select('date', 'flight', 'origin', 'destination', 'import_id')) as Row[];
  const out = new Map<string, number | null>();
  for (const r of rows) out.set(`${r.date}|${r.flight}|${r.origin}|${r.destination}`, num(r.import_id));
  return out;
}

export interface FlightFilterOptions {
  imports: { id: number; fileName: string; createdAt: string }[];
  fleets: { id: number; name: string }[];
  aircraft: string[];
}

/** What the flights page offers in its filters. */
export async function listFlightFilterOptions(scope: { workspaceId: number }): Promise<FlightFilterOptions> {
  const k = db();
  const [imports, fleets, aircraft] = await Promise.all([
    k('imports')
      .where('workspace_id', scope.workspaceId)
      .orderBy('id', 'desc')
      .limit(200)
      .select('id', 'file_name', 'created_at'),
    k('fleets').where('workspace_id', scope.workspaceId).orderBy('name').select('id', 'name'),
    k('aircraft_types').where('workspace_id', scope.workspaceId).orderBy('code').select('code'),
  ]);
  return {
    imports: (imports as Row[]).map((r) => ({
      id: Number(r.id),
      fileName: String(r.file_name),
      createdAt: String(r.created_at),
    })),
    fleets: (fleets as Row[]).map((r) => ({ id: Number(r.id), name: String(r.name) })),
    aircraft: (aircraft as Row[]).map((r) => String(r.code)),
  };
}

/** The workspace's fleets by lower-case name (the `fleet` column of a schedule). */
export async function listFleetsByName(scope: {
  workspaceId: number;
}): Promise<Map<string, { id: number; name: string }>> {
  const rows = (await db()('fleets').where('workspace_id', scope.workspaceId).select('id', 'name')) as Row[];
  return new Map(rows.map((r) => [String(r.name).toLowerCase(), { id: Number(r.id), name: String(r.name) }]));
}

/**
 * Planned flights of the workspace dated between `from` and `to`, by `date|flight`: what a track
 * import pairs its flights with (origin, destination, aircraft and fuel when the file leaves them out).
 */
export async function listPlannedFlightRefs(
  scope: { workspaceId: number },
  range: { from: string; to: string },
): Promise<
  Map<
    string,
    {
      id: number;
      date: string;
      flight: string;
      origin: string;
      destination: string;
      aircraftCode: string;
      fuelKg: number;
    }[]
  >
> {
  const rows = (await db()('flights')
    .where({ workspace_id: scope.workspaceId, basis: 'planned' })
    .whereBetween('date', [range.from, range.to])
    .select('id', 'date', 'flight', 'origin', 'destination', 'aircraft_code', 'fuel_kg')) as Row[];
  const out = new Map<
    string,
    {
      id: number;
      date: string;
      flight: string;
      origin: string;
      destination: string;
      aircraftCode: string;
      fuelKg: number;
    }[]
  >();
  for (const r of rows) {
    const key = `${r.date}|${r.flight}`;
    const list = out.get(key) ?? [];
    list.push({
      id: Number(r.id),
      date: String(r.date),
      flight: String(r.flight),
      origin: String(r.origin),
      destination: String(r.destination),
      aircraftCode: String(r.aircraft_code),
      fuelKg: Number(r.fuel_kg),
    });
    out.set(key, list);
  }
  return out;
}

/** One imported flight with its stored screening input and where it came from; null when not in this workspace. */
export interface FlightDetail extends FlightDto {
  inputJson: string;
  importFileName: string | null;
  importKind: 'schedule' | 'tracks' | null;
  sourceLine: number | null;
}

export async function getFlight(scope: { workspaceId: number }, id: number): Promise<FlightDetail | null> {
  const r = (await db()('flights as f')
    .leftJoin('fleets as fl', function joinFleet() {
      this.on('fl.id', '=', 'f.fleet_id').andOn('fl.workspace_id', '=', 'f.workspace_id');
    })
    .leftJoin('imports as i', 'i.id', 'f.import_id')
    .where({ 'f.workspace_id': scope.workspaceId, 'f.id': id })
    .select('f.*', 'fl.name as fleet_name', 'i.file_name as import_file_name', 'i.kind as import_kind')
    .first()) as Row | undefined;
  if (!r) return null;
  return {
    ...toDto(r),
    inputJson: String(r.input_json),
    importFileName: (r.import_file_name as string | null) ?? null,
    importKind: r.import_kind === 'tracks' ? 'tracks' : r.import_kind === 'schedule' ? 'schedule' : null,
    sourceLine: num(r.source_line),
  };
}

/** The other basis of the same flight (same date, flight, origin, destination): the flown track of a planned flight, or the plan of a flown one. */
export async function getPairedFlight(
  scope: { workspaceId: number },
  f: { id: number; basis: FlightBasis; date: string; flight: string; origin: string; destination: string },
): Promise<FlightDetail | null> {
  const other = (await db()('flights')
    .where({
      workspace_id: scope.workspaceId,
      basis: f.basis === 'planned' ? 'flown' : 'planned',
      date: f.date,
      flight: f.flight,
      origin: f.origin,
      destination: f.destination,
    })
    .first('id')) as Row | undefined;
  return other ? getFlight(scope, Number(other.id)) : null;
}
