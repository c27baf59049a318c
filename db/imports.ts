import 'server-only';
import type { Knex } from 'knex';
import { db, insertId, nowIso, writeTx } from './client';
import { createAuditEntry } from './audit';
import { adjustFlightRollups, pruneFlightRollups } from './flight-rollups';
import { PENDING_FLIGHT_COLUMNS } from './flight-columns';
import { AppError, notFound } from '@/lib/errors';
import type { LineProblem } from '@/lib/validation/problems';

/** The values of `imports.status` (the same four as IMPORT_STATUSES in lib/validation/imports.ts). */
export type ImportStatus = 'queued' | 'screening' | 'complete' | 'failed';

/** A warning or problem kept with an import, by line and column of its file. */
export type ImportProblem = LineProblem;

/** An import as the API and the pages show it. */
export interface ImportDto {
  id: number;
  /** schedule (planned flights) or tracks (flown flights). */
  kind: 'schedule' | 'tracks';
  fileName: string;
  status: ImportStatus;
  rows: number;
  /** Flights screened or failed so far. */
  rowsDone: number;
  rowsScreened: number;
  rowsFailed: number;
  rowsPerSecond: number | null;
  secondsLeft: number | null;
  /** Warnings kept with an accepted file (unknown columns) and flights that could not be screened. */
  problems: ImportProblem[];
  problemCount: number;
  failureReason: string | null;
  createdAt: string;
  createdBy: string | null;
  startedAt: string | null;
  finishedAt: string | null;
  heartbeatAt: string | null;
  /** Engine versions of this import's screened flights, with how many flights each. */
  engineVersions: { engineVersion: string; flights: number }[];
  /** The latest background re-screen of its flights with a newer engine, if one was asked for. */
  rescreen: RescreenDto | null;
}

export type RescreenStatus = 'queued' | 'running' | 'complete';

export interface RescreenDto {
  status: RescreenStatus;
  engineVersion: string;
  /** Flights to screen again (those screened with another engine version when it was asked for). */
  rows: number;
  rowsDone: number;
  rowsFailed: number;
  requestedAt: string;
  finishedAt: string | null;
}

type Row = Record<string, unknown>;

/** What every checked import row (a schedule flight or a flown track) says of its flight. */
export interface PendingFlightFields {
  line: number;
  date: string;
  flight: string;
  origin: string;
  destination: string;
  aircraftTypeId: number;
  aircraftCode: string;
  fleetId: number | null;
  /** The first cruise level (the cruise_fl column, the first step, or the level most flown). */
  cruiseFl: number;
  maxFl: number;
  fuelKg: number;
}

/** A pending flight ready to store: plain data, its screening input already written as JSON. */
export interface NewFlightRow extends PendingFlightFields {
  inputJson: string;
  /** Set when the fuel is unusual (not impossible) for the distance: kept with the flight. */
  fuelWarning?: string | null;
}

/** 16 bindings a row: 1500 rows stay under SQLite's 32 766 and PostgreSQL's 65 535 bound parameters. */
export const FLIGHT_BATCH = 1500;
/** Flown flights a row: 18 bindings, so 1500 rows stay under both databases' parameter limits. */
const TRACK_BATCH = 200;

/**
 * Inserts pending flights inside the caller's transaction: one multi-row INSERT ... VALUES per batch,
 * written by hand (knex writes a multi-row insert on SQLite as a compound SELECT, at most 500 terms,
 * and its query builder is the slow part at 100 000 rows). Flown flights (`basis: 'flown'`) carry
 * that basis and no fuel warning.
 */
