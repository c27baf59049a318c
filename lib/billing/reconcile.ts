import 'server-only';
import { countLedgerUnits, getBilling, saveReconciliation, type ReconciliationDto } from '@/db/billing';
import { meterId } from './catalogue';
import { stripe } from './stripe';
import { isoFromSeconds, secondsFromIso } from './sync';

/**
 * Compares the usage ledger with what the payment service has counted for the current period. Meter
 * summaries are only available over minute-aligned windows, so both sides are counted over the same
 * window: from the minute the period started in up to the next whole minute after now. A difference
 * is expected while units wait to be sent; any other difference needs a look.
 */

const MINUTE_S = 60;

export function reconciliationWindow(periodStart: string, now: Date): { start: number; end: number } {
  const start = Math.floor(secondsFromIso(periodStart) / MINUTE_S) * MINUTE_S;
  const end = Math.max(start + MINUTE_S, Math.ceil((Math.floor(now.getTime() / 1000) + 1) / MINUTE_S) * MINUTE_S);
  return { start, end };
}

/**
 * The reconciliation of the workspace's current period, computed afresh when the stored one is older
 * than `maxAgeMs` or for another window start. Null without a subscription. Throws when the payment
 * service cannot be asked (callers show the last stored result).
 */
export async function reconcileUsage(
  scope: { workspaceId: number },
  opts: { maxAgeMs?: number; now?: Date } = {},
): Promise<ReconciliationDto | null> {
  const billing = await getBilling(scope);
  if (!billing?.customerId || !billing.subscriptionId || !billing.currentPeriodStart) return null;
  const now = opts.now ?? new Date();
  const window = reconciliationWindow(billing.currentPeriodStart, now);
  const windowStart = isoFromSeconds(window.start);
  const windowEnd = isoFromSeconds(window.end);
  const countLedger = () =>
    countLedgerUnits(scope, { from: windowStart, to: windowEnd, billableSince: billing.meteredSince });
  const stored = billing.reconciliation;
  if (
    stored &&
    stored.windowStart === windowStart &&
    opts.maxAgeMs !== undefined &&
    now.getTime() - Date.parse(stored.checkedAt) < opts.maxAgeMs
  ) {
    // Reuse a fresh check only while the ledger still says what it said then: every unit sent since
    // would make the stored figures look like a difference that is not there.
    const current = await countLedger();
    if (current.units === stored.ledgerUnits && current.sentUnits === stored.providerUnits) return stored;
  }

  const meter = await meterId();
  let providerUnits = 0;
  for await (const summary of stripe().billing.meters.listEventSummaries(meter, {
    customer: billing.customerId,
    start_time: window.start,
    end_time: window.end,
    limit: 100,
  })) {
    providerUnits += summary.aggregated_value;
  }
  const ledger = await countLedger();
  const result = {
    windowStart,
    windowEnd,
    ledgerUnits: ledger.units,
    providerUnits,
    checkedAt: now.toISOString(),
  };
  await saveReconciliation(scope, result);
  return { ...result, difference: result.ledgerUnits - result.providerUnits };
}
