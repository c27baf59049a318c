/**
 * `npm run test:pg`: the same migrations and integration tests on PostgreSQL. Starts Debian's
 * PostgreSQL as its own `postgres` user in a temporary directory on a free loopback port (installing
 * the `postgresql` package with apt-get when it is missing and this runs as root), checks that every
 * migration goes up, down and up again, then runs the vitest integration project with
 * TEST_PG_ADMIN_URL set: tests/support/global-setup.ts migrates a template database and
 * tests/support/test-db.ts gives each test file its own copy. The server is stopped afterwards.
 */
import { execFileSync, spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { freePort } from '../support/free-port';

const ROOT = process.cwd();

function pgBinDir(): string | null {
  const base = '/usr/lib/postgresql';
  if (!fs.existsSync(base)) return null;
  const versions = fs
    .readdirSync(base)
    .filter((v) => fs.existsSync(path.join(base, v, 'bin', 'initdb')))
    .sort((a, b) => Number(b) - Number(a));
  return versions.length ? path.join(base, versions[0], 'bin') : null;
}

function ensurePostgres(): string {
  const found = pgBinDir();
  if (found) return found;
  if (process.getuid?.() !== 0) throw new Error('PostgreSQL is not installed; run: apt-get install -y postgresql');
  console.log('[pg] installing Debian postgresql ...');
  execFileSync('apt-get', ['update', '-qq'], { stdio: 'inherit' });
  execFileSync('apt-get', ['install', '-y', '-qq', 'postgresql'], {
    stdio: 'inherit',
    env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' },
  });
  const bin = pgBinDir();
  if (!bin) throw new Error('postgresql installed but initdb not found');
  return bin;
}

/** Runs a PostgreSQL binary as the postgres user (initdb and the server refuse to run as root). */
function asPostgres(bin: string, args: string[], opts: { stdio?: 'inherit' | 'pipe' } = {}): void {
  const asRoot = process.getuid?.() === 0;
  const [cmd, argv] = asRoot ? ['runuser', ['-u', 'postgres', '--', bin, ...args]] : [bin, args];
  const r = spawnSync(cmd, argv, { stdio: opts.stdio ?? 'pipe', encoding: 'utf8', cwd: os.tmpdir() });
  if (r.status !== 0)
    throw new Error(`${path.basename(bin)} ${args.join(' ')} failed:\n${r.stdout ?? ''}${r.stderr ?? ''}`);
}

function knex(env: NodeJS.ProcessEnv, ...args: string[]): void {
  const r = spawnSync(
    process.execPath,
    ['--import', 'tsx', 'node_modules/knex/bin/cli.js', '--knexfile', 'knexfile.ts', ...args],
    { cwd: ROOT, env, stdio: 'pipe', encoding: 'utf8' },
  );
  if (r.status !== 0) throw new Error(`knex ${args.join(' ')} failed:\n${r.stdout}${r.stderr}`);
  console.log(`[pg] knex ${args.join(' ')}: ${(r.stdout.trim().split('\n').pop() ?? '').trim()}`);
}

async function main(): Promise<number> {
  const bin = ensurePostgres();
  const work = fs.mkdtempSync(path.join(os.tmpdir(), 'tropopass-pg-'));
  const data = path.join(work, 'data');
  const sock = path.join(work, 'sock');
  fs.mkdirSync(sock);
  if (process.getuid?.() === 0) execFileSync('chown', ['-R', 'postgres:postgres', work]);
  const port = await freePort();
  asPostgres(path.join(bin, 'initdb'), [
    '-D',
    data,
    '-A',
    'trust',
    '-U',
    'postgres',
    '-E',
    'UTF8',
    '--locale=C',
    '--no-sync',
  ]);
  const serverOpts = `-p ${port} -c listen_addresses=127.0.0.1 -k ${sock} -c fsync=off -c synchronous_commit=off -c full_page_writes=off -c max_connections=300`;
  asPostgres(path.join(bin, 'pg_ctl'), [
    '-D',
    data,
    '-l',
    path.join(work, 'server.log'),
    '-o',
    serverOpts,
    '-w',
    'start',
  ]);
  const admin = `postgres://postgres@127.0.0.1:${port}/postgres`;
  console.log(`[pg] PostgreSQL (${path.basename(path.dirname(bin))}) on 127.0.0.1:${port}`);
  try {
    execFileSync('psql', [admin, '-q', '-c', 'CREATE DATABASE tropopass_migrations']);
    const migEnv = { ...process.env, DATABASE_URL: `postgres://postgres@127.0.0.1:${port}/tropopass_migrations` };
    knex(migEnv, 'migrate:latest');
    knex(migEnv, 'migrate:rollback', '--all');
    knex(migEnv, 'migrate:latest');
    knex({ ...migEnv, DEMO_TODAY: '2026-11-20' }, 'seed:run');
    const args = process.argv.slice(2);
    const r = spawnSync(
      process.execPath,
      ['node_modules/vitest/vitest.mjs', 'run', '--project', 'integration', ...args],
      {
        cwd: ROOT,
        env: { ...process.env, TEST_PG_ADMIN_URL: admin, DATABASE_URL: '' },
        stdio: 'inherit',
      },
    );
    return r.status ?? 1;
  } finally {
    try {
      asPostgres(path.join(bin, 'pg_ctl'), ['-D', data, '-m', 'fast', '-w', 'stop']);
    } catch (err) {
      console.error(`[pg] stopping the server: ${(err as Error).message}`);
    }
    fs.rmSync(work, { recursive: true, force: true });
  }
}

main().then(
  (code) => process.exit(code),
  (err: Error) => {
    console.error(`[pg] ${err.message}`);
    process.exit(1);
  },
);
