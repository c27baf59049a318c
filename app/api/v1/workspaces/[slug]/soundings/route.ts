import { json, readJson, workspaceRoute } from '@/lib/api/handler';
import { listSoundings } from '@/db/soundings';
import { createSounding } from '@/lib/library/soundings';
import { soundingCreateSchema } from '@/lib/validation/library';

/** Soundings of the workspace, newest first: `{ items }`, each with its levels and tropopause (or null). */
export const GET = workspaceRoute<{ slug: string }>('flights:read', async ({ member }) => {
  return json({ items: await listSoundings({ workspaceId: member.workspace.id }) });
});

/** Stores `{ name, station?, observedAt?, levels }` with its WMO tropopause: 201; 422 at `levels.N.field`. */
export const POST = workspaceRoute<{ slug: string }>('library:write', async ({ req, member, userId, actorLabel }) => {
  const input = await readJson(req, soundingCreateSchema);
  return json(await createSounding({ workspaceId: member.workspace.id }, input, { userId, actor: actorLabel }), 201);
});
