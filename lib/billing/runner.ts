import 'server-only';
import { env } from '@/lib/env';
import { log } from '@/lib/log';
import { provisionBilling } from './provision';
import { sendPendingUsage } from './usage-sender';

/**
 * The in-process billing loop started from instrumentation.ts: provisions customers and the demo
 * subscriptions, then sends due usage, every BILLING_SENDER_INTERVAL_MS. One loop per process (kept
 * on globalThis: instrumentation and route handlers may load separate module copies); a tick never
 * overlaps the previous one, and provisioning backs off while the payment service is unreachable.
 */
interface LoopState {
  timer: NodeJS.Timeout | null;
  running: boolean;
  provisionFailures: number;
  nextProvisionAt: number;
}

const g = globalThis as unknown as { tropopassBillingLoop?: LoopState };

async function tick(state: LoopState): Promise<void> {
  if (state.running) return;
  state.running = true;
  try {
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
  } catch (err) {
    log.warn({ event: 'billing.loop_error', err }, 'billing loop tick failed; next tick retries');
  } finally {
    state.running = false;
  }
}

export function startBillingLoop(): boolean {
  if (g.tropopassBillingLoop) return false;
  const state: LoopState = { timer: null, running: false, provisionFailures: 0, nextProvisionAt: 0 };
  g.tropopassBillingLoop = state;
  const interval = env().BILLING_SENDER_INTERVAL_MS;
  state.timer = setInterval(() => void tick(state), interval);
  state.timer.unref();
  void tick(state);
  log.info({ event: 'billing.loop_started', intervalMs: interval }, 'billing sender started');
  return true;
}

export function stopBillingLoop(): void {
  const state = g.tropopassBillingLoop;
  if (state?.timer) clearInterval(state.timer);
  g.tropopassBillingLoop = undefined;
}
