import { json, workspaceRoute } from '@/lib/api/handler';
import { saveAirways } from '@/db/route-library';
import { csvRejection } from '@/lib/imports/csv';
import { readUpload } from '@/lib/api/upload';
import { parseAirwayCsv } from '@/lib/imports/route-library-csv';
import { ROUTE_LIBRARY_LIMITS } from '@/lib/validation/route-library';

/**
 * Airways from a CSV (`airway, sequence, fix`; multipart field `file`); an airway already in the
 * library is replaced: 201 `{ added, updated, warnings }`; 422 `{ error, problems, warnings }`.
 */
export const POST = workspaceRoute<{ slug: string }>('navdata:write', async ({ req, member, userId, actorLabel }) => {
  const upload = await readUpload(req, { maxBytes: ROUTE_LIBRARY_LIMITS.maxBytes });
  const parsed = parseAirwayCsv(upload.text);
  if (parsed.problems.length || parsed.rows.length === 0) {
    return csvRejection(
      parsed.problems.length ? parsed.problems : [{ line: 1, column: '', message: 'The file has no airways.' }],
      parsed.warnings,
    );
  }
  const saved = await saveAirways({ workspaceId: member.workspace.id }, parsed.rows, {
    userId,
    actor: actorLabel,
    fileName: upload.fileName,
  });
  return json({ ...saved, warnings: parsed.warnings }, 201);
});
