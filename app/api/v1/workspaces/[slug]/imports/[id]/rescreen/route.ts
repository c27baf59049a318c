import { idParam, json, workspaceRoute } from '@/lib/api/handler';
import { rescreenImport } from '@/lib/imports/rescreen';

/** Queues a re-screen of the import's flights with the current engine (not billed): 202 the import with its `rescreen` progress. */
export const POST = workspaceRoute<{ slug: string; id: string }>(
  'imports:create',
  async ({ params, member, userId, actorLabel }) => {
    return json(
      await rescreenImport({ workspaceId: member.workspace.id }, idParam(params.id), { userId, label: actorLabel }),
      202,
    );
  },
);
