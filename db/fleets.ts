import 'server-only';
import type { Knex } from 'knex';
import { db, insertId, nowIso, writeTx } from './client';
import { createAuditEntry } from './audit';
import { nameTaken } from './workspace-rows';
import { clearRollupKey, splitByWholeMonths, type RollupSource } from './flight-rollups';
import { conflict, invalidFields, notFound } from '@/lib/errors';

export interface FleetDto {
  id: number;
  name: string;
  description: string;
  createdAt: string;
  /** Aircraft types whose default fleet this is, by code. */
  aircraftTypes: { id: number; code: string }[];
  /** Screened flights that resolve to this fleet (their own fleet, else their type's default). */
  screenedFlights: number;
}

type Row = Record<string, unknown>;

/**
 * The one place a flight's fleet is decided: the fleet in the flight's own `fleet_id` (the CSV
 * `fleet` column), else its aircraft type's default fleet; only a fleet of the same workspace counts.
 * Gives `fl` (flights), `at` (its aircraft type) and `f` (the resolved fleet, null when none).
 */
export function flightsWithFleet(k: Knex | Knex.Transaction, workspaceId: number): Knex.QueryBuilder {
  return k('flights as fl')
    .leftJoin('aircraft_types as at', function joinType() {
      this.on('at.id', '=', 'fl.aircraft_type_id').andOn('at.workspace_id', '=', 'fl.workspace_id');
    })
    .leftJoin('fleets as f', function joinFleet() {
      this.on('f.id', '=', k.raw('coalesce(fl.fleet_id, at.default_fleet_id)')).andOn(
        'f.workspace_id',
        '=',
        'fl.workspace_id',
      );
    })
    .where('fl.workspace_id', workspaceId);
}

/**
 * The monthly roll-ups (db/flight-rollups.ts) with the same aliases and the same fleet rule as
 * flightsWithFleet: `fl` (roll-up rows, whose fleet and type are 0 for none), `at`, `f`.
 */
export function rollupsWithFleet(k: Knex | Knex.Transaction, workspaceId: number): Knex.QueryBuilder {
  return k('flight_month_rollups as fl')
    .leftJoin('aircraft_types as at', function joinType() {
      this.on('at.id', '=', 'fl.aircraft_type_id').andOn('at.workspace_id', '=', 'fl.workspace_id');
    })
    .leftJoin('fleets as f', function joinFleet() {
      this.on('f.id', '=', k.raw('coalesce(nullif(fl.fleet_id, 0), at.default_fleet_id)')).andOn(
        'f.workspace_id',
        '=',
        'fl.workspace_id',
      );
    })
    .where('fl.workspace_id', workspaceId);
}

/** The resolved fleet of each given flight id (null when it has none), for tests and the flight pages. */
export async function resolveFlightFleets(
  scope: { workspaceId: number },
  flightIds: number[],
): Promise<Map<number, number | null>> {
  const rows = (await flightsWithFleet(db(), scope.workspaceId)
    .whereIn('fl.id', flightIds)
    .select('fl.id', 'f.id as fleet_id')) as Row[];
  return new Map(
    rows.map((r) => [Number(r.id), r.fleet_id === null || r.fleet_id === undefined ? null : Number(r.fleet_id)]),
  );
}

