export async function register(): Promise<void> {
  if (process.env.NEXT_RUNTIME !== 'nodejs') return;
  const { env } = await import('./lib/env');
  const e = env();
  if (e.NEXT_PHASE === 'phase-production-build') return;
  const groups = [
    ...(e.IMPORT_WORKER ? (['imports'] as const) : []),
    ...(e.BILLING_SENDER ? (['usage'] as const) : []),
  ];
  if (groups.length === 0) return;
  const { startBackgroundJobs } = await import('./lib/jobs/start');
  await startBackgroundJobs(groups);
}
