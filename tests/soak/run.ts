/**
 * `npm run test:soak`: twenty SIGKILLs of the built server (`next start`) during imports and usage
 * sending (every other kill while a meter event is at the payment service), with the checks of
 * crash-harness.ts after each. SOAK_KILLS sets the count; SOAK_SERVER=plain
 * uses the plain-Node server of the same handlers instead of the build. It takes the checkout's e2e
 * lock for its whole run, and builds first when there is no build (or SOAK_BUILD=1).
 */
import { build, hasBuild, reexecUnderLock } from './app-process';
import { formatReport, runCrashSoak } from './crash-harness';

async function main(): Promise<number> {
  const server = process.env.SOAK_SERVER === 'plain' ? 'plain' : 'next';
  if (server === 'next') {
    const locked = reexecUnderLock('tests/soak/run.ts');
    if (locked !== null) return locked;
    if (process.env.SOAK_BUILD === '1' || !hasBuild()) build();
  }
  const kills = Number(process.env.SOAK_KILLS ?? 20);
  console.log(`soak: ${kills} kills of the ${server === 'next' ? 'built server (next start)' : 'plain-Node server'}`);
  const report = await runCrashSoak({
    kills,
    server,
    rows: Number(process.env.SOAK_ROWS ?? 3000),
    drainSeconds: Number(process.env.SOAK_DRAIN_SECONDS ?? 120),
    log: (l) => console.log(`[soak] ${l}`),
  });
  console.log(formatReport(report));
  const ok =
    report.problems.length === 0 &&
    report.kills.length === kills &&
    report.killsMidImport > 0 &&
    (kills < 2 || report.killsBetweenSendAndMark > 0);
  console.log(ok ? 'soak: passed' : 'soak: FAILED');
  return ok ? 0 : 1;
}

main().then(
  (code) => process.exit(code),
  (err: Error) => {
    console.error(`test:soak failed: ${err.stack ?? err.message}`);
    process.exit(1);
  },
);
