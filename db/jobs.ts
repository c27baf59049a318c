import 'server-only';
import { db, insertId, nowIso, writeTx } from './client';

/**
 * The tables of background jobs: the in-process runner's queue (`local_jobs`, the SQLite default)
 * and the dead letters of both runners (`job_failures`). The rules (attempts, back-off, which
 * runner) live in lib/jobs.
 */

type Row = Record<string, unknown>;

export interface LocalJob {
  id: number;
  name: string;
  payloadJson: string;
  singletonKey: string | null;
  attempts: number;
  maxAttempts: number;
}

const toLocalJob = (r: Row): LocalJob => ({
  id: Number(r.id),
  name: String(r.name),
  payloadJson: String(r.payload_json),
  singletonKey: r.singleton_key === null ? null : String(r.singleton_key),
  attempts: Number(r.attempts),
  maxAttempts: Number(r.max_attempts),
});

/**
 * Queues a job. With a singleton key it is skipped (null) while a job of that name and key is
 * queued or running, so asking twice for the same work queues it once.
 */
export async function insertLocalJob(job: {
  name: string;
  payloadJson: string;
  singletonKey: string | null;
  maxAttempts: number;
  runAfter?: string;
}): Promise<number | null> {
  return writeTx(async (trx) => {
    if (job.singletonKey !== null) {
      const open = await trx('local_jobs').where({ name: job.name, singleton_key: job.singletonKey }).first('id');
      if (open) return null;
    }
    const now = nowIso();
    return insertId(
      trx('local_jobs')
        .insert({
          name: job.name,
          payload_json: job.payloadJson,
          singleton_key: job.singletonKey,
          state: 'queued',
          attempts: 0,
          max_attempts: job.maxAttempts,
          run_after: job.runAfter ?? now,
          created_at: now,
        })
        .returning('id'),
    );
  });
}

/** Takes the next due job (queued, its time come) and marks it running with one more attempt. */
export async function claimDueLocalJob(asOf: string = nowIso()): Promise<LocalJob | null> {
  return writeTx(async (trx) => {
    const row = (await trx('local_jobs')
      .where('state', 'queued')
      .where('run_after', '<=', asOf)
      .orderBy([{ column: 'run_after' }, { column: 'id' }])
      .first('*')) as Row | undefined;
    if (!row) return null;
    await trx('local_jobs')
      .where('id', row.id as number)
      .update({ state: 'active', attempts: Number(row.attempts) + 1 });
    return toLocalJob({ ...row, attempts: Number(row.attempts) + 1 });
  });
}

export async function deleteLocalJob(id: number): Promise<void> {
  await db()('local_jobs').where('id', id).delete();
}

/** Puts a job back in the queue (a retry after its back-off, or the next step of its work). */
export async function requeueLocalJob(
  id: number,
  input: { runAfter: string; lastError: string | null; resetAttempts: boolean },
): Promise<void> {
  await db()('local_jobs')
    .where('id', id)
    .update({
      state: 'queued',
      run_after: input.runAfter,
      last_error: input.lastError,
      ...(input.resetAttempts ? { attempts: 0 } : {}),
    });
}

/** Jobs left running by a process that died: queued again (one process runs jobs on SQLite). */
export async function requeueAbandonedLocalJobs(): Promise<number> {
  return db()('local_jobs').where('state', 'active').update({ state: 'queued' });
}

export interface JobFailureInput {
  workspaceId: number | null;
  jobName: string;
  payloadJson: string;
  reason: string;
  attempts: number;
}

async function insertFailure(trx: ReturnType<typeof db>, f: JobFailureInput): Promise<number> {
  return insertId(
    trx('job_failures')
      .insert({
        workspace_id: f.workspaceId,
        job_name: f.jobName,
        payload_json: f.payloadJson,
        reason: f.reason.slice(0, 1000),
        attempts: f.attempts,
        failed_at: nowIso(),
      })
      .returning('id'),
  );
}

/** A job that used up its attempts, recorded for its workspace's owners (PostgreSQL runner). */
export async function recordJobFailure(f: JobFailureInput): Promise<number> {
  return insertFailure(db(), f);
}

/** The in-process runner's dead letter: the job leaves the queue and joins the failures, at once. */
export async function deadLetterLocalJob(id: number, f: JobFailureInput): Promise<number> {
  return writeTx(async (trx) => {
    await trx('local_jobs').where('id', id).delete();
    return insertFailure(trx as unknown as ReturnType<typeof db>, f);
  });
}

export interface JobFailureDto {
  id: number;
  jobName: string;
  payloadJson: string;
  reason: string;
  attempts: number;
  failedAt: string;
}

const toFailure = (r: Row): JobFailureDto => ({
  id: Number(r.id),
  jobName: String(r.job_name),
  payloadJson: String(r.payload_json),
  reason: String(r.reason),
  attempts: Number(r.attempts),
  failedAt: String(r.failed_at),
});

/** The workspace's failed jobs not yet queued again, newest first. */
export async function listJobFailures(
  scope: { workspaceId: number },
  opts: { limit?: number } = {},
): Promise<JobFailureDto[]> {
  const rows = (await db()('job_failures')
    .where('workspace_id', scope.workspaceId)
    .whereNull('retried_at')
    .orderBy([
      { column: 'failed_at', order: 'desc' },
      { column: 'id', order: 'desc' },
    ])
    .limit(opts.limit ?? 50)
    .select('*')) as Row[];
  return rows.map(toFailure);
}

/**
 * Marks a failure as queued again, once: null when it is not this workspace's, or was already
 * retried (two owners pressing retry at once queue it once).
 */
export async function markJobFailureRetried(
  scope: { workspaceId: number },
  id: number,
  userId: number | null,
): Promise<JobFailureDto | null> {
  return writeTx(async (trx) => {
    const row = (await trx('job_failures')
      .where({ id, workspace_id: scope.workspaceId })
      .whereNull('retried_at')
      .first('*')) as Row | undefined;
    if (!row) return null;
    const n = await trx('job_failures')
      .where('id', id)
      .whereNull('retried_at')
      .update({ retried_at: nowIso(), retried_by: userId });
    return n > 0 ? toFailure(row) : null;
  });
}

/** Undoes markJobFailureRetried when the job could not be queued again. */
export async function clearJobFailureRetry(id: number): Promise<void> {
  await db()('job_failures').where('id', id).update({ retried_at: null, retried_by: null });
}
