import { workspaceRoute } from '@/lib/api/handler';
import { buildAuditPack } from '@/lib/periods/audit-pack';
import { attachmentHeaders } from '@/lib/reports/download';

/** The audit pack of a signed period, a zip (409 for a period that is not signed). */
export const GET = workspaceRoute<{ slug: string; id: string }>('flights:read', async ({ params, member }) => {
  const pack = await buildAuditPack({ workspaceId: member.workspace.id }, params.id, {
    slug: member.workspace.slug,
    workspaceName: member.workspace.name,
  });
  return new Response(new Uint8Array(pack.zip), {
    status: 200,
    headers: {
      ...attachmentHeaders(pack.name, 'zip', 'application/zip'),
      'content-length': String(pack.zip.byteLength),
    },
  });
});
