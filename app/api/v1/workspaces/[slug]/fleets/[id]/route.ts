import { idParam, json, readJson, workspaceRoute } from '@/lib/api/handler';
import { deleteFleet, getFleet, updateFleet } from '@/db/fleets';
import { fleetUpdateSchema } from '@/lib/validation/fleets';

type Params = { slug: string; id: string };

export const GET = workspaceRoute<Params>('flights:read', async ({ params, member }) => {
  return json(await getFleet({ workspaceId: member.workspace.id }, idParam(params.id)));
});

/** Rename, describe, or set exactly which aircraft types default to this fleet. */
export const PATCH = workspaceRoute<Params>('fleets:write', async ({ req, params, member, userId, actorLabel }) => {
  const id = idParam(params.id);
  const body = await readJson(req, fleetUpdateSchema);
  return json(await updateFleet({ workspaceId: member.workspace.id }, id, { ...body, actor: actorLabel, userId }));
});

/** 204; aircraft types lose this default and flights fall back to their type's default fleet. */
export const DELETE = workspaceRoute<Params>('fleets:write', async ({ params, member, userId, actorLabel }) => {
  await deleteFleet({ workspaceId: member.workspace.id }, idParam(params.id), { actor: actorLabel, userId });
  return new Response(null, { status: 204 });
});
