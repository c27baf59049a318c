import { json, workspaceRoute } from '@/lib/api/handler';
import { createSounding } from '@/lib/library/soundings';
import { csvRejection } from '@/lib/imports/csv';
import { readUpload } from '@/lib/api/upload';
import { levelProblemsToCsv, parseSoundingCsv } from '@/lib/imports/soundings-csv';
import { LIBRARY_CSV_MAX_BYTES, soundingMetaSchema } from '@/lib/validation/library';
import { zodFields } from '@/lib/errors';
import { ScreeningInputError } from '@/lib/screening';

/**
 * A sounding from a CSV of levels (multipart: `file`, and the fields `name`, `station`,
 * `observedAt`): 201 with the sounding and its tropopause; 422 `{ error, problems, warnings }` with
 * the file's problems by line and column (and `error.fields` for the form fields), nothing saved.
 */
export const POST = workspaceRoute<{ slug: string }>('library:write', async ({ req, member, userId, actorLabel }) => {
  const upload = await readUpload(req, { maxBytes: LIBRARY_CSV_MAX_BYTES });
  const meta = soundingMetaSchema.safeParse({
    name: upload.fields.name ?? '',
    station: upload.fields.station,
    observedAt: upload.fields.observedAt,
  });
  const parsed = parseSoundingCsv(upload.text);
  const fields = meta.success ? [] : zodFields(meta.error);
  if (parsed.problems.length || !meta.success) return csvRejection(parsed.problems, parsed.warnings, fields);
  try {
    const sounding = await createSounding(
      { workspaceId: member.workspace.id },
      { ...meta.data, levels: parsed.levels },
      { userId, actor: actorLabel },
    );
    return json({ ...sounding, warnings: parsed.warnings }, 201);
  } catch (err) {
    if (err instanceof ScreeningInputError)
      return csvRejection(levelProblemsToCsv(err.fields, parsed.lines, parsed.temperatureColumn), parsed.warnings);
    throw err;
  }
});
