import { idParam, json, workspaceRoute } from '@/lib/api/handler';
import { deleteReport, getReport, listReportSends } from '@/db/reports';
import { reportJson } from '@/lib/reports/json';

/** One report: metadata, summary (SI units), its e-mail sends and download links. */
export const GET = workspaceRoute<{ slug: string; id: string }>('flights:read', async ({ params, member }) => {
  const scope = { workspaceId: member.workspace.id };
  const id = idParam(params.id);
  const [report, sends] = await Promise.all([getReport(scope, id), listReportSends(scope, id)]);
  return json({ ...reportJson(member.workspace.slug, report), sendHistory: sends });
});

/** Deletes the report, its stored PDF and CSV and its e-mail history (204); the audit log records it. */
export const DELETE = workspaceRoute<{ slug: string; id: string }>(
  'reports:delete',
  async ({ params, member, userId, actorLabel }) => {
    await deleteReport({ workspaceId: member.workspace.id }, idParam(params.id), { userId, actor: actorLabel });
    return new Response(null, { status: 204 });
  },
);
