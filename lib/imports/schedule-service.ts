import { loadRouteLibrary } from '@/db/route-library';
import 'server-only';
import { createHash } from 'node:crypto';
import { listAircraftForScreening } from '@/db/aircraft-lookup';
import { listFleetsByName, listFlightKeys } from '@/db/flights';
import { findImportByHash, type ImportDto } from '@/db/imports';
import { createImport } from './save-import';
import { assertBillingAllows } from '@/lib/billing/gate';
import { estimateImport, type ImportEstimate } from '@/lib/billing/budget';
import { tooLarge } from '@/lib/errors';
import { readUploadedFile, type UploadedFile } from '@/lib/api/upload';
import { IMPORT_LIMITS, type ImportProblem } from '@/lib/validation/imports';
import { flightKey, parseSchedule, sortProblems } from './schedule';
import { queueImportWork } from './jobs';

export type UploadOutcome =
  | { accepted: true; import: ImportDto; warnings: ImportProblem[] }
  | { accepted: true; dryRun: true; rows: number; estimate: ImportEstimate; warnings: ImportProblem[] }
  | { accepted: false; problems: ImportProblem[]; problemCount: number; warnings: ImportProblem[] };

const MB = 1024 * 1024;

export const tooBigMessage = `The file is larger than ${IMPORT_LIMITS.maxBytes / MB} MB. Split the schedule into smaller files (at most ${IMPORT_LIMITS.maxRows.toLocaleString('en-GB')} flights each) and upload them one by one.`;

/** Reads the multipart body and returns its `file` field; 413 past the limit, 400 when unreadable. */
export function readScheduleFile(req: Request): Promise<UploadedFile> {
  return readUploadedFile(req, {
    maxBytes: IMPORT_LIMITS.maxBytes,
    what: 'the schedule CSV',
    tooBig: tooBigMessage,
    defaultName: 'schedule.csv',
  });
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
