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
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import Database from 'better-sqlite3';
import { encode } from 'next-auth/jwt';
import { freePort } from '../support/free-port';
import { BENCH_DIST_DIR, benchNextEnv, hasBenchBuild } from './dist-dir';
import { writeTrackFile } from './track-file';

const FLIGHTS = Number(process.argv[2] ?? 2000);
const PER = Number(process.argv[3] ?? 500);
const root = process.cwd();
const SECRET = 'bench-secret-0123456789-abcdefghijkl';
const LOCK = '/tmp/tropopass-e2e.lock';
/** Extra Node flags for the server (diagnosis, e.g. BENCH_SERVER_FLAGS=--trace-gc). */
const serverFlags = (process.env.BENCH_SERVER_FLAGS ?? '').split(' ').filter(Boolean);
/** BENCH_RSS_TIMELINE=1 prints the server's RSS every second. */
const timeline = process.env.BENCH_RSS_TIMELINE === '1';

function run(cmd: string, args: string[], env: NodeJS.ProcessEnv, label: string): void {
  const r = spawnSync(cmd, args, { cwd: root, env, stdio: 'inherit' });
  if (r.status !== 0) throw new Error(`${label} failed (exit ${r.status})`);
}

/** Resident memory (kB) of every process in the server's process group. */
function groupRssKb(pgid: number): number {
  let total = 0;
  for (const entry of fs.readdirSync('/proc')) {
    if (!/^\d+$/.test(entry)) continue;
    try {
      const stat = fs.readFileSync(`/proc/${entry}/stat`, 'utf8');
      const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
      if (Number(fields[2]) !== pgid) continue;
      const status = fs.readFileSync(`/proc/${entry}/status`, 'utf8');
      total += Number(/VmRSS:\s+(\d+)/.exec(status)?.[1] ?? 0);
    } catch {
      /* the process ended meanwhile */
    }
  }
  return total;
}

