import 'server-only';
import type { Knex } from 'knex';
import { db } from './client';

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

export const routeOf = (r: Row): RouteDto => ({
  id: Number(r.id),
  name: String(r.name),
  waypoints: JSON.parse(String(r.waypoints_json)) as RouteWaypoint[],
  notes: String(r.notes ?? ''),
  createdAt: String(r.created_at),
  updatedAt: String(r.updated_at),
});

/** Saved routes of a workspace, by name. */
export async function listRoutes(scope: { workspaceId: number }, trx: Knex | Knex.Transaction = db()): Promise<RouteDto[]> {
  const rows = await trx('routes').where({ workspace_id: scope.workspaceId }).orderBy('name', 'asc').orderBy('id', 'asc');
  return rows.map(routeOf);
}
