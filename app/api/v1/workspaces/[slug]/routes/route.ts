import { json, readJson, workspaceRoute } from '@/lib/api/handler';
import { listRoutes } from '@/db/routes';
import { createRoute, routeWithDistance as routeBody } from '@/lib/library/routes';
import { routeSaveSchema } from '@/lib/validation/library';

/** Saved routes of the workspace, by name: `{ items }`. */
export const GET = workspaceRoute<{ slug: string }>('flights:read', async ({ member }) => {
  const routes = await listRoutes({ workspaceId: member.workspace.id });
  return json({ items: routes.map(routeBody) });
});

/** Saves a route: 201 with the route; 409 when the name is taken; 422 for unknown airports (`waypoints.N.airport`). */
export const POST = workspaceRoute<{ slug: string }>('library:write', async ({ req, member, userId, actorLabel }) => {
  const input = await readJson(req, routeSaveSchema);
  const route = await createRoute({ workspaceId: member.workspace.id }, input, { userId, actor: actorLabel });
  return json(routeBody(route), 201);
});
