/**
 * What the benchmarks that upload to the running app share (import.ts, track-app.ts): the e2e lock
 * and the build into `.next-bench`, a fresh demo database with an analyst's session for skarn-polar,
 * `next start` in its own process group, and that group's resident memory.
 */
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import Database from 'better-sqlite3';
import { encode } from 'next-auth/jwt';
import { freePort } from '../support/free-port';
import { BENCH_DIST_DIR, benchNextEnv, hasBenchBuild } from './dist-dir';

const root = process.cwd();
const SECRET = 'bench-secret-0123456789-abcdefghijkl';
const LOCK = '/tmp/tropopass-e2e.lock';

function run(cmd: string, args: string[], env: NodeJS.ProcessEnv, label: string): void {
  const r = spawnSync(cmd, args, { cwd: root, env, stdio: 'inherit' });
  if (r.status !== 0) throw new Error(`${label} failed (exit ${r.status})`);
}

/**
 * Runs `entry` (this benchmark's file under tests/bench) again under the e2e lock and exits with its
 * code; inside the lock, builds the app into BENCH_DIST_DIR unless BENCH_SKIP_BUILD=1 finds a build.
 */
export function lockAndBuild(entry: string): void {
  if (process.env.TROPOPASS_BENCH_LOCKED !== '1') {
    const r = spawnSync(
      'flock',
      [LOCK, process.execPath, '--import', 'tsx', path.join('tests', 'bench', entry), ...process.argv.slice(2)],
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
}

export interface BenchApp {
  /** The temporary folder of this run (database, files); removed by stopBenchApp. */
  work: string;
  port: number;
  baseUrl: string;
  env: NodeJS.ProcessEnv;
  conn: Database.Database;
  workspaceId: number;
  /** The session cookie of the demo analyst. */
  cookie: string;
}

/** A fresh demo database (migrated and seeded) in a new temporary folder, and the app's environment for it. */
export async function prepareBenchApp(prefix: string): Promise<BenchApp> {
  const work = fs.mkdtempSync(path.join(os.tmpdir(), prefix));
  const port = await freePort();
  const baseUrl = `http://127.0.0.1:${port}`;
  const dbFile = path.join(work, 'bench.sqlite');
  const env: NodeJS.ProcessEnv = benchNextEnv({
    ...process.env,
    NODE_ENV: 'production',
    SQLITE_FILE: dbFile,
    DATABASE_URL: '',
    DEMO_TODAY: '2026-11-20',
    NEXTAUTH_URL: baseUrl,
    NEXTAUTH_SECRET: SECRET,
    IMPORT_WORKER: '1',
    // The payment fake is not started here: the usage sender would only retry, and it is not part of the import figure.
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
  return { work, port, baseUrl, env, conn, workspaceId: workspace.id, cookie };
}

/** `next start` for the app in its own process group (node flags first); wait for it with waitForServer. */
export function spawnServer(app: BenchApp, nodeFlags: string[] = []): ChildProcess {
  return spawn(
    process.execPath,
    [...nodeFlags, 'node_modules/next/dist/bin/next', 'start', '-H', '127.0.0.1', '-p', String(app.port)],
    { cwd: root, env: app.env, stdio: ['ignore', 'inherit', 'inherit'], detached: true },
  );
}

/** Waits until the server answers its sign-in page below 500. */
export async function waitForServer(app: BenchApp, child: ChildProcess, seconds = 60): Promise<void> {
  const url = `${app.baseUrl}/signin`;
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

/** Closes the database, stops the server's process group (SIGTERM, then SIGKILL after 0.5 s) and removes the folder. */
export async function stopBenchApp(app: BenchApp, server: ChildProcess): Promise<void> {
  app.conn.close();
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
  fs.rmSync(app.work, { recursive: true, force: true });
}

/**
 * Polls the import every 250 ms until it is complete or failed (an error after 10 minutes from `t0`,
 * a performance.now() time); `onPoll` sees each answer. Returns the last status.
 */
export async function waitForImport(
  app: BenchApp,
  importId: number,
  t0: number,
  onPoll: (p: { status: string; rowsPerSecond?: number | null }) => void = () => undefined,
): Promise<string> {
  let status = '';
  while (status !== 'complete' && status !== 'failed') {
    await new Promise((r) => setTimeout(r, 250));
    const p = (await (
      await fetch(`${app.baseUrl}/api/v1/workspaces/skarn-polar/imports/${importId}`, {
        headers: { cookie: app.cookie },
      })
    ).json()) as { status: string; rowsPerSecond?: number | null };
    status = p.status;
    onPoll(p);
    if (performance.now() - t0 > 600_000) throw new Error('the import did not finish within 10 minutes');
  }
  return status;
}

/** The import's screened flights (flown ones only with `basis`) and the usage units recorded for its flights. */
export function importCounts(app: BenchApp, importId: number, basis?: 'flown'): { screened: number; units: number } {
  const screened = (
    app.conn
      .prepare(
        `select count(*) as n from flights where import_id = ? and status = 'screened'${basis ? ` and basis = '${basis}'` : ''}`,
      )
      .get(importId) as { n: number }
  ).n;
  const units = (
    app.conn
      .prepare(
        "select count(*) as n from usage_events u join flights f on f.id = u.source_id where u.kind = 'imported_flight' and f.import_id = ? and u.workspace_id = ?",
      )
      .get(importId, app.workspaceId) as { n: number }
  ).n;
  return { screened, units };
}

/** Resident memory (kB) of every process in the server's process group. */
export function groupRssKb(pgid: number): number {
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
