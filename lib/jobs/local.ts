import 'server-only';
import { setTimeout as sleep } from 'node:timers/promises';
import {
  claimDueLocalJob,
  deadLetterLocalJob,
  deleteLocalJob,
  insertLocalJob,
  requeueAbandonedLocalJobs,
  requeueLocalJob,
} from '@/db/jobs';
import { log } from '@/lib/log';
import { afterDeadLetter, failureReason, workspaceOfJob } from './failure';
import { registry, retryDelayMs, type JobDefinition, type JobGroup } from './registry';

/**
 * The in-process runner (SQLite, one process): jobs wait in the `local_jobs` table, so a restart
 * loses none, and run one at a time on this process's event loop (the screening itself goes to
 * worker threads). A failed run is retried after its back-off; the last failure moves the job to
 * `job_failures` in the same transaction that takes it off the queue.
 */

const POLL_MS = 500;

interface LocalState {
  running: boolean;
  stopping: boolean;
  groups: Set<JobGroup>;
  loop: Promise<void> | null;
  wake: (() => void) | null;
}

const g = globalThis as unknown as { tropopassLocalJobs?: LocalState };

function state(): LocalState {
  g.tropopassLocalJobs ??= { running: false, stopping: false, groups: new Set(), loop: null, wake: null };
  return g.tropopassLocalJobs;
}

export async function enqueueLocal(
  def: JobDefinition,
  payload: unknown,
  opts: { singletonKey?: string; delayMs?: number },
): Promise<boolean> {
  const id = await insertLocalJob({
    name: def.name,
    payloadJson: JSON.stringify(payload ?? {}),
    singletonKey: opts.singletonKey ?? null,
    maxAttempts: def.maxAttempts,
    runAfter: opts.delayMs ? new Date(Date.now() + opts.delayMs).toISOString() : undefined,
  });
  state().wake?.();
  return id !== null;
}

/**
 * Runs due jobs until none is due; returns how many runs there were (tests, scripts). A job of a
 * group this runner does not take, or of no known definition, stays queued.
 */
export async function runDueLocalJobs(opts: { groups?: JobGroup[]; asOf?: () => Date } = {}): Promise<number> {
  const groups = new Set(opts.groups ?? (['imports', 'usage', 'mail'] as JobGroup[]));
  let runs = 0;
  for (;;) {
    if (state().stopping) return runs;
    const job = await claimDueLocalJob((opts.asOf?.() ?? new Date()).toISOString());
    if (!job) break;
    const def = registry().get(job.name);
    if (!def || !groups.has(def.group)) {
      // Not ours: back in the queue a little later, so the others can run.
      await requeueLocalJob(job.id, {
        runAfter: new Date(Date.now() + 60_000).toISOString(),
        lastError: def ? null : 'no job of this name is defined in this process',
        resetAttempts: false,
      });
      continue;
    }
    runs += 1;
    const payload = JSON.parse(job.payloadJson) as unknown;
    try {
      const result = await def.handler(payload, { attempt: job.attempts });
      if (result === 'again')
        await requeueLocalJob(job.id, { runAfter: new Date().toISOString(), lastError: null, resetAttempts: true });
      else await deleteLocalJob(job.id);
    } catch (err) {
      const reason = failureReason(err);
      log.warn({ err, event: 'jobs.failed', job: def.name, attempt: job.attempts }, 'job run failed');
      if (job.attempts >= job.maxAttempts && def.everyMs) {
        // A recurring job's next run is already on its way: its failure is in the log, not a dead letter.
        await deleteLocalJob(job.id);
      } else if (job.attempts >= job.maxAttempts) {
        await deadLetterLocalJob(job.id, {
          workspaceId: workspaceOfJob(def, payload),
          jobName: def.name,
          payloadJson: job.payloadJson,
          reason,
          attempts: job.attempts,
        });
        await afterDeadLetter(def, payload, reason);
      } else {
        await requeueLocalJob(job.id, {
          runAfter: new Date(Date.now() + retryDelayMs(def, job.attempts)).toISOString(),
          lastError: reason,
          resetAttempts: false,
        });
      }
    }
  }
  return runs;
}

async function loop(s: LocalState): Promise<void> {
  while (!s.stopping) {
    try {
      await runDueLocalJobs({ groups: [...s.groups] });
    } catch (err) {
      log.error({ err, event: 'jobs.local_pass_failed' }, 'job runner pass failed; retrying');
    }
    if (s.stopping) break;
    await new Promise<void>((resolve) => {
      const timer = setTimeout(resolve, POLL_MS);
      timer.unref();
      s.wake = () => {
        clearTimeout(timer);
        resolve();
      };
    });
    s.wake = null;
  }
}

export async function startLocalRunner(groups: JobGroup[]): Promise<void> {
  const s = state();
  if (s.running) return;
  s.running = true;
  s.stopping = false;
  s.groups = new Set(groups);
  const abandoned = await requeueAbandonedLocalJobs();
  if (abandoned > 0) log.info({ event: 'jobs.resumed', count: abandoned }, 'jobs left running were queued again');
  s.loop = loop(s);
}

export async function stopLocalRunner(): Promise<void> {
  const s = state();
  if (!s.running) return;
  s.stopping = true;
  s.wake?.();
  await s.loop;
  await sleep(0);
  s.running = false;
  s.stopping = false;
  s.loop = null;
}
