import { idParam, json, workspaceRoute } from '@/lib/api/route';
import { getScreening } from '@/db/screenings';

export const GET = workspaceRoute<{ slug: string; id: string }>('flights:read', async ({ params, member }) => {
  const r = await getScreening({ workspaceId: member.workspace.id }, idParam(params.id));
  return json({ id: r.id, name: r.name, createdAt: r.createdAt, aircraft: r.aircraftCode, input: r.input, result: r.result });
});
