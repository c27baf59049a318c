/**
 * Import benchmark (issue 5): a deterministic 100 000-row flight schedule uploaded to the running
 * app (the production build under `next start`, on a fresh demo database), validated, imported and
 * screened by the in-process worker; timed from the upload to the import's status `complete`.
 * Prints rows/s for each stage, the total seconds and the peak RSS of the server process (its whole
 * process group). Figures only; it fails only when the import does not complete correctly.
 *
 * Run: npx tsx tests/bench/import.ts [rows]. It builds the app into its own directory (`.next-bench`,
 * see dist-dir.ts; BENCH_SKIP_BUILD=1 reuses that build), so a demo serving `.next` keeps running, and
 * holds the e2e lock (/tmp/tropopass-e2e.lock) for the whole run.
 */
import { createHash } from 'node:crypto';
import os from 'node:os';
import { seededRandom } from '../../lib/random';
import * as bench from './app-bench';

const ROWS = Number(process.argv[2] ?? 100_000);

// Real airports for the invented polar schedule (codes resolved by the app from OurAirports data).
const EUROPE = ['EGLL', 'EFHK', 'ENGM', 'BIKF', 'ESSA', 'EKCH', 'EDDF', 'EHAM'];
const PACIFIC = ['PANC', 'RJAA', 'RJTT', 'KSEA', 'CYVR', 'KSFO', 'RJBB', 'ZSPD'];

/** `rows` distinct flights for the demo workspace skarn-polar, 30 % of them with a step climb. */
function schedule(rows: number): string {
  const rnd = seededRandom(20_261_120);
  const pick = <T>(xs: readonly T[]) => xs[Math.floor(rnd() * xs.length)];
  const lines = ['date,flight,origin,destination,aircraft,cruise_fl,fuel_kg,steps'];
  for (let i = 0; i < rows; i++) {
    const eastbound = rnd() < 0.5;
    const [o, d] = eastbound ? [pick(EUROPE), pick(PACIFIC)] : [pick(PACIFIC), pick(EUROPE)];
    const day = String(1 + (i % 30)).padStart(2, '0');
    const fl = 330 + 10 * Math.floor(rnd() * 5);
    const fuel = Math.round(38_000 + rnd() * 22_000);
    const steps =
      rnd() < 0.3
        ? `${fl}@0 ${fl + 20}@${Math.round(2000 + rnd() * 1500)} ${Math.min(410, fl + 40)}@${Math.round(5000 + rnd() * 1500)}`
        : '';
    lines.push(`2026-10-${day},BN${i},${o},${d},${rnd() < 0.5 ? 'SK-LR1' : 'SK-LR2'},${fl},${fuel},${steps}`);
  }
  return lines.join('\r\n') + '\r\n';
}

async function main(): Promise<void> {
  bench.lockAndBuild('import.ts');
  const app = await bench.prepareBenchApp('tropopass-bench-');
  const { baseUrl, cookie } = app;

  const csv = schedule(ROWS);
  const bytes = Buffer.byteLength(csv);
  console.log(`Tropopass import benchmark (Node ${process.version}, ${os.cpus().length} cores)`);
  console.log(
    `file                       ${ROWS} rows, ${(bytes / 1024 / 1024).toFixed(2)} MB, sha256 ${createHash('sha256').update(csv).digest('hex').slice(0, 12)}…`,
  );

  const server = bench.spawnServer(app);
  let peakKb = 0;
  let sampler: NodeJS.Timeout | undefined;
  try {
    await bench.waitForServer(app, server);
    const idleKb = bench.groupRssKb(server.pid ?? 0);
    sampler = setInterval(() => {
      peakKb = Math.max(peakKb, bench.groupRssKb(server.pid ?? 0));
    }, 100);

    const form = new FormData();
    form.set('file', new File([csv], 'bench-schedule.csv', { type: 'text/csv' }));
    const t0 = performance.now();
    const res = await fetch(`${baseUrl}/api/v1/workspaces/skarn-polar/imports`, {
      method: 'POST',
      headers: { cookie },
      body: form,
    });
    const t1 = performance.now();
    const acceptPeakKb = Math.max(peakKb, bench.groupRssKb(server.pid ?? 0));
    const accepted = (await res.json()) as { id?: number; status?: string; error?: { message: string } };
    if (res.status !== 202 || !accepted.id)
      throw new Error(`upload refused (${res.status}): ${JSON.stringify(accepted).slice(0, 500)}`);

    let maxRate = 0;
    const status = await bench.waitForImport(app, accepted.id, t0, (p) => {
      if (p.rowsPerSecond) maxRate = Math.max(maxRate, p.rowsPerSecond);
    });
    const t2 = performance.now();
    clearInterval(sampler);
    peakKb = Math.max(peakKb, bench.groupRssKb(server.pid ?? 0));

    const { screened, units } = bench.importCounts(app, accepted.id);
    const accept = (t1 - t0) / 1000;
    const screen = (t2 - t1) / 1000;
    const total = (t2 - t0) / 1000;
    console.log(`validate + import (202)    ${accept.toFixed(2)} s  (${Math.round(ROWS / accept)} rows/s)`);
    console.log(
      `screening (worker)         ${screen.toFixed(2)} s  (${Math.round(ROWS / screen)} rows/s; the import reported up to ${Math.round(maxRate)} rows/s)`,
    );
    console.log(
      `end to end                 ${total.toFixed(2)} s  (${Math.round(ROWS / total)} rows/s)  target < 30 s`,
    );
    console.log(
      `server RSS                 idle ${Math.round(idleKb / 1024)} MB, peak ${Math.round(peakKb / 1024)} MB (up to the 202: ${Math.round(acceptPeakKb / 1024)} MB; process group, sampled every 100 ms)  target < 600 MB`,
    );
    console.log(`checks                     status ${status}, ${screened} flights screened, ${units} usage units`);
    if (status !== 'complete' || screened !== ROWS || units !== ROWS)
      throw new Error('the import did not screen and bill every row exactly once');
  } finally {
    if (sampler) clearInterval(sampler);
    await bench.stopBenchApp(app, server);
  }
}

main().then(
  () => process.exit(0),
  (err: Error) => {
    console.error(`[bench:import] ${err.message}`);
    process.exit(1);
  },
);
