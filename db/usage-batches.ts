import 'server-only';
import { randomUUID } from 'node:crypto';
import type { Knex } from 'knex';
import { db, insertId, nowIso, writeTx } from './client';

/**
 * The usage ledger's batches: the unit of delivery to the payment service. A batch holds ledger rows
 * of one workspace (one customer) recorded in one UTC minute, so every minute-aligned window the
 * service summarises holds whole batches and its total equals the ledger's over the same window; a
 * billing period ending inside a minute splits it, so each unit is invoiced in its own period.
 */

type Row = Record<string, unknown>;

export interface UsageBatchDto {
  id: number;
  workspaceId: number;
  customerId: string;
  identifier: string;
  quantity: number;
  occurredAt: string;
  sendAttempts: number;
}

function toDto(r: Row): UsageBatchDto {
  return {
    id: Number(r.id),
    workspaceId: Number(r.workspace_id),
    customerId: String(r.customer_id),
    identifier: String(r.identifier),
    quantity: Number(r.quantity),
    occurredAt: String(r.occurred_at),
    sendAttempts: Number(r.send_attempts),
  };
}

/** `YYYY-MM-DDTHH:MM` of an ISO instant, and the same for the minute after. */
const MINUTE_CHARS = 16;
function nextMinute(minute: string): string {
  return new Date(Date.parse(`${minute}:00.000Z`) + 60_000).toISOString().slice(0, MINUTE_CHARS);
}

/** Ledger rows not yet in a batch and billable now: the workspace is subscribed and metered since their time. */
function unbatched(q: Knex.QueryBuilder): Knex.QueryBuilder {
  return q
    .join('workspace_billing as b', 'b.workspace_id', 'u.workspace_id')
    .whereNull('u.sent_at')
    .whereNull('u.batch_id')
    .whereNotNull('b.customer_id')
    .whereNotNull('b.subscription_id')
    .whereNotNull('b.metered_since')
    .whereRaw('u.occurred_at >= b.metered_since');
}

export interface FormReport {
  batches: number;
  units: number;
}

/**
 * Puts due ledger rows into new batches: per workspace and UTC minute, at most `maxBatchUnits` rows
 * each, at most `maxBatches` new batches a call. Each batch is created and filled in one write
 * transaction that only takes rows still without a batch, so two senders racing cannot put a row in
 * two batches, and a crash leaves either the whole batch or none of it.
 */
export async function formUsageBatches(opts: {
  maxBatchUnits: number;
  maxBatches: number;
  workspaceId?: number;
}): Promise<FormReport> {
  const groupsQuery = unbatched(db()('usage_events as u'))
    .groupBy('u.workspace_id', 'b.customer_id')
    .groupByRaw(`substr(u.occurred_at, 1, ${MINUTE_CHARS})`)
    .select('u.workspace_id', 'b.customer_id')
    .select(db().raw(`substr(u.occurred_at, 1, ${MINUTE_CHARS}) as minute`))
    .select(db().raw('count(*) as n'))
    .select(db().raw('min(u.id) as first_id'))
    .orderBy('first_id')
    .limit(opts.maxBatches);
  if (opts.workspaceId !== undefined) groupsQuery.where('u.workspace_id', opts.workspaceId);
  const groups = (await groupsQuery) as Row[];

  const report: FormReport = { batches: 0, units: 0 };
  for (const g of groups) {
    let remaining = Number(g.n);
    const workspaceId = Number(g.workspace_id);
    const customerId = String(g.customer_id);
    const minute = String(g.minute);
    while (remaining > 0 && report.batches < opts.maxBatches) {
      const made = await fillBatch({ workspaceId, customerId, minute, maxUnits: opts.maxBatchUnits });
      if (made.rows === 0) break;
      report.batches += 1;
      report.units += made.units;
      remaining -= made.rows;
    }
  }
  return report;
}

