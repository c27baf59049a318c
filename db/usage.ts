import 'server-only';
import type { Knex } from 'knex';
import { db, nowIso } from './client';

export type UsageKind = 'screening' | 'imported_flight';

/**
 * One billable unit in the usage ledger. Call inside the transaction that does the work, so the
 * unit exists exactly when the work does. The (kind, source) pair is unique: a retry of the same
 * work can never add a second unit.
 */
export async function recordUsage(
  trx: Knex.Transaction,
  input: { workspaceId: number; kind: UsageKind; sourceId: number; occurredAt?: string },
): Promise<void> {
  await trx('usage_events')
    .insert({
      workspace_id: input.workspaceId,
      kind: input.kind,
      source_id: input.sourceId,
      idempotency_key: `tp-${input.kind}-${input.sourceId}`,
      quantity: 1,
      occurred_at: input.occurredAt ?? nowIso(),
    })
    .onConflict(['kind', 'source_id'])
    .ignore();
}

/** Units in the ledger for a workspace between two ISO instants (inclusive start, exclusive end). */
export async function countUsage(scope: { workspaceId: number }, range: { from: string; to: string }): Promise<number> {
  const r = await db()('usage_events')
    .where({ workspace_id: scope.workspaceId })
    .where('occurred_at', '>=', range.from)
    .where('occurred_at', '<', range.to)
    .sum({ n: 'quantity' });
  return Number((r[0] as { n: number | null }).n ?? 0);
}
