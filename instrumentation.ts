export async function register(): Promise<void> {
  if (process.env.NEXT_RUNTIME !== 'nodejs') return;
  const { env } = await import('./lib/env');
  const e = env();
  if (e.IMPORT_WORKER && e.NEXT_PHASE !== 'phase-production-build') {
    const { startImportWorker } = await import('./lib/imports/worker');
    startImportWorker();
  }
  if (e.BILLING_SENDER && e.NEXT_PHASE !== 'phase-production-build') {
    const { startBillingLoop } = await import('./lib/billing/runner');
    startBillingLoop();
  }
}
