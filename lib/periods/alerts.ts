import 'server-only';
import { db } from '@/db/client';
import { claimTargetAlert, listAnalystEmails, listOpenPeriodTargets } from '@/db/periods';
import { appUrl } from '@/lib/env';
import { log } from '@/lib/log';
import { sendMail, type OutgoingMail } from '@/lib/mail/mailer';
import { TARGET_METRIC_LABELS, type TargetMetric } from '@/lib/validation/periods';
import { metricValue, periodFigures, type PeriodInfo } from './service';

const esc = (s: string) => s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

export const TARGET_THRESHOLDS = [90, 100] as const;
export type TargetThreshold = (typeof TARGET_THRESHOLDS)[number];

/** To the analysts when a period's running figure reaches 90 % or 100 % of one of its targets. */
export function targetAlertMail(
  to: string,
  input: {
    workspaceName: string;
    periodName: string;
    fleetName: string;
    metric: TargetMetric;
    threshold: TargetThreshold;
    target: number;
    actual: number;
    periodUrl: string;
  },
): OutgoingMail {
  const { label, unit } = TARGET_METRIC_LABELS[input.metric];
  const fmt = (v: number) => v.toLocaleString('en-GB', { maximumFractionDigits: unit === 't' ? 2 : 3 });
  const reached = input.threshold === 100 ? 'has reached' : 'has reached 90 % of';
  const lines = [
    `${label} of ${input.fleetName} in ${input.periodName} ${reached} its target in the Tropopass workspace “${input.workspaceName}”: ${fmt(input.actual)} ${unit} so far against a target of ${fmt(input.target)} ${unit} (${Math.round((100 * input.actual) / input.target)} %).`,
    'This is the running figure of an open period, from the flights screened so far: it moves as more flights are imported. Screening estimates, not a certified inventory.',
    'You get this message as an analyst of the workspace. Each threshold of a target is sent once; changing the target starts again.',
  ];
  const text = [...lines, '', `The period: ${input.periodUrl}`, '', '— Tropopass'].join('\n');
  const html = `<div style="font-family:sans-serif;max-width:560px">${lines.map((l) => `<p>${esc(l)}</p>`).join('')}<p><a href="${esc(input.periodUrl)}">Open the period</a></p><p style="color:#667">— Tropopass</p></div>`;
  return {
    to,
    subject: `${input.workspaceName}: ${input.periodName} at ${input.threshold} % of a target (${label}, ${input.fleetName})`,
    text,
    html,
  };
}

/**
 * Sends the 90 % and 100 % alerts that the running figures of the workspace's open periods have
 * reached and that were not sent yet (each threshold of each target once). Never throws.
 */
export async function checkTargetAlerts(scope: {
  workspaceId: number;
}): Promise<{ targetId: number; threshold: TargetThreshold }[]> {
  const sent: { targetId: number; threshold: TargetThreshold }[] = [];
  try {
    const targets = await listOpenPeriodTargets(scope);
    if (!targets.length) return sent;
    const ws = await db()('workspaces').where({ id: scope.workspaceId }).first('slug', 'name');
    if (!ws) return sent;
    const figuresByPeriod = new Map<number, Awaited<ReturnType<typeof periodFigures>>>();
    let recipients: string[] | null = null;
    for (const t of targets) {
      const info: PeriodInfo = {
        ref: t.period.key,
        kind: t.period.kind,
        name: t.period.name,
        from: t.period.from,
        to: t.period.to,
        state: t.period.state,
        frozenAt: null,
        frozenBy: null,
        signedAt: null,
        signedBy: null,
        signHash: null,
      };
      let figures = figuresByPeriod.get(t.periodId);
      if (!figures) {
        figures = await periodFigures(scope, info, t.period);
        figuresByPeriod.set(t.periodId, figures);
      }
      const fleet = t.fleetId === null ? null : figures.fleets.find((f) => f.fleetId === t.fleetId);
      const f = t.fleetId === null ? figures.total : fleet;
      if (!f) continue;
      const actual = metricValue(f, t.metric as TargetMetric);
      if (actual === null) continue;
      for (const threshold of TARGET_THRESHOLDS) {
        if (actual < (t.value * threshold) / 100) continue;
        if (!(await claimTargetAlert(t.id, threshold))) continue;
        recipients ??= await listAnalystEmails(scope);
        const periodUrl = new URL(`/w/${ws.slug}/periods/${t.period.key}`, appUrl()).toString();
        for (const to of recipients) {
          await sendMail(
            targetAlertMail(to, {
              workspaceName: String(ws.name),
              periodName: t.period.name,
              fleetName: t.fleetId === null ? 'all fleets' : (fleet?.fleetName ?? `fleet ${t.fleetId}`),
              metric: t.metric as TargetMetric,
              threshold,
              target: t.value,
              actual,
              periodUrl,
            }),
          );
        }
        sent.push({ targetId: t.id, threshold });
      }
    }
  } catch (err) {
    log.error(
      { event: 'periods.target_alert_failed', workspaceId: scope.workspaceId, err },
      'could not check or send the target alerts',
    );
  }
  return sent;
}
