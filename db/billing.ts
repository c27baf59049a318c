import 'server-only';
import type { Knex } from 'knex';
import { db, nowIso } from './client';
import { DEFAULT_PLAN_ID, PLAN_IDS, type PlanId } from '@/lib/billing/plan-catalogue';

const isPlanId = (value: unknown): value is PlanId =>
  typeof value === 'string' && (PLAN_IDS as readonly string[]).includes(value);

export const BILLING_STATUSES = ['trialing', 'active', 'past_due', 'canceled'] as const;
export type BillingStatus = (typeof BILLING_STATUSES)[number];

export function isBillingStatus(value: unknown): value is BillingStatus {
  return typeof value === 'string' && (BILLING_STATUSES as readonly string[]).includes(value);
}

export interface ReconciliationDto {
  windowStart: string;
  windowEnd: string;
  ledgerUnits: number;
  providerUnits: number;
  difference: number;
  checkedAt: string;
}

export interface BillingDto {
  workspaceId: number;
  planId: PlanId;
  status: BillingStatus;
  trialEndsAt: string | null;
  customerId: string | null;
  subscriptionId: string | null;
  currentPeriodStart: string | null;
  currentPeriodEnd: string | null;
  cancelAtPeriodEnd: boolean;
  billingEmail: string | null;
  paymentMethodLabel: string | null;
  /** Usage from this instant on is sent to the payment service; earlier units (a free trial) are not billed. */
  meteredSince: string | null;
  paymentFailedAt: string | null;
  reconciliation: ReconciliationDto | null;
  /** Monthly usage budget: per-flight charges of a billing period, in cents; null when none is set. */
  usageBudgetCents: number | null;
  /** Whether reaching the budget refuses new billable work (402). */
  budgetHardStop: boolean;
  updatedAt: string;
}

type Row = Record<string, unknown>;
type Trx = Knex | Knex.Transaction;

const str = (v: unknown): string | null => (v === null || v === undefined ? null : String(v));

function toDto(r: Row): BillingDto {
  const status = isBillingStatus(r.status) ? r.status : 'canceled';
  const planId = isPlanId(r.plan_id) ? r.plan_id : DEFAULT_PLAN_ID;
  const checkedAt = str(r.recon_checked_at);
  const ledger =
    r.recon_ledger_units === null || r.recon_ledger_units === undefined ? null : Number(r.recon_ledger_units);
  const provider =
    r.recon_provider_units === null || r.recon_provider_units === undefined ? null : Number(r.recon_provider_units);
  return {
    workspaceId: Number(r.workspace_id),
    planId,
    status,
    trialEndsAt: str(r.trial_ends_at),
    customerId: str(r.customer_id),
    subscriptionId: str(r.subscription_id),
    currentPeriodStart: str(r.current_period_start),
    currentPeriodEnd: str(r.current_period_end),
    cancelAtPeriodEnd: Boolean(r.cancel_at_period_end),
    billingEmail: str(r.billing_email),
    paymentMethodLabel: str(r.payment_method_label),
    meteredSince: str(r.metered_since),
    paymentFailedAt: str(r.payment_failed_at),
    reconciliation:
      checkedAt && ledger !== null && provider !== null
        ? {
            windowStart: String(r.recon_window_start),
            windowEnd: String(r.recon_window_end),
            ledgerUnits: ledger,
            providerUnits: provider,
            difference: ledger - provider,
            checkedAt,
          }
        : null,
    usageBudgetCents:
      r.usage_budget_cents === null || r.usage_budget_cents === undefined ? null : Number(r.usage_budget_cents),
    budgetHardStop: Boolean(r.budget_hard_stop),
    updatedAt: String(r.updated_at),
  };
}

/** Writes a workspace's first billing state, a trial (kept as it is when the workspace already has one). */
export async function insertTrialBilling(
  trx: Knex.Transaction,
  input: { workspaceId: number; planId: PlanId; trialEndsAt: string },
): Promise<void> {
  await trx('workspace_billing')
    .insert({
      workspace_id: input.workspaceId,
      plan_id: input.planId,
      status: 'trialing',
      trial_ends_at: input.trialEndsAt,
      cancel_at_period_end: false,
      updated_at: nowIso(),
    })
    .onConflict('workspace_id')
    .ignore();
}

