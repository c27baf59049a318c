import 'server-only';
import { randomUUID } from 'node:crypto';
import {
  finishReportSend,
  getReport,
  getReportPdf,
  getReportSendForJob,
  listStaleQueuedReportSends,
  markReportSendAttempt,
  noteReportSendRetry,
  queueReportSend,
  reopenReportSend,
  type ReportSendDto,
} from '@/db/reports';
import { AppError } from '@/lib/errors';
import { defineJob, enqueue } from '@/lib/jobs';
import { log } from '@/lib/log';
import { messageIdFor, sendMail } from '@/lib/mail/mailer';
import type { ReportSummary } from './model';

/**
 * Every report e-mail is a `report.send` job. The request records the send as queued with a per-send
 * key and queues the job; the job sends the e-mail through the mail module with that key as its
 * Message-ID and records the outcome. Retries with back-off (30 s, 1 min, 2 min, 4 min); a send that
 * still fails is recorded as failed and is a dead letter in the owners' Background jobs, whose retry
 * queues it again.
 *
 * Idempotency: a run first checks that the send is still queued (a replay after the sent record
 * sends nothing) and counts the attempt before the mail server is asked. A worker that dies between
 * the mail server's acceptance and the record leaves the send queued: its replay sends the e-mail
 * again, with the same Message-ID, so that one case remains at least once.
 *
 * A process that dies after recording the send and before queueing its job leaves a queued send with
 * no job: the recurring `reports.sweep` queues the job of every send still queued a minute after it was
 * recorded (the singleton key skips those whose job is waiting, backing off or running).
 */
export interface ReportSendJob {
  workspaceId: number;
  reportId: number;
  sendId: number;
  note?: string;
  senderName: string;
  sentBy: number | null;
  actor: string;
}

export const REPORT_SEND_JOB = 'report.send';

const REFUSED = 'The mail server did not accept the report e-mail.';

async function deliver(p: ReportSendJob): Promise<'done'> {
  const scope = { workspaceId: p.workspaceId };
  const send = await getReportSendForJob(scope, p.sendId);
  // Deleted with its report, or already sent or given up by an earlier run: nothing to do.
  if (!send || send.status !== 'queued') return 'done';
  let report;
  let file;
  try {
    [report, file] = await Promise.all([
      getReport<ReportSummary>(scope, send.reportId),
      getReportPdf(scope, send.reportId),
    ]);
  } catch (err) {
    if (err instanceof AppError && err.code === 'not_found') return 'done';
    throw err;
  }
  if (!(await markReportSendAttempt(scope, send.id))) return 'done';
  const { reportMail } = await import('./send');
  const mail = reportMail(send.recipients, report.summary, { senderName: p.senderName, note: p.note, pdf: file.pdf });
  let messageId: string;
  try {
    messageId = await sendMail({ ...mail, messageId: messageIdFor(send.sendKey ?? `report-send-${send.id}`) });
  } catch (err) {
    log.warn({ err, event: 'report.send_refused', reportId: send.reportId, sendId: send.id }, 'report e-mail refused');
    await noteReportSendRetry(scope, send.id, `${REFUSED} Trying again shortly.`);
    throw new AppError('unavailable', REFUSED);
  }
  await finishReportSend(scope, send.id, { status: 'sent', messageId }, { userId: p.sentBy, actor: p.actor });
  return 'done';
}

defineJob<ReportSendJob>(REPORT_SEND_JOB, deliver, {
  group: 'mail',
  maxAttempts: 5,
  retryDelaySeconds: 30,
  expireInSeconds: 120,
  workspaceOf: (p) => p.workspaceId,
  singletonKeyOf: (p) => `report-send:${p.sendId}`,
  describe: (p) => `E-mail of report #${p.reportId} (send #${p.sendId})`,
  onDeadLetter: async (p, reason) => {
    await finishReportSend(
      { workspaceId: p.workspaceId },
      p.sendId,
      { status: 'failed', error: `${reason} An owner can retry it under Background jobs.` },
      { userId: p.sentBy, actor: p.actor },
    );
  },
  beforeRetry: async (p) => {
    await reopenReportSend({ workspaceId: p.workspaceId }, p.sendId);
  },
});

/**
 * Records the send as queued and queues its job. When the queue refuses, the send is recorded as
 * failed and the caller gets 503 (nothing was sent).
 */
/** A request to e-mail a report: to whom, with what note, from whom. */
export interface ReportSendRequest {
  reportId: number;
  recipients: string[];
  note?: string;
  sentBy: number | null;
  senderName: string;
  actor: string;
}

