import { json, workspaceRoute } from '@/lib/api/handler';
import { saveFixes } from '@/db/route-library';
import { csvRejection } from '@/lib/imports/csv';
import { readUpload } from '@/lib/api/upload';
import { parseFixCsv } from '@/lib/imports/route-library-csv';
import { ROUTE_LIBRARY_LIMITS } from '@/lib/validation/route-library';

/**
 * Fixes from a CSV (`name, lat, lon`, optional `region`; multipart field `file`): 201 `{ added,
 * updated, warnings }`; 422 `{ error, problems, warnings }` by line and column, nothing saved.
 */
export const POST = workspaceRoute<{ slug: string }>('navdata:write', async ({ req, member, userId, actorLabel }) => {
  const upload = await readUpload(req, { maxBytes: ROUTE_LIBRARY_LIMITS.maxBytes });
  const parsed = parseFixCsv(upload.text);
  if (parsed.problems.length || parsed.rows.length === 0) {
    return csvRejection(
      parsed.problems.length ? parsed.problems : [{ line: 1, column: '', message: 'The file has no fixes.' }],
      parsed.warnings,
    );
  }
  const saved = await saveFixes({ workspaceId: member.workspace.id }, parsed.rows, {
    userId,
    actor: actorLabel,
    fileName: upload.fileName,
  });
  return json({ ...saved, warnings: parsed.warnings }, 201);
});
