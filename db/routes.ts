import 'server-only';
import type { Knex } from 'knex';
import { db, insertId, nowIso, writeTx } from './client';
import { auditChange } from './audit';
import { nameTaken, rowInWorkspace, rowsInWorkspace } from './workspace-rows';
import type { LibraryActor } from './engines';
import { conflict } from '@/lib/errors';

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
  return (await rowsInWorkspace(trx, 'routes', scope, 'name', 'asc')).map(routeOf);
}

export async function getRoute(scope: { workspaceId: number }, id: number, trx: Db = db()): Promise<RouteDto> {
  return routeOf(await rowInWorkspace(trx, 'routes', scope, id, 'No saved route with that id in this workspace.'));
}

/** 409 at `name` when another saved route of the workspace has this name (any case). */
export async function assertRouteNameFree(
  trx: Db,
  workspaceId: number,
  name: string,
  exceptId?: number,
): Promise<void> {
  if (await nameTaken(trx, 'routes', workspaceId, name, exceptId))
    throw conflict(`A saved route called “${name}” already exists in this workspace.`, [
      { path: 'name', message: 'Another saved route already has this name.' },
    ]);
}

/** What a saved route holds; the service resolves and checks the waypoints before it is stored. */
export interface RouteRecord {
  name: string;
  waypoints: RouteWaypoint[];
  notes: string;
}

/** Inserts a route inside the caller's write transaction, with its audit entry. */
export async function insertRoute(
  trx: Knex.Transaction,
  scope: { workspaceId: number },
  route: RouteRecord,
  by: LibraryActor,
): Promise<RouteDto> {
  await assertRouteNameFree(trx, scope.workspaceId, route.name);
  const now = nowIso();
  const id = await insertId(
    trx('routes').insert(
      {
        workspace_id: scope.workspaceId,
        name: route.name,
        waypoints_json: JSON.stringify(route.waypoints),
        notes: route.notes,
        created_by: by.userId,
        created_at: now,
        updated_at: now,
      },
      ['id'],
    ),
  );
  await auditChange(trx, scope, by, { action: 'route.create', target: `route:${id}`, detail: { name: route.name } });
  return getRoute(scope, id, trx);
}

/** Replaces a route inside the caller's write transaction (404 when it is not in the workspace), with its audit entry. */
export async function replaceRoute(
  trx: Knex.Transaction,
  scope: { workspaceId: number },
  id: number,
  route: RouteRecord,
  by: LibraryActor,
): Promise<RouteDto> {
  await getRoute(scope, id, trx);
  await assertRouteNameFree(trx, scope.workspaceId, route.name, id);
  await trx('routes')
    .where({ workspace_id: scope.workspaceId, id })
    .update({
      name: route.name,
      waypoints_json: JSON.stringify(route.waypoints),
      notes: route.notes,
      updated_at: nowIso(),
    });
  await auditChange(trx, scope, by, { action: 'route.update', target: `route:${id}`, detail: { name: route.name } });
  return getRoute(scope, id, trx);
}

export async function deleteRoute(scope: { workspaceId: number }, id: number, by: LibraryActor): Promise<void> {
  await writeTx(async (trx) => {
    const route = await getRoute(scope, id, trx);
    await trx('routes').where({ workspace_id: scope.workspaceId, id }).delete();
    await auditChange(trx, scope, by, { action: 'route.delete', target: `route:${id}`, detail: { name: route.name } });
  });
}
