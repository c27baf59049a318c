import 'server-only';

/**
 * The job definitions of this process. Kept on globalThis: Next.js may load a module twice
 * (instrumentation and route handlers), and both copies must see one registry.
 */

export type JobResult = void | 'again' | 'done';

export interface JobContext {
  /** 1 on the first run, 2 on the first retry, ... */
  attempt: number;
}

export type JobHandler<P> = (payload: P, ctx: JobContext) => Promise<JobResult>;

/**
 * Which runner takes it: `npm run worker` with IMPORT_WORKER=0 or BILLING_SENDER=0 leaves 'imports'
 * or 'usage' out; 'mail' (report e-mails) runs in every process that runs jobs at all.
 */
export type JobGroup = 'imports' | 'usage' | 'mail';

export interface JobOptions<P> {
  group: JobGroup;
  /** Runs in all, the first included; the last failure makes a dead letter. Default 4. */
  maxAttempts?: number;
  /** Seconds before the first retry; each further retry waits twice as long. Default 2. */
  retryDelaySeconds?: number;
  /**
   * Seconds a run may take before it counts as lost (its process died) and is retried elsewhere.
   * PostgreSQL only; the in-process runner re-queues its running job when it starts. Default 60.
   */
  expireInSeconds?: number;
  /**
   * Queue this job every so many milliseconds while a runner runs (one at a time across processes).
   * A recurring job that fails is logged and simply runs again at its next turn: no dead letter.
   */
  everyMs?: () => number;
  /** The workspace whose owners see this job when it fails (none: only the logs show it). */
  workspaceOf?: (payload: P) => number | null;
  /** The singleton key the job is queued with when an owner retries it. */
  singletonKeyOf?: (payload: P) => string | undefined;
  /** A short label for the owner's list, e.g. "Screening of import #12". */
  describe?: (payload: P) => string;
  /** Runs once when the job used up its attempts (after the failure is recorded). */
  onDeadLetter?: (payload: P, reason: string) => Promise<void>;
  /** Runs before an owner's retry queues the job again (to reopen what the dead letter closed). */
  beforeRetry?: (payload: P) => Promise<void>;
}

export interface JobDefinition<P = unknown>
  extends
    Required<Pick<JobOptions<P>, 'maxAttempts' | 'retryDelaySeconds' | 'expireInSeconds'>>,
    Omit<JobOptions<P>, 'maxAttempts' | 'retryDelaySeconds' | 'expireInSeconds'> {
  name: string;
  handler: JobHandler<P>;
}

const g = globalThis as unknown as { tropopassJobs?: Map<string, JobDefinition> };

export function registry(): Map<string, JobDefinition> {
  g.tropopassJobs ??= new Map();
  return g.tropopassJobs;
}

/** Letters, digits, dots, dashes and underscores: valid for both runners. */
const NAME = /^[a-z][a-z0-9._-]{0,60}$/;

/**
 * Defines a background job. The code that defines it does not know which runner runs it: pg-boss on
 * PostgreSQL, the in-process runner on SQLite. A handler must be idempotent (a run may be repeated
 * after a crash); it returns 'again' to be queued again with the same payload (the next step of long
 * work), and throws to fail the run (retried with back-off, then a dead letter).
 */
export function defineJob<P>(name: string, handler: JobHandler<P>, options: JobOptions<P>): JobDefinition<P> {
  if (!NAME.test(name)) throw new Error(`job name ${JSON.stringify(name)} is not a valid job name`);
  const def: JobDefinition<P> = {
    ...options,
    name,
    handler,
    maxAttempts: options.maxAttempts ?? 4,
    retryDelaySeconds: options.retryDelaySeconds ?? 2,
    expireInSeconds: options.expireInSeconds ?? 60,
  };
  registry().set(name, def as unknown as JobDefinition);
  return def;
}

export function jobDefinition(name: string): JobDefinition {
  const def = registry().get(name);
  if (!def) throw new Error(`no job is defined with the name ${name}`);
  return def;
}

/** The delay before the run after `attempt` failed runs: retryDelay, 2 x, 4 x, ... */
export function retryDelayMs(def: Pick<JobDefinition, 'retryDelaySeconds'>, attempt: number): number {
  return def.retryDelaySeconds * 1000 * 2 ** Math.max(0, attempt - 1);
}
