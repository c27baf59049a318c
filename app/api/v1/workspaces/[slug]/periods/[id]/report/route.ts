import { workspaceRoute } from '@/lib/api/handler';
import { getPeriodReportPdf } from '@/lib/periods/service';
import { attachmentHeaders } from '@/lib/reports/download';

/** The period's frozen report PDF (in review or signed; 409 while open). */
export const GET = workspaceRoute<{ slug: string; id: string }>('flights:read', async ({ params, member }) => {
  const file = await getPeriodReportPdf({ workspaceId: member.workspace.id }, params.id);
  return new Response(new Uint8Array(file.pdf), {
    status: 200,
    headers: {
      ...attachmentHeaders(`${member.workspace.name} ${file.name}`, 'pdf', 'application/pdf'),
      'content-length': String(file.pdf.byteLength),
    },
  });
});
