import 'server-only';
import { getReport } from '@/db/reports';
import type { OutgoingMail } from '@/lib/mail/mailer';
import { formatMass, formatMassRange, formatNumber, formatPercent } from '@/lib/format';
import { limitReportSend } from '@/lib/auth/throttle';
import type { ReportSummary } from './model';
import { fileStem } from './text';
import { COUNT_LABELS } from '@/lib/counts';
import { queueReportSendJob, type ReportSendRequest } from './jobs';

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

/** What the send request answers (202): the send is queued; its history entry shows the outcome. */
export interface QueuedReportSend {
  id: number;
  recipients: string[];
  status: 'queued';
}

/**
 * Queues a report e-mail: the report must exist (404), sends are limited per workspace
 * (`RATE_LIMIT_REPORT_SENDS_PER_HOUR`: beyond it, 429 and nothing is queued), then the send is
 * recorded as queued with a per-send key and the `report.send` job (lib/reports/jobs.ts) sends it,
 * with retries. When the job cannot be queued the send is recorded as failed and the caller gets 503.
 */
export async function sendReport(scope: { workspaceId: number }, input: ReportSendRequest): Promise<QueuedReportSend> {
  await getReport(scope, input.reportId);
  await limitReportSend(scope.workspaceId);
  const send = await queueReportSendJob(scope, input);
  return { id: send.id, recipients: send.recipients, status: 'queued' };
}
