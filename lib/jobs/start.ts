import 'server-only';
import '@/lib/imports/jobs';
import '@/lib/billing/jobs';
import '@/lib/reports/jobs';
import { startJobRunner, stopJobRunner } from './index';
import type { JobGroup } from './registry';

/**
 * Loads every job definition of the app and starts this process's runner for the given groups
 * (instrumentation.ts for the web process, lib/worker/main.ts for `npm run worker`).
 */
export function startBackgroundJobs(groups: JobGroup[]): Promise<boolean> {
  if (groups.length === 0) return Promise.resolve(false);
  return startJobRunner(groups.includes('mail') ? groups : [...groups, 'mail']);
}

export { stopJobRunner };
