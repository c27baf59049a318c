import { json, readJson, readQuery, workspaceRoute } from '@/lib/api/handler';
import { listReports } from '@/db/reports';
import { buildFleetReport } from '@/lib/reports/build';
import { reportJson } from '@/lib/reports/json';
import { reportCreateSchema } from '@/lib/validation/reports';
import { z } from 'zod';

const listQuery = z.object({
  cursor: z.coerce.number().int().positive().optional(),
  limit: z.coerce.number().int().min(1).max(200).optional(),
});

/** `{ items, nextCursor }`, newest first. */
export const GET = workspaceRoute<{ slug: string }>('flights:read', async ({ req, member }) => {
  const query = readQuery(req, listQuery);
  const page = await listReports({ workspaceId: member.workspace.id }, query);
  return json({ items: page.items.map((r) => reportJson(member.workspace.slug, r)), nextCursor: page.nextCursor });
});

/** Builds and stores a fleet report (PDF and CSV): 201 with the report and its download links. */
export const POST = workspaceRoute<{ slug: string }>(
  'reports:create',
  async ({ req, member, principal, userId, actorLabel }) => {
    const body = await readJson(req, reportCreateSchema);
    const user = principal.kind === 'user' ? principal.user : null;
    const report = await buildFleetReport(
      { workspaceId: member.workspace.id },
      {
        ...body,
        workspaceName: member.workspace.name,
        units: user?.units ?? 'metric',
        createdBy: userId,
        actor: actorLabel,
        actorName: user ? user.name || user.email : actorLabel,
      },
    );
    return json(reportJson(member.workspace.slug, report), 201);
  },
);
