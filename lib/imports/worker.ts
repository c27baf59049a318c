import 'server-only';
import { setImmediate as yieldToEventLoop } from 'node:timers/promises';
import { screenTotals, ScreeningInputError, type ScreeningInput } from '@/lib/screening';
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
  type ScreenedOutcome,
} from '@/db/imports';
import { log } from '@/lib/log';
import { figuresOf } from './figures';
import { leaseImport } from './import-lock';
import { screenInThreads } from './screening-pool';
import { buildComponentBacklog } from './components';
import { nextChunkSize } from './chunk-size';
import { checkBudgetAlerts } from '@/lib/billing/budget';
import { checkTargetAlerts } from '@/lib/periods/alerts';

/**
 * The background screening of imported flights, in the server process or a standalone worker
 * process (`npm run worker`). It polls for imports that are queued or were left mid-way (status
 * screening: a restart resumes them), screens their pending flights in chunks (in worker threads,
 * see screening-pool.ts), and writes each chunk (figures, status, one usage unit per screened flight) in
 * one transaction. A chunk only touches flights still pending, so a chunk replayed after a crash
 * can neither lose a flight nor bill one twice.
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
const IDLE_POLL_MS = 1000;
const RETRY_MS = 2000;
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
  started: boolean;
  stopping: boolean;
  timer: NodeJS.Timeout | null;
  /** Serialises every pass in this process (the background loop and explicit runs). */
  chain: Promise<unknown>;
  errors: Map<number, number>;
  /** False until a backlog pass found no flight lacking components since the last import or re-screen. */
  componentsClean: boolean;
}

const g = globalThis as unknown as { tropopassImportWorker?: WorkerState };

function state(): WorkerState {
  g.tropopassImportWorker ??= {
    started: false,
    stopping: false,
    timer: null,
    chain: Promise.resolve(),
    errors: new Map(),
    componentsClean: false,
  };
  return g.tropopassImportWorker;
}

function reasonOf(err: unknown): string {
  if (err instanceof ScreeningInputError)
    return err.fields.map((f) => `${f.path}: ${f.message}`).join('; ') || err.message;
  if (err instanceof Error) return err.message;
  return 'the screening engine could not screen this flight';
}

function screenChunk(pending: Awaited<ReturnType<typeof listPendingFlights>>): ScreenedOutcome[] {
  return pending.map((p) => {
    try {
      const input = JSON.parse(p.inputJson) as ScreeningInput;
      // Only the summary figures leave this function: the full result (its segments) dies young.
      return { id: p.id, workspaceId: p.workspaceId, line: p.line, figures: figuresOf(screenTotals(input)) };
    } catch (err) {
      return { id: p.id, workspaceId: p.workspaceId, line: p.line, error: reasonOf(err) };
    }
  });
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
    if (state().stopping || pastDeadline(opts)) return flights;
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
    const outcomes = (await screenInThreads(pending)) ?? screenChunk(pending);
    const saved = await saveScreenedChunk(importId, outcomes);
    flights += saved;
    await checkBudgetAlerts({ workspaceId: pending[0].workspaceId });
    state().errors.delete(importId);
    await opts.onChunk?.({ importId, saved });
    await yieldToEventLoop();
  }
}

/**
 * Screens an import's flights again with the current engine, chunk by chunk after its cursor. Figures
 * only: no usage unit is written (db/imports.ts saveRescreenChunk).
 */
async function processRescreen(job: RescreenJob, opts: RunOptions): Promise<number> {
  const chunkSize = opts.chunkSize ?? IMPORT_CHUNK_SIZE;
  let cursor = job;
  let flights = 0;
  let workspaceId: number | null = null;
  for (;;) {
    if (state().stopping || pastDeadline(opts)) return flights;
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
    const { done } = await saveRescreenChunk(cursor, screenChunk(batch));
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
    if (active.length === 0 && !state().stopping) {
      const rescreens = await listActiveRescreens();
      if (rescreens.length === 0) {
        if (state().componentsClean) return summary;
        // Idle: build the fleet-sampling components the screened flights lack, giving way to imports.
        const backlog = await buildComponentBacklog(
          async () => state().stopping || (await listActiveImports()).length > 0,
        );
        if (backlog.built > 0)
          log.info({ event: 'import.components_built', flights: backlog.built }, 'fleet-sampling components built');
        if (!backlog.interrupted) state().componentsClean = true;
        if (!backlog.interrupted || state().stopping) return summary;
        continue;
      }
      state().componentsClean = false;
      for (const job of rescreens) {
        summary.flights += await processRescreen(job, opts);
        summary.imports += 1;
      }
      continue;
    }
    if (active.length === 0 || state().stopping) return summary;
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

function schedule(delayMs: number): void {
  const s = state();
  if (!s.started || s.stopping) return;
  if (s.timer) clearTimeout(s.timer);
  s.timer = setTimeout(() => {
    s.timer = null;
    enqueue(() => pass({})).then(
      () => schedule(IDLE_POLL_MS),
      (err: unknown) => {
        log.error({ err, event: 'import.worker_pass_failed' }, 'import worker pass failed; retrying');
        schedule(RETRY_MS);
      },
    );
  }, delayMs);
  s.timer.unref();
}

/** Starts the in-process worker (idempotent). On start it resumes imports left in screening. */
export function startImportWorker(): void {
  const s = state();
  if (s.started) return;
  s.started = true;
  s.stopping = false;
  log.info({ event: 'import.worker_started' }, 'import worker started');
  schedule(0);
}

/** Asks a started worker to look for work now (after an upload), instead of at its next poll. */
export function wakeImportWorker(): void {
  const s = state();
  if (s.started && !s.stopping && s.timer) schedule(0);
}

/** Stops the background loop after its current chunk. */
export async function stopImportWorker(): Promise<void> {
  const s = state();
  s.stopping = true;
  if (s.timer) clearTimeout(s.timer);
  s.timer = null;
  s.started = false;
  await s.chain;
  s.stopping = false;
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
