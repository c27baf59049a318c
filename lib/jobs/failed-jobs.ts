import 'server-only';
import { createAuditEntry } from '@/db/audit';
import { clearJobFailureRetry, listJobFailures, markJobFailureRetried, type JobFailureDto } from '@/db/jobs';
import { notFound } from '@/lib/errors';
import { enqueue } from './index';
import { registry } from './registry';
import './start';

/** A failed job as its workspace's owners see it. */
export interface FailedJob {
  id: number;
  jobName: string;
  /** What the job was doing, e.g. "Screening of import #12". */
  label: string;
  reason: string;
  attempts: number;
  failedAt: string;
}

function payloadOf(f: JobFailureDto): unknown {
  try {
    return JSON.parse(f.payloadJson) as unknown;
  } catch {
    return {};
  }
}

function labelOf(f: JobFailureDto): string {
  const def = registry().get(f.jobName);
  try {
    return def?.describe?.(payloadOf(f) as never) ?? f.jobName;
  } catch {
    return f.jobName;
  }
}

/** The workspace's dead letters not yet retried, newest first (same table on SQLite and PostgreSQL). */
export async function listFailedJobs(scope: { workspaceId: number }): Promise<FailedJob[]> {
  const rows = await listJobFailures(scope, { limit: 50 });
  return rows.map((f) => ({
    id: f.id,
    jobName: f.jobName,
    label: labelOf(f),
    reason: f.reason,
    attempts: f.attempts,
    failedAt: f.failedAt,
  }));
}

/**
 * Queues a failed job again with its payload and a fresh set of attempts, once: a second retry of
 * the same failure (or one from another workspace) is a 404. The job's own `beforeRetry` runs first
 * (a failed import is opened again).
 */
export async function retryFailedJob(
  scope: { workspaceId: number },
  id: number,
  actor: { userId: number | null; label: string },
): Promise<FailedJob> {
  const f = await markJobFailureRetried(scope, id, actor.userId);
  if (!f) throw notFound('This failed job was not found, or it was already retried.');
  const def = registry().get(f.jobName);
  const payload = payloadOf(f);
  try {
    if (!def) throw new Error(`no job is defined with the name ${f.jobName}`);
    await def.beforeRetry?.(payload as never);
    await enqueue(f.jobName, payload, { singletonKey: def.singletonKeyOf?.(payload as never) });
  } catch (err) {
    await clearJobFailureRetry(f.id);
    throw err;
  }
  await createAuditEntry({
    workspaceId: scope.workspaceId,
    userId: actor.userId,
    actor: actor.label,
    action: 'job.retried',
    target: `job_failure:${f.id}`,
    detail: { job: f.jobName },
  });
  return {
    id: f.id,
    jobName: f.jobName,
    label: labelOf(f),
    reason: f.reason,
    attempts: f.attempts,
    failedAt: f.failedAt,
  };
}
