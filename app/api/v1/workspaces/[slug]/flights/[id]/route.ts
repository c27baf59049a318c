import { idParam, json, workspaceRoute } from '@/lib/api/handler';
import { flightViewJson, getFlightView } from '@/lib/flights/view';

/** One imported flight (planned or flown) with, when the same flight was both planned and flown, the other side and the differences. */
export const GET = workspaceRoute<{ slug: string; id: string }>('flights:read', async ({ member, params }) => {
  const view = await getFlightView({ workspaceId: member.workspace.id }, idParam(params.id));
  return json(flightViewJson(view));
});
