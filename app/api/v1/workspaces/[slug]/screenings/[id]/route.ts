import { idParam, json, workspaceRoute } from '@/lib/api/handler';
import { listRescreensOf } from '@/db/screenings';
import { getScreening } from '@/lib/screening-service/saved';
import { ENGINE_VERSION } from '@/lib/screening';

export const GET = workspaceRoute<{ slug: string; id: string }>('flights:read', async ({ params, member }) => {
  const scope = { workspaceId: member.workspace.id };
  const r = await getScreening(scope, idParam(params.id));
  const rescreens = await listRescreensOf(scope, r.id);
  return json({
    id: r.id,
    name: r.name,
    createdAt: r.createdAt,
    aircraft: r.aircraftCode,
    engineVersion: r.engineVersion,
    currentEngineVersion: ENGINE_VERSION,
    outdated: r.engineVersion !== ENGINE_VERSION,
    rescreenOf: r.rescreenOf,
    rescreens,
    input: r.input,
    result: r.result,
  });
});