export async function insertPendingFlights(
  trx: Knex.Transaction,
  ctx: { workspaceId: number; importId: number; createdAt: string; basis?: 'flown' },
  flights: NewFlightRow[],
): Promise<void> {
  const flown = ctx.basis === 'flown';
  const columns: string[] = flown ? [...PENDING_FLIGHT_COLUMNS, 'basis'] : [...PENDING_FLIGHT_COLUMNS];
  const size = flown ? TRACK_BATCH : FLIGHT_BATCH;
  const row = `(${columns.map(() => '?').join(', ')})`;
  for (let i = 0; i < flights.length; i += size) {
    const batch = flights.slice(i, i + size);
    const bindings: (string | number | null)[] = [];
    for (const f of batch) {
      bindings.push(
        ctx.workspaceId,
        ctx.importId,
        f.date,
        f.flight,
        f.origin,
        f.destination,
        f.aircraftTypeId,
        f.aircraftCode,
        f.fleetId,
        f.cruiseFl,
        f.maxFl,
        f.inputJson,
        'pending',
        f.fuelKg,
        f.line,
        ctx.createdAt,
        flown ? null : (f.fuelWarning?.slice(0, 500) ?? null),
      );
      if (flown) bindings.push('flown');
    }
    await trx.raw(`INSERT INTO flights (${columns.join(', ')}) VALUES ${batch.map(() => row).join(', ')}`, bindings);
  }
}
const PROBLEMS_SHOWN = 200;

function rate(r: Row): { rowsPerSecond: number | null; secondsLeft: number | null } {
  const status = r.status as ImportStatus;
  const since = r.rate_since ? Date.parse(String(r.rate_since)) : Number.NaN;
  const until = Date.parse(String((status === 'screening' ? r.heartbeat_at : r.finished_at) ?? ''));
  const done = Number(r.rows_done) - Number(r.rate_base_rows ?? 0);
  const seconds = (until - since) / 1000;
  const rowsPerSecond = Number.isFinite(seconds) && seconds >= 0.2 && done > 0 ? done / seconds : null;
  if (status === 'complete') return { rowsPerSecond, secondsLeft: 0 };
  if (status !== 'screening' || rowsPerSecond === null) return { rowsPerSecond, secondsLeft: null };
  return { rowsPerSecond, secondsLeft: Math.max(0, (Number(r.rows) - Number(r.rows_done)) / rowsPerSecond) };
}

function rescreenOf(r: Row): RescreenDto | null {
  if (!r.rescreen_status) return null;
  return {
    status: r.rescreen_status as RescreenStatus,
    engineVersion: String(r.rescreen_engine_version),
    rows: Number(r.rescreen_rows ?? 0),
    rowsDone: Number(r.rescreen_rows_done ?? 0),
    rowsFailed: Number(r.rescreen_rows_failed ?? 0),
    requestedAt: String(r.rescreen_requested_at),
    finishedAt: (r.rescreen_finished_at as string | null) ?? null,
  };
}

function toDto(
  r: Row,
  counts: { screened: number; failed: number },
  problems: ImportProblem[],
  problemCount: number,
  engineVersions: { engineVersion: string; flights: number }[],
): ImportDto {
  return {
    id: Number(r.id),
    kind: r.kind === 'tracks' ? 'tracks' : 'schedule',
    fileName: String(r.file_name),
    status: r.status as ImportStatus,
    rows: Number(r.rows),
    rowsDone: Number(r.rows_done),
    rowsScreened: counts.screened,
    rowsFailed: counts.failed,
    ...rate(r),
    problems,
    problemCount,
    failureReason: (r.failure_reason as string | null) ?? null,
    createdAt: String(r.created_at),
    createdBy: (r.created_by_name as string | null) ?? null,
    startedAt: (r.started_at as string | null) ?? null,
    finishedAt: (r.finished_at as string | null) ?? null,
    heartbeatAt: (r.heartbeat_at as string | null) ?? null,
    engineVersions,
    rescreen: rescreenOf(r),
  };
}

