import 'server-only';
import type { Knex } from 'knex';
import { db, insertId, nowIso, writeTx } from './client';
import { createAuditEntry } from './audit';
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
    flightsWithFleet(trx, scope.workspaceId)
      .where('fl.status', 'screened')
      .whereNotNull('f.id')
      .groupBy('f.id')
      .select('f.id as fleet_id')
      .count({ n: '*' }) as Promise<Row[]>,
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
  const q = trx('fleets').where({ workspace_id: workspaceId }).whereRaw('lower(name) = ?', [name.toLowerCase()]);
  if (exceptId !== undefined) q.andWhereNot('id', exceptId);
  if (await q.first())
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
}

export function applyFilters(q: Knex.QueryBuilder, f: FlightFilters): Knex.QueryBuilder {
  q.where('fl.status', 'screened').whereBetween('fl.date', [f.from, f.to]);
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

/** Sums of screened flights per resolved fleet, and per month or aircraft type when asked. */
export async function aggregateFlights(
  scope: { workspaceId: number },
  filters: FlightFilters,
  by: { month?: boolean; aircraft?: boolean } = {},
): Promise<FlightAggregate[]> {
  const k = db();
  const q = applyFilters(flightsWithFleet(k, scope.workspaceId), filters);
  const cols: (string | Knex.Raw)[] = ['f.id as fleet_id', 'f.name as fleet_name'];
  const groups: (string | Knex.Raw)[] = ['f.id', 'f.name'];
  if (by.month) {
    cols.push(k.raw('substr(fl.date, 1, 7) as month'));
    groups.push(k.raw('substr(fl.date, 1, 7)'));
  }
  if (by.aircraft) {
    cols.push(k.raw('upper(fl.aircraft_code) as aircraft_code'));
    groups.push(k.raw('upper(fl.aircraft_code)'));
  }
  const rows = (await q
    .select(cols)
    .count({ flights: '*' })
    .sum({
      distance_km: 'fl.distance_km',
      fuel_kg: 'fl.fuel_kg',
      nox_total_kg: 'fl.nox_total_kg',
      nox_above_kg: 'fl.nox_above_kg',
      ozone_central_kg: 'fl.ozone_central_kg',
      ozone_low_kg: 'fl.ozone_low_kg',
      ozone_high_kg: 'fl.ozone_high_kg',
    })
    .groupBy(groups)) as Row[];
  const num = (v: unknown) => (v === null || v === undefined ? 0 : Number(v));
  return rows.map((r) => ({
    fleetId: r.fleet_id === null || r.fleet_id === undefined ? null : Number(r.fleet_id),
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
  }));
}

/** NOx above the tropopause per resolved fleet and cruise-level pair, for the fleet-scale context. */
export async function noxAboveByLevels(
  scope: { workspaceId: number },
  filters: FlightFilters,
): Promise<{ fleetId: number | null; cruiseFl: number; maxFl: number; noxAboveKg: number }[]> {
  const rows = (await applyFilters(flightsWithFleet(db(), scope.workspaceId), filters)
    .where('fl.nox_above_kg', '>', 0)
    .select('f.id as fleet_id', 'fl.cruise_fl', 'fl.max_fl')
    .sum({ nox_above_kg: 'fl.nox_above_kg' })
    .groupBy('f.id', 'fl.cruise_fl', 'fl.max_fl')) as Row[];
  return rows.map((r) => ({
    fleetId: r.fleet_id === null || r.fleet_id === undefined ? null : Number(r.fleet_id),
    cruiseFl: Number(r.cruise_fl),
    maxFl: Number(r.max_fl),
    noxAboveKg: Number(r.nox_above_kg ?? 0),
  }));
}

/** Aircraft type codes that have screened flights, for the filter's list. */
export async function listFlownAircraftCodes(scope: { workspaceId: number }): Promise<string[]> {
  const rows = (await db()('flights')
    .where({ workspace_id: scope.workspaceId, status: 'screened' })
    .distinct(db().raw('upper(aircraft_code) as code'))
    .orderBy('code')) as Row[];
  return rows.map((r) => String(r.code));
}

/** How many of the flights the filters keep each engine version screened, oldest version first. */
export async function countFlightsByEngineVersion(
  scope: { workspaceId: number },
  filters: FlightFilters,
): Promise<{ engineVersion: string; flights: number }[]> {
  const rows = (await applyFilters(flightsWithFleet(db(), scope.workspaceId), filters)
    .whereNotNull('fl.engine_version')
    .groupBy('fl.engine_version')
    .orderBy('fl.engine_version')
    .select('fl.engine_version as v')
    .count({ n: '*' })) as Row[];
  return rows.map((r) => ({ engineVersion: String(r.v), flights: Number(r.n) }));
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
  const base = () =>
    applyFilters(flightsWithFleet(db(), scope.workspaceId), filters)
      .whereNotNull('fl.fuel_warning')
      .andWhere('fl.status', 'screened');
  const [counted, rows] = await Promise.all([
    base().count({ n: '*' }).first() as Promise<{ n: number | string } | undefined>,
    base()
      .select('fl.date', 'fl.flight', 'fl.origin', 'fl.destination', 'fl.fuel_warning')
      .orderBy([{ column: 'fl.date' }, { column: 'fl.id' }])
      .limit(limit) as Promise<Row[]>,
  ]);
  return {
    count: Number(counted?.n ?? 0),
    items: rows.map((r) => ({
      date: String(r.date),
      flight: String(r.flight),
      origin: String(r.origin),
      destination: String(r.destination),
      warning: String(r.fuel_warning),
    })),
  };
}