export async function listFleets(
  scope: { workspaceId: number },
  trx: Knex | Knex.Transaction = db(),
): Promise<FleetDto[]> {
  const [fleets, types, counts] = await Promise.all([
    trx('fleets').where({ workspace_id: scope.workspaceId }).orderBy('name', 'asc').orderBy('id', 'asc') as Promise<
      Row[]
    >,
    trx('aircraft_types')
      .where({ workspace_id: scope.workspaceId })
      .whereNotNull('default_fleet_id')
      .orderBy('code', 'asc')
      .select('id', 'code', 'default_fleet_id') as Promise<Row[]>,
    rollupsWithFleet(trx, scope.workspaceId)
      .where('fl.basis', 'planned')
      .whereNotNull('f.id')
      .groupBy('f.id')
      .select('f.id as fleet_id')
      .sum({ n: 'fl.flights' }) as Promise<Row[]>,
  ]);
  const countOf = new Map(counts.map((c) => [Number(c.fleet_id), Number(c.n)]));
  return fleets.map((f) => ({
    id: Number(f.id),
    name: String(f.name),
    description: String(f.description ?? ''),
    createdAt: String(f.created_at),
    aircraftTypes: types
      .filter((t) => Number(t.default_fleet_id) === Number(f.id))
      .map((t) => ({ id: Number(t.id), code: String(t.code) })),
    screenedFlights: countOf.get(Number(f.id)) ?? 0,
  }));
}

export async function getFleet(
  scope: { workspaceId: number },
  id: number,
  trx: Knex | Knex.Transaction = db(),
): Promise<FleetDto> {
  const fleet = (await listFleets(scope, trx)).find((f) => f.id === id);
  if (!fleet) throw notFound('No fleet with that id in this workspace.');
  return fleet;
}

async function assertNameFree(
  trx: Knex.Transaction,
  workspaceId: number,
  name: string,
  exceptId?: number,
): Promise<void> {
  if (await nameTaken(trx, 'fleets', workspaceId, name, exceptId))
    throw conflict(`A fleet called “${name}” already exists here.`, [
      { path: 'name', message: 'Another fleet already has this name.' },
    ]);
}

async function setFleetTypes(
  trx: Knex.Transaction,
  workspaceId: number,
  fleetId: number,
  aircraftTypeIds: number[],
): Promise<void> {
  const found = (await trx('aircraft_types')
    .where({ workspace_id: workspaceId })
    .whereIn('id', aircraftTypeIds)
    .select('id')) as Row[];
  const known = new Set(found.map((r) => Number(r.id)));
  const missing = aircraftTypeIds.findIndex((id) => !known.has(id));
  if (missing >= 0)
    throw invalidFields([
      {
        path: `aircraftTypeIds.${missing}`,
        message: `No aircraft type with id ${aircraftTypeIds[missing]} in this workspace.`,
      },
    ]);
  const now = nowIso();
  await trx('aircraft_types')
    .where({ workspace_id: workspaceId, default_fleet_id: fleetId })
    .whereNotIn('id', aircraftTypeIds)
    .update({ default_fleet_id: null, updated_at: now });
  if (aircraftTypeIds.length)
    await trx('aircraft_types')
      .where({ workspace_id: workspaceId })
      .whereIn('id', aircraftTypeIds)
      .update({ default_fleet_id: fleetId, updated_at: now });
}

export async function createFleet(
  scope: { workspaceId: number },
  input: { name: string; description?: string; actor: string; userId: number | null },
): Promise<FleetDto> {
  const id = await writeTx(async (trx) => {
    await assertNameFree(trx, scope.workspaceId, input.name);
    const newId = await insertId(
      trx('fleets')
        .insert({
          workspace_id: scope.workspaceId,
          name: input.name,
          description: input.description ?? '',
          created_at: nowIso(),
        })
        .returning('id'),
    );
    await createAuditEntry(
      {
        workspaceId: scope.workspaceId,
        userId: input.userId,
        actor: input.actor,
        action: 'fleet.create',
        target: `fleet:${newId}`,
        detail: { name: input.name },
      },
      trx,
    );
    return newId;
  });
  return getFleet(scope, id);
}

