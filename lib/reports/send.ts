import 'server-only';
import { getReport, getReportPdf, recordReportSend, type ReportSendDto } from '@/db/reports';
import { sendMail, type OutgoingMail } from '@/lib/mail/mailer';
import { formatMass, formatMassRange, formatNumber, formatPercent } from '@/lib/format';
import { AppError } from '@/lib/errors';
import { log } from '@/lib/log';
import { limitReportSend } from '@/lib/auth/throttle';
import type { ReportSummary } from './model';
import { fileStem } from './text';
import { COUNT_LABELS } from '@/lib/counts';
import { queueReportRedelivery } from './jobs';

const esc = (s: string) => s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

/** The e-mail that carries a report: key totals in the builder's units, the caution, the PDF. */
export function reportMail(
  to: string[],
  s: ReportSummary,
  input: { senderName: string; note?: string; pdf: Buffer },
): OutgoingMail {
  const t = s.totals;
  const u = s.units;
  const lines = [
    `${input.senderName} sent you the fleet report “${s.title}” for ${s.workspaceName}, ${s.period.from} to ${s.period.to}.`,
    ...(input.note ? [`Note: ${input.note}`] : []),
    `Fleets: ${s.fleets.map((f) => f.name).join(', ')}.`,
    `${COUNT_LABELS.importedFlightsScreened}: ${formatNumber(t.flights)}. NOx: ${formatMass(t.noxTotalKg, u)}, of which above the tropopause ${formatMass(t.noxAboveKg, u)} (${t.shareAbove === null ? '-' : formatPercent(t.shareAbove, 1)}). Ozone-loss screening figure: ${formatMass(t.ozone.centralKg, u)} (${formatMassRange(t.ozone.lowKg, t.ozone.highKg, u, ' to ')}).`,
    'Screening estimate for planning and reporting support, not a certified emissions inventory or a regulatory method; the ozone figure is a gross catalytic loss, not a net column change. Follow the operator’s approved methods and applicable regulation.',
    'The full report, with its method, assumptions and data sources, is attached as a PDF.',
  ];
  return {
    to,
    subject: `Fleet report: ${s.title}`,
    text: [...lines, '', '— Tropopass'].join('\n'),
    html: `<div style="font-family:sans-serif;max-width:600px">${lines.map((l) => `<p>${esc(l)}</p>`).join('')}<p style="color:#667">— Tropopass</p></div>`,
    attachments: [{ filename: `${fileStem(s.title)}.pdf`, content: input.pdf, contentType: 'application/pdf' }],
  };
}

/**
 * E-mails a stored report with its PDF to the recipients and records the attempt (sent or failed).
 * A mail-server failure is recorded and comes back as 503 with a plain message. Sends are limited
 * per workspace (`RATE_LIMIT_REPORT_SENDS_PER_HOUR`): beyond it, 429 and nothing is sent.
 */
export async function sendReport(
  scope: { workspaceId: number },
  input: {
    reportId: number;
    recipients: string[];
    note?: string;
    sentBy: number | null;
    senderName: string;
    actor: string;
  },
): Promise<ReportSendDto> {
  const [report, file] = await Promise.all([
    getReport<ReportSummary>(scope, input.reportId),
    getReportPdf(scope, input.reportId),
  ]);
  await limitReportSend(scope.workspaceId);
  const mail = reportMail(input.recipients, report.summary, {
    senderName: input.senderName,
    note: input.note,
    pdf: file.pdf,
  });
  let messageId: string | null = null;
  let failure: string | null = null;
  try {
    messageId = await sendMail(mail);
  } catch (err) {
    failure = err instanceof Error ? err.message : String(err);
    log.warn({ event: 'report.send_failed', reportId: input.reportId, err: failure }, 'report e-mail failed');
  }
  const send = await recordReportSend(scope, {
    reportId: input.reportId,
    recipients: input.recipients,
    sentBy: input.sentBy,
    status: failure ? 'failed' : 'sent',
    messageId,
    error: failure ? 'The mail server did not accept the message.' : null,
    actor: input.actor,
  });
  if (failure) {
    await queueReportRedelivery({
      workspaceId: scope.workspaceId,
      reportId: input.reportId,
      recipients: input.recipients,
      note: input.note,
      sentBy: input.sentBy,
      senderName: input.senderName,
      actor: input.actor,
    });
    throw new AppError(
      'unavailable',
      'The mail server did not accept the report. The attempt is recorded and the e-mail is retried in the background for a few minutes; an owner sees it under Background jobs if it still fails.',
      { extra: { sendId: send.id } },
    );
  }
  return send;
}
