import { json, readQuery, workspaceRoute } from '@/lib/api/handler';
import { listAirways } from '@/db/route-library';
import { routeLibraryQuerySchema } from '@/lib/validation/route-library';

/** The workspace's airways by designator, each with its fix names in order; `?q=` a prefix: `{ items }`. */
export const GET = workspaceRoute<{ slug: string }>('flights:read', async ({ req, member }) => {
  const query = readQuery(req, routeLibraryQuerySchema);
  return json({ items: await listAirways({ workspaceId: member.workspace.id }, query) });
});
