import { libraryItemRoutes } from '@/lib/api/library-routes';
import { deleteRoute, getRoute, type RouteDto } from '@/db/routes';
import { routeWithDistance, updateRoute } from '@/lib/library/routes';
import { routeSaveSchema } from '@/lib/validation/library';

const saveOf = ({ name, waypoints, notes }: RouteDto) => ({ name, waypoints, notes });
const api = libraryItemRoutes(getRoute, saveOf, routeSaveSchema, updateRoute, deleteRoute, routeWithDistance);

export const GET = api.GET;

/** Changes any of name, waypoints, notes; the rest is kept. */
export const PATCH = api.PATCH;

export const DELETE = api.DELETE;