async function describe(rows: Row[]): Promise<ImportDto[]> {
  if (!rows.length) return [];
  const ids = rows.map((r) => Number(r.id));
  const k = db();
  const [counts, problemCounts, problems, versions] = await Promise.all([
    k('flights')
      .whereIn('import_id', ids)
      .whereIn('status', ['screened', 'failed'])
      .groupBy('import_id', 'status')
      .select('import_id', 'status')
      .count({ n: '*' }),
    k('import_problems').whereIn('import_id', ids).groupBy('import_id').select('import_id').count({ n: '*' }),
    k('import_problems')
      .whereIn('import_id', ids)
      .orderBy(['import_id', 'line', 'id'])
      .select('import_id', 'line', 'column', 'message'),
    k('flights')
      .whereIn('import_id', ids)
      .where('status', 'screened')
      .groupBy('import_id', 'engine_version')
      .orderBy(['import_id', 'engine_version'])
      .select('import_id', 'engine_version')
      .count({ n: '*' }),
  ]);
  const versionsOf = new Map<number, { engineVersion: string; flights: number }[]>();
  for (const v of versions as Row[]) {
    const list = versionsOf.get(Number(v.import_id)) ?? [];
    list.push({ engineVersion: String(v.engine_version), flights: Number(v.n) });
    versionsOf.set(Number(v.import_id), list);
  }
  const byImport = new Map<number, { screened: number; failed: number }>();
  for (const c of counts as Row[]) {
    const e = byImport.get(Number(c.import_id)) ?? { screened: 0, failed: 0 };
    if (c.status === 'screened') e.screened = Number(c.n);
    else e.failed = Number(c.n);
    byImport.set(Number(c.import_id), e);
  }
  const problemTotal = new Map((problemCounts as Row[]).map((c) => [Number(c.import_id), Number(c.n)]));
  const listed = new Map<number, ImportProblem[]>();
  for (const p of problems as Row[]) {
    const list = listed.get(Number(p.import_id)) ?? [];
    if (list.length < PROBLEMS_SHOWN)
      list.push({ line: Number(p.line), column: String(p.column), message: String(p.message) });
    listed.set(Number(p.import_id), list);
  }
  return rows.map((r) =>
    toDto(
      r,
      byImport.get(Number(r.id)) ?? { screened: 0, failed: 0 },
      listed.get(Number(r.id)) ?? [],
      problemTotal.get(Number(r.id)) ?? 0,
      versionsOf.get(Number(r.id)) ?? [],
    ),
  );
}

const importQuery = (k: Knex | Knex.Transaction) =>
  k('imports as i')
    .leftJoin('users as u', 'u.id', 'i.created_by')
    .select('i.*', k.raw('coalesce(u.name, u.email) as created_by_name'));

export async function getImport(scope: { workspaceId: number }, id: number): Promise<ImportDto> {
  const row = (await importQuery(db()).where({ 'i.workspace_id': scope.workspaceId, 'i.id': id }).first()) as
    Row | undefined;
  if (!row) throw notFound('No import with that id in this workspace.');
  return (await describe([row]))[0];
}

/** Newest first, keyset-paged by id. */
export async function listImports(
  scope: { workspaceId: number },
  opts: { cursor?: number; limit?: number } = {},
): Promise<{ items: ImportDto[]; nextCursor: string | null }> {
  const limit = Math.min(Math.max(opts.limit ?? 20, 1), 100);
  const q = importQuery(db())
    .where('i.workspace_id', scope.workspaceId)
    .orderBy('i.id', 'desc')
    .limit(limit + 1);
  if (opts.cursor) q.andWhere('i.id', '<', opts.cursor);
  const rows = (await q) as Row[];
  const items = await describe(rows.slice(0, limit));
  return { items, nextCursor: rows.length > limit && items.length ? String(items[items.length - 1].id) : null };
}

function duplicateFile(prior: Row): AppError {
  const when = String(prior.created_at).slice(0, 10);
  return new AppError(
    'conflict',
    `This file was already imported on ${when} as import #${prior.id} (“${prior.file_name}”). Its flights are in the workspace; delete that import first to import the file again.`,
    {
      extra: {
        import: { id: Number(prior.id), fileName: String(prior.file_name), createdAt: String(prior.created_at) },
      },
    },
  );
}

/**
 * The import of this exact file (by SHA-256), if the workspace has one, as the 409 to answer; read in
 * the caller's transaction when it gives one.
 */
