import 'server-only';
import { setImmediate as yieldToEventLoop } from 'node:timers/promises';
import {
  claimImport,
  failImport,
  finishImport,
  finishRescreen,
  listActiveImports,
  listActiveRescreens,
  listPendingFlights,
  listRescreenFlights,
  saveRescreenChunk,
  saveScreenedChunk,
  type RescreenJob,
} from '@/db/imports';
import { log } from '@/lib/log';
import { leaseImport } from './import-lock';
import { screenChunk } from './screen-chunk';
import { screenAndSaveInThreads, screenInThreads } from './screening-pool';
import { buildComponentBacklog } from './components';
import { nextChunkSize } from './chunk-size';
import { checkBudgetAlerts } from '@/lib/billing/budget';
import { checkTargetAlerts } from '@/lib/periods/alerts';

/**
 * The screening of imported flights, run as job steps (jobs.ts: screenImportStep, rescreenImportStep)
 * in the server process or a standalone worker process (`npm run worker`), and to the end by
 * runImportsToCompletion (tests, scripts). It screens an import's pending flights in chunks (in
 * worker threads, see screening-pool.ts) and writes each chunk (figures, status, roll-ups, one usage
 * unit per screened flight) in one transaction, on SQLite from the threads themselves so the event
 * loop stays free. A chunk only touches flights still pending, so a chunk replayed after a crash can
 * neither lose a flight nor bill one twice.
 *
 * When no import or re-screen is left, it builds the fleet-sampling components that screened flights
 * lack (components.ts), giving way to any import that arrives.
 *
 * Failure policy: a flight whose screening throws is marked failed with its reason and listed as a
 * problem of its import; the import still completes with the others (and shows how many failed). An
 * import ends failed only when not one of its flights could be screened, or when the database keeps
 * refusing its results; it is never complete while any flight is pending.
 */

export const IMPORT_CHUNK_SIZE = 500;
const MAX_CONSECUTIVE_ERRORS = 5;

export interface ChunkProgress {
  importId: number;
  saved: number;
}

export interface RunOptions {
  chunkSize?: number;
  /** Called after each chunk is committed (tests use it to crash a worker mid-way). */
  onChunk?: (p: ChunkProgress) => void | Promise<void>;
  /** Stop after the chunk that passes this time (ms since the epoch): a job's share of the work. */
  deadline?: number;
}

export interface RunSummary {
  imports: number;
  flights: number;
}

interface WorkerState {
  /** Serialises every explicit run in this process. */
  chain: Promise<unknown>;
  errors: Map<number, number>;
  /** False until a backlog pass found no flight lacking components since the last import or re-screen. */
  componentsClean: boolean;
}

const g = globalThis as unknown as { tropopassImportWorker?: WorkerState };

function state(): WorkerState {
  g.tropopassImportWorker ??= {
    chain: Promise.resolve(),
    errors: new Map(),
    componentsClean: false,
  };
  return g.tropopassImportWorker;
}

const pastDeadline = (opts: RunOptions): boolean => opts.deadline !== undefined && Date.now() >= opts.deadline;

/** Screens one import to its end; null when another worker process is screening it. */
async function processImport(importId: number, opts: RunOptions): Promise<number | null> {
  const lease = await leaseImport(importId);
  if (!lease) return null;
  try {
    return await screenImport(importId, opts);
  } finally {
    await lease.release();
  }
}

async function screenImport(importId: number, opts: RunOptions): Promise<number> {
  let chunkSize = opts.chunkSize ?? IMPORT_CHUNK_SIZE;
  if (!(await claimImport(importId))) return 0;
  let flights = 0;
  let workspaceId: number | null = null;
  for (;;) {
    if (pastDeadline(opts)) return flights;
    const pending = await listPendingFlights(importId, chunkSize);
    if (pending.length === 0) {
      const status = await finishImport(importId);
      if (status !== null) {
        log.info({ event: 'import.finished', importId, status }, 'import finished');
        // New figures may take an open period past a target: alerts once the import is done.
        if (workspaceId !== null) await checkTargetAlerts({ workspaceId });
        return flights;
      }
      continue;
    }
    workspaceId = pending[0].workspaceId;
    chunkSize = nextChunkSize(chunkSize, pending);
    const saved =
      (await screenAndSaveInThreads(importId, pending)) ??
      (await saveScreenedChunk(importId, (await screenInThreads(pending)) ?? screenChunk(pending)));
    flights += saved;
    await checkBudgetAlerts({ workspaceId: pending[0].workspaceId });
    state().errors.delete(importId);
    await opts.onChunk?.({ importId, saved });
    await yieldToEventLoop();
  }
}

/**
 * Screens an import's flights again with the current engine, chunk by chunk after its cursor, on the
 * screening threads as a first screening is. Figures only: no usage unit is written (db/imports.ts
 * saveRescreenChunk).
 */
