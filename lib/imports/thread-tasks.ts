import type { PendingFlight } from '@/db/imports';
import { ENGINE_VERSION, screenTotals, screenWithComponents } from '@/lib/screening';
import { reasonOf, screenChunk } from './screen-chunk';

/**
 * The tasks of a screening worker thread (screen-thread.mjs loads this module once, so each thread
 * holds one copy of the engine). No `server-only` here; the database layer is loaded on first use by
 * screenAndSave only.
 */

/** Screens `{ id, inputJson }[]`; each comes back as `{ id, totals }` or `{ id, error }`. */
export function screenBatch(items: { id: number; inputJson: string }[]) {
  return items.map(({ id, inputJson }) => {
    try {
      return { id, totals: screenTotals(JSON.parse(inputJson)) };
    } catch (err) {
      return { id, error: reasonOf(err) };
    }
  });
}

/**
 * Builds fleet-sampling components for `{ id, inputJson }[]`; each comes back as
 * `{ id, engineVersion, components }`, components null when they cannot be built.
 */
export function componentsBatch(items: { id: number; inputJson: string }[]) {
  return items.map(({ id, inputJson }) => {
    try {
      const { totals, components } = screenWithComponents(JSON.parse(inputJson));
      return { id, engineVersion: totals.engineVersion, components };
    } catch {
      return { id, engineVersion: ENGINE_VERSION, components: null };
    }
  });
}

export interface ScreenAndSaveTask {
  importId: number;
  /** The database file the caller uses, absolute. */
  sqliteFile: string;
  flights: PendingFlight[];
}

/**
 * A thread's whole share of an import chunk on SQLite: screens the flights and writes their figures,
 * status, roll-ups and usage units in one transaction of this thread's own connection (db/imports.ts
 * saveScreenedChunk, the same replay-safe write the event loop makes otherwise). The write's
 * statements and its commit (an fsync with `synchronous = FULL`) then block this thread, not the
 * server's event loop; WAL lets the server's connection read meanwhile. Returns how many flights it
 * saved.
 */
export async function screenAndSave(task: ScreenAndSaveTask): Promise<number> {
  const outcomes = screenChunk(task.flights);
  const [{ openSqliteFile }, { saveScreenedChunk }] = await Promise.all([
    import('@/db/file-client'),
    import('@/db/imports'),
  ]);
  await openSqliteFile(task.sqliteFile);
  return saveScreenedChunk(task.importId, outcomes);
}
