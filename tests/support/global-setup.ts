import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import Database from 'better-sqlite3';
import type { TestProject } from 'vitest/node';

declare module 'vitest' {
  export interface ProvidedContext {
    templateDb: string;
    /** PostgreSQL mode (`npm run test:pg`): the migrated template database each test file copies; '' otherwise. */
    pgTemplate: string;
  }
}

/** Migrates one template SQLite file through the real knex CLI; each test file copies it. */
export default function setup(project: TestProject): () => void {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'tropopass-test-'));
  const file = path.join(dir, 'template.sqlite');
  execFileSync(
    process.execPath,
    ['--import', 'tsx', 'node_modules/knex/bin/cli.js', '--knexfile', 'knexfile.ts', 'migrate:latest'],
    {
      env: { ...process.env, SQLITE_FILE: file, DATABASE_URL: '' },
      stdio: 'pipe',
    },
  );
  // Fold the WAL into the main file so a plain copy of it is the whole migrated database.
  const conn = new Database(file);
  conn.pragma('wal_checkpoint(TRUNCATE)');
  conn.pragma('journal_mode = DELETE');
  conn.close();
  project.provide('templateDb', file);
  const pgTemplate = setupPostgresTemplate();
  project.provide('pgTemplate', pgTemplate);
  return () => {
    fs.rmSync(dir, { recursive: true, force: true });
    if (pgTemplate) dropPostgresDatabase(pgTemplate);
  };
}

/** With TEST_PG_ADMIN_URL (set by tests/pg/run.ts), one migrated PostgreSQL template database. */
function setupPostgresTemplate(): string {
  const admin = process.env.TEST_PG_ADMIN_URL;
  if (!admin) return '';
  const name = `tropopass_tpl_${process.pid}`;
  psql(admin, `DROP DATABASE IF EXISTS ${name}`);
  psql(admin, `CREATE DATABASE ${name}`);
  const url = new URL(admin);
  url.pathname = `/${name}`;
  execFileSync(
    process.execPath,
    ['--import', 'tsx', 'node_modules/knex/bin/cli.js', '--knexfile', 'knexfile.ts', 'migrate:latest'],
    {
      env: { ...process.env, DATABASE_URL: url.toString() },
      stdio: 'pipe',
    },
  );
  return name;
}

function dropPostgresDatabase(name: string): void {
  const admin = process.env.TEST_PG_ADMIN_URL;
  if (admin) psql(admin, `DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
}

function psql(url: string, sql: string): void {
  execFileSync('psql', [url, '-v', 'ON_ERROR_STOP=1', '-q', '-c', sql], { stdio: 'pipe' });
}
