import { idParam, workspaceRoute } from '@/lib/api/handler';
import { revokeApiKey } from '@/db/api-keys';

export const DELETE = workspaceRoute<{ slug: string; id: string }>(
  'apikeys:manage',
  async ({ params, member, userId, actorLabel }) => {
    await revokeApiKey(
      { workspaceId: member.workspace.id },
      { id: idParam(params.id), actorId: userId, actor: actorLabel },
    );
    return new Response(null, { status: 204 });
  },
);