export async function findImportByHash(
  scope: { workspaceId: number },
  fileHash: string,
  trx: Knex | Knex.Transaction = db(),
): Promise<AppError | null> {
  const prior = (await trx('imports').where({ workspace_id: scope.workspaceId, file_hash: fileHash }).first()) as
    Row | undefined;
  return prior ? duplicateFile(prior) : null;
}

/** Inserts a new import (queued) inside the caller's transaction and returns its id. */
export async function insertImport(
  trx: Knex.Transaction,
  input: {
    workspaceId: number;
    kind: 'schedule' | 'tracks';
    fileName: string;
    fileHash: string;
    rows: number;
    createdBy: number | null;
    createdAt: string;
  },
): Promise<number> {
  return insertId(
    trx('imports')
      .insert({
        workspace_id: input.workspaceId,
        kind: input.kind,
        file_name: input.fileName.slice(0, 255),
        file_hash: input.fileHash,
        status: 'queued',
        rows: input.rows,
        rows_done: 0,
        rate_base_rows: 0,
        created_by: input.createdBy,
        created_at: input.createdAt,
      })
      .returning('id'),
  );
}

/** Keeps an accepted file's warnings with its import, inside the caller's transaction. */
export async function insertImportProblems(
  trx: Knex.Transaction,
  importId: number,
  problems: ImportProblem[],
): Promise<void> {
  if (!problems.length) return;
  await trx('import_problems').insert(
    problems.map((w) => ({
      import_id: importId,
      line: w.line,
      column: w.column.slice(0, 64),
      message: w.message.slice(0, 1000),
    })),
  );
}

/**
 * Deletes an import and its flights. Units already billed for its screened flights stay in the usage
 * ledger (they were billed when screened); the result says how many.
 */
export async function deleteImport(
  scope: { workspaceId: number },
  id: number,
  actor: { userId: number | null; label: string },
): Promise<{ id: number; fileName: string; flightsDeleted: number; billedUnitsKept: number }> {
  return writeTx(async (trx) => {
    const imp = (await trx('imports').where({ workspace_id: scope.workspaceId, id }).first()) as Row | undefined;
    if (!imp) throw notFound('No import with that id in this workspace.');
    const flightIds = trx('flights').where({ workspace_id: scope.workspaceId, import_id: id }).select('id');
    const units = (await trx('usage_events')
      .where({ workspace_id: scope.workspaceId, kind: 'imported_flight' })
      .whereIn('source_id', flightIds)
      .sum({ n: 'quantity' })
      .first()) as Row | undefined;
    await adjustFlightRollups(trx, (q) => q.where({ workspace_id: scope.workspaceId, import_id: id }), -1);
    await pruneFlightRollups(trx, [scope.workspaceId]);
    const flightsDeleted = await trx('flights').where({ workspace_id: scope.workspaceId, import_id: id }).delete();
    await trx('import_problems').where({ import_id: id }).delete();
    await trx('imports').where({ workspace_id: scope.workspaceId, id }).delete();
    const billedUnitsKept = Number(units?.n ?? 0);
    await createAuditEntry(
      {
        workspaceId: scope.workspaceId,
        userId: actor.userId,
        actor: actor.label,
        action: 'import.deleted',
        target: `import:${id}`,
        detail: { fileName: imp.file_name, flightsDeleted, billedUnitsKept },
      },
      trx,
    );
    return { id, fileName: String(imp.file_name), flightsDeleted, billedUnitsKept };
  });
}

/* The worker's side: it works across workspaces, always by import id, and writes each flight's unit with its result. */

export interface PendingFlight {
  id: number;
  workspaceId: number;
  line: number | null;
  inputJson: string;
}

/** What a flight row keeps of its screening result. */
export interface FlightFigures {
  distanceKm: number;
  noxTotalKg: number;
  noxAboveTropopauseKg: number;
  fractionAboveTropopause: number;
  meanDepthAboveTropopauseKm: number;
  ozoneCentralKg: number;
  ozoneLowKg: number;
  ozoneHighKg: number;
  engineVersion: string;
}

