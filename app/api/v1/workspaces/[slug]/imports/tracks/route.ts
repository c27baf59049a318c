import { json, workspaceRoute } from '@/lib/api/handler';
import { acceptTrackUpload } from '@/lib/imports/track-service';
import { invalidFields } from '@/lib/errors';

/**
 * Uploads a flown-track CSV (multipart, field `file`, read as a stream). 202 with the queued import
 * once every point and flight is good; 422 `{ error, problems: { line, column, message }[] }` and
 * nothing saved otherwise. Each flight is screened in the background and billed once.
 */
export const POST = workspaceRoute<{ slug: string }>('imports:create', async ({ req, member, userId, actorLabel }) => {
  const dry = new URL(req.url).searchParams.get('dryRun');
  if (dry !== null && dry !== '1' && dry !== 'true' && dry !== '0' && dry !== 'false')
    throw invalidFields([{ path: 'dryRun', message: 'dryRun is 1 (check only) or 0.' }]);
  const outcome = await acceptTrackUpload({ workspaceId: member.workspace.id }, { userId, label: actorLabel }, req, {
    dryRun: dry === '1' || dry === 'true',
  });
  if (!outcome.accepted) {
    const lines = new Set(outcome.problems.map((p) => p.line)).size;
    const listed =
      outcome.problemCount > outcome.problems.length
        ? ` The first ${outcome.problems.length} of ${outcome.problemCount} problems are listed.`
        : '';
    return json(
      {
        error: {
          code: 'invalid_fields',
          message: `${outcome.problemCount} problem${outcome.problemCount === 1 ? '' : 's'} on ${lines} line${lines === 1 ? '' : 's'}; nothing was imported. Fix the track file and upload it again.${listed}`,
        },
        problems: outcome.problems,
        problemCount: outcome.problemCount,
        warnings: outcome.warnings,
      },
      422,
    );
  }
  if ('dryRun' in outcome)
    return json({ dryRun: true, flights: outcome.flights, points: outcome.points, warnings: outcome.warnings });
  return json({ ...outcome.import, points: outcome.points }, 202, {
    location: `/api/v1/workspaces/${member.workspace.slug}/imports/${outcome.import.id}`,
  });
});
