import { json, readJson, workspaceRoute } from '@/lib/api/handler';
import { createFleet, listFleets } from '@/db/fleets';
import { fleetCreateSchema } from '@/lib/validation/fleets';

/** `{ items }`: the workspace's fleets with the aircraft types that default to each. */
export const GET = workspaceRoute<{ slug: string }>('flights:read', async ({ member }) => {
  return json({ items: await listFleets({ workspaceId: member.workspace.id }) });
});

/** 201 with the new fleet; 409 when the name is taken. */
export const POST = workspaceRoute<{ slug: string }>('fleets:write', async ({ req, member, userId, actorLabel }) => {
  const body = await readJson(req, fleetCreateSchema);
  return json(await createFleet({ workspaceId: member.workspace.id }, { ...body, actor: actorLabel, userId }), 201);
});
