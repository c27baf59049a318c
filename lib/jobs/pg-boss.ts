import 'server-only';
import PgBoss from 'pg-boss';
import { db } from '@/db/client';
import { log } from '@/lib/log';
import { failureReason, recordDeadLetter } from './failure';
import { registry, type JobDefinition, type JobGroup } from './registry';

/**
 * The PostgreSQL runner: pg-boss (its tables in the `pgboss` schema, made by pg-boss itself on first
 * start), talking through the app's own Knex pool, so there is one pool and one DATABASE_URL. Each job
 * name is a pg-boss queue with the definition's retry limit, exponential back-off, expiry and a dead-letter
 * queue (`<name>__dead`); the job's last failure is also recorded in `job_failures` for its owners.
 * Queues use the "short" policy (at most one waiting job per singleton key); `enqueue` with a singleton
 * key also skips while a job with that key is waiting, retrying or running.
 */

const SCHEMA = 'pgboss';

interface PgConnection {
  query(sql: string, values?: unknown[]): Promise<{ rows: unknown[] }>;
}
interface PoolClient {
  acquireConnection(): Promise<PgConnection>;
  releaseConnection(conn: PgConnection): Promise<void>;
}

const knexPool: PgBoss.Db = {
  async executeSql(text: string, values: unknown[]) {
    const client = db().client as unknown as PoolClient;
    const conn = await client.acquireConnection();
    try {
      return (await conn.query(text, values)) as { rows: never[] };
    } finally {
      await client.releaseConnection(conn);
    }
  },
};

interface BossState {
  boss: PgBoss | null;
  supervising: boolean;
  starting: Promise<PgBoss> | null;
  queues: Map<string, Promise<void>>;
  workers: string[];
}

const g = globalThis as unknown as { tropopassBoss?: BossState };

function state(): BossState {
  g.tropopassBoss ??= { boss: null, supervising: false, starting: null, queues: new Map(), workers: [] };
  return g.tropopassBoss;
}

/**
 * This process's pg-boss. A process that only queues (a web instance) does no maintenance; a runner
 * also expires lost runs and archives finished ones (pg-boss lets one process at a time do it).
 */
async function boss(supervise = false): Promise<PgBoss> {
  const s = state();
  if (s.starting && supervise && !s.supervising) {
    await s.starting.catch(() => undefined);
    await stopBoss();
  }
  if (s.boss) return s.boss;
  s.supervising = supervise;
  s.starting ??= (async () => {
    const b = new PgBoss({
      db: knexPool,
      schema: SCHEMA,
      supervise,
      // Expired runs (a worker that died) go back to retry at this pace; one process does it at a time.
      maintenanceIntervalSeconds: 5,
      archiveCompletedAfterSeconds: 3600,
      schedule: false,
    });
    b.on('error', (err: unknown) => log.warn({ err, event: 'jobs.boss_error' }, 'job queue error'));
    await b.start();
    s.boss = b;
    return b;
  })();
  try {
    return await s.starting;
  } catch (err) {
    s.starting = null;
    throw err;
  }
}

export const deadLetterQueue = (name: string): string => `${name}__dead`;

function ensureQueue(b: PgBoss, def: JobDefinition): Promise<void> {
  const s = state();
  let made = s.queues.get(def.name);
  if (!made) {
    made = (async () => {
      await b.createQueue(deadLetterQueue(def.name), { name: deadLetterQueue(def.name) });
      await b.createQueue(def.name, {
        name: def.name,
        policy: 'short',
        retryLimit: def.maxAttempts - 1,
        retryDelay: def.retryDelaySeconds,
        retryBackoff: true,
        expireInSeconds: def.expireInSeconds,
        deadLetter: deadLetterQueue(def.name),
      });
    })();
    s.queues.set(def.name, made);
    made.catch(() => s.queues.delete(def.name));
  }
  return made;
}

async function hasOpenJob(name: string, singletonKey: string): Promise<boolean> {
  const r = await knexPool.executeSql(
    `select 1 from ${SCHEMA}.job where name = $1 and singleton_key = $2 and state < 'completed' limit 1`,
    [name, singletonKey],
  );
  return r.rows.length > 0;
}

async function send(b: PgBoss, def: JobDefinition, payload: unknown, singletonKey?: string): Promise<boolean> {
  const id = await b.send(def.name, (payload ?? {}) as object, {
    singletonKey,
    retryLimit: def.maxAttempts - 1,
    retryDelay: def.retryDelaySeconds,
    retryBackoff: true,
    expireInSeconds: def.expireInSeconds,
    deadLetter: deadLetterQueue(def.name),
  });
  return id !== null;
}

export async function enqueueBoss(
  def: JobDefinition,
  payload: unknown,
  opts: { singletonKey?: string; ignoreOpen?: boolean },
): Promise<boolean> {
  const b = await boss();
  await ensureQueue(b, def);
  if (opts.singletonKey && !opts.ignoreOpen && (await hasOpenJob(def.name, opts.singletonKey))) return false;
  return send(b, def, payload, opts.singletonKey);
}

async function runOne(b: PgBoss, def: JobDefinition, job: PgBoss.JobWithMetadata<object>): Promise<void> {
  const attempt = job.retryCount + 1;
  try {
    const result = await def.handler(job.data, { attempt });
    // The next step is queued before this run completes: a crash between the two leaves a step
    // queued (harmless, the work is idempotent), never none.
    if (result === 'again') await send(b, def, job.data, job.singletonKey ?? undefined);
  } catch (err) {
    log.warn({ err, event: 'jobs.failed', job: def.name, attempt }, 'job run failed');
    // A recurring job's next run is already on its way: its failure is in the log, not a dead letter.
    if (job.retryCount >= job.retryLimit && !def.everyMs) await recordDeadLetter(def, job.data, err, attempt);
    throw new Error(failureReason(err));
  }
}

export async function startBossRunner(groups: JobGroup[]): Promise<void> {
  const b = await boss(true);
  const s = state();
  for (const def of registry().values()) {
    if (!groups.includes(def.group)) continue;
    await ensureQueue(b, def);
    const id = await b.work<object>(
      def.name,
      { includeMetadata: true, batchSize: 1, pollingIntervalSeconds: 0.5 },
      async (jobs) => {
        for (const job of jobs) await runOne(b, def, job);
      },
    );
    s.workers.push(id);
  }
}

export async function stopBoss(): Promise<void> {
  const s = state();
  const b = s.boss;
  if (!b) return;
  s.boss = null;
  s.starting = null;
  s.queues.clear();
  s.workers = [];
  await b.stop({ graceful: true, wait: true, close: false, timeout: 10_000 });
}