export async function updateFleet(
  scope: { workspaceId: number },
  id: number,
  input: { name?: string; description?: string; aircraftTypeIds?: number[]; actor: string; userId: number | null },
): Promise<FleetDto> {
  await writeTx(async (trx) => {
    const row = await trx('fleets').where({ workspace_id: scope.workspaceId, id }).first();
    if (!row) throw notFound('No fleet with that id in this workspace.');
    const patch: Row = {};
    if (input.name !== undefined && input.name !== row.name) {
      await assertNameFree(trx, scope.workspaceId, input.name, id);
      patch.name = input.name;
    }
    if (input.description !== undefined) patch.description = input.description;
    if (Object.keys(patch).length) await trx('fleets').where({ id }).update(patch);
    if (input.aircraftTypeIds !== undefined) await setFleetTypes(trx, scope.workspaceId, id, input.aircraftTypeIds);
    await createAuditEntry(
      {
        workspaceId: scope.workspaceId,
        userId: input.userId,
        actor: input.actor,
        action: 'fleet.update',
        target: `fleet:${id}`,
        detail: { ...patch, ...(input.aircraftTypeIds ? { aircraftTypeIds: input.aircraftTypeIds } : {}) },
      },
      trx,
    );
  });
  return getFleet(scope, id);
}

/**
 * Deletes a fleet. Aircraft types that defaulted to it lose their default; flights that named it
 * fall back to their type's default fleet. Saved reports keep the names they were built with.
 */
export async function deleteFleet(
  scope: { workspaceId: number },
  id: number,
  input: { actor: string; userId: number | null },
): Promise<void> {
  await writeTx(async (trx) => {
    const row = await trx('fleets').where({ workspace_id: scope.workspaceId, id }).first();
    if (!row) throw notFound('No fleet with that id in this workspace.');
    const now = nowIso();
    await trx('aircraft_types')
      .where({ workspace_id: scope.workspaceId, default_fleet_id: id })
      .update({ default_fleet_id: null, updated_at: now });
    await trx('flights').where({ workspace_id: scope.workspaceId, fleet_id: id }).update({ fleet_id: null });
    await clearRollupKey(trx, scope.workspaceId, 'fleet_id', id);
    await trx('fleets').where({ workspace_id: scope.workspaceId, id }).delete();
    await createAuditEntry(
      {
        workspaceId: scope.workspaceId,
        userId: input.userId,
        actor: input.actor,
        action: 'fleet.delete',
        target: `fleet:${id}`,
        detail: { name: row.name },
      },
      trx,
    );
  });
}

/** Sets (or clears, with null) one aircraft type's default fleet. */
export async function setAircraftTypeFleet(
  scope: { workspaceId: number },
  input: { aircraftTypeId: number; fleetId: number | null; actor: string; userId: number | null },
): Promise<void> {
  await writeTx(async (trx) => {
    const type = await trx('aircraft_types')
      .where({ workspace_id: scope.workspaceId, id: input.aircraftTypeId })
      .first();
    if (!type) throw notFound('No aircraft type with that id in this workspace.');
    if (
      input.fleetId !== null &&
      !(await trx('fleets').where({ workspace_id: scope.workspaceId, id: input.fleetId }).first())
    ) {
      throw notFound('No fleet with that id in this workspace.');
    }
    await trx('aircraft_types')
      .where({ id: input.aircraftTypeId })
      .update({ default_fleet_id: input.fleetId, updated_at: nowIso() });
    await createAuditEntry(
      {
        workspaceId: scope.workspaceId,
        userId: input.userId,
        actor: input.actor,
        action: 'aircraft_type.default_fleet',
        target: `aircraft_type:${input.aircraftTypeId}`,
        detail: { code: type.code, fleetId: input.fleetId },
      },
      trx,
    );
  });
}

/** Filters of the comparison as the data layer applies them (already validated). */
export interface FlightFilters {
  from: string;
  to: string;
  /** Aircraft type code, compared case-insensitively. */
  aircraft?: string;
  /** Airport codes to match: every group needs one of its codes at the origin or the destination. */
  routeTerms?: string[][];
  minFl?: number;
  maxFl?: number;
  /** Resolved fleet ids to keep; `null` in the list keeps flights with no fleet. */
  fleetIds?: (number | null)[];
  /**
   * planned (default): schedule flights; flown: imported tracks; flown-where-available: each
   * flight's flown track where the workspace has a screened one, its plan otherwise.
   */
  basis?: 'planned' | 'flown' | 'flown-where-available';
}

