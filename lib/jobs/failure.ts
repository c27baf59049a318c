import 'server-only';
import { AppError } from '@/lib/errors';
import { log } from '@/lib/log';
import { recordJobFailure } from '@/db/jobs';
import type { JobDefinition } from './registry';

/**
 * The reason an owner reads for a failed job. Application errors carry a message written for users;
 * database and driver errors (they have a `code`) are named by their code only, so no SQL or server
 * text reaches a page; anything else keeps its first 300 characters.
 */
export function failureReason(err: unknown): string {
  if (err instanceof AppError) return err.message;
  if (err instanceof Error) {
    const code = (err as Error & { code?: unknown }).code;
    if (typeof code === 'string' && code.length > 0)
      return `The database refused the job's work (error code ${code}); the worker log has the details.`;
    return err.message.slice(0, 300) || 'The job failed without a message.';
  }
  return 'The job failed without a message.';
}

export function workspaceOfJob(def: JobDefinition, payload: unknown): number | null {
  try {
    return def.workspaceOf?.(payload) ?? null;
  } catch {
    return null;
  }
}

/** After the record of a dead letter: the job's own clean-up, which must not hide the failure. */
export async function afterDeadLetter(def: JobDefinition, payload: unknown, reason: string): Promise<void> {
  log.error({ event: 'jobs.dead_letter', job: def.name, reason }, 'job used up its attempts');
  try {
    await def.onDeadLetter?.(payload, reason);
  } catch (err) {
    log.error({ err, event: 'jobs.dead_letter_hook_failed', job: def.name }, 'dead-letter clean-up failed');
  }
}

/** The PostgreSQL runner's dead letter (the in-process runner moves its row in one transaction). */
export async function recordDeadLetter(
  def: JobDefinition,
  payload: unknown,
  err: unknown,
  attempts: number,
): Promise<void> {
  const reason = failureReason(err);
  await recordJobFailure({
    workspaceId: workspaceOfJob(def, payload),
    jobName: def.name,
    payloadJson: JSON.stringify(payload ?? {}),
    reason,
    attempts,
  });
  await afterDeadLetter(def, payload, reason);
}
