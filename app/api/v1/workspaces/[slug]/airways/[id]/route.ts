import { idParam, workspaceRoute } from '@/lib/api/handler';
import { deleteAirway } from '@/db/route-library';

type Params = { slug: string; id: string };

export const DELETE = workspaceRoute<Params>('navdata:write', async ({ params, member, userId, actorLabel }) => {
  await deleteAirway({ workspaceId: member.workspace.id }, idParam(params.id), { userId, actor: actorLabel });
  return new Response(null, { status: 204 });
});
