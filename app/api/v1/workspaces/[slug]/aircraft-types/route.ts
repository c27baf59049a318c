import { json, readJson, workspaceRoute } from '@/lib/api/handler';
import { createAircraftType, listAircraftTypes } from '@/db/engines';
import { aircraftTypeSaveSchema } from '@/lib/validation/library';

/** Aircraft types of the workspace, by code: `{ items }`. */
export const GET = workspaceRoute<{ slug: string }>('flights:read', async ({ member }) => {
  return json({ items: await listAircraftTypes({ workspaceId: member.workspace.id }) });
});

/** Adds a type: 201; 409 when the code is taken; 422 by field (`engineId` or `directEiGPerKg`, `engineCount`...). */
export const POST = workspaceRoute<{ slug: string }>('library:write', async ({ req, member, userId, actorLabel }) => {
  const input = await readJson(req, aircraftTypeSaveSchema);
  return json(
    await createAircraftType({ workspaceId: member.workspace.id }, input, { userId, actor: actorLabel }),
    201,
  );
});