async function fillBatch(g: {
  workspaceId: number;
  customerId: string;
  minute: string;
  maxUnits: number;
}): Promise<{ rows: number; units: number }> {
  return writeTx(async (trx) => {
    const billing = (await trx('workspace_billing')
      .where({ workspace_id: g.workspaceId })
      .first('customer_id', 'subscription_id', 'metered_since', 'current_period_end')) as Row | undefined;
    if (!billing || billing.customer_id !== g.customerId || !billing.subscription_id || !billing.metered_since)
      return { rows: 0, units: 0 };
    const minuteRows = () =>
      trx('usage_events')
        .where({ workspace_id: g.workspaceId })
        .whereNull('sent_at')
        .whereNull('batch_id')
        .where('occurred_at', '>=', g.minute)
        .where('occurred_at', '<', nextMinute(g.minute))
        .where('occurred_at', '>=', String(billing.metered_since));
    // A billing period that ends inside this minute splits it: the units before the end are one
    // batch (stamped before it, so they are invoiced in the period that is closing), the rest another.
    const periodEnd = typeof billing.current_period_end === 'string' ? billing.current_period_end : null;
    let side: 'before' | 'after' | null = null;
    if (periodEnd && periodEnd > g.minute && periodEnd < nextMinute(g.minute)) {
      side = (await minuteRows().where('occurred_at', '<', periodEnd).first('id')) ? 'before' : 'after';
    }
    const rows = () => {
      const q = minuteRows();
      if (side === 'before') q.where('occurred_at', '<', periodEnd as string);
      if (side === 'after') q.where('occurred_at', '>=', periodEnd as string);
      return q;
    };
    const cutoff = (await rows()
      .orderBy('id')
      .offset(g.maxUnits - 1)
      .first('id')) as Row | undefined;
    const id = await insertId(
      trx('usage_batches')
        .insert({
          workspace_id: g.workspaceId,
          customer_id: g.customerId,
          identifier: `tpb-${g.workspaceId}-${randomUUID()}`,
          quantity: 0,
          occurred_at: `${g.minute}:00.000Z`,
          created_at: nowIso(),
        })
        .returning('id'),
    );
    const take = rows();
    if (cutoff) take.where('id', '<=', Number(cutoff.id));
    const n = Number(await take.update({ batch_id: id }));
    if (n === 0) {
      await trx('usage_batches').where({ id }).delete();
      return { rows: 0, units: 0 };
    }
    const totals = (await trx('usage_events')
      .where({ batch_id: id })
      .sum({ q: 'quantity' })
      .max({ last: 'occurred_at' })
      .first()) as Row;
    const units = Number(totals.q ?? 0);
    await trx('usage_batches')
      .where({ id })
      .update({ quantity: units, occurred_at: String(totals.last) });
    return { rows: n, units };
  });
}

/** Unsent batches due by `asOf` (never tried, or their retry time has come), oldest first. */
export async function listDueUsageBatches(input: {
  asOf: string;
  limit: number;
  workspaceId?: number;
}): Promise<UsageBatchDto[]> {
  const q = db()('usage_batches')
    .whereNull('sent_at')
    .where((w) => w.whereNull('next_attempt_at').orWhere('next_attempt_at', '<=', input.asOf))
    .orderBy('id')
    .limit(input.limit);
  if (input.workspaceId !== undefined) q.where('workspace_id', input.workspaceId);
  return ((await q) as Row[]).map(toDto);
}

/** The batch and every row in it are sent, together. */
export async function markUsageBatchSent(id: number, at: string = nowIso()): Promise<void> {
  await writeTx(async (trx) => {
    await trx('usage_batches')
      .where({ id })
      .whereNull('sent_at')
      .update({ sent_at: at, next_attempt_at: null, last_error: null });
    await trx('usage_events').where({ batch_id: id }).whereNull('sent_at').update({ sent_at: at });
  });
}

export async function markUsageBatchFailed(
  id: number,
  input: { attempts: number; nextAttemptAt: string; error: string },
): Promise<void> {
  await db()('usage_batches')
    .where({ id })
    .whereNull('sent_at')
    .update({
      send_attempts: input.attempts,
      next_attempt_at: input.nextAttemptAt,
      last_error: input.error.slice(0, 500),
    });
}
