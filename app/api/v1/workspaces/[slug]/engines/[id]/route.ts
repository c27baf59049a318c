import { z } from 'zod';
import { idParam, json, readJson, workspaceRoute } from '@/lib/api/handler';
import { deleteEngine, engineSaveOf, getEngine, updateEngine } from '@/db/engines';
import { engineSaveSchema } from '@/lib/validation/library';
import { fromZod } from '@/lib/errors';

type Params = { slug: string; id: string };

export const GET = workspaceRoute<Params>('flights:read', async ({ params, member }) => {
  return json(await getEngine({ workspaceId: member.workspace.id }, idParam(params.id)));
});

/** Changes any of name, fuelFlowKgS, eiNoxGPerKg, source (the four-value lists are replaced whole). */
export const PATCH = workspaceRoute<Params>('library:write', async ({ req, params, member, userId, actorLabel }) => {
  const scope = { workspaceId: member.workspace.id };
  const id = idParam(params.id);
  const current = await getEngine(scope, id);
  const patch = await readJson(
    req,
    z.record(z.string(), z.unknown(), { error: 'Send a JSON object with the fields to change.' }),
  );
  const parsed = engineSaveSchema.safeParse({ ...engineSaveOf(current), ...patch });
  if (!parsed.success) throw fromZod(parsed.error);
  return json(await updateEngine(scope, id, parsed.data, { userId, actor: actorLabel }));
});

/** 204; 409 while an aircraft type uses the engine. */
export const DELETE = workspaceRoute<Params>('library:write', async ({ params, member, userId, actorLabel }) => {
  await deleteEngine({ workspaceId: member.workspace.id }, idParam(params.id), { userId, actor: actorLabel });
  return new Response(null, { status: 204 });
});
