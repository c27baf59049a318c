import 'server-only';
import { nowIso, writeTx } from '@/db/client';
import { createAuditEntry } from '@/db/audit';
import {
  FLIGHT_BATCH,
  findImportByHash,
  getImport,
  insertImport,
  insertImportProblems,
  insertPendingFlights,
  type ImportDto,
  type NewFlightRow,
} from '@/db/imports';
import { assertBillingAllows } from '@/lib/billing/gate';
import { AppError } from '@/lib/errors';
import type { ImportProblem } from '@/lib/validation/imports';
import { screeningInputOf, type PreparedFlight } from './schedule';

function isUniqueViolation(err: unknown): boolean {
  const e = err as { code?: string; message?: string };
  return (
    e?.code === 'SQLITE_CONSTRAINT_UNIQUE' || e?.code === '23505' || /UNIQUE constraint failed/.test(e?.message ?? '')
  );
}

interface NewImport {
  kind: 'schedule' | 'tracks';
  fileName: string;
  fileHash: string;
  createdBy: number | null;
  actor: string;
  rows: number;
  warnings: ImportProblem[];
  /** What the audit entry says besides the file name and flight count. */
  auditDetail: Record<string, unknown>;
  /** Writes the import's flights inside its transaction. */
  insertFlights: (trx: Parameters<typeof insertPendingFlights>[0], importId: number, now: string) => Promise<void>;
  /** The 409 when another upload wrote the same file or flights at the same moment. */
  raceMessage: string;
}

/**
 * One write transaction for an accepted file: the billing gate for all its flights, the same file
 * again (409), the import (queued), its warnings, its pending flights and the audit entry. Nothing is
 * billed here; the worker bills each flight when it screens it.
 */
async function saveImport(scope: { workspaceId: number }, input: NewImport): Promise<ImportDto> {
  let id = 0;
  try {
    await writeTx(async (trx) => {
      await assertBillingAllows(scope, trx, input.rows);
      const duplicate = await findImportByHash(scope, input.fileHash, trx);
      if (duplicate) throw duplicate;
      const now = nowIso();
      id = await insertImport(trx, {
        workspaceId: scope.workspaceId,
        kind: input.kind,
        fileName: input.fileName,
        fileHash: input.fileHash,
        rows: input.rows,
        createdBy: input.createdBy,
        createdAt: now,
      });
      await insertImportProblems(trx, id, input.warnings);
      await input.insertFlights(trx, id, now);
      await createAuditEntry(
        {
          workspaceId: scope.workspaceId,
          userId: input.createdBy,
          actor: input.actor,
          action: 'import.created',
          target: `import:${id}`,
          detail: { fileName: input.fileName, flights: input.rows, ...input.auditDetail },
        },
        trx,
      );
    });
  } catch (err) {
    if (isUniqueViolation(err)) throw new AppError('conflict', input.raceMessage);
    throw err;
  }
  return getImport(scope, id);
}

/** A prepared schedule flight as a row to store, its screening input written as JSON. */
function scheduleRow(f: PreparedFlight): NewFlightRow {
  return {
    line: f.line,
    date: f.date,
    flight: f.flight,
    origin: f.origin,
    destination: f.destination,
    aircraftTypeId: f.aircraftTypeId,
    aircraftCode: f.aircraftCode,
    fleetId: f.fleetId,
    cruiseFl: f.cruiseFl,
    maxFl: f.maxFl,
    fuelKg: f.fuelKg,
    inputJson: JSON.stringify(screeningInputOf(f)),
    fuelWarning: f.fuelWarning,
  };
}

/**
 * Saves an accepted schedule: the import (queued), its warnings and every flight (pending, with its
 * screening input) in one write transaction, flights inserted in batches. Nothing is billed here; the
 * worker bills each flight when it screens it.
 */
export function createImport(
  scope: { workspaceId: number },
  input: {
    fileName: string;
    fileHash: string;
    createdBy: number | null;
    actor: string;
    flights: PreparedFlight[];
    warnings: ImportProblem[];
  },
): Promise<ImportDto> {
  return saveImport(scope, {
    kind: 'schedule',
    fileName: input.fileName,
    fileHash: input.fileHash,
    createdBy: input.createdBy,
    actor: input.actor,
    rows: input.flights.length,
    warnings: input.warnings,
    auditDetail: {},
    // A batch at a time: the JSON of 100 000 screening inputs is never held all at once.
    insertFlights: async (trx, importId, now) => {
      for (let i = 0; i < input.flights.length; i += FLIGHT_BATCH) {
        await insertPendingFlights(
          trx,
          { workspaceId: scope.workspaceId, importId, createdAt: now },
          input.flights.slice(i, i + FLIGHT_BATCH).map(scheduleRow),
        );
      }
    },
    raceMessage:
      'Another upload added this file or some of these flights a moment ago. Nothing from this upload was saved; upload it again to see which rows are already in the workspace.',
  });
}

/**
 * Saves an accepted track file: the import (kind tracks, queued), its warnings and every flown flight
 * (pending, basis flown, with its track input) in one write transaction. Nothing is billed here: the
 * worker bills each flight once when it screens it, as for schedules.
 */
export function createTrackImport(
  scope: { workspaceId: number },
  input: {
    fileName: string;
    fileHash: string;
    createdBy: number | null;
    actor: string;
    flights: NewFlightRow[];
    warnings: ImportProblem[];
    points: number;
  },
): Promise<ImportDto> {
  return saveImport(scope, {
    kind: 'tracks',
    fileName: input.fileName,
    fileHash: input.fileHash,
    createdBy: input.createdBy,
    actor: input.actor,
    rows: input.flights.length,
    warnings: input.warnings,
    auditDetail: { points: input.points, kind: 'tracks' },
    insertFlights: (trx, importId, now) =>
      insertPendingFlights(
        trx,
        { workspaceId: scope.workspaceId, importId, createdAt: now, basis: 'flown' },
        input.flights,
      ),
    raceMessage:
      'Another upload added this file or some of these flown flights a moment ago. Nothing from this upload was saved; upload it again to see which flights are already in the workspace.',
  });
}
