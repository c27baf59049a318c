import { json, workspaceRoute } from '@/lib/api/route';
import { listFlights } from '@/db/flights';
import { flightListQuerySchema } from '@/lib/validation/imports';
import { fromZod } from '@/lib/errors';

/** `{ items, nextCursor }`: flights newest date first, filtered by import, date range, fleet and aircraft. */
export const GET = workspaceRoute<{ slug: string }>('flights:read', async ({ req, member }) => {
  const q = flightListQuerySchema.safeParse(Object.fromEntries(new URL(req.url).searchParams));
  if (!q.success) throw fromZod(q.error);
  return json(await listFlights({ workspaceId: member.workspace.id }, q.data));
});
