import 'server-only';
import type { Knex } from 'knex';
import { db, nowIso } from './client';

export interface AuditEntry {
  workspaceId?: number | null;
  userId?: number | null;
  actor?: string | null;
  action: string;
  target?: string | null;
  detail?: Record<string, unknown>;
  ip?: string | null;
}

/** Appends one audit row; pass the transaction when the audited change is in one. */
export async function createAuditEntry(entry: AuditEntry, trx: Knex | Knex.Transaction = db()): Promise<void> {
  await trx('audit_log').insert({
    workspace_id: entry.workspaceId ?? null,
    user_id: entry.userId ?? null,
    actor: entry.actor ?? null,
    action: entry.action,
    target: entry.target ?? null,
    detail: entry.detail ? JSON.stringify(entry.detail) : null,
    ip: entry.ip ?? null,
    created_at: nowIso(),
  });
}

/**
 * Appends the audit row of a change `by` made in a workspace, inside the change's transaction:
 * `await auditChange(trx, scope, by, { action: 'engine.create', target: 'engine:7', detail })`.
 */
export async function auditChange(
  trx: Knex | Knex.Transaction,
  scope: { workspaceId: number },
  by: { userId: number | null; actor: string },
  change: { action: string; target: string | null; detail?: Record<string, unknown> },
): Promise<void> {
  await createAuditEntry({ workspaceId: scope.workspaceId, userId: by.userId, actor: by.actor, ...change }, trx);
}

export interface AuditRow {
  id: number;
  action: string;
  actor: string | null;
  target: string | null;
  detail: Record<string, unknown> | null;
  ip: string | null;
  createdAt: string;
}

export async function listAuditEntries(
  scope: { workspaceId: number },
  opts: { limit?: number; beforeId?: number } = {},
): Promise<AuditRow[]> {
  const q = db()('audit_log')
    .where({ workspace_id: scope.workspaceId })
    .orderBy('id', 'desc')
    .limit(Math.min(opts.limit ?? 100, 500));
  if (opts.beforeId) q.andWhere('id', '<', opts.beforeId);
  const rows = await q;
  return rows.map((r) => ({
    id: Number(r.id),
    action: r.action,
    actor: r.actor,
    target: r.target,
    detail: r.detail ? (JSON.parse(r.detail) as Record<string, unknown>) : null,
    ip: r.ip,
    createdAt: r.created_at,
  }));
}