/**
 * Keeps the flights of one basis (`fl` is the flights alias). "flown-where-available" counts each
 * flight (date, flight, origin, destination) once: its screened flown track, else its plan.
 */
function applyBasis(q: Knex.QueryBuilder, basis: FlightFilters['basis']): void {
  if (basis === 'flown') {
    q.where('fl.basis', 'flown');
    return;
  }
  if (basis !== 'flown-where-available') {
    q.where('fl.basis', 'planned');
    return;
  }
  q.where((w) =>
    w.where('fl.basis', 'flown').orWhere((p) =>
      p.where('fl.basis', 'planned').whereNotExists(function flownTwin() {
        this.select(this.client.raw('1'))
          .from('flights as tw')
          .whereRaw('tw.workspace_id = fl.workspace_id')
          .where('tw.basis', 'flown')
          .where('tw.status', 'screened')
          .whereRaw('tw.date = fl.date')
          .whereRaw('tw.flight = fl.flight')
          .whereRaw('tw.origin = fl.origin')
          .whereRaw('tw.destination = fl.destination');
      }),
    ),
  );
}

/**
 * Where the filters' figures come from: the roll-ups for the whole months of the period, the flight
 * rows for the part-months at either end, and the rows alone when a route is asked for (the roll-ups
 * keep no airports).
 */
function sourcesOf(f: FlightFilters): RollupSource[] {
  // The roll-ups keep no airports, and pairing a plan with its flown track needs the flight rows.
  if (f.routeTerms?.length || f.basis === 'flown-where-available') return [{ rollup: false, from: f.from, to: f.to }];
  return splitByWholeMonths(f.from, f.to);
}

/** The rows of one source with the filters applied: flight rows or roll-up rows (aliased `fl`). */
function filtered(k: Knex | Knex.Transaction, workspaceId: number, src: RollupSource, f: FlightFilters) {
  const q = src.rollup ? rollupsWithFleet(k, workspaceId) : flightsWithFleet(k, workspaceId);
  if (src.rollup) q.whereBetween('fl.month', [src.fromMonth, src.toMonth]);
  else q.where('fl.status', 'screened').whereBetween('fl.date', [src.from, src.to]);
  return applyFilters(q, f);
}

/** How a source counts flights: one a row, or the roll-up's count. */
const flightCount = (k: Knex | Knex.Transaction, src: RollupSource) =>
  k.raw(src.rollup ? 'sum(fl.flights)' : 'count(*)');

/** The basis and the filters other than the dates and status (each source sets those; see `filtered`). */
export function applyFilters(q: Knex.QueryBuilder, f: FlightFilters): Knex.QueryBuilder {
  applyBasis(q, f.basis);
  if (f.aircraft) q.whereRaw('upper(fl.aircraft_code) = ?', [f.aircraft.toUpperCase()]);
  for (const group of f.routeTerms ?? []) {
    q.where((w) => {
      for (const code of group)
        w.orWhereRaw('upper(fl.origin) = ?', [code]).orWhereRaw('upper(fl.destination) = ?', [code]);
    });
  }
  // The band keeps flights whose cruise, from the first to the highest level, touches it.
  if (f.minFl !== undefined) q.where('fl.max_fl', '>=', f.minFl);
  if (f.maxFl !== undefined) q.where('fl.cruise_fl', '<=', f.maxFl);
  if (f.fleetIds) {
    const ids = f.fleetIds.filter((x): x is number => x !== null);
    const withNone = f.fleetIds.includes(null);
    q.where((w) => {
      if (ids.length) w.whereIn('f.id', ids);
      if (withNone) w.orWhereNull('f.id');
      if (!ids.length && !withNone) w.whereRaw('1 = 0');
    });
  }
  return q;
}

const num = (v: unknown) => (v === null || v === undefined ? 0 : Number(v));
const fleetOf = (v: unknown) => (v === null || v === undefined ? null : Number(v));

