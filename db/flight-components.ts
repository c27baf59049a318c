import 'server-only';
import type { Knex } from 'knex';
import { db, nowIso, writeTx } from './client';
import { applyFilters, flightsWithFleet, type FlightFilters } from './fleets';

/**
 * The per-flight components of the fleet uncertainty sampling (bytes made by the engine's
 * encodeFlightComponents) and the stored fleet percentiles. The import worker builds components for
 * screened flights once its imports and re-screens are done (lib/imports/worker.ts), chunk by chunk;
 * `engine_version` is the engine of the figures they were built for, so a re-screened flight's
 * components are known stale until rebuilt.
 */

type Row = Record<string, unknown>;

export interface ComponentsRow {
  flightId: number;
  workspaceId: number;
  engineVersion: string;
  data: Uint8Array;
}

/** Writes (or replaces) components inside the caller's transaction. */
export async function saveFlightComponents(trx: Knex.Transaction, rows: ComponentsRow[]): Promise<void> {
  for (let i = 0; i < rows.length; i += 200) {
    const batch = rows.slice(i, i + 200).map((r) => ({
      flight_id: r.flightId,
      workspace_id: r.workspaceId,
      engine_version: r.engineVersion,
      data: Buffer.from(r.data.buffer, r.data.byteOffset, r.data.byteLength),
    }));
    await trx('flight_components').insert(batch).onConflict('flight_id').merge(['engine_version', 'data']);
  }
}

/** A screened flight whose components are missing or from another engine version than its figures. */
export interface FlightNeedingComponents {
  id: number;
  workspaceId: number;
  engineVersion: string;
  inputJson: string;
}

/**
 * Screened flights (any workspace: the worker's side) after `afterId` whose components are missing or
 * stale, in id order. A flight whose components could not be built has an empty row and is not listed.
 */
export async function listFlightsNeedingComponents(afterId: number, limit: number): Promise<FlightNeedingComponents[]> {
  const rows = (await db()('flights as fl')
    .leftJoin('flight_components as fc', 'fc.flight_id', 'fl.id')
    .where('fl.status', 'screened')
    .where('fl.id', '>', afterId)
    .where((w) => w.whereNull('fc.flight_id').orWhereRaw('fc.engine_version <> fl.engine_version'))
    .orderBy('fl.id')
    .limit(limit)
    .select('fl.id', 'fl.workspace_id', 'fl.engine_version', 'fl.input_json')) as Row[];
  return rows.map((r) => ({
    id: Number(r.id),
    workspaceId: Number(r.workspace_id),
    engineVersion: String(r.engine_version),
    inputJson: String(r.input_json),
  }));
}

/**
 * Stores built components for flights whose figures are still from the components' engine version
 * (a flight re-screened meanwhile waits for its own), in one transaction. `data` empty: the engine
 * could not build them (kept so the flight is not tried again; the sampling counts it left out).
 */
export async function saveBuiltComponents(rows: ComponentsRow[]): Promise<number> {
  if (!rows.length) return 0;
  return writeTx(async (trx) => {
    const current = (await trx('flights')
      .whereIn(
        'id',
        rows.map((r) => r.flightId),
      )
      .select('id', 'engine_version')) as Row[];
    const versionOf = new Map(current.map((r) => [Number(r.id), String(r.engine_version)]));
    const keep = rows.filter((r) => versionOf.get(r.flightId) === r.engineVersion);
    await saveFlightComponents(trx, keep);
    return keep.length;
  });
}

/** A flight of a fleet selection: its resolved fleet, engine version and whether its components are current. */
export interface FleetFlightRef {
  id: number;
  fleetId: number | null;
  engineVersion: string;
  current: boolean;
}

