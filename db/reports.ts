import 'server-only';
import type { Knex } from 'knex';
import { db, insertId, nowIso, writeTx } from './client';
import { createAuditEntry } from './audit';
import { notFound } from '@/lib/errors';

/**
 * What db/ needs of a stored report summary (`reports.summary_json`): its period and fleets. The
 * full shape is `ReportSummary` in lib/reports/model.ts; callers that read more name it as `S`.
 */
export interface StoredReportSummary {
  period: { from: string; to: string };
  fleets: { id: number; name: string }[];
}

export interface ReportListItem {
  id: number;
  name: string;
  periodFrom: string;
  periodTo: string;
  fleetIds: number[];
  fleetNames: string[];
  createdAt: string;
  createdBy: string | null;
  pdfBytes: number;
  sends: number;
  lastSentAt: string | null;
}

export interface ReportRecord<S extends StoredReportSummary = StoredReportSummary> extends ReportListItem {
  summary: S;
}

/**
 * One report e-mail: queued in the request, then sent (or failed) by the `report.send` job.
 * `queuedAt` is when it was asked for; `sentAt` when the mail server accepted it (null until then);
 * `failedAt` when it was given up (null unless failed); `attempts` counts the mail server attempts.
 */
export interface ReportSendDto {
  id: number;
  recipients: string[];
  sentBy: string | null;
  status: 'queued' | 'sent' | 'failed';
  messageId: string | null;
  error: string | null;
  attempts: number;
  queuedAt: string;
  sentAt: string | null;
  failedAt: string | null;
}

/** What the `report.send` job reads of a send. */
export interface ReportSendJobRow {
  id: number;
  reportId: number;
  recipients: string[];
  status: 'queued' | 'sent' | 'failed';
  sendKey: string | null;
  attempts: number;
}

type Row = Record<string, unknown>;

function parseSummary<S extends StoredReportSummary>(r: Row): S {
  return JSON.parse(String(r.summary_json)) as S;
}

function itemOf(r: Row): ReportListItem {
  const summary = parseSummary<StoredReportSummary>(r);
  return {
    id: Number(r.id),
    name: String(r.name),
    periodFrom: String(r.period_from),
    periodTo: String(r.period_to),
    fleetIds: JSON.parse(String(r.fleet_ids_json)) as number[],
    fleetNames: summary.fleets.map((f) => f.name),
    createdAt: String(r.created_at),
    createdBy: (r.created_by_name as string | null) || (r.created_by_email as string | null) || null,
    pdfBytes: Number(r.pdf_bytes ?? 0),
    sends: Number(r.sends ?? 0),
    lastSentAt: (r.last_sent_at as string | null) ?? null,
  };
}

function reportQuery(workspaceId: number) {
  const k = db();
  return k('reports as r')
    .leftJoin('users as u', 'u.id', 'r.created_by')
    .where('r.workspace_id', workspaceId)
    .select(
      'r.id',
      'r.name',
      'r.period_from',
      'r.period_to',
      'r.fleet_ids_json',
      'r.summary_json',
      'r.created_at',
      'u.name as created_by_name',
      'u.email as created_by_email',
      k.raw('length(r.pdf) as pdf_bytes'),
      k.raw("(select count(*) from report_sends s where s.report_id = r.id and s.status = 'sent') as sends"),
      k.raw(
        "(select max(s.sent_at) from report_sends s where s.report_id = r.id and s.status = 'sent') as last_sent_at",
      ),
    );
}

export async function createReport<S extends StoredReportSummary>(
  scope: { workspaceId: number },
  input: {
    name: string;
    summary: S;
    fleetIds: number[];
    pdf: Uint8Array;
    csv: string;
    createdBy: number | null;
    actor: string;
  },
): Promise<ReportRecord<S>> {
  const id = await writeTx(async (trx) => {
    const newId = await insertId(
      trx('reports')
        .insert({
          workspace_id: scope.workspaceId,
          name: input.name.slice(0, 160),
          period_from: input.summary.period.from,
          period_to: input.summary.period.to,
          fleet_ids_json: JSON.stringify(input.fleetIds),
          summary_json: JSON.stringify(input.summary),
          pdf: Buffer.from(input.pdf),
          csv: input.csv,
          created_by: input.createdBy,
          created_at: nowIso(),
        })
        .returning('id'),
    );
    await createAuditEntry(
      {
        workspaceId: scope.workspaceId,
        userId: input.createdBy,
        actor: input.actor,
        action: 'report.create',
        target: `report:${newId}`,
        detail: { name: input.name, from: input.summary.period.from, to: input.summary.period.to },
      },
      trx,
    );
    return newId;
  });
  return getReport<S>(scope, id);
}

/** Newest first, keyset-paged by id. */
export async function listReports(
  scope: { workspaceId: number },
  opts: { cursor?: number; limit?: number } = {},
): Promise<{ items: ReportListItem[]; nextCursor: string | null }> {
  const limit = Math.min(Math.max(opts.limit ?? 50, 1), 200);
  const q = reportQuery(scope.workspaceId)
    .orderBy('r.id', 'desc')
    .limit(limit + 1);
  if (opts.cursor) q.andWhere('r.id', '<', opts.cursor);
  const rows = (await q) as Row[];
  const items = rows.slice(0, limit).map(itemOf);
  return { items, nextCursor: rows.length > limit ? String(items[items.length - 1].id) : null };
}

