import { json, readQuery, workspaceRoute } from '@/lib/api/handler';
import { listImports } from '@/db/imports';
import { acceptScheduleUpload, readScheduleFile } from '@/lib/imports/schedule-service';
import { importListQuerySchema } from '@/lib/validation/imports';
import { invalidFields } from '@/lib/errors';

/**
 * Uploads a flight-schedule CSV (multipart, field `file`). 202 with the queued import once every row
 * is good; 422 `{ error, problems: { line, column, message }[] }` and nothing saved otherwise.
 */
export const POST = workspaceRoute<{ slug: string }>('imports:create', async ({ req, member, userId, actorLabel }) => {
  const dry = new URL(req.url).searchParams.get('dryRun');
  if (dry !== null && dry !== '1' && dry !== 'true' && dry !== '0' && dry !== 'false')
    throw invalidFields([{ path: 'dryRun', message: 'dryRun is 1 (check and estimate only) or 0.' }]);
  const dryRun = dry === '1' || dry === 'true';
  const file = await readScheduleFile(req);
  const outcome = await acceptScheduleUpload(
    { workspaceId: member.workspace.id },
    { userId, label: actorLabel },
    file,
    { dryRun },
  );
  if (!outcome.accepted) {
    const rows = new Set(outcome.problems.map((p) => p.line)).size;
    const listed =
      outcome.problemCount > outcome.problems.length
        ? ` The first ${outcome.problems.length} of ${outcome.problemCount} problems are listed.`
        : '';
    return json(
      {
        error: {
          code: 'invalid_fields',
          message: `${outcome.problemCount} problem${outcome.problemCount === 1 ? '' : 's'} on ${rows} line${rows === 1 ? '' : 's'}; nothing was imported. Fix the file and upload it again.${listed}`,
        },
        problems: outcome.problems,
        problemCount: outcome.problemCount,
        warnings: outcome.warnings,
      },
      422,
    );
  }
  if ('dryRun' in outcome) {
    return json({ dryRun: true, rows: outcome.rows, ...outcome.estimate, warnings: outcome.warnings });
  }
  return json(outcome.import, 202, {
    location: `/api/v1/workspaces/${member.workspace.slug}/imports/${outcome.import.id}`,
  });
});

/** `{ items, nextCursor }`, newest first. */
export const GET = workspaceRoute<{ slug: string }>('flights:read', async ({ req, member }) => {
  const query = readQuery(req, importListQuerySchema);
  return json(await listImports({ workspaceId: member.workspace.id }, query));
});
