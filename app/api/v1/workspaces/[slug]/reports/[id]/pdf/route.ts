import { idParam, workspaceRoute } from '@/lib/api/handler';
import { getReportPdf } from '@/db/reports';
import { attachmentHeaders } from '@/lib/reports/download';

/** The stored PDF as an attachment. */
export const GET = workspaceRoute<{ slug: string; id: string }>('flights:read', async ({ params, member }) => {
  const file = await getReportPdf({ workspaceId: member.workspace.id }, idParam(params.id));
  return new Response(new Uint8Array(file.pdf), {
    status: 200,
    headers: {
      ...attachmentHeaders(file.name, 'pdf', 'application/pdf'),
      'content-length': String(file.pdf.byteLength),
    },
  });
});
