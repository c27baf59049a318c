import 'server-only';
import { failImport, listActiveImports, listActiveRescreens, reopenFailedImport } from '@/db/imports';
import { enqueue, defineJob } from '@/lib/jobs';
import { log } from '@/lib/log';
import { buildComponentBacklog } from './components';
import { rescreenImportStep, screenImportStep } from './worker';

/**
 * The import work as jobs. `import.screen` screens an import in steps (worker.ts screenImportStep:
 * each step saves its chunks with the replay-safe chunk logic and queues the next step), so a step
 * lost with its worker is retried by another one after its expiry and screens and bills nothing
 * twice. `imports.sweep` queues a step for every import left unfinished (a lost step, an import made
 * before the queue existed); the singleton key keeps one step per import waiting or running.
 */

export interface ImportJob {
  importId: number;
  workspaceId: number;
}

const isImportJob = (p: unknown): p is ImportJob =>
  typeof p === 'object' &&
  p !== null &&
  Number.isInteger((p as ImportJob).importId) &&
  Number.isInteger((p as ImportJob).workspaceId);

const payloadOf = (p: unknown): ImportJob => {
  if (!isImportJob(p)) throw new Error('the job payload names no import');
  return p;
};

export const IMPORT_SCREEN_JOB = 'import.screen';
export const IMPORT_RESCREEN_JOB = 'import.rescreen';
export const IMPORT_SWEEP_JOB = 'imports.sweep';
export const COMPONENTS_BACKLOG_JOB = 'imports.components';

/** How long one backlog turn may build fleet-sampling components before it gives the slot back. */
const BACKLOG_TURN_MS = 45_000;

const STOPPED_REASON =
  'Screening stopped: the results could not be saved after several attempts. Flights already screened keep their figures; an owner can retry it under Background jobs, or delete this import and upload the file again.';

defineJob<ImportJob>(IMPORT_SCREEN_JOB, async (p) => screenImportStep(payloadOf(p).importId), {
  group: 'imports',
  maxAttempts: 5,
  retryDelaySeconds: 2,
  // A step takes about IMPORT_STEP_MS (5 s); a step still running after 30 s lost its worker.
  expireInSeconds: 30,
  workspaceOf: (p) => (isImportJob(p) ? p.workspaceId : null),
  singletonKeyOf: (p) => `import:${p.importId}`,
  describe: (p) => `Screening of import #${p.importId}`,
  onDeadLetter: async (p) => failImport(p.importId, STOPPED_REASON),
  beforeRetry: async (p) => {
    await reopenFailedImport(p.importId);
  },
});

defineJob<ImportJob>(IMPORT_RESCREEN_JOB, async (p) => rescreenImportStep(payloadOf(p).importId), {
  group: 'imports',
  maxAttempts: 5,
  retryDelaySeconds: 2,
  expireInSeconds: 30,
  workspaceOf: (p) => (isImportJob(p) ? p.workspaceId : null),
  singletonKeyOf: (p) => `rescreen:${p.importId}`,
  describe: (p) => `Re-screening of import #${p.importId}`,
});

defineJob(
  IMPORT_SWEEP_JOB,
  async () => {
    for (const imp of await listActiveImports())
      await queueImportScreening({ importId: imp.id, workspaceId: imp.workspaceId });
    for (const r of await listActiveRescreens())
      await queueImportRescreen({ importId: r.importId, workspaceId: r.workspaceId });
  },
  { group: 'imports', maxAttempts: 1, expireInSeconds: 60, everyMs: () => 30_000 },
);

/**
 * While no import or re-screen is left, builds the fleet-sampling components that screened flights
 * lack (components.ts), for at most BACKLOG_TURN_MS a turn and giving way to any import that arrives;
 * the next turn carries on where the flights still lack them.
 */
defineJob(
  COMPONENTS_BACKLOG_JOB,
  async () => {
    const busy = async () => (await listActiveImports()).length > 0 || (await listActiveRescreens()).length > 0;
    if (await busy()) return;
    const deadline = Date.now() + BACKLOG_TURN_MS;
    const r = await buildComponentBacklog(async () => Date.now() > deadline || (await busy()));
    if (r.built > 0)
      log.info({ event: 'import.components_built', flights: r.built }, 'fleet-sampling components built');
  },
  { group: 'imports', maxAttempts: 1, expireInSeconds: 120, everyMs: () => 30_000 },
);

export function queueImportScreening(job: ImportJob): Promise<boolean> {
  return enqueue(IMPORT_SCREEN_JOB, job, { singletonKey: `import:${job.importId}` });
}

export function queueImportRescreen(job: ImportJob): Promise<boolean> {
  return enqueue(IMPORT_RESCREEN_JOB, job, { singletonKey: `rescreen:${job.importId}` });
}

/**
 * After an upload or a re-screen request: queue the work now. A failure here loses nothing (the
 * import is saved and the sweep queues it within half a minute), so it is logged, not thrown.
 */
export async function queueImportWork(kind: 'screen' | 'rescreen', job: ImportJob): Promise<void> {
  try {
    await (kind === 'screen' ? queueImportScreening(job) : queueImportRescreen(job));
  } catch (err) {
    log.warn(
      { err, event: 'import.enqueue_failed', importId: job.importId },
      'could not queue import work; the sweep will',
    );
  }
}
