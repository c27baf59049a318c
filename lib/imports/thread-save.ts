import type { PendingFlight } from '@/db/imports';
import { screenChunk } from './screen-chunk';

/**
 * A screening thread's whole share of an import chunk on SQLite (screen-thread.mjs `screenAndSave`):
 * screens the flights and writes their figures, status, roll-ups and usage units in one transaction
 * of this thread's own connection (db/imports.ts saveScreenedChunk, the same replay-safe write the
 * event loop makes otherwise). The write's statements and its commit (an fsync with
 * `synchronous = FULL`) then block this thread, not the server's event loop; WAL lets the server's
 * connection read meanwhile. Returns how many flights it saved.
 */

export interface ScreenAndSaveTask {
  importId: number;
  /** The database file the caller uses, absolute. */
  sqliteFile: string;
  flights: PendingFlight[];
}

export async function screenAndSave(task: ScreenAndSaveTask): Promise<number> {
  const outcomes = screenChunk(task.flights);
  // Loaded on first use, so threads that only screen never load the database layer.
  const [{ openSqliteFile }, { saveScreenedChunk }] = await Promise.all([
    import('@/db/file-client'),
    import('@/db/imports'),
  ]);
  await openSqliteFile(task.sqliteFile);
  return saveScreenedChunk(task.importId, outcomes);
}
