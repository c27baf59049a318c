import 'server-only';
import { env } from '@/lib/env';
import { defineJob } from '@/lib/jobs';
import { runBillingTick } from './runner';

/**
 * Usage sending as a recurring job: every runner with the usage group queues it each
 * BILLING_SENDER_INTERVAL_MS, one waiting or running at a time across processes (its singleton key),
 * and the tick itself runs under the billing advisory lock (runner.ts), so usage is sent by one
 * process at a time. A failed tick is logged and the next one retries: no dead letter.
 */
export const USAGE_SEND_JOB = 'usage.send';

defineJob(USAGE_SEND_JOB, async () => runBillingTick(), {
  group: 'usage',
  maxAttempts: 1,
  expireInSeconds: 300,
  everyMs: () => env().BILLING_SENDER_INTERVAL_MS,
});
