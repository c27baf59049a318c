import { json, workspaceRoute } from '@/lib/api/route';
import { listAirways } from '@/db/route-library';
import { routeLibraryQuerySchema } from '@/lib/validation/route-library';
import { fromZod } from '@/lib/errors';

/** The workspace's airways by designator, each with its fix names in order; `?q=` a prefix: `{ items }`. */
export const GET = workspaceRoute<{ slug: string }>('flights:read', async ({ req, member }) => {
  const q = routeLibraryQuerySchema.safeParse(Object.fromEntries(new URL(req.url).searchParams));
  if (!q.success) throw fromZod(q.error);
  return json({ items: await listAirways({ workspaceId: member.workspace.id }, q.data) });
});