export async function queueReportSendJob(
  scope: { workspaceId: number },
  input: ReportSendRequest,
): Promise<ReportSendDto> {
  const rest: SendJobRest = {
    ...(input.note ? { note: input.note } : {}),
    senderName: input.senderName,
    sentBy: input.sentBy,
    actor: input.actor,
  };
  const send = await queueReportSend(scope, {
    reportId: input.reportId,
    recipients: input.recipients,
    sentBy: input.sentBy,
    sendKey: `report-send-${randomUUID()}`,
    actor: input.actor,
    jobJson: JSON.stringify(rest),
  });
  const job: ReportSendJob = { workspaceId: scope.workspaceId, reportId: input.reportId, sendId: send.id, ...rest };
  try {
    await enqueue(REPORT_SEND_JOB, job, { singletonKey: `report-send:${send.id}` });
  } catch (err) {
    log.error({ err, event: 'report.send_enqueue_failed', sendId: send.id }, 'could not queue a report e-mail');
    await finishReportSend(
      scope,
      send.id,
      { status: 'failed', error: 'The e-mail could not be queued; nothing was sent.' },
      { userId: input.sentBy, actor: input.actor },
    );
    throw new AppError('unavailable', 'The report e-mail could not be queued; nothing was sent. Try again shortly.');
  }
  return send;
}

/** What a send keeps of its job beyond the send's own ids (report_sends.job_json). */
type SendJobRest = Pick<ReportSendJob, 'note' | 'senderName' | 'sentBy' | 'actor'>;

function restOf(json: string): SendJobRest | null {
  try {
    const v = JSON.parse(json) as Partial<SendJobRest>;
    if (typeof v.senderName !== 'string' || typeof v.actor !== 'string') return null;
    return {
      ...(typeof v.note === 'string' ? { note: v.note } : {}),
      senderName: v.senderName,
      sentBy: typeof v.sentBy === 'number' ? v.sentBy : null,
      actor: v.actor,
    };
  } catch {
    return null;
  }
}

export const REPORT_SEND_SWEEP_JOB = 'reports.sweep';

/** How long a send may stay queued before the sweep looks for its job: the request queues it within milliseconds. */
export const STALE_SEND_MS = 60_000;

/**
 * Queues the job of every send still queued STALE_SEND_MS after it was recorded, unless its job is
 * still open; returns how many it queued.
 */
export async function sweepQueuedReportSends(now: Date = new Date()): Promise<number> {
  let queued = 0;
  for (const s of await listStaleQueuedReportSends(new Date(now.getTime() - STALE_SEND_MS).toISOString())) {
    const rest = restOf(s.jobJson);
    if (!rest) continue;
    const job: ReportSendJob = { workspaceId: s.workspaceId, reportId: s.reportId, sendId: s.id, ...rest };
    if (await enqueue(REPORT_SEND_JOB, job, { singletonKey: `report-send:${s.id}` })) queued += 1;
  }
  if (queued > 0)
    log.info({ event: 'report.sends_requeued', count: queued }, 'queued report e-mails found without a job');
  return queued;
}

defineJob(REPORT_SEND_SWEEP_JOB, async () => void (await sweepQueuedReportSends()), {
  group: 'mail',
  maxAttempts: 1,
  expireInSeconds: 60,
  everyMs: () => STALE_SEND_MS,
});

/**
 * `report.redeliver`, the job an earlier release queued for a refused first attempt: kept so such
 * jobs (and their dead letters) still run. It records a new queued send and queues `report.send`.
 */
interface LegacyRedelivery extends ReportSendRequest {
  workspaceId: number;
}

export const LEGACY_REPORT_REDELIVERY_JOB = 'report.redeliver';

defineJob<LegacyRedelivery>(
  LEGACY_REPORT_REDELIVERY_JOB,
  async (p) => {
    try {
      await queueReportSendJob({ workspaceId: p.workspaceId }, p);
    } catch (err) {
      // The report was deleted since: nothing left to deliver.
      if (err instanceof AppError && err.code === 'not_found') return 'done';
      throw err;
    }
    return 'done';
  },
  {
    group: 'mail',
    maxAttempts: 5,
    retryDelaySeconds: 30,
    workspaceOf: (p) => p.workspaceId,
    describe: (p) =>
      `E-mail of report #${p.reportId} to ${p.recipients.length} recipient${p.recipients.length === 1 ? '' : 's'}`,
  },
);
