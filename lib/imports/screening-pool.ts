import 'server-only';
import os from 'node:os';
import path from 'node:path';
import { Piscina } from 'piscina';
import type { PendingFlight, ScreenedOutcome } from '@/db/imports';
import { figuresOf } from './figures';
import { env } from '@/lib/env';
import { usingPostgres } from '@/db/client';
import type { ScreeningTotals } from '@/lib/screening';

/**
 * Imported flights are screened in worker threads (a piscina pool), so a 100 000-row import leaves
 * the process's event loop to the requests it serves; the loop only parses rows in and writes
 * figures out. SCREENING_THREADS sets the pool size (0 screens on the event loop, as before).
 */

type ThreadResult = { id: number; totals: ScreeningTotals } | { id: number; error: string };

/** One pool for the thread's three tasks (screen-thread.mjs): each call below names its task and result type. */
type Pool = Piscina<unknown, unknown>;

const g = globalThis as unknown as { tropopassScreeningPool?: Pool };

/** Threads for screening: SCREENING_THREADS, else one core short of the machine (1 to 4), none under tests. */
export function screeningThreads(): number {
  const e = env();
  if (e.SCREENING_THREADS !== undefined) return e.SCREENING_THREADS;
  if (e.NODE_ENV === 'test') return 0;
  return Math.max(1, Math.min(4, os.availableParallelism() - 1));
}

function pool(threads: number): Pool {
  g.tropopassScreeningPool ??= new Piscina({
    filename: path.join(/*turbopackIgnore: true*/ process.cwd(), 'lib/imports/screen-thread.mjs'),
    minThreads: 0,
    maxThreads: threads,
    // The threads load db/ (screenAndSave), whose modules are marked server-only as the server's are.
    execArgv: ['--conditions=react-server'],
    idleTimeout: 30_000,
  });
  return g.tropopassScreeningPool;
}

/**
 * Screens a chunk of pending flights across the pool's threads, in the order given; null when
 * screening threads are off (the caller screens on the event loop).
 */
export async function screenInThreads(pending: PendingFlight[]): Promise<ScreenedOutcome[] | null> {
  const threads = screeningThreads();
  if (threads === 0) return null;
  if (pending.length === 0) return [];
  const p = pool(threads);
  const size = Math.ceil(pending.length / threads);
  const slices: PendingFlight[][] = [];
  for (let i = 0; i < pending.length; i += size) slices.push(pending.slice(i, i + size));
  const results = (
    await Promise.all(
      slices.map((s) => p.run(s.map((f) => ({ id: f.id, inputJson: f.inputJson }))) as Promise<ThreadResult[]>),
    )
  ).flat();
  const byId = new Map(results.map((r) => [r.id, r]));
  return pending.map((f) => {
    const r = byId.get(f.id);
    const base = { id: f.id, workspaceId: f.workspaceId, line: f.line };
    if (!r) return { ...base, error: 'the screening thread returned no result for this flight' };
    return 'totals' in r ? { ...base, figures: figuresOf(r.totals) } : { ...base, error: r.error };
  });
}

/**
 * On SQLite, screens a chunk of pending flights and saves it from the pool's threads, each thread
 * its own slice in its own transaction (thread-tasks.ts screenAndSave), so neither the screening nor the write
 * blocks the event loop; returns how many flights were saved. Null when screening threads are off
 * or the database is PostgreSQL (its driver does not block the event loop: the caller saves).
 */
export async function screenAndSaveInThreads(importId: number, pending: PendingFlight[]): Promise<number | null> {
  const threads = screeningThreads();
  if (threads === 0 || usingPostgres()) return null;
  if (pending.length === 0) return 0;
  const p = pool(threads);
  const sqliteFile = path.resolve(/*turbopackIgnore: true*/ process.cwd(), env().SQLITE_FILE);
  const size = Math.ceil(pending.length / threads);
  const runs: Promise<number>[] = [];
  for (let i = 0; i < pending.length; i += size)
    runs.push(
      p.run(
        { importId, sqliteFile, flights: pending.slice(i, i + size) },
        { name: 'screenAndSave' },
      ) as Promise<number>,
    );
  // Every slice runs to its end before a failure is reported, so a retry finds no write still going.
  const settled = await Promise.allSettled(runs);
  const failed = settled.find((r): r is PromiseRejectedResult => r.status === 'rejected');
  if (failed) throw failed.reason;
  return settled.reduce((n, r) => n + (r.status === 'fulfilled' ? r.value : 0), 0);
}

/** Components built for one flight: bytes, or null when the engine could not build them. */
export interface BuiltComponents {
  id: number;
  engineVersion: string;
  components: Uint8Array | null;
}

/**
 * Builds fleet-sampling components for flights across the pool's threads (screen-thread.mjs
 * componentsBatch); null when screening threads are off (the caller builds on the event loop).
 */
export async function componentsInThreads(
  items: { id: number; inputJson: string }[],
): Promise<BuiltComponents[] | null> {
  const threads = screeningThreads();
  if (threads === 0) return null;
  if (items.length === 0) return [];
  const p = pool(threads);
  const size = Math.ceil(items.length / threads);
  const runs: Promise<BuiltComponents[]>[] = [];
  for (let i = 0; i < items.length; i += size)
    runs.push(p.run(items.slice(i, i + size), { name: 'componentsBatch' }) as Promise<BuiltComponents[]>);
  return (await Promise.all(runs)).flat();
}

/** Ends the pool's threads (tests, a worker process shutting down). */
export async function closeScreeningPool(): Promise<void> {
  const p = g.tropopassScreeningPool;
  g.tropopassScreeningPool = undefined;
  if (p) await p.close({ force: true });
}
