import 'server-only';
import type { Knex } from 'knex';
import { db, nowIso, writeTx } from './client';
import { applyFilters, flightsWithFleet, type FlightFilters } from './fleets';

/**
 * The per-flight components of the fleet uncertainty sampling (bytes made by the engine's
 * encodeFlightComponents) and the stored fleet percentiles. Components are written by the import
 * worker in the transaction that writes the flight's figures; `engine_version` is the engine that
 * made them, so components of an older screening are known stale.
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

/** Components of flights inside the caller's transaction are removed (a flight re-screened without them). */
export async function deleteFlightComponents(trx: Knex.Transaction, flightIds: number[]): Promise<void> {
  for (let i = 0; i < flightIds.length; i += 500)
    await trx('flight_components')
      .whereIn('flight_id', flightIds.slice(i, i + 500))
      .delete();
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
  const rows = (await applyFilters(flightsWithFleet(db(), scope.workspaceId), filters)
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

/** Components built outside an import (lazily, for flights screened before they were kept). */
export async function storeFlightComponents(rows: ComponentsRow[]): Promise<void> {
  if (rows.length) await writeTx((trx) => saveFlightComponents(trx, rows));
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
      if (ref && ref.engineVersion === r.engine_version) each(ref, r.data as Uint8Array);
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