async function processRescreen(job: RescreenJob, opts: RunOptions): Promise<number> {
  const chunkSize = opts.chunkSize ?? IMPORT_CHUNK_SIZE;
  let cursor = job;
  let flights = 0;
  let workspaceId: number | null = null;
  for (;;) {
    if (pastDeadline(opts)) return flights;
    const batch = await listRescreenFlights(cursor, chunkSize);
    if (batch.length === 0) {
      await finishRescreen(job.importId);
      log.info(
        { event: 'import.rescreen_finished', importId: job.importId, engineVersion: job.engineVersion },
        'import re-screen finished',
      );
      if (workspaceId !== null) await checkTargetAlerts({ workspaceId });
      return flights;
    }
    workspaceId = batch[0].workspaceId;
    const { done } = await saveRescreenChunk(cursor, (await screenInThreads(batch)) ?? screenChunk(batch));
    flights += done;
    cursor = { ...cursor, lastFlightId: batch[batch.length - 1].id };
    await opts.onChunk?.({ importId: job.importId, saved: done });
    await yieldToEventLoop();
  }
}

async function pass(opts: RunOptions): Promise<RunSummary> {
  const summary: RunSummary = { imports: 0, flights: 0 };
  for (;;) {
    const active = await listActiveImports();
    if (active.length === 0) {
      const rescreens = await listActiveRescreens();
      if (rescreens.length === 0) {
        if (state().componentsClean) return summary;
        // Idle: build the fleet-sampling components the screened flights lack, giving way to imports.
        const backlog = await buildComponentBacklog(async () => (await listActiveImports()).length > 0);
        if (backlog.built > 0)
          log.info({ event: 'import.components_built', flights: backlog.built }, 'fleet-sampling components built');
        if (!backlog.interrupted) state().componentsClean = true;
        if (!backlog.interrupted) return summary;
        continue;
      }
      state().componentsClean = false;
      for (const job of rescreens) {
        summary.flights += await processRescreen(job, opts);
        summary.imports += 1;
      }
      continue;
    }
    let progressed = false;
    let leasedElsewhere = 0;
    for (const imp of active) {
      try {
        const flights = await processImport(imp.id, opts);
        if (flights === null) {
          leasedElsewhere += 1;
          continue;
        }
        summary.flights += flights;
        summary.imports += 1;
        progressed = true;
        state().componentsClean = false;
      } catch (err) {
        const count = (state().errors.get(imp.id) ?? 0) + 1;
        state().errors.set(imp.id, count);
        log.error(
          { err, event: 'import.chunk_failed', importId: imp.id, attempt: count },
          'import screening chunk failed',
        );
        if (count >= MAX_CONSECUTIVE_ERRORS) {
          state().errors.delete(imp.id);
          await failImport(
            imp.id,
            'Screening stopped: the results could not be saved after several attempts. Flights already screened keep their figures; delete this import and upload the file again to screen the rest.',
          );
          progressed = true;
        }
      }
    }
    // Every import left is being screened by another worker process: look again at the next poll.
    if (!progressed && leasedElsewhere === active.length) return summary;
    if (!progressed) throw new Error('no import could make progress');
  }
}

function enqueue<T>(fn: () => Promise<T>): Promise<T> {
  const s = state();
  const next = s.chain.then(fn, fn);
  s.chain = next.catch(() => undefined);
  return next;
}

/**
 * Screens every queued or unfinished import to the end, then returns (tests, the benchmark, scripts);
 * on PostgreSQL it leaves alone an import another worker process is screening (import-lock.ts).
 * Runs after any pass already going in this process.
 */
export function runImportsToCompletion(opts: RunOptions = {}): Promise<RunSummary> {
  return enqueue(() => pass(opts));
}

/** Time a job spends on one import before it queues its next step (lib/imports/jobs.ts). */
export const IMPORT_STEP_MS = 5_000;

/**
 * One job's share of an import: chunks for about IMPORT_STEP_MS, each saved as always (the chunk logic
 * above, replay-safe). 'again' while the import still has flights to screen; 'done' when it is
 * finished, failed, deleted, or being screened by another process (which queues its own next step).
 */
export async function screenImportStep(importId: number, opts: RunOptions = {}): Promise<'again' | 'done'> {
  const flights = await processImport(importId, { deadline: Date.now() + IMPORT_STEP_MS, ...opts });
  if (flights === null) return 'done';
  return (await listActiveImports()).some((i) => i.id === importId) ? 'again' : 'done';
}

/** One job's share of an import's re-screen, as screenImportStep. */
export async function rescreenImportStep(importId: number, opts: RunOptions = {}): Promise<'again' | 'done'> {
  const job = (await listActiveRescreens()).find((r) => r.importId === importId);
  if (!job) return 'done';
  await processRescreen(job, { deadline: Date.now() + IMPORT_STEP_MS, ...opts });
  return (await listActiveRescreens()).some((r) => r.importId === importId) ? 'again' : 'done';
}
