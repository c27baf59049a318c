import 'server-only';
import { db, usingPostgres } from '@/db/client';
import { log } from '@/lib/log';
import { provisionBilling } from './provision';
import { sendPendingUsage } from './usage-sender';

/**
 * The billing work of the recurring `usage.send` job (jobs.ts): provisions customers and the demo
 * subscriptions, then sends due usage. A tick never overlaps the previous one in this process (the
 * state is kept on globalThis: instrumentation and route handlers may load separate module copies),
 * and provisioning backs off while the payment service is unreachable. On PostgreSQL a tick runs
 * under a transaction-scoped advisory lock, so across every process only one ticks at a time; the
 * others skip their turn.
 */

/** The advisory lock key of the billing loop (any fixed 64-bit number no other lock uses). */
export const BILLING_LOCK_KEY = 7_243_190_511;

/**
 * Runs `fn` unless another process holds the billing lock (PostgreSQL); on SQLite there is one
 * process and it always runs. The lock is released when the transaction ends, also when the
 * process dies, so a killed sender never blocks the others.
 */
export async function withBillingLock<T>(fn: () => Promise<T>): Promise<{ ran: true; value: T } | { ran: false }> {
  if (!usingPostgres()) return { ran: true, value: await fn() };
  return db().transaction(async (trx) => {
    const r = (await trx.raw('select pg_try_advisory_xact_lock(?) as ok', [BILLING_LOCK_KEY])) as {
      rows: { ok: boolean }[];
    };
    if (!r.rows[0]?.ok) return { ran: false as const };
    return { ran: true as const, value: await fn() };
  });
}
interface LoopState {
  running: boolean;
  provisionFailures: number;
  nextProvisionAt: number;
}

async function tick(state: LoopState): Promise<void> {
  if (state.running) return;
  state.running = true;
  try {
    await withBillingLock(() => work(state));
  } catch (err) {
    log.warn({ event: 'billing.loop_error', err }, 'billing tick failed; next tick retries');
  } finally {
    state.running = false;
  }
}

async function work(state: LoopState): Promise<void> {
  if (Date.now() >= state.nextProvisionAt) {
    const report = await provisionBilling();
    if (report.failed > 0) {
      state.provisionFailures += 1;
      state.nextProvisionAt = Date.now() + Math.min(60_000, 1_000 * 2 ** state.provisionFailures);
    } else {
      state.provisionFailures = 0;
      state.nextProvisionAt = 0;
    }
  }
  await sendPendingUsage();
}

const gt = globalThis as unknown as { tropopassBillingTick?: LoopState };

/**
 * One tick of the billing work (provisioning with its back-off, then due usage), under the billing
 * lock: what the recurring `usage.send` job runs (lib/billing/jobs.ts). Errors are logged and the
 * next tick retries.
 */
export async function runBillingTick(): Promise<void> {
  gt.tropopassBillingTick ??= { running: false, provisionFailures: 0, nextProvisionAt: 0 };
  await tick(gt.tropopassBillingTick);
}
