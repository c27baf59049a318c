import 'server-only';
import { getReport, getReportPdf, recordReportSend } from '@/db/reports';
import { AppError } from '@/lib/errors';
import { defineJob, enqueue } from '@/lib/jobs';
import { log } from '@/lib/log';
import { sendMail } from '@/lib/mail/mailer';
import type { ReportSummary } from './model';

/**
 * A report e-mail the mail server refused while the sender waited (send.ts answers 503 and records
 * the failed attempt) is delivered again as a job: retried with back-off (30 s, 1 min, 2 min, 4 min),
 * each success recorded as a sent attempt; a delivery that still fails is a dead letter in the
 * owners' Background jobs. Delivery is at least once: a worker that dies between the mail server's
 * acceptance and the record may send it again.
 */
export interface ReportRedelivery {
  workspaceId: number;
  reportId: number;
  recipients: string[];
  note?: string;
  sentBy: number | null;
  senderName: string;
  actor: string;
}

export const REPORT_REDELIVERY_JOB = 'report.redeliver';

defineJob<ReportRedelivery>(
  REPORT_REDELIVERY_JOB,
  async (p) => {
    const scope = { workspaceId: p.workspaceId };
    let report;
    let file;
    try {
      [report, file] = await Promise.all([
        getReport<ReportSummary>(scope, p.reportId),
        getReportPdf(scope, p.reportId),
      ]);
    } catch (err) {
      // The report was deleted since: nothing left to deliver.
      if (err instanceof AppError && err.code === 'not_found') return 'done';
      throw err;
    }
    const { reportMail } = await import('./send');
    let messageId: string;
    try {
      messageId = await sendMail(
        reportMail(p.recipients, report.summary, { senderName: p.senderName, note: p.note, pdf: file.pdf }),
      );
    } catch (err) {
      log.warn({ err, event: 'report.redelivery_failed', reportId: p.reportId }, 'report e-mail refused again');
      throw new AppError('unavailable', 'The mail server did not accept the report e-mail.');
    }
    await recordReportSend(scope, {
      reportId: p.reportId,
      recipients: p.recipients,
      sentBy: p.sentBy,
      status: 'sent',
      messageId,
      error: null,
      actor: p.actor,
    });
    return 'done';
  },
  {
    group: 'mail',
    maxAttempts: 5,
    retryDelaySeconds: 30,
    expireInSeconds: 120,
    workspaceOf: (p) => p.workspaceId,
    describe: (p) =>
      `E-mail of report #${p.reportId} to ${p.recipients.length} recipient${p.recipients.length === 1 ? '' : 's'}`,
  },
);

/** Queues the redelivery; a failure to queue is logged (the failed attempt is recorded either way). */
export async function queueReportRedelivery(p: ReportRedelivery): Promise<void> {
  try {
    await enqueue(REPORT_REDELIVERY_JOB, p);
  } catch (err) {
    log.warn(
      { err, event: 'report.redelivery_enqueue_failed', reportId: p.reportId },
      'could not queue the redelivery',
    );
  }
}
