/**
 * `npm run worker`: a background process apart from the web: screens imports (in worker threads)
 * and sends usage to the payment service, against the same database as the web instances. Run any
 * number of them; on PostgreSQL the usage sender ticks in one process at a time (an advisory lock,
 * lib/billing/runner.ts). Web instances started with IMPORT_WORKER=0 BILLING_SENDER=0 leave this
 * work to them. IMPORT_WORKER=0 or BILLING_SENDER=0 here makes a worker that does only the other.
 *
 *   node --conditions=react-server --import tsx lib/worker/main.ts
 *
 * (`react-server` lets the app's `server-only` modules load outside Next.js.)
 */
import { closeDb } from '@/db/client';
import { startBillingLoop, stopBillingLoop } from '@/lib/billing/runner';
import { env } from '@/lib/env';
import { closeScreeningPool, screeningThreads } from '@/lib/imports/screening-pool';
import { startImportWorker, stopImportWorker } from '@/lib/imports/worker';
import { log } from '@/lib/log';

async function main(): Promise<void> {
  const e = env();
  if (!e.IMPORT_WORKER && !e.BILLING_SENDER)
    throw new Error('IMPORT_WORKER=0 and BILLING_SENDER=0 leave this worker nothing to do.');
  if (e.IMPORT_WORKER) startImportWorker();
  if (e.BILLING_SENDER) startBillingLoop();
  log.info(
    {
      event: 'worker.started',
      pid: process.pid,
      imports: e.IMPORT_WORKER,
      usage: e.BILLING_SENDER,
      screeningThreads: screeningThreads(),
    },
    'worker started',
  );
  console.log(
    `worker ${process.pid} started (imports: ${e.IMPORT_WORKER ? 'yes' : 'no'}, usage sending: ${e.BILLING_SENDER ? 'yes' : 'no'})`,
  );

  let stopping = false;
  const stop = async (signal: NodeJS.Signals) => {
    if (stopping) return;
    stopping = true;
    log.info({ event: 'worker.stopping', signal }, 'worker stopping after the current chunk');
    stopBillingLoop();
    await stopImportWorker();
    await closeScreeningPool();
    await closeDb();
    process.exit(0);
  };
  process.on('SIGTERM', (s) => void stop(s));
  process.on('SIGINT', (s) => void stop(s));
  // The loops' timers are unref'd: this keeps the process alive until a signal.
  setInterval(() => undefined, 60_000);
}

main().catch((err: unknown) => {
  console.error(`worker failed to start: ${err instanceof Error ? err.message : String(err)}`);
  process.exit(1);
});