/**
 * A workspace's billing row. `forUpdate` (inside a transaction) locks it on PostgreSQL until the
 * transaction ends, so a read-check-write of the subscription period cannot interleave with another
 * (SQLite's write transactions are serial already).
 */
export async function getBilling(
  scope: { workspaceId: number },
  trx: Trx = db(),
  opts: { forUpdate?: boolean } = {},
): Promise<BillingDto | null> {
  const q = trx('workspace_billing').where({ workspace_id: scope.workspaceId }).first();
  const r = await (opts.forUpdate ? q.forUpdate() : q);
  return r ? toDto(r) : null;
}

export interface BillingPatch {
  planId?: PlanId;
  status?: BillingStatus;
  trialEndsAt?: string | null;
  customerId?: string | null;
  subscriptionId?: string | null;
  currentPeriodStart?: string | null;
  currentPeriodEnd?: string | null;
  cancelAtPeriodEnd?: boolean;
  billingEmail?: string | null;
  paymentMethodLabel?: string | null;
  meteredSince?: string | null;
  paymentFailedAt?: string | null;
  usageBudgetCents?: number | null;
  budgetHardStop?: boolean;
}

const COLUMNS: Record<keyof BillingPatch, string> = {
  planId: 'plan_id',
  status: 'status',
  trialEndsAt: 'trial_ends_at',
  customerId: 'customer_id',
  subscriptionId: 'subscription_id',
  currentPeriodStart: 'current_period_start',
  currentPeriodEnd: 'current_period_end',
  cancelAtPeriodEnd: 'cancel_at_period_end',
  billingEmail: 'billing_email',
  paymentMethodLabel: 'payment_method_label',
  meteredSince: 'metered_since',
  paymentFailedAt: 'payment_failed_at',
  usageBudgetCents: 'usage_budget_cents',
  budgetHardStop: 'budget_hard_stop',
};

/**
 * Marks a budget alert as sent for a period, unless it already was: true for the one caller that
 * gets to send it (a conditional update, so two processes cannot both send).
 */
export async function claimBudgetAlert(
  scope: { workspaceId: number },
  threshold: 80 | 100,
  periodStart: string,
  trx: Trx = db(),
): Promise<boolean> {
  const column = threshold === 80 ? 'budget_alert_80_period' : 'budget_alert_100_period';
  const n = await trx('workspace_billing')
    .where({ workspace_id: scope.workspaceId })
    .where((q) => q.whereNull(column).orWhereNot(column, periodStart))
    .update({ [column]: periodStart });
  return n > 0;
}

export async function updateBilling(
  scope: { workspaceId: number },
  patch: BillingPatch,
  trx: Trx = db(),
): Promise<void> {
  const values: Record<string, unknown> = { updated_at: nowIso() };
  for (const [key, column] of Object.entries(COLUMNS) as [keyof BillingPatch, string][]) {
    if (patch[key] !== undefined) values[column] = patch[key];
  }
  await trx('workspace_billing').where({ workspace_id: scope.workspaceId }).update(values);
}

/** The billing row of a payment-service customer; `forUpdate` as for getBilling. */
export async function findBillingByCustomer(
  customerId: string,
  trx: Trx = db(),
  opts: { forUpdate?: boolean } = {},
): Promise<BillingDto | null> {
  const q = trx('workspace_billing').where({ customer_id: customerId }).first();
  const r = await (opts.forUpdate ? q.forUpdate() : q);
  return r ? toDto(r) : null;
}

/**
 * Billing rows the payment service does not fully know yet: no customer, or marked subscribed (the demo
 * seed) without a subscription. With the workspace's slug and name.
 */
