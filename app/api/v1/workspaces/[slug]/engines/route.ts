import { json, readJson, workspaceRoute } from '@/lib/api/handler';
import { createEngine, listEngines } from '@/db/engines';
import { engineSaveSchema } from '@/lib/validation/library';

/** Engines of the workspace, by name: `{ items }`. */
export const GET = workspaceRoute<{ slug: string }>('flights:read', async ({ member }) => {
  return json({ items: await listEngines({ workspaceId: member.workspace.id }) });
});

/** Adds an engine: 201; 409 when the name is taken; 422 by field (`fuelFlowKgS.2`, `eiNoxGPerKg.0`, `name`). */
export const POST = workspaceRoute<{ slug: string }>('library:write', async ({ req, member, userId, actorLabel }) => {
  const input = await readJson(req, engineSaveSchema);
  return json(await createEngine({ workspaceId: member.workspace.id }, input, { userId, actor: actorLabel }), 201);
});