export type ScreenedOutcome = { id: number; workspaceId: number; line: number | null } & (
  { figures: FlightFigures } | { error: string }
);

/** Imports waiting for the worker or left mid-way (a restart resumes them), oldest first. */
export async function listActiveImports(): Promise<{ id: number; workspaceId: number }[]> {
  const rows = (await db()('imports')
    .whereIn('status', ['queued', 'screening'])
    .orderBy('id')
    .select('id', 'workspace_id')) as Row[];
  return rows.map((r) => ({ id: Number(r.id), workspaceId: Number(r.workspace_id) }));
}

/** Marks the import as screening and restarts its rate measurement from the rows already done. */
export async function claimImport(importId: number): Promise<boolean> {
  return writeTx(async (trx) => {
    const now = nowIso();
    const n = await trx('imports')
      .where('id', importId)
      .whereIn('status', ['queued', 'screening'])
      .update({
        status: 'screening',
        started_at: trx.raw('coalesce(started_at, ?)', [now]),
        rate_since: now,
        rate_base_rows: trx.raw('rows_done'),
        heartbeat_at: now,
      });
    return n > 0;
  });
}

export async function listPendingFlights(importId: number, limit: number): Promise<PendingFlight[]> {
  const rows = (await db()('flights')
    .where({ import_id: importId, status: 'pending' })
    .orderBy('id')
    .limit(limit)
    .select('id', 'workspace_id', 'source_line', 'input_json')) as Row[];
  return rows.map((r) => ({
    id: Number(r.id),
    workspaceId: Number(r.workspace_id),
    line: r.source_line === null ? null : Number(r.source_line),
    inputJson: String(r.input_json),
  }));
}

/**
 * Writes a chunk of outcomes in one transaction: each screened flight's figures with its usage unit,
 * each failure with its reason (and a problem on the import). Only flights still pending are touched,
 * so a replayed chunk changes and bills nothing twice.
 */
export async function saveScreenedChunk(importId: number, outcomes: ScreenedOutcome[]): Promise<number> {
  return writeTx(async (trx) => {
    const now = nowIso();
    let saved = 0;
    const screened = outcomes.filter((o): o is ScreenedOutcome & { figures: FlightFigures } => 'figures' in o);
    const workspaceOf = new Map(screened.map((o) => [o.id, o.workspaceId]));
    for (let i = 0; i < screened.length; i += SCREENED_BATCH) {
      const ids = await markScreened(trx, screened.slice(i, i + SCREENED_BATCH), now);
      if (ids.length) await adjustFlightRollups(trx, (q) => q.whereIn('id', ids), 1);
      await recordImportedFlightUnits(
        trx,
        ids.map((id) => ({ workspaceId: workspaceOf.get(id) ?? 0, sourceId: id })),
        now,
      );
      saved += ids.length;
    }
    for (const o of outcomes) {
      if ('figures' in o) continue;
      const reason = o.error.slice(0, 500);
      const n = await trx('flights')
        .where({ id: o.id, status: 'pending' })
        .update({ status: 'failed', failure_reason: reason, screened_at: now });
      if (n > 0) {
        await trx('import_problems').insert({
          import_id: importId,
          line: o.line ?? 0,
          column: '',
          message: `Not screened: ${reason}`.slice(0, 1000),
        });
        saved += 1;
      }
    }
    await trx('imports')
      .where('id', importId)
      .update({ rows_done: trx.raw('rows_done + ?', [saved]), heartbeat_at: now });
    return saved;
  });
}

const SCREENED_BATCH = 500;

/**
 * The usage units of a batch of screened flights in one INSERT: the same ledger rows as
 * db/usage.ts recordUsage (kind imported_flight, key tp-imported_flight-<flight id>, quantity 1),
 * and like it a no-op for a flight already billed, since (kind, source_id) is unique. One statement
 * per batch instead of one per flight: at 100 000 flights the per-row inserts alone cost seconds.
 */
