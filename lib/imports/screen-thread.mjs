// The body of a screening worker thread (lib/imports/screening-pool.ts). It loads the engine's
// TypeScript through tsx's API, so the same source serves the thread, the server and the tests.
import fs from 'node:fs';
import os from 'node:os';
import { tsImport } from 'tsx/esm/api';

const engine = await tsImport('../screening/index.ts', import.meta.url);

// This thread yields the CPU to the server's event loop: screening is background work, a request is
// not. On Linux a thread's nice value is its own (setpriority with the thread's id); elsewhere, or
// where /proc is missing, the thread keeps the process's priority.
try {
  const tid = Number(fs.readlinkSync('/proc/thread-self').split('/').pop());
  if (Number.isInteger(tid) && tid > 0) os.setPriority(tid, 10);
} catch {
  // no per-thread priority here
}

let saver = null;

/**
 * Screens `{ importId, sqliteFile, flights }` and saves the chunk from this thread (SQLite; piscina
 * task name `screenAndSave`, see thread-save.ts); returns how many flights it saved.
 */
export async function screenAndSave(task) {
  saver ??= await tsImport('./thread-save.ts', import.meta.url);
  return saver.screenAndSave(task);
}

function reasonOf(err) {
  if (err instanceof engine.ScreeningInputError)
    return err.fields.map((f) => `${f.path}: ${f.message}`).join('; ') || err.message;
  if (err instanceof Error) return err.message;
  return 'the screening engine could not screen this flight';
}

/** Screens `{ id, inputJson }[]`; each comes back as `{ id, totals }` or `{ id, error }`. */
export default function screenBatch(items) {
  return items.map(({ id, inputJson }) => {
    try {
      return { id, totals: engine.screenTotals(JSON.parse(inputJson)) };
    } catch (err) {
      return { id, error: reasonOf(err) };
    }
  });
}

/**
 * Builds fleet-sampling components for `{ id, inputJson }[]` (piscina task name `componentsBatch`);
 * each comes back as `{ id, engineVersion, components }`, components null when they cannot be built.
 */
export function componentsBatch(items) {
  return items.map(({ id, inputJson }) => {
    try {
      const { totals, components } = engine.screenWithComponents(JSON.parse(inputJson));
      return { id, engineVersion: totals.engineVersion, components };
    } catch {
      return { id, engineVersion: engine.ENGINE_VERSION, components: null };
    }
  });
}