export async function getReport<S extends StoredReportSummary = StoredReportSummary>(
  scope: { workspaceId: number },
  id: number,
): Promise<ReportRecord<S>> {
  const row = (await reportQuery(scope.workspaceId).andWhere('r.id', id).first()) as Row | undefined;
  if (!row) throw notFound('No report with that id in this workspace.');
  return { ...itemOf(row), summary: parseSummary<S>(row) };
}

export async function getReportPdf(scope: { workspaceId: number }, id: number): Promise<{ name: string; pdf: Buffer }> {
  const row = (await db()('reports').where({ workspace_id: scope.workspaceId, id }).select('name', 'pdf').first()) as
    Row | undefined;
  if (!row) throw notFound('No report with that id in this workspace.');
  const pdf = row.pdf;
  return { name: String(row.name), pdf: Buffer.isBuffer(pdf) ? pdf : Buffer.from(pdf as Uint8Array) };
}

export async function getReportCsv(scope: { workspaceId: number }, id: number): Promise<{ name: string; csv: string }> {
  const row = (await db()('reports').where({ workspace_id: scope.workspaceId, id }).select('name', 'csv').first()) as
    Row | undefined;
  if (!row) throw notFound('No report with that id in this workspace.');
  return { name: String(row.name), csv: String(row.csv) };
}

/** The sends of reports in this workspace (a send of another workspace's report is not found). */
function sendsOf(k: Knex | Knex.Transaction, workspaceId: number) {
  return k('report_sends').whereIn('report_id', k('reports').where({ workspace_id: workspaceId }).select('id'));
}

/**
 * Records a report e-mail as queued, with its per-send key (the job's Message-ID), in one transaction
 * with its audit entry; the `report.send` job then sends it.
 */
export async function queueReportSend(
  scope: { workspaceId: number },
  input: {
    reportId: number;
    recipients: string[];
    sentBy: number | null;
    sendKey: string;
    actor: string;
    /** What the job needs beyond the send (sender name, note): kept so the sweep can queue it again. */
    jobJson: string;
  },
): Promise<ReportSendDto> {
  const id = await writeTx(async (trx) => {
    const report = await trx('reports').where({ workspace_id: scope.workspaceId, id: input.reportId }).first('id');
    if (!report) throw notFound('No report with that id in this workspace.');
    const now = nowIso();
    const newId = await insertId(
      trx('report_sends')
        .insert({
          report_id: input.reportId,
          recipients: JSON.stringify(input.recipients),
          sent_by: input.sentBy,
          status: 'queued',
          message_id: null,
          error: null,
          send_key: input.sendKey,
          job_json: input.jobJson,
          attempts: 0,
          queued_at: now,
          sent_at: now,
        })
        .returning('id'),
    );
    await createAuditEntry(
      {
        workspaceId: scope.workspaceId,
        userId: input.sentBy,
        actor: input.actor,
        action: 'report.send_queued',
        target: `report:${input.reportId}`,
        detail: { recipients: input.recipients.length, send: newId },
      },
      trx,
    );
    return newId;
  });
  const found = (await listReportSends(scope, input.reportId)).find((s) => s.id === id);
  if (!found) throw notFound();
  return found;
}

export async function getReportSendForJob(
  scope: { workspaceId: number },
  sendId: number,
): Promise<ReportSendJobRow | null> {
  const r = (await sendsOf(db(), scope.workspaceId).where({ id: sendId }).first()) as Row | undefined;
  if (!r) return null;
  const status = String(r.status);
  return {
    id: Number(r.id),
    reportId: Number(r.report_id),
    recipients: JSON.parse(String(r.recipients)) as string[],
    status: status === 'sent' || status === 'failed' ? status : 'queued',
    sendKey: (r.send_key as string | null) ?? null,
    attempts: Number(r.attempts ?? 0),
  };
}

/** A send still queued since before `queuedBefore`, with what its job needs (the sweep's input). */
export interface StaleReportSend {
  id: number;
  workspaceId: number;
  reportId: number;
  jobJson: string;
}

/**
 * Sends still queued that were recorded before `queuedBefore` and keep their job's input, oldest
 * first, at most `limit`: the ones whose job may never have been queued (lib/reports/jobs.ts sweep).
 */
export async function listStaleQueuedReportSends(queuedBefore: string, limit = 200): Promise<StaleReportSend[]> {
  const rows = (await db()('report_sends as s')
    .join('reports as r', 'r.id', 's.report_id')
    .where('s.status', 'queued')
    .whereNotNull('s.job_json')
    .where('s.queued_at', '<', queuedBefore)
    .orderBy('s.id')
    .limit(limit)
    .select('s.id', 'r.workspace_id', 's.report_id', 's.job_json')) as Row[];
  return rows.map((r) => ({
    id: Number(r.id),
    workspaceId: Number(r.workspace_id),
    reportId: Number(r.report_id),
    jobJson: String(r.job_json),
  }));
}

