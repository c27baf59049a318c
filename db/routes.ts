import 'server-only';
import type { Knex } from 'knex';
import { db, insertId, nowIso, writeTx } from './client';
import { createAuditEntry } from './audit';
import type { LibraryActor } from './engines';
import { conflict, notFound } from '@/lib/errors';
import { routeDistanceKm } from '@/lib/screening';
import { planRoute, resolveWaypoints } from '@/lib/screening/route';
import type { RouteSave } from '@/lib/validation/library';

/** A route point: coordinates in degrees, or an airport's ICAO or IATA code. */
export type RouteWaypoint = { lat: number; lon: number } | { airport: string };

export interface RouteDto {
  id: number;
  name: string;
  waypoints: RouteWaypoint[];
  notes: string;
  createdAt: string;
  updatedAt: string;
}

type Row = Record<string, unknown>;
type Db = Knex | Knex.Transaction;

export const routeOf = (r: Row): RouteDto => ({
  id: Number(r.id),
  name: String(r.name),
  waypoints: JSON.parse(String(r.waypoints_json)) as RouteWaypoint[],
  notes: String(r.notes ?? ''),
  createdAt: String(r.created_at),
  updatedAt: String(r.updated_at),
});

/** Saved routes of a workspace, by name. */
export async function listRoutes(scope: { workspaceId: number }, trx: Db = db()): Promise<RouteDto[]> {
  const rows = await trx('routes').where({ workspace_id: scope.workspaceId }).orderBy('name', 'asc').orderBy('id', 'asc');
  return rows.map(routeOf);
}

export async function getRoute(scope: { workspaceId: number }, id: number, trx: Db = db()): Promise<RouteDto> {
  const row = await trx('routes').where({ workspace_id: scope.workspaceId, id }).first();
  if (!row) throw notFound('No saved route with that id in this workspace.');
  return routeOf(row);
}

/** Great-circle length of a saved route, km (mean-sphere, as the screening engine measures it). */
export function routeLengthKm(route: Pick<RouteDto, 'waypoints'>): number {
  return routeDistanceKm(route.waypoints);
}

/** A saved route with its great-circle length, km (the API's route body). */
export function routeWithDistance(route: RouteDto): RouteDto & { distanceKm: number } {
  return { ...route, distanceKm: routeLengthKm(route) };
}

/**
 * Checks waypoints the way a screening will read them: airport codes the engine knows (422 at
 * `waypoints.N.airport`), a route with length and no antipodal legs. Codes are stored in capitals.
 */
export function resolveRouteWaypoints(waypoints: readonly RouteWaypoint[]): RouteWaypoint[] {
  const out = waypoints.map((w) => ('airport' in w ? { airport: w.airport.trim().toUpperCase() } : { lat: w.lat, lon: w.lon }));
  const { lat, lon } = resolveWaypoints(out, 'waypoints');
  planRoute(lat, lon, 'waypoints');
  return out;
}

async function assertRouteNameFree(trx: Db, workspaceId: number, name: string, exceptId?: number): Promise<void> {
  const q = trx('routes').where({ workspace_id: workspaceId }).whereRaw('lower(name) = ?', [name.toLowerCase()]);
  if (exceptId !== undefined) q.andWhereNot('id', exceptId);
  if (await q.first()) throw conflict(`A saved route called “${name}” already exists in this workspace.`, [{ path: 'name', message: 'Another saved route already has this name.' }]);
}

export async function createRoute(scope: { workspaceId: number }, input: RouteSave, by: LibraryActor): Promise<RouteDto> {
  const waypoints = resolveRouteWaypoints(input.waypoints);
  return writeTx(async (trx) => {
    await assertRouteNameFree(trx, scope.workspaceId, input.name);
    const now = nowIso();
    const id = await insertId(
      trx('routes').insert(
        { workspace_id: scope.workspaceId, name: input.name, waypoints_json: JSON.stringify(waypoints), notes: input.notes, created_by: by.userId, created_at: now, updated_at: now },
        ['id'],
      ),
    );
    await createAuditEntry({ workspaceId: scope.workspaceId, userId: by.userId, actor: by.actor, action: 'route.create', target: `route:${id}`, detail: { name: input.name } }, trx);
    return getRoute(scope, id, trx);
  });
}

export async function updateRoute(scope: { workspaceId: number }, id: number, input: RouteSave, by: LibraryActor): Promise<RouteDto> {
  const waypoints = resolveRouteWaypoints(input.waypoints);
  return writeTx(async (trx) => {
    await getRoute(scope, id, trx);
    await assertRouteNameFree(trx, scope.workspaceId, input.name, id);
    await trx('routes').where({ workspace_id: scope.workspaceId, id }).update({ name: input.name, waypoints_json: JSON.stringify(waypoints), notes: input.notes, updated_at: nowIso() });
    await createAuditEntry({ workspaceId: scope.workspaceId, userId: by.userId, actor: by.actor, action: 'route.update', target: `route:${id}`, detail: { name: input.name } }, trx);
    return getRoute(scope, id, trx);
  });
}

export async function deleteRoute(scope: { workspaceId: number }, id: number, by: LibraryActor): Promise<void> {
  await writeTx(async (trx) => {
    const route = await getRoute(scope, id, trx);
    await trx('routes').where({ workspace_id: scope.workspaceId, id }).delete();
    await createAuditEntry({ workspaceId: scope.workspaceId, userId: by.userId, actor: by.actor, action: 'route.delete', target: `route:${id}`, detail: { name: route.name } }, trx);
  });
}