export interface FlightAggregate {
  fleetId: number | null;
  fleetName: string | null;
  /** YYYY-MM, when grouped by month. */
  month?: string;
  /** Aircraft type code, when grouped by aircraft. */
  aircraftCode?: string;
  flights: number;
  distanceKm: number;
  fuelKg: number;
  noxTotalKg: number;
  noxAboveKg: number;
  ozoneCentralKg: number;
  ozoneLowKg: number;
  ozoneHighKg: number;
}

const SUM_KEYS = [
  'flights',
  'distanceKm',
  'fuelKg',
  'noxTotalKg',
  'noxAboveKg',
  'ozoneCentralKg',
  'ozoneLowKg',
  'ozoneHighKg',
] as const;

/**
 * Sums of screened flights per resolved fleet, and per month or aircraft type when asked: whole
 * months from the roll-ups, part-months from the flight rows, added together.
 */
export async function aggregateFlights(
  scope: { workspaceId: number },
  filters: FlightFilters,
  by: { month?: boolean; aircraft?: boolean } = {},
): Promise<FlightAggregate[]> {
  const k = db();
  const parts = await Promise.all(
    sourcesOf(filters).map((src) => {
      const cols: (string | Knex.Raw)[] = ['f.id as fleet_id', 'f.name as fleet_name'];
      const groups: (string | Knex.Raw)[] = ['f.id', 'f.name'];
      const month = src.rollup ? 'fl.month' : 'substr(fl.date, 1, 7)';
      if (by.month) {
        cols.push(k.raw(`${month} as month`));
        groups.push(k.raw(month));
      }
      if (by.aircraft) {
        cols.push(k.raw('upper(fl.aircraft_code) as aircraft_code'));
        groups.push(k.raw('upper(fl.aircraft_code)'));
      }
      cols.push(flightCount(k, src).wrap('', ' as flights'));
      return filtered(k, scope.workspaceId, src, filters)
        .select(cols)
        .sum({
          distance_km: 'fl.distance_km',
          fuel_kg: 'fl.fuel_kg',
          nox_total_kg: 'fl.nox_total_kg',
          nox_above_kg: 'fl.nox_above_kg',
          ozone_central_kg: 'fl.ozone_central_kg',
          ozone_low_kg: 'fl.ozone_low_kg',
          ozone_high_kg: 'fl.ozone_high_kg',
        })
        .groupBy(groups) as Promise<Row[]>;
    }),
  );
  const out = new Map<string, FlightAggregate>();
  for (const r of parts.flat()) {
    const a: FlightAggregate = {
      fleetId: fleetOf(r.fleet_id),
      fleetName: (r.fleet_name as string | null) ?? null,
      ...(by.month ? { month: String(r.month) } : {}),
      ...(by.aircraft ? { aircraftCode: String(r.aircraft_code) } : {}),
      flights: num(r.flights),
      distanceKm: num(r.distance_km),
      fuelKg: num(r.fuel_kg),
      noxTotalKg: num(r.nox_total_kg),
      noxAboveKg: num(r.nox_above_kg),
      ozoneCentralKg: num(r.ozone_central_kg),
      ozoneLowKg: num(r.ozone_low_kg),
      ozoneHighKg: num(r.ozone_high_kg),
    };
    const key = `${a.fleetId}|${a.month ?? ''}|${a.aircraftCode ?? ''}`;
    const seen = out.get(key);
    if (!seen) out.set(key, a);
    else for (const s of SUM_KEYS) seen[s] += a[s];
  }
  return [...out.values()];
}

