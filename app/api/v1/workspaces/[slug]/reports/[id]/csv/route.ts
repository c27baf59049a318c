import { idParam, workspaceRoute } from '@/lib/api/handler';
import { getReportCsv } from '@/db/reports';
import { attachmentHeaders } from '@/lib/reports/download';

/** The stored CSV (RFC 4180, SI units) as an attachment. */
export const GET = workspaceRoute<{ slug: string; id: string }>('flights:read', async ({ params, member }) => {
  const file = await getReportCsv({ workspaceId: member.workspace.id }, idParam(params.id));
  return new Response(file.csv, {
    status: 200,
    headers: attachmentHeaders(file.name, 'csv', 'text/csv; charset=utf-8; header=present'),
  });
});
