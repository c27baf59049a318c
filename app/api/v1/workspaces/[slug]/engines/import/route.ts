import { json, workspaceRoute } from '@/lib/api/handler';
import { createEngines, engineNamesInUse } from '@/db/engines';
import { csvRejection } from '@/lib/imports/csv';
import { readUpload } from '@/lib/api/upload';
import { engineCsvTemplate, parseEnginesCsv } from '@/lib/imports/engines-csv';
import { LIBRARY_CSV_MAX_BYTES } from '@/lib/validation/library';

/** The CSV template: the header and one invented example row. */
export const GET = workspaceRoute<{ slug: string }>('flights:read', async () => {
  return new Response(engineCsvTemplate(), {
    status: 200,
    headers: {
      'content-type': 'text/csv; charset=utf-8',
      'content-disposition': 'attachment; filename="engines-template.csv"',
    },
  });
});

/**
 * Imports engines from a CSV in the multipart field `file`, all or nothing: 201 `{ items, warnings }`,
 * or 422 `{ error, problems: { line, column, message }[], warnings }` with nothing saved.
 */
export const POST = workspaceRoute<{ slug: string }>('library:write', async ({ req, member, userId, actorLabel }) => {
  const scope = { workspaceId: member.workspace.id };
  const upload = await readUpload(req, { maxBytes: LIBRARY_CSV_MAX_BYTES });
  const parsed = parseEnginesCsv(upload.text, { existingNames: await engineNamesInUse(scope) });
  if (parsed.problems.length) return csvRejection(parsed.problems, parsed.warnings);
  const items = await createEngines(scope, parsed.engines, { userId, actor: actorLabel, fileName: upload.fileName });
  return json({ items, warnings: parsed.warnings }, 201);
});
