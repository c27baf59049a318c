import { describe, expect, it } from 'vitest';
import { formatReport, runCrashSoak } from './crash-harness';

/**
 * Three SIGKILLs of the app process (the plain-Node server of the real route handlers, import worker
 * and usage sender: no build needed) during an import's screening and usage sending; see
 * crash-harness.ts for the checks. `npm run test:soak` runs twenty against the built server.
 */
describe('crash safety', () => {
  it('3 kills: integrity, no lost acknowledged write, no doubled unit', { timeout: 120_000 }, async () => {
    const report = await runCrashSoak({
      kills: Number(process.env.SOAK_KILLS ?? 3),
      server: 'plain',
      rows: 1500,
      drainSeconds: 3,
      log: (l) => console.info(`[soak] ${l}`),
    });
    console.info(formatReport(report));
    expect(report.problems).toEqual([]);
    expect(report.kills).toHaveLength(Number(process.env.SOAK_KILLS ?? 3));
    expect(report.killsMidImport, 'at least one kill landed while the import was being screened').toBeGreaterThan(0);
    expect(report.acknowledgedScreenings).toBeGreaterThan(0);
    expect(report.flightUnits).toBeGreaterThan(0);
    expect(
      report.killsBetweenSendAndMark,
      'at least one kill landed after the service counted a batch and before the ledger marked it',
    ).toBeGreaterThan(0);
    expect(report.providerUnits, 'usage reaches the payment service in aggregated meter events').toBeGreaterThan(
      report.providerEvents,
    );
  });
});