async function waitFor(url: string, child: ChildProcess, seconds = 60): Promise<void> {
  const until = Date.now() + seconds * 1000;
  while (Date.now() < until) {
    if (child.exitCode !== null) throw new Error(`server exited early (code ${child.exitCode})`);
    try {
      if ((await fetch(url)).status < 500) return;
    } catch {
      /* not up yet */
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error(`timed out waiting for ${url}`);
}

async function main(): Promise<void> {
  if (process.env.TROPOPASS_BENCH_LOCKED !== '1') {
    const r = spawnSync(
      'flock',
      [
        LOCK,
        process.execPath,
        '--import',
        'tsx',
        path.join('tests', 'bench', 'track-app.ts'),
        ...process.argv.slice(2),
      ],
      { cwd: root, env: { ...process.env, TROPOPASS_BENCH_LOCKED: '1' }, stdio: 'inherit' },
    );
    process.exit(r.status ?? 1);
  }
  if (process.env.BENCH_SKIP_BUILD !== '1' || !hasBenchBuild(root)) {
    console.log(`building the app into ${BENCH_DIST_DIR} (BENCH_SKIP_BUILD=1 reuses that build)…`);
    run(
      process.execPath,
      ['node_modules/next/dist/bin/next', 'build'],
      benchNextEnv({ ...process.env, NODE_ENV: 'production' }),
      'next build',
    );
  }
  const work = fs.mkdtempSync(path.join(os.tmpdir(), 'tropopass-trackbench-'));
  const port = await freePort();
  const baseUrl = `http://127.0.0.1:${port}`;
  const dbFile = path.join(work, 'bench.sqlite');
  const trackFile = path.join(work, 'tracks.csv');
  const env: NodeJS.ProcessEnv = benchNextEnv({
    ...process.env,
    NODE_ENV: 'production',
    SQLITE_FILE: dbFile,
    DATABASE_URL: '',
    DEMO_TODAY: '2026-11-20',
    NEXTAUTH_URL: baseUrl,
    NEXTAUTH_SECRET: SECRET,
    IMPORT_WORKER: '1',
    BILLING_SENDER: '0',
    RATE_LIMIT_API_PER_MIN: '100000',
    LOG_LEVEL: 'warn',
  });
  const knexCli = ['--import', 'tsx', 'node_modules/knex/bin/cli.js', '--knexfile', 'knexfile.ts'];
  run(process.execPath, [...knexCli, 'migrate:latest'], env, 'migrate');
  run(process.execPath, [...knexCli, 'seed:run'], env, 'seed');

  const conn = new Database(dbFile);
  const analyst = conn
    .prepare("select id, session_version from users where email = 'analyst@tropopass.test'")
    .get() as { id: number; session_version: number };
  const workspace = conn.prepare("select id from workspaces where slug = 'skarn-polar'").get() as { id: number };
  const sid = `bench-${process.pid}-${Date.now()}`;
  conn
    .prepare('insert into auth_sessions (id, user_id, created_at, expires_at) values (?, ?, ?, ?)')
    .run(sid, analyst.id, new Date().toISOString(), new Date(Date.now() + 12 * 3_600_000).toISOString());
  const cookie = `next-auth.session-token=${await encode({ token: { uid: analyst.id, sv: Number(analyst.session_version), authAt: Date.now(), sid }, secret: SECRET })}`;

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

  const server = spawn(
    process.execPath,
    [...serverFlags, 'node_modules/next/dist/bin/next', 'start', '-H', '127.0.0.1', '-p', String(port)],
    { cwd: root, env, stdio: ['ignore', 'inherit', 'inherit'], detached: true },
  );
  let peakKb = 0;
  let sampler: NodeJS.Timeout | undefined;
  try {
    await waitFor(`${baseUrl}/signin`, server);
    const idleKb = groupRssKb(server.pid ?? 0);
    let ticks = 0;
    const started = performance.now();
    sampler = setInterval(() => {
      const kb = groupRssKb(server.pid ?? 0);
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
    const acceptPeakKb = Math.max(peakKb, groupRssKb(server.pid ?? 0));
    if (res.status !== 202 || !accepted.id)
      throw new Error(`upload refused (${res.status}): ${JSON.stringify(accepted).slice(0, 500)}`);

    let status = accepted.status;
    while (status !== 'complete' && status !== 'failed') {
      await new Promise((r) => setTimeout(r, 250));
      const p = (await (
        await fetch(`${baseUrl}/api/v1/workspaces/skarn-polar/imports/${accepted.id}`, { headers: { cookie } })
      ).json()) as { status: string };
      status = p.status;
      if (performance.now() - t0 > 600_000) throw new Error('the import did not finish within 10 minutes');
    }
    const t2 = performance.now();
    clearInterval(sampler);
    peakKb = Math.max(peakKb, groupRssKb(server.pid ?? 0));

    const screened = (
      conn
        .prepare("select count(*) as n from flights where import_id = ? and status = 'screened' and basis = 'flown'")
        .get(accepted.id) as { n: number }
    ).n;
    const units = (
      conn
        .prepare(
          "select count(*) as n from usage_events u join flights f on f.id = u.source_id where u.kind = 'imported_flight' and f.import_id = ? and u.workspace_id = ?",
        )
        .get(accepted.id, workspace.id) as { n: number }
    ).n;
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
    conn.close();
    try {
      if (server.pid) process.kill(-server.pid, 'SIGTERM');
    } catch {
      /* already gone */
    }
    await new Promise((r) => setTimeout(r, 500));
    try {
      if (server.pid && server.exitCode === null) process.kill(-server.pid, 'SIGKILL');
    } catch {
      /* already gone */
    }
    fs.rmSync(work, { recursive: true, force: true });
  }
}

main().then(
  () => process.exit(0),
  (err: Error) => {
    console.error(`[bench:track-app] ${err.message}`);
    process.exit(1);
  },
);
