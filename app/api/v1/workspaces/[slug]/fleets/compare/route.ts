import { json, workspaceRoute } from '@/lib/api/route';
import { compareFleets } from '@/lib/fleets/compare';
import { fleetCompareQuerySchema } from '@/lib/validation/fleets';
import { fromZod } from '@/lib/errors';

/** The fleet comparison for the filters in the query string (SI units; the client converts). */
export const GET = workspaceRoute<{ slug: string }>('flights:read', async ({ req, member }) => {
  const q = fleetCompareQuerySchema.safeParse(Object.fromEntries(new URL(req.url).searchParams));
  if (!q.success) throw fromZod(q.error);
  return json(await compareFleets({ workspaceId: member.workspace.id }, q.data));
});