/**
 * Counts a mail server attempt before it is made; false when the send is no longer queued (sent or
 * given up by an earlier run, or deleted with its report): then nothing may be sent.
 */
export async function markReportSendAttempt(scope: { workspaceId: number }, sendId: number): Promise<boolean> {
  const n = await sendsOf(db(), scope.workspaceId)
    .where({ id: sendId, status: 'queued' })
    .update({ attempts: db().raw('attempts + 1') });
  return Number(n) > 0;
}

/** Notes why the latest attempt failed while the send stays queued for its next attempt. */
export async function noteReportSendRetry(
  scope: { workspaceId: number },
  sendId: number,
  error: string,
): Promise<void> {
  await sendsOf(db(), scope.workspaceId)
    .where({ id: sendId, status: 'queued' })
    .update({ error: error.slice(0, 500) });
}

/**
 * Records a queued send's outcome (sent with its Message-ID, or failed with a reason) with its audit
 * entry, once: a send no longer queued is left as it is (false).
 */
export async function finishReportSend(
  scope: { workspaceId: number },
  sendId: number,
  outcome: { status: 'sent'; messageId: string } | { status: 'failed'; error: string },
  audit: { userId: number | null; actor: string },
): Promise<boolean> {
  return writeTx(async (trx) => {
    const row = (await sendsOf(trx, scope.workspaceId)
      .where({ id: sendId, status: 'queued' })
      .first('id', 'report_id', 'recipients')) as Row | undefined;
    if (!row) return false;
    await trx('report_sends')
      .where({ id: sendId })
      .update({
        status: outcome.status,
        message_id: outcome.status === 'sent' ? outcome.messageId : null,
        error: outcome.status === 'failed' ? outcome.error.slice(0, 500) : null,
        sent_at: nowIso(),
      });
    await createAuditEntry(
      {
        workspaceId: scope.workspaceId,
        userId: audit.userId,
        actor: audit.actor,
        action: outcome.status === 'sent' ? 'report.send' : 'report.send_failed',
        target: `report:${String(row.report_id)}`,
        detail: { recipients: (JSON.parse(String(row.recipients)) as string[]).length, send: sendId },
      },
      trx,
    );
    return true;
  });
}

/** Queues a failed send again (an owner's retry of its dead letter); false when it is not failed. */
export async function reopenReportSend(scope: { workspaceId: number }, sendId: number): Promise<boolean> {
  const n = await sendsOf(db(), scope.workspaceId)
    .where({ id: sendId, status: 'failed' })
    .update({ status: 'queued', error: null });
  return Number(n) > 0;
}

/** Deletes a stored report with its files and e-mail history; the audit log keeps that it existed. */
export async function deleteReport(
  scope: { workspaceId: number },
  id: number,
  by: { userId: number | null; actor: string },
): Promise<void> {
  await writeTx(async (trx) => {
    const report = await trx('reports')
      .where({ workspace_id: scope.workspaceId, id })
      .first('id', 'name', 'period_from', 'period_to');
    if (!report) throw notFound('No report with that id in this workspace.');
    const sends = await trx('report_sends').where({ report_id: id }).delete();
    await trx('reports').where({ workspace_id: scope.workspaceId, id }).delete();
    await createAuditEntry(
      {
        workspaceId: scope.workspaceId,
        userId: by.userId,
        actor: by.actor,
        action: 'report.delete',
        target: `report:${id}`,
        detail: { name: report.name, period: `${report.period_from} to ${report.period_to}`, sends },
      },
      trx,
    );
  });
}

export async function listReportSends(scope: { workspaceId: number }, reportId: number): Promise<ReportSendDto[]> {
  const rows = (await db()('report_sends as s')
    .join('reports as r', 'r.id', 's.report_id')
    .leftJoin('users as u', 'u.id', 's.sent_by')
    .where({ 'r.workspace_id': scope.workspaceId, 's.report_id': reportId })
    .orderBy('s.id', 'desc')
    .select('s.*', 'u.name as sent_by_name', 'u.email as sent_by_email')) as Row[];
  return rows.map((r) => {
    const status = r.status === 'sent' || r.status === 'queued' ? r.status : 'failed';
    const at = String(r.sent_at);
    return {
      id: Number(r.id),
      recipients: JSON.parse(String(r.recipients)) as string[],
      sentBy: (r.sent_by_name as string | null) || (r.sent_by_email as string | null) || null,
      status,
      messageId: (r.message_id as string | null) ?? null,
      error: (r.error as string | null) ?? null,
      attempts: Number(r.attempts ?? 0),
      // Sends recorded before they were jobs have no queued_at: they were asked for when attempted.
      queuedAt: (r.queued_at as string | null) ?? at,
      sentAt: status === 'sent' ? at : null,
      failedAt: status === 'failed' ? at : null,
    };
  });
}