async function recordImportedFlightUnits(
  trx: Knex.Transaction,
  units: { workspaceId: number; sourceId: number }[],
  occurredAt: string,
): Promise<void> {
  if (!units.length) return;
  const bindings: (number | string)[] = [];
  for (const u of units)
    bindings.push(u.workspaceId, 'imported_flight', u.sourceId, `tp-imported_flight-${u.sourceId}`, 1, occurredAt);
  const values = units.map(() => '(?, ?, ?, ?, ?, ?)').join(', ');
  await trx.raw(
    `INSERT INTO usage_events (workspace_id, kind, source_id, idempotency_key, quantity, occurred_at) VALUES ${values} ON CONFLICT (kind, source_id) DO NOTHING`,
    bindings,
  );
}
const FIGURE_COLUMNS = [
  'distance_km',
  'nox_total_kg',
  'nox_above_kg',
  'fraction_above',
  'mean_depth_above_km',
  'ozone_central_kg',
  'ozone_low_kg',
  'ozone_high_kg',
] as const;

/**
 * One UPDATE ... FROM (VALUES ...) for a batch of screened flights (SQLite 3.33+ and PostgreSQL
 * alike), touching only flights still pending; returns the ids it changed. One statement per batch
 * instead of one per flight keeps a 100 000-flight import within its time budget.
 */
async function markScreened(
  trx: Knex.Transaction,
  batch: (ScreenedOutcome & { figures: FlightFigures })[],
  now: string,
): Promise<number[]> {
  if (!batch.length) return [];
  const cast = `CAST(? AS INTEGER), ${FIGURE_COLUMNS.map(() => 'CAST(? AS DOUBLE PRECISION)').join(', ')}, CAST(? AS VARCHAR(32))`;
  const values = batch.map(() => `(${cast})`).join(', ');
  const bindings: (number | string)[] = [];
  for (const o of batch) {
    const f = o.figures;
    bindings.push(
      o.id,
      f.distanceKm,
      f.noxTotalKg,
      f.noxAboveTropopauseKg,
      f.fractionAboveTropopause,
      f.meanDepthAboveTropopauseKm,
      f.ozoneCentralKg,
      f.ozoneLowKg,
      f.ozoneHighKg,
      f.engineVersion,
    );
  }
  const sets = FIGURE_COLUMNS.map((c, i) => `${c} = v.column${i + 2}`).join(', ');
  const sql = `UPDATE flights SET status = 'screened', failure_reason = NULL, ${sets}, engine_version = v.column${FIGURE_COLUMNS.length + 2}, screened_at = ? FROM (VALUES ${values}) AS v WHERE flights.id = v.column1 AND flights.status = 'pending' RETURNING flights.id`;
  const result = (await trx.raw(sql, [now, ...bindings])) as { id: number }[] | { rows: { id: number }[] };
  const rows = Array.isArray(result) ? result : result.rows;
  return rows.map((r) => Number(r.id));
}

/**
 * Ends an import once no flight is pending: complete (failed flights, if any, are listed as problems),
 * or failed when not one flight could be screened. Returns null while flights are still pending.
 */
export async function finishImport(importId: number): Promise<ImportStatus | null> {
  return writeTx(async (trx) => {
    const counts = (await trx('flights')
      .where('import_id', importId)
      .groupBy('status')
      .select('status')
      .count({ n: '*' })) as Row[];
    const by = new Map(counts.map((c) => [String(c.status), Number(c.n)]));
    if ((by.get('pending') ?? 0) > 0) return null;
    const screened = by.get('screened') ?? 0;
    const failed = by.get('failed') ?? 0;
    const status: ImportStatus = failed > 0 && screened === 0 ? 'failed' : 'complete';
    let reason: string | null = null;
    if (status === 'failed') {
      const first = (await trx('flights')
        .where({ import_id: importId, status: 'failed' })
        .orderBy('id')
        .first('source_line', 'failure_reason')) as Row | undefined;
      reason =
        `None of the ${failed} flights could be screened. First problem (line ${first?.source_line ?? '?'}): ${first?.failure_reason ?? 'unknown'}`.slice(
          0,
          1000,
        );
    }
    const now = nowIso();
    await trx('imports')
      .where('id', importId)
      .whereIn('status', ['queued', 'screening'])
      .update({ status, failure_reason: reason, rows_done: screened + failed, finished_at: now, heartbeat_at: now });
    return status;
  });
}

