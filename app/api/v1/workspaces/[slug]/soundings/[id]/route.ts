import { idParam, json, workspaceRoute } from '@/lib/api/handler';
import { deleteSounding, getSounding } from '@/db/soundings';

type Params = { slug: string; id: string };

export const GET = workspaceRoute<Params>('flights:read', async ({ params, member }) => {
  return json(await getSounding({ workspaceId: member.workspace.id }, idParam(params.id)));
});

export const DELETE = workspaceRoute<Params>('library:write', async ({ params, member, userId, actorLabel }) => {
  await deleteSounding({ workspaceId: member.workspace.id }, idParam(params.id), { userId, actor: actorLabel });
  return new Response(null, { status: 204 });
});
