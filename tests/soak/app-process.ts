/**
 * Starts the built app the way tests/e2e/run.ts does (fresh SQLite file migrated and seeded with the
 * demo scenario, `next start` on 127.0.0.1, every child in its own process group) for the load
 * benchmark and the crash-safety soak. Building is left to the caller, under the e2e lock.
 */
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import Database from 'better-sqlite3';
import { newApiKey } from '@/lib/auth/tokens';

export const ROOT = process.cwd();

/** `distDir` is the build directory (TROPOPASS_DIST_DIR); the benchmarks pass their own. */
export function hasBuild(distDir = '.next'): boolean {
  return fs.existsSync(path.join(ROOT, distDir, 'BUILD_ID'));
}

const LOCK = '/tmp/tropopass-e2e.lock';

/**
 * Runs this script again under the checkout's e2e lock (flock), so no `next build` can replace
 * `.next/` while the server runs from it. Returns the child's exit code, or null when the lock is
 * already held (the caller then goes on).
 */
export function reexecUnderLock(entry: string): number | null {
  if (process.env.TROPOPASS_E2E_LOCK_HELD === '1') return null;
  const r = spawnSync('flock', [LOCK, process.execPath, '--import', 'tsx', entry, ...process.argv.slice(2)], {
    cwd: ROOT,
    stdio: 'inherit',
    env: { ...process.env, TROPOPASS_E2E_LOCK_HELD: '1' },
  });
  return r.status ?? 1;
}

/** `next build`; call it only while holding the lock (see reexecUnderLock). */
export function build(env: NodeJS.ProcessEnv = process.env): void {
  const r = spawnSync(process.execPath, ['node_modules/next/dist/bin/next', 'build'], {
    cwd: ROOT,
    stdio: 'inherit',
    env,
  });
  if (r.status !== 0) throw new Error(`next build failed (exit ${r.status})`);
}

export interface AppEnvOptions {
  dir: string;
  port: number;
  extra?: Record<string, string>;
}

export function appEnv(o: AppEnvOptions): NodeJS.ProcessEnv {
  const base = `http://127.0.0.1:${o.port}`;
  return {
    ...process.env,
    NODE_ENV: 'production',
    SQLITE_FILE: path.join(o.dir, 'app.sqlite'),
    DATABASE_URL: '',
    DEMO_TODAY: process.env.DEMO_TODAY ?? '2026-11-20',
    NEXTAUTH_URL: base,
    NEXTAUTH_SECRET: 'bench-secret-0123456789-abcdefghijkl',
    RATE_LIMIT_SIGNIN_PER_15MIN: '100000',
    RATE_LIMIT_PREVIEW_PER_MIN: '100000000',
    RATE_LIMIT_API_PER_MIN: '100000000',
    RATE_LIMIT_EMAIL_PER_HOUR: '100000',
    LOG_LEVEL: 'warn',
    ...o.extra,
  };
}

const KNEX_CLI = ['--import', 'tsx', 'node_modules/knex/bin/cli.js', '--knexfile', 'knexfile.ts'];

/** A fresh database: the real migrations and the demo seed, through the knex CLI. */
export function prepareDatabase(env: NodeJS.ProcessEnv, opts: { seed?: boolean } = {}): void {
  for (const step of opts.seed === false ? ['migrate:latest'] : ['migrate:latest', 'seed:run']) {
    const r = spawnSync(process.execPath, [...KNEX_CLI, step], { cwd: ROOT, env, stdio: 'pipe', encoding: 'utf8' });
    if (r.status !== 0) throw new Error(`${step} failed: ${r.stderr}`);
  }
}

/** A workspace API key inserted straight into the database before the server starts. */
export function insertApiKey(file: string, slug: string, role: 'planner' | 'analyst' | 'viewer' = 'analyst'): string {
  const conn = new Database(file);
  try {
    conn.pragma('busy_timeout = 5000');
    const ws = conn.prepare('select id from workspaces where slug = ?').get(slug) as { id: number } | undefined;
    if (!ws) throw new Error(`no workspace ${slug} in ${file}`);
    const { key, prefix, hash } = newApiKey();
    // A key lives only while its creator may make keys, so it is made in an owner's name.
    const owner = conn
      .prepare("select user_id from memberships where workspace_id = ? and role = 'owner' order by id limit 1")
      .get(ws.id) as { user_id: number } | undefined;
    if (!owner) throw new Error(`no owner in ${slug}`);
    conn
      .prepare(
        'insert into api_keys (workspace_id, name, role, key_prefix, key_hash, created_by, created_at) values (?, ?, ?, ?, ?, ?, ?)',
      )
      .run(ws.id, `bench-${Date.now()}`, role, prefix, hash, owner.user_id, new Date().toISOString());
    return key;
  } finally {
    conn.close();
  }
}

export interface RunningApp {
  child: ChildProcess;
  baseUrl: string;
  /** Everything the server printed so far (stdout and stderr). */
  output: () => string;
  stop: (signal?: NodeJS.Signals) => Promise<void>;
}

/** Signals a child's whole process group and waits for the child to exit; SIGKILL after 5 s. */
export async function stopGroup(child: ChildProcess, signal: NodeJS.Signals): Promise<void> {
  if (child.exitCode !== null || child.signalCode !== null) return;
  const exited = new Promise<void>((r) => child.once('exit', () => r()));
  try {
    if (child.pid) process.kill(-child.pid, signal);
  } catch {
    return;
  }
  const t = setTimeout(() => {
    try {
      if (child.pid) process.kill(-child.pid, 'SIGKILL');
    } catch {
      /* already gone */
    }
  }, 5000);
  await exited;
  clearTimeout(t);
}

export async function startApp(
  env: NodeJS.ProcessEnv,
  port: number,
  opts: { echo?: boolean } = {},
): Promise<RunningApp> {
  const child = spawn(
    process.execPath,
    ['node_modules/next/dist/bin/next', 'start', '-H', '127.0.0.1', '-p', String(port)],
    { cwd: ROOT, env, stdio: ['ignore', 'pipe', 'pipe'], detached: true },
  );
  let out = '';
  const collect = (b: Buffer) => {
    out += b.toString('utf8');
    if (opts.echo) process.stderr.write(b);
  };
  child.stdout?.on('data', collect);
  child.stderr?.on('data', collect);
  const baseUrl = `http://127.0.0.1:${port}`;
  const app: RunningApp = {
    child,
    baseUrl,
    output: () => out,
    stop: async (signal = 'SIGTERM') => stopGroup(child, signal),
  };
  const until = Date.now() + 60_000;
  while (Date.now() < until) {
    if (child.exitCode !== null) throw new Error(`server exited early (code ${child.exitCode}):\n${out}`);
    try {
      const res = await fetch(`${baseUrl}/api/health`);
      if (res.status < 500) return app;
    } catch {
      /* not up yet */
    }
    await new Promise((r) => setTimeout(r, 100));
  }
  await app.stop('SIGKILL');
  throw new Error(`timed out waiting for ${baseUrl}`);
}

export function tempDir(prefix: string): string {
  return fs.mkdtempSync(path.join(os.tmpdir(), prefix));
}
