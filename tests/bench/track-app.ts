/**
 * Track-file import benchmark through the app (issue 13): the deterministic 1 000 000-point file of
 * track-import.ts (2 000 flights x 500 points, about 67 MB) uploaded to the running app (the production
 * build under `next start`, on a fresh demo database) at `POST /api/v1/workspaces/{slug}/imports/tracks`,
 * read as a stream, checked, saved, and screened by the in-process job runner; timed from the start of the
 * upload to the 202 and on to the import's status `complete`. Prints those times and the peak RSS of the
 * server's process group (VmRSS summed over every process in it, sampled every 100 ms). Figures only; it
 * fails only when the import does not screen and bill every flight exactly once.
 *
 * Run: npx tsx tests/bench/track-app.ts [flights] [pointsPerFlight]. It builds the app into its own
 * directory (`.next-bench`, see dist-dir.ts; BENCH_SKIP_BUILD=1 reuses that build) and holds the e2e lock
 * (/tmp/tropopass-e2e.lock) for the whole run, as the schedule import benchmark (import.ts) does.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import * as bench from './app-bench';
import { writeTrackFile } from './track-file';

const FLIGHTS = Number(process.argv[2] ?? 2000);
const PER = Number(process.argv[3] ?? 500);
/** Extra Node flags for the server (diagnosis, e.g. BENCH_SERVER_FLAGS=--trace-gc). */
const serverFlags = (process.env.BENCH_SERVER_FLAGS ?? '').split(' ').filter(Boolean);
/** BENCH_RSS_TIMELINE=1 prints the server's RSS every second. */
const timeline = process.env.BENCH_RSS_TIMELINE === '1';

async function main(): Promise<void> {
  bench.lockAndBuild('track-app.ts');
  const app = await bench.prepareBenchApp('tropopass-trackbench-');
  const { baseUrl, cookie } = app;
  const trackFile = path.join(app.work, 'tracks.csv');

  const bytes = await writeTrackFile(trackFile, FLIGHTS, PER, 'SK-LR1');
  const points = FLIGHTS * PER;
  console.log(
    `Tropopass track-file import benchmark (Node ${process.version}, ${os.cpus().length} cores; load ${os
      .loadavg()
      .map((l) => l.toFixed(2))
      .join(' ')})`,
  );
  console.log(
    `file                       ${FLIGHTS} flights x ${PER} points = ${points.toLocaleString('en-GB')} points, ${(bytes / 1024 / 1024).toFixed(1)} MB (streamed from disk)`,
  );

  const server = bench.spawnServer(app, serverFlags);
  let peakKb = 0;
  let sampler: NodeJS.Timeout | undefined;
  try {
    await bench.waitForServer(app, server);
    const idleKb = bench.groupRssKb(server.pid ?? 0);
    let ticks = 0;
    const started = performance.now();
    sampler = setInterval(() => {
      const kb = bench.groupRssKb(server.pid ?? 0);
      peakKb = Math.max(peakKb, kb);
      if (timeline && ++ticks % 10 === 0)
        console.log(
          `  rss ${((performance.now() - started) / 1000).toFixed(0).padStart(3)} s  ${Math.round(kb / 1024)} MB`,
        );
    }, 100);

    const form = new FormData();
    form.set('file', await fs.openAsBlob(trackFile, { type: 'text/csv' }), 'bench-tracks.csv');
    const t0 = performance.now();
    const res = await fetch(`${baseUrl}/api/v1/workspaces/skarn-polar/imports/tracks`, {
      method: 'POST',
      headers: { cookie },
      body: form,
    });
    const accepted = (await res.json()) as { id?: number; status?: string; error?: { message: string } };
    const t1 = performance.now();
    const acceptPeakKb = Math.max(peakKb, bench.groupRssKb(server.pid ?? 0));
    if (res.status !== 202 || !accepted.id)
      throw new Error(`upload refused (${res.status}): ${JSON.stringify(accepted).slice(0, 500)}`);

    const status = await bench.waitForImport(app, accepted.id, t0);
    const t2 = performance.now();
    clearInterval(sampler);
    peakKb = Math.max(peakKb, bench.groupRssKb(server.pid ?? 0));

    const { screened, units } = bench.importCounts(app, accepted.id, 'flown');
    const accept = (t1 - t0) / 1000;
    const screen = (t2 - t1) / 1000;
    const total = (t2 - t0) / 1000;
    console.log(
      `upload, read, check, save  ${accept.toFixed(2)} s to the 202  (${Math.round(points / accept).toLocaleString('en-GB')} points/s)`,
    );
    console.log(`screening (job runner)     ${screen.toFixed(2)} s  (${Math.round(FLIGHTS / screen)} flights/s)`);
    console.log(`end to end, fully screened ${total.toFixed(2)} s  target < 60 s`);
    console.log(
      `server RSS                 idle ${Math.round(idleKb / 1024)} MB, peak ${Math.round(peakKb / 1024)} MB (up to the 202: ${Math.round(acceptPeakKb / 1024)} MB; process group, sampled every 100 ms)  target < 800 MB`,
    );
    console.log(
      `checks                     status ${status}, ${screened} flown flights screened, ${units} usage units; load ${os
        .loadavg()
        .map((l) => l.toFixed(2))
        .join(' ')}`,
    );
    if (status !== 'complete' || screened !== FLIGHTS || units !== FLIGHTS)
      throw new Error('the import did not screen and bill every flight exactly once');
  } finally {
    if (sampler) clearInterval(sampler);
    await bench.stopBenchApp(app, server);
  }
}

main().then(
  () => process.exit(0),
  (err: Error) => {
    console.error(`[bench:track-app] ${err.message}`);
    process.exit(1);
  },
);