/** NOx above the tropopause per resolved fleet and cruise-level pair, for the fleet-scale context. */
export async function noxAboveByLevels(
  scope: { workspaceId: number },
  filters: FlightFilters,
): Promise<{ fleetId: number | null; cruiseFl: number; maxFl: number; noxAboveKg: number }[]> {
  const parts = await Promise.all(
    sourcesOf(filters).map(
      (src) =>
        filtered(db(), scope.workspaceId, src, filters)
          .where('fl.nox_above_kg', '>', 0)
          .select('f.id as fleet_id', 'fl.cruise_fl', 'fl.max_fl')
          .sum({ nox_above_kg: 'fl.nox_above_kg' })
          .groupBy('f.id', 'fl.cruise_fl', 'fl.max_fl') as Promise<Row[]>,
    ),
  );
  const out = new Map<string, { fleetId: number | null; cruiseFl: number; maxFl: number; noxAboveKg: number }>();
  for (const r of parts.flat()) {
    const row = {
      fleetId: fleetOf(r.fleet_id),
      cruiseFl: Number(r.cruise_fl),
      maxFl: Number(r.max_fl),
      noxAboveKg: num(r.nox_above_kg),
    };
    const key = `${row.fleetId}|${row.cruiseFl}|${row.maxFl}`;
    const seen = out.get(key);
    if (seen) seen.noxAboveKg += row.noxAboveKg;
    else out.set(key, row);
  }
  return [...out.values()];
}

/** Aircraft type codes that have screened flights, for the filter's list. */
export async function listFlownAircraftCodes(scope: { workspaceId: number }): Promise<string[]> {
  const rows = (await db()('flight_month_rollups')
    .where({ workspace_id: scope.workspaceId })
    .distinct(db().raw('upper(aircraft_code) as code'))
    .orderBy('code')) as Row[];
  return rows.map((r) => String(r.code));
}

/** How many of the flights the filters keep each engine version screened, oldest version first. */
export async function countFlightsByEngineVersion(
  scope: { workspaceId: number },
  filters: FlightFilters,
): Promise<{ engineVersion: string; flights: number }[]> {
  const k = db();
  const parts = await Promise.all(
    sourcesOf(filters).map((src) => {
      const q = filtered(k, scope.workspaceId, src, filters);
      if (src.rollup) q.where('fl.engine_version', '<>', '');
      else q.whereNotNull('fl.engine_version');
      return q
        .groupBy('fl.engine_version')
        .select('fl.engine_version as v', flightCount(k, src).wrap('', ' as n')) as Promise<Row[]>;
    }),
  );
  const out = new Map<string, number>();
  for (const r of parts.flat()) out.set(String(r.v), (out.get(String(r.v)) ?? 0) + num(r.n));
  return [...out.entries()]
    .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0))
    .filter(([, n]) => n > 0)
    .map(([engineVersion, flights]) => ({ engineVersion, flights }));
}

/** Flights of the selection whose fuel was unusual for their distance: how many, and the first few. */
export async function listFuelWarnings(
  scope: { workspaceId: number },
  filters: FlightFilters,
  limit = 25,
): Promise<{
  count: number;
  items: { date: string; flight: string; origin: string; destination: string; warning: string }[];
}> {
  const k = db();
  const raw = { rollup: false as const, from: filters.from, to: filters.to };
  const [counts, rows] = await Promise.all([
    Promise.all(
      sourcesOf(filters).map((src) => {
        const q = filtered(k, scope.workspaceId, src, filters);
        if (src.rollup) return q.select(k.raw('sum(fl.fuel_warnings) as n')) as Promise<Row[]>;
        return q.whereNotNull('fl.fuel_warning').count({ n: '*' }) as Promise<Row[]>;
      }),
    ),
    filtered(k, scope.workspaceId, raw, filters)
      .whereNotNull('fl.fuel_warning')
      .select('fl.date', 'fl.flight', 'fl.origin', 'fl.destination', 'fl.fuel_warning')
      .orderBy([{ column: 'fl.date' }, { column: 'fl.id' }])
      .limit(limit) as Promise<Row[]>,
  ]);
  return {
    count: counts.flat().reduce((n, r) => n + num(r.n), 0),
    items: rows.map((r) => ({
      date: String(r.date),
      flight: String(r.flight),
      origin: String(r.origin),
      destination: String(r.destination),
      warning: String(r.fuel_warning),
    })),
  };
}
