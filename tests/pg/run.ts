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
import { pgBinDir, startScratchPostgres } from '../support/scratch-postgres';

const ROOT = process.cwd();

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
  const pg = await startScratchPostgres(bin, work, ['full_page_writes=off', 'max_connections=300']);
  const { port, adminUrl: admin } = pg;
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
    pg.stop('[pg] stopping the server');
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
