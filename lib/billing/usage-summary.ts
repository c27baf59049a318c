import 'server-only';
import { countLedgerUnits, getUsageDeliveryProblem, type BillingDto, type BillingStatus } from '@/db/billing';
import { ensureBilling } from '@/lib/billing/trial';
import { log } from '@/lib/log';
import { PLANS, TRIAL_DAYS, estimateChargeCents, type PlanId } from './plans';
import { reconcileUsage } from './reconcile';
import { describeStripeError } from './stripe';

/** The shape of `GET /api/v1/workspaces/{slug}/usage` and of the billing page's usage meter. */
export interface UsageSummary {
  units: number;
  periodStart: string;
  periodEnd: string;
  estimatedChargeCents: number;
  planId: PlanId;
  status: BillingStatus;
  /** Units of the period already counted by the payment service. */
  sentUnits: number;
  /** Units of the period still waiting to be sent (0 when the workspace is not metered: a free trial). */
  pendingUnits: number;
  reconciliation: {
    ledgerUnits: number;
    providerUnits: number;
    difference: number;
    checkedAt: string;
    windowStart: string;
    windowEnd: string;
  } | null;
  /** False when the payment service could not be asked just now; `reconciliation` is then the last stored one. */
  providerReachable: boolean;
  /** Whether the period is free (a trial): the estimate is then 0. */
  freePeriod: boolean;
  trialEndsAt: string | null;
  cancelAtPeriodEnd: boolean;
  baseFeeCents: number;
  perFlightCents: number;
  currency: 'usd';
  /** Units whose delivery to the payment service failed at least once and is being retried. */
  retryingUnits: number;
}

/** The period usage is counted over: the subscription's, else the free trial's. */
export function usagePeriod(billing: BillingDto, now = new Date()): { start: string; end: string } {
  if (billing.currentPeriodStart && billing.currentPeriodEnd)
    return { start: billing.currentPeriodStart, end: billing.currentPeriodEnd };
  if (billing.trialEndsAt) {
    return {
      start: new Date(Date.parse(billing.trialEndsAt) - TRIAL_DAYS * 86_400_000).toISOString(),
      end: billing.trialEndsAt,
    };
  }
  const start = new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth(), 1));
  return {
    start: start.toISOString(),
    end: new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth() + 1, 1)).toISOString(),
  };
}

export async function getUsageSummary(
  scope: { workspaceId: number },
  opts: { reconcile?: boolean; maxAgeMs?: number } = {},
): Promise<UsageSummary> {
  let billing = await ensureBilling(scope);
  let providerReachable = true;
  if (opts.reconcile !== false && billing.subscriptionId) {
    try {
      await reconcileUsage(scope, { maxAgeMs: opts.maxAgeMs ?? 15_000 });
      billing = await ensureBilling(scope);
    } catch (err) {
      providerReachable = false;
      log.warn(
        { event: 'billing.reconcile_failed', workspaceId: scope.workspaceId, error: describeStripeError(err) },
        'reconciliation skipped',
      );
    }
  }
  const period = usagePeriod(billing);
  const metered = Boolean(billing.subscriptionId && billing.meteredSince);
  const [counts, billable, problem] = await Promise.all([
    countLedgerUnits(scope, { from: period.start, to: period.end }),
    metered
      ? countLedgerUnits(scope, { from: period.start, to: period.end, billableSince: billing.meteredSince })
      : null,
    getUsageDeliveryProblem(scope),
  ]);
  const plan = PLANS[billing.planId];
  const freePeriod = billing.status === 'trialing';
  const charges = billing.status === 'active' || billing.status === 'past_due';
  const rec = billing.reconciliation;
  return {
    units: counts.units,
    periodStart: period.start,
    periodEnd: period.end,
    estimatedChargeCents: charges ? estimateChargeCents(billing.planId, counts.units) : 0,
    planId: billing.planId,
    status: billing.status,
    sentUnits: billable?.sentUnits ?? 0,
    pendingUnits: billable?.pendingUnits ?? 0,
    reconciliation: rec
      ? {
          ledgerUnits: rec.ledgerUnits,
          providerUnits: rec.providerUnits,
          difference: rec.difference,
          checkedAt: rec.checkedAt,
          windowStart: rec.windowStart,
          windowEnd: rec.windowEnd,
        }
      : null,
    providerReachable,
    freePeriod,
    trialEndsAt: billing.trialEndsAt,
    cancelAtPeriodEnd: billing.cancelAtPeriodEnd,
    baseFeeCents: plan.baseFeeCents,
    perFlightCents: plan.perFlightCents,
    currency: 'usd',
    retryingUnits: problem?.failingUnits ?? 0,
  };
}

/**
 * The billable units of the workspace's current billing period: the same count, over the same
 * period, as the billing page's meter (`getUsageSummary().units`), without asking the payment service.
 */
export async function getBillableUnits(scope: {
  workspaceId: number;
}): Promise<{ units: number; periodStart: string; periodEnd: string }> {
  const billing = await ensureBilling(scope);
  const period = usagePeriod(billing);
  const counts = await countLedgerUnits(scope, { from: period.start, to: period.end });
  return { units: counts.units, periodStart: period.start, periodEnd: period.end };
}
