import { json, readJson, readQuery, workspaceRoute } from '@/lib/api/handler';
import { listFixes, saveFixes } from '@/db/route-library';
import { fixRowSchema, routeLibraryQuerySchema, ROUTE_LIBRARY_LIMITS } from '@/lib/validation/route-library';
import { z } from 'zod';

/** The workspace's named points by name, `?q=` a name prefix: `{ items }`. */
export const GET = workspaceRoute<{ slug: string }>('flights:read', async ({ req, member }) => {
  const query = readQuery(req, routeLibraryQuerySchema);
  return json({ items: await listFixes({ workspaceId: member.workspace.id }, query) });
});

const fixesBodySchema = z.strictObject({
  fixes: z
    .array(fixRowSchema)
    .min(1, { error: 'Give at least one fix.' })
    .max(ROUTE_LIBRARY_LIMITS.maxRows, { error: `Give at most ${ROUTE_LIBRARY_LIMITS.maxRows} fixes.` }),
});

/** Adds `{ fixes: { name, lat, lon, region? }[] }` (same name and region: moved): 201 `{ added, updated }`. */
export const POST = workspaceRoute<{ slug: string }>('navdata:write', async ({ req, member, userId, actorLabel }) => {
  const body = await readJson(req, fixesBodySchema);
  return json(await saveFixes({ workspaceId: member.workspace.id }, body.fixes, { userId, actor: actorLabel }), 201);
});
