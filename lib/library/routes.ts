import 'server-only';
import { writeTx } from '@/db/client';
import { insertRoute, replaceRoute, type RouteDto, type RouteWaypoint } from '@/db/routes';
import type { LibraryActor } from '@/db/engines';
import { routeDistanceKm } from '@/lib/screening';
import { planRoute, resolveWaypoints } from '@/lib/screening/great-circle';
import type { RouteSave } from '@/lib/validation/library';

/**
 * Saved routes: the engine's checks of the waypoints run here, before the write transaction the
 * trx-taking queries of `db/routes.ts` share.
 */

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
  const out = waypoints.map((w) =>
    'airport' in w ? { airport: w.airport.trim().toUpperCase() } : { lat: w.lat, lon: w.lon },
  );
  const { lat, lon } = resolveWaypoints(out, 'waypoints');
  planRoute(lat, lon, 'waypoints');
  return out;
}

export async function createRoute(
  scope: { workspaceId: number },
  input: RouteSave,
  by: LibraryActor,
): Promise<RouteDto> {
  const waypoints = resolveRouteWaypoints(input.waypoints);
  return writeTx((trx) => insertRoute(trx, scope, { name: input.name, waypoints, notes: input.notes }, by));
}

export async function updateRoute(
  scope: { workspaceId: number },
  id: number,
  input: RouteSave,
  by: LibraryActor,
): Promise<RouteDto> {
  const waypoints = resolveRouteWaypoints(input.waypoints);
  return writeTx((trx) => replaceRoute(trx, scope, id, { name: input.name, waypoints, notes: input.notes }, by));
}
