import { z } from 'zod';
import { idParam, json, readJson, workspaceRoute } from '@/lib/api/handler';
import { aircraftTypeSaveOf, deleteAircraftType, getAircraftType, updateAircraftType } from '@/db/engines';
import { aircraftTypeSaveSchema } from '@/lib/validation/library';
import { fromZod } from '@/lib/errors';

type Params = { slug: string; id: string };

export const GET = workspaceRoute<Params>('flights:read', async ({ params, member }) => {
  return json(await getAircraftType({ workspaceId: member.workspace.id }, idParam(params.id)));
});

/**
 * Changes any field; the rest is kept. Switching between an engine and a direct EI NOx means sending
 * both (`{ engineId: null, directEiGPerKg: 12 }`).
 */
export const PATCH = workspaceRoute<Params>('library:write', async ({ req, params, member, userId, actorLabel }) => {
  const scope = { workspaceId: member.workspace.id };
  const id = idParam(params.id);
  const current = await getAircraftType(scope, id);
  const patch = await readJson(
    req,
    z.record(z.string(), z.unknown(), { error: 'Send a JSON object with the fields to change.' }),
  );
  const parsed = aircraftTypeSaveSchema.safeParse({ ...aircraftTypeSaveOf(current), ...patch });
  if (!parsed.success) throw fromZod(parsed.error);
  return json(await updateAircraftType(scope, id, parsed.data, { userId, actor: actorLabel }));
});

export const DELETE = workspaceRoute<Params>('library:write', async ({ params, member, userId, actorLabel }) => {
  await deleteAircraftType({ workspaceId: member.workspace.id }, idParam(params.id), { userId, actor: actorLabel });
  return new Response(null, { status: 204 });
});
