import { json, readQuery, workspaceRoute } from '@/lib/api/handler';
import { compareFleets } from '@/lib/fleets/compare';
import { fleetCompareQuerySchema } from '@/lib/validation/fleets';

/** The fleet comparison for the filters in the query string (SI units; the client converts). */
export const GET = workspaceRoute<{ slug: string }>('flights:read', async ({ req, member }) => {
  const query = readQuery(req, fleetCompareQuerySchema);
  return json(await compareFleets({ workspaceId: member.workspace.id }, query));
});
