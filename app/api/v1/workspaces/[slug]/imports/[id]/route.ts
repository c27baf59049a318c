import { idParam, json, workspaceRoute } from '@/lib/api/handler';
import { deleteImport, getImport } from '@/db/imports';

/** One import with its progress: rows done, rows per second, seconds left, problems. */
export const GET = workspaceRoute<{ slug: string; id: string }>('flights:read', async ({ params, member }) => {
  return json(await getImport({ workspaceId: member.workspace.id }, idParam(params.id)));
});

/** Deletes the import and its flights; units already billed stay in the usage ledger. */
export const DELETE = workspaceRoute<{ slug: string; id: string }>(
  'imports:delete',
  async ({ params, member, userId, actorLabel }) => {
    const r = await deleteImport({ workspaceId: member.workspace.id }, idParam(params.id), {
      userId,
      label: actorLabel,
    });
    return json({
      ...r,
      message: `Import #${r.id} and its ${r.flightsDeleted} flights were deleted. ${r.billedUnitsKept} unit${r.billedUnitsKept === 1 ? '' : 's'} already billed for screened flights stay billed.`,
    });
  },
);
