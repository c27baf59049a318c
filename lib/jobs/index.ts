import 'server-only';
import { usingPostgres } from '@/db/client';
import { log } from '@/lib/log';
import { enqueueBoss, startBossRunner, stopBoss } from './pg-boss';
import { enqueueLocal, startLocalRunner, stopLocalRunner } from './local';
import { jobDefinition, registry, type JobGroup } from './registry';

export {
  defineJob,
  type JobContext,
  type JobGroup,
  type JobHandler,
  type JobOptions,
  type JobResult,
} from './registry';

/**
 * The job interface of the app: `defineJob(name, handler, options)` (registry.ts), `enqueue(name,
 * payload, { singletonKey })` and `startJobRunner()`. On PostgreSQL the jobs go through pg-boss
 * (pg-boss.ts), any number of processes running them; on SQLite through the in-process runner
 * (local.ts). The code that defines or queues a job does not know which.
 */

export interface EnqueueOptions {
  /** While a job of this name and key waits or runs, queueing it again does nothing. */
  singletonKey?: string;
  /** Skip the check that a job with the same key is already running (the job queues its own next step). */
  ignoreOpen?: boolean;
}

/** Queues a job; false when a job with the same singleton key is already waiting or running. */
export async function enqueue(name: string, payload: unknown, opts: EnqueueOptions = {}): Promise<boolean> {
  const def = jobDefinition(name);
  return usingPostgres() ? enqueueBoss(def, payload, opts) : enqueueLocal(def, payload, opts);
}

interface RunnerState {
  groups: JobGroup[];
  timers: NodeJS.Timeout[];
}

const g = globalThis as unknown as { tropopassJobRunner?: RunnerState };

/**
 * Runs the jobs of the given groups in this process until `stopJobRunner()`; recurring jobs
 * (`everyMs`) are queued at once and then at their pace, one waiting at a time across processes.
 * The definitions must be loaded first (lib/jobs/all.ts does it).
 */
export async function startJobRunner(groups: JobGroup[] = ['imports', 'usage', 'mail']): Promise<boolean> {
  if (g.tropopassJobRunner || groups.length === 0) return false;
  const s: RunnerState = { groups, timers: [] };
  g.tropopassJobRunner = s;
  if (usingPostgres()) await startBossRunner(groups);
  else await startLocalRunner(groups);
  for (const def of registry().values()) {
    if (!def.everyMs || !groups.includes(def.group)) continue;
    const tick = () =>
      void enqueue(def.name, {}, { singletonKey: def.name }).catch((err: unknown) =>
        log.warn({ err, event: 'jobs.tick_failed', job: def.name }, 'could not queue a recurring job'),
      );
    tick();
    const timer = setInterval(tick, def.everyMs());
    timer.unref();
    s.timers.push(timer);
  }
  log.info({ event: 'jobs.runner_started', groups, postgres: usingPostgres() }, 'job runner started');
  return true;
}

/** Stops taking jobs, lets the running one finish, and stops the runner's timers. */
export async function stopJobRunner(): Promise<void> {
  const s = g.tropopassJobRunner;
  g.tropopassJobRunner = undefined;
  for (const t of s?.timers ?? []) clearInterval(t);
  if (usingPostgres()) await stopBoss();
  else await stopLocalRunner();
}
