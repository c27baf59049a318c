import { loadRouteLibrary } from '@/db/route-library';
import 'server-only';
import { createHash } from 'node:crypto';
import { listAircraftForScreening } from '@/db/aircraft-lookup';
import { listFleetsByName, listFlightKeys } from '@/db/flights';
import { createImport, findImportByHash, type ImportDto } from '@/db/imports';
import { assertBillingAllows } from '@/lib/billing/gate';
import { estimateImport, type ImportEstimate } from '@/lib/billing/budget';
import { badRequest, tooLarge } from '@/lib/errors';
import { IMPORT_LIMITS, type ImportProblem } from '@/lib/validation/imports';
import { flightKey, parseSchedule, sortProblems } from './schedule';
import { queueImportWork } from './jobs';

/** An uploaded file as the multipart parser gives it. */
export interface UploadedFile {
  name: string;
  size: number;
  stream(): ReadableStream<Uint8Array>;
}

export type UploadOutcome =
  | { accepted: true; import: ImportDto; warnings: ImportProblem[] }
  | { accepted: true; dryRun: true; rows: number; estimate: ImportEstimate; warnings: ImportProblem[] }
  | { accepted: false; problems: ImportProblem[]; problemCount: number; warnings: ImportProblem[] };

const MB = 1024 * 1024;
/** Room for the multipart boundaries and headers around the file itself. */
const MULTIPART_OVERHEAD_BYTES = 64 * 1024;

export const tooBigMessage = `The file is larger than ${IMPORT_LIMITS.maxBytes / MB} MB. Split the schedule into smaller files (at most ${IMPORT_LIMITS.maxRows.toLocaleString('en-GB')} flights each) and upload them one by one.`;

/** A copy of the request body that stops with 413 once it passes the upload limit. */
function limitedBody(req: Request): ReadableStream<Uint8Array> | null {
  if (!req.body) return null;
  const limit = IMPORT_LIMITS.maxBytes + MULTIPART_OVERHEAD_BYTES;
  let seen = 0;
  return req.body.pipeThrough(
    new TransformStream<Uint8Array, Uint8Array>({
      transform(chunk, controller) {
        seen += chunk.byteLength;
        if (seen > limit) controller.error(tooLarge(tooBigMessage));
        else controller.enqueue(chunk);
      },
    }),
  );
}

/** Reads the multipart body and returns its `file` field; 413 past the limit, 400 when unreadable. */
export async function readUploadedFile(req: Request): Promise<UploadedFile> {
  const declared = Number(req.headers.get('content-length') ?? '0');
  if (declared > IMPORT_LIMITS.maxBytes + MULTIPART_OVERHEAD_BYTES) throw tooLarge(tooBigMessage);
  const type = req.headers.get('content-type') ?? '';
  if (!/^multipart\/form-data/i.test(type))
    throw badRequest('Send the schedule as multipart/form-data with the CSV in the field “file”.');
  const body = limitedBody(req);
  if (!body) throw badRequest('The request has no body; attach the schedule CSV in the field “file”.');
  let form: FormData;
  try {
    form = await new Response(body, { headers: { 'content-type': type } }).formData();
  } catch (err) {
    if (err instanceof Error && 'status' in err && (err as { status: number }).status === 413) throw err;
    const cause = (err as { cause?: unknown }).cause;
    if (cause instanceof Error && 'status' in cause && (cause as { status: number }).status === 413) throw cause;
    throw badRequest(
      'The upload could not be read as multipart/form-data. Attach the schedule CSV in the field “file”.',
    );
  }
  const file = form.get('file');
  if (file === null || typeof file === 'string') throw badRequest('Attach the schedule CSV in the field “file”.');
  if (file.size > IMPORT_LIMITS.maxBytes) throw tooLarge(tooBigMessage);
  return { name: file.name || 'schedule.csv', size: file.size, stream: () => file.stream() };
}

async function sha256(stream: ReadableStream<Uint8Array>): Promise<string> {
  const hash = createHash('sha256');
  for await (const chunk of stream as unknown as AsyncIterable<Uint8Array>) hash.update(chunk);
  return hash.digest('hex');
}

/**
 * Validates a schedule and, when every row is good, saves the import with its pending flights and
 * wakes the worker. Order: billing (402), size (413), the same file again (409), rows (413 past the
 * row limit, else problems), flights already in the workspace (problems).
 */
export async function acceptScheduleUpload(
  scope: { workspaceId: number },
  actor: { userId: number | null; label: string },
  file: UploadedFile,
  opts: { dryRun?: boolean } = {},
): Promise<UploadOutcome> {
  await assertBillingAllows(scope);
  if (file.size > IMPORT_LIMITS.maxBytes) throw tooLarge(tooBigMessage);
  const fileHash = await sha256(file.stream());
  const duplicate = await findImportByHash(scope, fileHash);
  if (duplicate) throw duplicate;

  const [aircraft, fleets, library] = await Promise.all([
    listAircraftForScreening(scope),
    listFleetsByName(scope),
    loadRouteLibrary(scope),
  ]);
  const parsed = await parseSchedule(file.stream(), { aircraft, fleets, library });
  const problems = parsed.problems;
  if (parsed.flights.length) {
    let from = parsed.flights[0].date;
    let to = from;
    for (const f of parsed.flights) {
      if (f.date < from) from = f.date;
      if (f.date > to) to = f.date;
    }
    const existing = await listFlightKeys(scope, { from, to });
    if (existing.size) {
      for (const f of parsed.flights) {
        const key = flightKey(f);
        if (!existing.has(key)) continue;
        const importId = existing.get(key);
        problems.push({
          line: f.line,
          column: 'flight',
          message: `Flight ${f.flight} on ${f.date} from ${f.origin} to ${f.destination} is already in this workspace${importId ? ` (import #${importId})` : ''}; it is not imported or billed twice. Remove the row.`,
        });
      }
    }
  }
  if (problems.length) {
    sortProblems(problems);
    return {
      accepted: false,
      problems: problems.slice(0, IMPORT_LIMITS.maxProblemsListed),
      problemCount: problems.length,
      warnings: parsed.warnings,
    };
  }
  if (opts.dryRun) {
    return {
      accepted: true,
      dryRun: true,
      rows: parsed.flights.length,
      estimate: await estimateImport(scope, parsed.flights.length),
      warnings: parsed.warnings,
    };
  }
  const saved = await createImport(scope, {
    fileName: file.name,
    fileHash,
    createdBy: actor.userId,
    actor: actor.label,
    flights: parsed.flights,
    warnings: parsed.warnings,
  });
  await queueImportWork('screen', { importId: saved.id, workspaceId: scope.workspaceId });
  return { accepted: true, import: saved, warnings: parsed.warnings };
}