/** Stops an import that cannot go on, with the reason shown to the uploader. */
export async function failImport(importId: number, reason: string): Promise<void> {
  const now = nowIso();
  await writeTx((trx) =>
    trx('imports')
      .where('id', importId)
      .whereIn('status', ['queued', 'screening'])
      .update({ status: 'failed', failure_reason: reason.slice(0, 1000), finished_at: now, heartbeat_at: now }),
  );
}

/**
 * Opens again an import that failed with flights still pending (an owner retries its failed job):
 * back to screening, its reason cleared. False when it has nothing left to screen or did not fail.
 */
export async function reopenFailedImport(importId: number): Promise<boolean> {
  return writeTx(async (trx) => {
    const pending = await trx('flights').where({ import_id: importId, status: 'pending' }).first('id');
    if (!pending) return false;
    const n = await trx('imports')
      .where({ id: importId, status: 'failed' })
      .update({ status: 'screening', failure_reason: null, finished_at: null, heartbeat_at: nowIso() });
    return n > 0;
  });
}

/* Re-screening an import's flights with a newer engine: asked for by a member, run by the worker. */

/**
 * Asks for the import's screened flights made with another engine version to be screened again with
 * `engineVersion`. Not billed and not gated: each flight's unit was recorded when it was first
 * screened, and the worker's re-screen writes figures only. A re-screen already queued or running
 * for that version is returned as it is.
 */
export async function requestImportRescreen(
  scope: { workspaceId: number },
  id: number,
  input: { engineVersion: string; requestedBy: number | null; actor: string },
): Promise<ImportDto> {
  await writeTx(async (trx) => {
    const imp = (await trx('imports').where({ workspace_id: scope.workspaceId, id }).first()) as Row | undefined;
    if (!imp) throw notFound('No import with that id in this workspace.');
    if (imp.status === 'queued' || imp.status === 'screening') {
      throw new AppError(
        'conflict',
        `Import #${id} is still being screened; its flights can be screened again once it is complete.`,
      );
    }
    if (
      (imp.rescreen_status === 'queued' || imp.rescreen_status === 'running') &&
      imp.rescreen_engine_version === input.engineVersion
    )
      return;
    const stale = (await trx('flights')
      .where({ workspace_id: scope.workspaceId, import_id: id, status: 'screened' })
      .whereNot('engine_version', input.engineVersion)
      .count({ n: '*' })
      .first()) as Row | undefined;
    const rows = Number(stale?.n ?? 0);
    if (rows === 0)
      throw new AppError(
        'conflict',
        `Every screened flight of import #${id} was made with the current engine version (${input.engineVersion}); there is nothing to screen again.`,
      );
    const now = nowIso();
    await trx('imports').where({ workspace_id: scope.workspaceId, id }).update({
      rescreen_status: 'queued',
      rescreen_engine_version: input.engineVersion,
      rescreen_rows: rows,
      rescreen_rows_done: 0,
      rescreen_rows_failed: 0,
      rescreen_last_flight_id: 0,
      rescreen_requested_by: input.requestedBy,
      rescreen_requested_at: now,
      rescreen_finished_at: null,
    });
    await createAuditEntry(
      {
        workspaceId: scope.workspaceId,
        userId: input.requestedBy,
        actor: input.actor,
        action: 'import.rescreen_requested',
        target: `import:${id}`,
        detail: { engineVersion: input.engineVersion, flights: rows },
      },
      trx,
    );
  });
  return getImport(scope, id);
}

export interface RescreenJob {
  importId: number;
  workspaceId: number;
  engineVersion: string;
  lastFlightId: number;
}

