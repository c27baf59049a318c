import { z } from 'zod';
import { idParam, json, readJson, workspaceRoute } from '@/lib/api/handler';
import { deleteRoute, getRoute } from '@/db/routes';
import { routeWithDistance as routeBody, updateRoute } from '@/lib/library/routes';
import { routeSaveSchema } from '@/lib/validation/library';
import { fromZod } from '@/lib/errors';

type Params = { slug: string; id: string };

export const GET = workspaceRoute<Params>('flights:read', async ({ params, member }) => {
  return json(routeBody(await getRoute({ workspaceId: member.workspace.id }, idParam(params.id))));
});

/** Changes any of name, waypoints, notes; the rest is kept. */
export const PATCH = workspaceRoute<Params>('library:write', async ({ req, params, member, userId, actorLabel }) => {
  const scope = { workspaceId: member.workspace.id };
  const id = idParam(params.id);
  const current = await getRoute(scope, id);
  const patch = await readJson(
    req,
    z.record(z.string(), z.unknown(), { error: 'Send a JSON object with the fields to change.' }),
  );
  const parsed = routeSaveSchema.safeParse({
    name: current.name,
    waypoints: current.waypoints,
    notes: current.notes,
    ...patch,
  });
  if (!parsed.success) throw fromZod(parsed.error);
  return json(routeBody(await updateRoute(scope, id, parsed.data, { userId, actor: actorLabel })));
});

export const DELETE = workspaceRoute<Params>('library:write', async ({ params, member, userId, actorLabel }) => {
  await deleteRoute({ workspaceId: member.workspace.id }, idParam(params.id), { userId, actor: actorLabel });
  return new Response(null, { status: 204 });
});
