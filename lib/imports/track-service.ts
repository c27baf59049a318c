import 'server-only';
import { Readable } from 'node:stream';
import type { ReadableStream as NodeReadableStream } from 'node:stream/web';
import Busboy from '@fastify/busboy';
import { listAircraftForScreening } from '@/db/aircraft-lookup';
import { listFlightKeys, listPlannedFlightRefs } from '@/db/flights';
import { findImportByHash, type ImportDto } from '@/db/imports';
import { createTrackImport } from './save-import';
import { assertBillingAllows } from '@/lib/billing/gate';
import { AppError, badRequest, tooLarge } from '@/lib/errors';
import { TRACK_IMPORT_LIMITS } from '@/lib/validation/track-import';
import type { ImportProblem } from '@/lib/validation/imports';
import { parseTrackCsv, prepareTrackFlights, type ParsedTracks } from './tracks';
import { sortProblems } from './schedule';
import { queueImportWork } from './jobs';

export type TrackUploadOutcome =
  | { accepted: true; import: ImportDto; points: number; warnings: ImportProblem[] }
  | { accepted: true; dryRun: true; flights: number; points: number; warnings: ImportProblem[] }
  | { accepted: false; problems: ImportProblem[]; problemCount: number; warnings: ImportProblem[] };

const MB = 1024 * 1024;
const MULTIPART_OVERHEAD_BYTES = 64 * 1024;

export const trackTooBigMessage = `The track file is larger than ${TRACK_IMPORT_LIMITS.maxBytes / MB} MB. Split it into smaller files (at most ${TRACK_IMPORT_LIMITS.maxPoints.toLocaleString('en-GB')} points each) and upload them one by one.`;

/**
 * Reads the multipart body as a stream and parses the `file` field's CSV while it arrives: the file
 * is never held whole in memory (only its points, per flight, in typed arrays). 413 past the track
 * upload limit, 400 when the body is not readable multipart with a file.
 */
export async function readTrackUpload(req: Request): Promise<{ name: string; parsed: ParsedTracks }> {
  const declared = Number(req.headers.get('content-length') ?? '0');
  if (declared > TRACK_IMPORT_LIMITS.maxBytes + MULTIPART_OVERHEAD_BYTES) throw tooLarge(trackTooBigMessage);
  const type = req.headers.get('content-type') ?? '';
  if (!/^multipart\/form-data/i.test(type))
    throw badRequest('Send the track file as multipart/form-data with the CSV in the field “file”.');
  if (!req.body) throw badRequest('The request has no body; attach the track CSV in the field “file”.');
  let bb: ReturnType<typeof Busboy>;
  try {
    bb = Busboy({ headers: { 'content-type': type }, limits: { fileSize: TRACK_IMPORT_LIMITS.maxBytes, files: 1 } });
  } catch {
    throw badRequest('The upload could not be read as multipart/form-data. Attach the track CSV in the field “file”.');
  }
  const body = Readable.fromWeb(req.body as unknown as NodeReadableStream<Uint8Array>);
  return new Promise((resolve, reject) => {
    let result: Promise<{ name: string; parsed: ParsedTracks }> | null = null;
    let truncated = false;
    let settled = false;
    const fail = (err: unknown) => {
      if (settled) return;
      settled = true;
      body.unpipe(bb);
      body.resume();
      reject(err);
    };
    bb.on('file', (field, stream, filename) => {
      if (field !== 'file' || result !== null) {
        stream.resume();
        return;
      }
      stream.on('limit', () => {
        truncated = true;
      });
      result = parseTrackCsv(stream).then((parsed) => ({ name: filename || 'tracks.csv', parsed }));
      result.catch(() => undefined);
    });
    bb.on('finish', () => {
      if (result === null) {
        fail(badRequest('Attach the track CSV in the field “file”.'));
        return;
      }
      result.then(
        (r) => {
          if (truncated) fail(tooLarge(trackTooBigMessage));
          else if (!settled) {
            settled = true;
            resolve(r);
          }
        },
        (err) => fail(truncated ? tooLarge(trackTooBigMessage) : err),
      );
    });
    bb.on('error', (err) =>
      fail(
        err instanceof AppError
          ? err
          : badRequest(
              'The upload could not be read as multipart/form-data. Attach the track CSV in the field “file”.',
            ),
      ),
    );
    body.on('error', () => fail(badRequest('The upload was cut off before its end; send it again.')));
    body.pipe(bb);
  });
}

function refusal(problems: ImportProblem[], warnings: ImportProblem[]): TrackUploadOutcome {
  sortProblems(problems);
  return {
    accepted: false,
    problems: problems.slice(0, TRACK_IMPORT_LIMITS.maxProblemsListed),
    problemCount: problems.length,
    warnings,
  };
}

/**
 * Validates a track file and, when every point and flight is good, saves the import with its pending
 * flown flights and wakes the worker, which screens and bills each flight once. Order: billing (402),
 * size (413), the file read and checked as it streams (problems), the same file again (409), the
 * flights against the workspace (problems).
 */
export async function acceptTrackUpload(
  scope: { workspaceId: number },
  actor: { userId: number | null; label: string },
  req: Request,
  opts: { dryRun?: boolean } = {},
): Promise<TrackUploadOutcome> {
  await assertBillingAllows(scope);
  const { name, parsed } = await readTrackUpload(req);
  if (parsed.problems.length) return refusal(parsed.problems, parsed.warnings);
  const duplicate = await findImportByHash(scope, parsed.fileHash);
  if (duplicate) throw duplicate;
  let from = parsed.flights[0].date;
  let to = from;
  for (const f of parsed.flights) {
    if (f.date < from) from = f.date;
    if (f.date > to) to = f.date;
  }
  const [aircraft, planned, flown] = await Promise.all([
    listAircraftForScreening(scope),
    listPlannedFlightRefs(scope, { from, to }),
    listFlightKeys(scope, { from, to, basis: 'flown' }),
  ]);
  const prepared = prepareTrackFlights(parsed, { aircraft, planned, flownKeys: new Set(flown.keys()) });
  // The points now live in the prepared inputs: let their typed arrays go before the database write.
  parsed.flights = [];
  if (prepared.problems.length) return refusal(prepared.problems, parsed.warnings);
  if (opts.dryRun)
    return {
      accepted: true,
      dryRun: true,
      flights: prepared.flights.length,
      points: parsed.points,
      warnings: parsed.warnings,
    };
  const saved = await createTrackImport(scope, {
    fileName: name,
    fileHash: parsed.fileHash,
    createdBy: actor.userId,
    actor: actor.label,
    flights: prepared.flights,
    warnings: parsed.warnings,
    points: parsed.points,
  });
  // Screened by the job runner, like schedule imports (the sweep would find it too, within half a minute).
  await queueImportWork('screen', { importId: saved.id, workspaceId: scope.workspaceId });
  return { accepted: true, import: saved, points: parsed.points, warnings: parsed.warnings };
}