/** The screened flights the filters keep, in id order, with whether their components match their figures. */
export async function listFleetFlightRefs(
  scope: { workspaceId: number },
  filters: FlightFilters,
): Promise<FleetFlightRef[]> {
  const screened = flightsWithFleet(db(), scope.workspaceId)
    .where('fl.status', 'screened')
    .whereBetween('fl.date', [filters.from, filters.to]);
  const rows = (await applyFilters(screened, filters)
    .leftJoin('flight_components as fc', 'fc.flight_id', 'fl.id')
    .orderBy('fl.id')
    .select('fl.id', 'f.id as fleet_id', 'fl.engine_version', 'fc.engine_version as fc_version')) as Row[];
  return rows.map((r) => ({
    id: Number(r.id),
    fleetId: r.fleet_id === null || r.fleet_id === undefined ? null : Number(r.fleet_id),
    engineVersion: String(r.engine_version ?? ''),
    current: r.fc_version !== null && r.fc_version !== undefined && r.fc_version === r.engine_version,
  }));
}

/** The stored inputs of flights of this workspace, for building missing components. */
export async function listFlightInputs(
  scope: { workspaceId: number },
  ids: number[],
): Promise<{ id: number; inputJson: string }[]> {
  const out: { id: number; inputJson: string }[] = [];
  for (let i = 0; i < ids.length; i += 500) {
    const rows = (await db()('flights')
      .where('workspace_id', scope.workspaceId)
      .whereIn('id', ids.slice(i, i + 500))
      .select('id', 'input_json')) as Row[];
    for (const r of rows) out.push({ id: Number(r.id), inputJson: String(r.input_json) });
  }
  return out;
}

/**
 * Calls `each(ref, bytes)` for the components of the given flights (from listFleetFlightRefs, in id
 * order) that match their flight's engine version. Reads by primary-key ranges of `pageSize` flights,
 * without the selection's joins, so a 100 000-flight selection costs one pass over its blobs.
 */
export async function forEachFlightComponents(
  scope: { workspaceId: number },
  refs: readonly FleetFlightRef[],
  each: (ref: FleetFlightRef, data: Uint8Array) => void,
  pageSize = 10_000,
): Promise<void> {
  for (let i = 0; i < refs.length; i += pageSize) {
    const page = refs.slice(i, i + pageSize);
    const byId = new Map(page.map((r) => [r.id, r]));
    const rows = (await db()('flight_components')
      .where('workspace_id', scope.workspaceId)
      .whereBetween('flight_id', [page[0].id, page[page.length - 1].id])
      .orderBy('flight_id')
      .select('flight_id', 'engine_version', 'data')) as Row[];
    for (const r of rows) {
      const ref = byId.get(Number(r.flight_id));
      const data = r.data as Uint8Array;
      if (ref && ref.engineVersion === r.engine_version && data.byteLength > 0) each(ref, data);
    }
  }
}

/** A stored fleet-percentile result by its key, or null. */
export async function getFleetPercentiles(scope: { workspaceId: number }, cacheKey: string): Promise<string | null> {
  const row = (await db()('fleet_percentiles')
    .where({ workspace_id: scope.workspaceId, cache_key: cacheKey })
    .first('result_json')) as Row | undefined;
  return row ? String(row.result_json) : null;
}

/** Stores a fleet-percentile result under its key (a second writer of the same key changes nothing). */
export async function putFleetPercentiles(
  scope: { workspaceId: number },
  cacheKey: string,
  resultJson: string,
): Promise<void> {
  await writeTx((trx) =>
    trx('fleet_percentiles')
      .insert({ workspace_id: scope.workspaceId, cache_key: cacheKey, result_json: resultJson, created_at: nowIso() })
      .onConflict(['workspace_id', 'cache_key'])
      .ignore()
      .then(() =>
        // Keep the newest results only: an older flight set is not asked for again once it changes.
        trx('fleet_percentiles')
          .where('workspace_id', scope.workspaceId)
          .whereNotIn(
            'id',
            trx('fleet_percentiles')
              .where('workspace_id', scope.workspaceId)
              .orderBy('id', 'desc')
              .limit(KEEP_RESULTS)
              .select('id'),
          )
          .delete(),
      ),
  );
}

const KEEP_RESULTS = 200;