/** Re-screens queued or left mid-way (a restart resumes them), oldest first. */
export async function listActiveRescreens(): Promise<RescreenJob[]> {
  const rows = (await db()('imports')
    .whereIn('rescreen_status', ['queued', 'running'])
    .orderBy('id')
    .select('id', 'workspace_id', 'rescreen_engine_version', 'rescreen_last_flight_id')) as Row[];
  return rows.map((r) => ({
    importId: Number(r.id),
    workspaceId: Number(r.workspace_id),
    engineVersion: String(r.rescreen_engine_version),
    lastFlightId: Number(r.rescreen_last_flight_id ?? 0),
  }));
}

/** The next screened flights of a re-screen, after its cursor, that are not yet on its engine version. */
export async function listRescreenFlights(job: RescreenJob, limit: number): Promise<PendingFlight[]> {
  const rows = (await db()('flights')
    .where({ import_id: job.importId, status: 'screened' })
    .where('id', '>', job.lastFlightId)
    .whereNot('engine_version', job.engineVersion)
    .orderBy('id')
    .limit(limit)
    .select('id', 'workspace_id', 'source_line', 'input_json')) as Row[];
  return rows.map((r) => ({
    id: Number(r.id),
    workspaceId: Number(r.workspace_id),
    line: r.source_line === null ? null : Number(r.source_line),
    inputJson: String(r.input_json),
  }));
}

/**
 * Writes a chunk of re-screened flights: new figures and engine version, no usage unit (the flight
 * was billed when first screened). A flight the newer engine cannot screen keeps its earlier figures
 * and version and is counted as failed. The cursor moves past the chunk, so a replay repeats nothing
 * it has already changed; the update only touches flights not yet on the target version.
 */
export async function saveRescreenChunk(
  job: RescreenJob,
  outcomes: ScreenedOutcome[],
): Promise<{ done: number; failed: number }> {
  return writeTx(async (trx) => {
    const now = nowIso();
    let done = 0;
    let failed = 0;
    // The figures of these flights change: their roll-ups are taken away and added back around it.
    const changing = outcomes.filter((o) => 'figures' in o).map((o) => o.id);
    const pick = (q: Knex.QueryBuilder) => q.whereIn('id', changing).where('import_id', job.importId);
    if (changing.length) await adjustFlightRollups(trx, pick, -1);
    for (const o of outcomes) {
      if (!('figures' in o)) {
        failed += 1;
        continue;
      }
      const f = o.figures;
      const n = await trx('flights')
        .where({ id: o.id, import_id: job.importId, status: 'screened' })
        .whereNot('engine_version', f.engineVersion)
        .update({
          distance_km: f.distanceKm,
          nox_total_kg: f.noxTotalKg,
          nox_above_kg: f.noxAboveTropopauseKg,
          fraction_above: f.fractionAboveTropopause,
          mean_depth_above_km: f.meanDepthAboveTropopauseKm,
          ozone_central_kg: f.ozoneCentralKg,
          ozone_low_kg: f.ozoneLowKg,
          ozone_high_kg: f.ozoneHighKg,
          engine_version: f.engineVersion,
          screened_at: now,
        });
      done += n;
    }
    if (changing.length) {
      await adjustFlightRollups(trx, pick, 1);
      const workspaces = [...new Set(outcomes.map((o) => o.workspaceId))];
      await pruneFlightRollups(trx, workspaces);
    }
    const last = outcomes.reduce((m, o) => Math.max(m, o.id), job.lastFlightId);
    await trx('imports')
      .where('id', job.importId)
      .update({
        rescreen_status: 'running',
        rescreen_rows_done: trx.raw('rescreen_rows_done + ?', [done]),
        rescreen_rows_failed: trx.raw('rescreen_rows_failed + ?', [failed]),
        rescreen_last_flight_id: last,
      });
    return { done, failed };
  });
}

export async function finishRescreen(importId: number): Promise<void> {
  await writeTx((trx) =>
    trx('imports')
      .where('id', importId)
      .whereIn('rescreen_status', ['queued', 'running'])
      .update({ rescreen_status: 'complete', rescreen_finished_at: nowIso() }),
  );
}