export async function listBillingToProvision(limit = 20): Promise<(BillingDto & { slug: string; name: string })[]> {
  const rows = await db()('workspace_billing as b')
    .join('workspaces as w', 'w.id', 'b.workspace_id')
    .where((q) =>
      q.whereNull('b.customer_id').orWhere((a) => a.where('b.status', 'active').whereNull('b.subscription_id')),
    )
    .select('b.*', 'w.slug', 'w.name')
    .orderBy('b.workspace_id')
    .limit(limit);
  return rows.map((r: Row) => ({ ...toDto(r), slug: String(r.slug), name: String(r.name) }));
}

/** Who hears about billing problems: the billing e-mail, finance admins and owners, each once. */
export async function listBillingContacts(scope: { workspaceId: number }, trx: Trx = db()): Promise<string[]> {
  const [billing, members] = await Promise.all([
    trx('workspace_billing').where({ workspace_id: scope.workspaceId }).first('billing_email'),
    trx('memberships as m')
      .join('users as u', 'u.id', 'm.user_id')
      .where('m.workspace_id', scope.workspaceId)
      .whereIn('m.role', ['billing', 'owner'])
      .orderBy('u.email')
      .select('u.email'),
  ]);
  const all = [billing?.billing_email, ...members.map((m: { email: string }) => m.email)].filter(
    (e): e is string => typeof e === 'string' && e !== '',
  );
  return [...new Set(all.map((e) => e.trim().toLowerCase()))];
}

// The usage ledger, from billing's side.

export interface UsageCounts {
  units: number;
  sentUnits: number;
  pendingUnits: number;
}

/** Ledger units with `occurred_at` in [from, to), optionally only those at or after `billableSince`. */
export async function countLedgerUnits(
  scope: { workspaceId: number },
  range: { from: string; to: string; billableSince?: string | null },
): Promise<UsageCounts> {
  const base = () => {
    const q = db()('usage_events')
      .where({ workspace_id: scope.workspaceId })
      .where('occurred_at', '>=', range.from)
      .where('occurred_at', '<', range.to);
    if (range.billableSince) q.where('occurred_at', '>=', range.billableSince);
    return q;
  };
  const sum = (rows: unknown): number => Number((rows as { n: number | string | null }[])[0]?.n ?? 0);
  const [all, sent] = await Promise.all([
    base().sum({ n: 'quantity' }),
    base().whereNotNull('sent_at').sum({ n: 'quantity' }),
  ]);
  const units = sum(all);
  const sentUnits = sum(sent);
  const pendingUnits = units - sentUnits;
  return { units, sentUnits, pendingUnits };
}

/** Units of a workspace whose delivery has failed at least once and is still to be retried, for the billing page (no provider text). */
export async function getUsageDeliveryProblem(scope: {
  workspaceId: number;
}): Promise<{ failingUnits: number; since: string | null; nextAttemptAt: string | null } | null> {
  const r = (await db()('usage_batches')
    .where({ workspace_id: scope.workspaceId })
    .whereNull('sent_at')
    .where('send_attempts', '>', 0)
    .sum({ n: 'quantity' })
    .min({ since: 'occurred_at' })
    .min({ next: 'next_attempt_at' })
    .first()) as { n: number | string | null; since: string | null; next: string | null } | undefined;
  const n = Number(r?.n ?? 0);
  return n > 0 ? { failingUnits: n, since: r?.since ?? null, nextAttemptAt: r?.next ?? null } : null;
}

export async function saveReconciliation(
  scope: { workspaceId: number },
  rec: { windowStart: string; windowEnd: string; ledgerUnits: number; providerUnits: number; checkedAt: string },
): Promise<void> {
  await db()('workspace_billing').where({ workspace_id: scope.workspaceId }).update({
    recon_window_start: rec.windowStart,
    recon_window_end: rec.windowEnd,
    recon_ledger_units: rec.ledgerUnits,
    recon_provider_units: rec.providerUnits,
    recon_checked_at: rec.checkedAt,
  });
}

/** Records a payment-service event id; false when it was already processed (a replay). */
export async function recordWebhookEvent(trx: Knex.Transaction, event: { id: string; type: string }): Promise<boolean> {
  const seen = await trx('webhook_events').where({ id: event.id }).first();
  if (seen) return false;
  await trx('webhook_events').insert({ id: event.id, type: event.type.slice(0, 64), received_at: nowIso() });
  return true;
}
