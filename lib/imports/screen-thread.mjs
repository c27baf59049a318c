// The body of a screening worker thread (lib/imports/screening-pool.ts). It loads the tasks'
// TypeScript (thread-tasks.ts, with the engine) through tsx's API, so the same source serves the
// thread, the server and the tests.
import fs from 'node:fs';
import os from 'node:os';
import { tsImport } from 'tsx/esm/api';

const tasks = await tsImport('./thread-tasks.ts', import.meta.url);

// This thread yields the CPU to the server's event loop: screening is background work, a request is
// not. On Linux a thread's nice value is its own (setpriority with the thread's id); elsewhere, or
// where /proc is missing, the thread keeps the process's priority.
try {
  const tid = Number(fs.readlinkSync('/proc/thread-self').split('/').pop());
  if (Number.isInteger(tid) && tid > 0) os.setPriority(tid, 10);
} catch {
  // no per-thread priority here
}

/** The default task: `{ id, inputJson }[]` to `{ id, totals }` or `{ id, error }` each. */
export default function screenBatch(items) {
  return tasks.screenBatch(items);
}

/** Piscina task `componentsBatch`: fleet-sampling components for `{ id, inputJson }[]`. */
export function componentsBatch(items) {
  return tasks.componentsBatch(items);
}

/** Piscina task `screenAndSave` (SQLite): screens `{ importId, sqliteFile, flights }` and saves it here. */
export function screenAndSave(task) {
  return tasks.screenAndSave(task);
}
