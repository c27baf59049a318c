import 'server-only';
import { nowIso } from '@/db/client';
import {
  formUsageBatches,
  listDueUsageBatches,
  markUsageBatchFailed,
  markUsageBatchSent,
  type UsageBatchDto,
} from '@/db/usage-batches';
import { log } from '@/lib/log';
import { METER_CUSTOMER_PAYLOAD_KEY, METER_EVENT_NAME, METER_VALUE_PAYLOAD_KEY } from './plans';
import { describeStripeError, isStripeError, stripe } from './stripe';

/**
 * Delivers the usage ledger to the payment service as aggregated meter events. Due ledger rows are
 * first put into batches (per workspace and UTC minute, see db/usage-batches.ts); each batch is one
 * event whose value is its unit count and whose `identifier` and request idempotency key are the
 * batch's identifier, fixed before the first attempt, so however often a batch is retried the
 * service counts its units once. A failed delivery is retried later with exponential backoff and
 * jitter; a reply that the identifier already exists means an earlier attempt got through, and the
 * batch (with all its rows) is marked sent.
 */

export const BACKOFF_BASE_MS = 1_000;
export const BACKOFF_MAX_MS = 5 * 60_000;
/** Units in one meter event at most; a 100 000-flight import is a handful of events. */
export const MAX_BATCH_UNITS = 10_000;

/** The payment service accepts meter-event timestamps up to 35 days back and 5 minutes ahead. */
const MAX_PAST_S = 35 * 86_400 - 3_600;
const MAX_FUTURE_S = 4 * 60;

/**
 * Wait before attempt `attempt + 1` after `attempt` failures: base x 2^(attempt-1), capped, with
 * "equal jitter" (half fixed, half random) so many failing rows do not retry in lockstep.
 */
export function backoffMs(attempt: number, random: () => number = Math.random): number {
  const exp = Math.min(BACKOFF_MAX_MS, BACKOFF_BASE_MS * 2 ** Math.max(0, attempt - 1));
  return Math.round(exp / 2 + random() * (exp / 2));
}

/**
 * The event's time: when the unit was recorded, so it lands in the period it belongs to; omitted
 * (stamped on receipt) when outside what the service accepts, which only a long outage causes.
 */
function meterTimestamp(occurredAt: string, nowMs: number): number | undefined {
  const t = Math.floor(Date.parse(occurredAt) / 1000);
  const now = Math.floor(nowMs / 1000);
  if (!Number.isFinite(t) || t < now - MAX_PAST_S || t > now + MAX_FUTURE_S) return undefined;
  return t;
}

type Outcome = 'sent' | 'already_recorded' | 'failed';

async function deliver(row: UsageBatchDto): Promise<Outcome> {
  const timestamp = meterTimestamp(row.occurredAt, Date.now());
  if (timestamp === undefined) {
    log.warn(
      { event: 'billing.usage_late', batchId: row.id, occurredAt: row.occurredAt },
      'usage older than the meter accepts; stamped on receipt',
    );
  }
  try {
    await stripe().billing.meterEvents.create(
      {
        event_name: METER_EVENT_NAME,
        payload: { [METER_CUSTOMER_PAYLOAD_KEY]: row.customerId, [METER_VALUE_PAYLOAD_KEY]: String(row.quantity) },
        identifier: row.identifier,
        ...(timestamp === undefined ? {} : { timestamp }),
      },
      { idempotencyKey: row.identifier },
    );
    await markUsageBatchSent(row.id, nowIso());
    return 'sent';
  } catch (err) {
    // An idempotency key is only kept for a request that succeeded, so both replies mean "already counted".
    if (isStripeError(err) && (err.code === 'resource_already_exists' || err.type === 'StripeIdempotencyError')) {
      await markUsageBatchSent(row.id, nowIso());
      return 'already_recorded';
    }
    const attempts = row.sendAttempts + 1;
    const nextAttemptAt = new Date(Date.now() + backoffMs(attempts)).toISOString();
    await markUsageBatchFailed(row.id, { attempts, nextAttemptAt, error: describeStripeError(err) });
    log.warn(
      {
        event: 'billing.usage_send_failed',
        batchId: row.id,
        units: row.quantity,
        attempts,
        nextAttemptAt,
        error: describeStripeError(err),
      },
      'meter event will be retried',
    );
    return 'failed';
  }
}

export interface SendReport {
  /** Ledger rows put into new batches in this pass, and how many batches. */
  batchedUnits: number;
  batchesFormed: number;
  /** Meter events (one per batch) tried, delivered, found already counted, failed. */
  attempted: number;
  sent: number;
  alreadyRecorded: number;
  failed: number;
  /** Units now counted by the service: those of the sent and already-recorded batches. */
  unitsDelivered: number;
}

/**
 * Batches the ledger rows due now, then sends every batch due by `asOf` (default now), oldest first,
 * at most `limit`. Tests call it directly; the billing loop calls it every few seconds.
 */
export async function sendPendingUsage(
  opts: { asOf?: Date; limit?: number; workspaceId?: number; maxBatchUnits?: number } = {},
): Promise<SendReport> {
  const limit = opts.limit ?? 200;
  const formed = await formUsageBatches({
    maxBatchUnits: opts.maxBatchUnits ?? MAX_BATCH_UNITS,
    maxBatches: limit,
    workspaceId: opts.workspaceId,
  });
  const batches = await listDueUsageBatches({
    asOf: (opts.asOf ?? new Date()).toISOString(),
    limit,
    workspaceId: opts.workspaceId,
  });
  const report: SendReport = {
    batchedUnits: formed.units,
    batchesFormed: formed.batches,
    attempted: batches.length,
    sent: 0,
    alreadyRecorded: 0,
    failed: 0,
    unitsDelivered: 0,
  };
  for (const batch of batches) {
    const outcome = await deliver(batch);
    if (outcome === 'sent') report.sent += 1;
    else if (outcome === 'already_recorded') report.alreadyRecorded += 1;
    else report.failed += 1;
    if (outcome !== 'failed') report.unitsDelivered += batch.quantity;
  }
  return report;
}
