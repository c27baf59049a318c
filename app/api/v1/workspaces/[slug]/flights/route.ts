import { json, readQuery, workspaceRoute } from '@/lib/api/handler';
import { listFlights } from '@/db/flights';
import { flightListQuerySchema } from '@/lib/validation/imports';

/** `{ items, nextCursor }`: flights newest date first, filtered by import, date range, fleet and aircraft. */
export const GET = workspaceRoute<{ slug: string }>('flights:read', async ({ req, member }) => {
  const query = readQuery(req, flightListQuerySchema);
  return json(await listFlights({ workspaceId: member.workspace.id }, query));
});
