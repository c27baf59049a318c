/**
 * `npm run worker`: a background process apart from the web: runs the background jobs (lib/jobs:
 * import screening in worker threads, re-screening, usage sending) against the same database as the
 * web instances. Run any number of them; on PostgreSQL they share the pg-boss queue, and the usage
 * sender runs in one process at a time (a singleton job under an advisory lock,
 * lib/billing/jobs.ts). Web instances started with IMPORT_WORKER=0 BILLING_SENDER=0 leave this work
 * to them. IMPORT_WORKER=0 or BILLING_SENDER=0 here makes a worker that does only the other.
 *
 *   node --conditions=react-server --import tsx lib/worker/main.ts
 *
 * (`react-server` lets the app's `server-only` modules load outside Next.js.)
 */
import { closeDb } from '@/db/client';
import { env } from '@/lib/env';
import { closeScreeningPool, screeningThreads } from '@/lib/imports/screening-pool';
import { startBackgroundJobs, stopJobRunner } from '@/lib/jobs/start';
import { log } from '@/lib/log';

async function main(): Promise<void> {
  const e = env();
  if (!e.IMPORT_WORKER && !e.BILLING_SENDER)
    throw new Error('IMPORT_WORKER=0 and BILLING_SENDER=0 leave this worker nothing to do.');
  await startBackgroundJobs([
    ...(e.IMPORT_WORKER ? (['imports'] as const) : []),
    ...(e.BILLING_SENDER ? (['usage'] as const) : []),
  ]);
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
    log.info({ event: 'worker.stopping', signal }, 'worker stopping after the current job');
    await stopJobRunner();
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
