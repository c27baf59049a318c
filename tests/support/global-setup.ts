import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import Database from 'better-sqlite3';
import type { TestProject } from 'vitest/node';

declare module 'vitest' {
  export interface ProvidedContext {
    templateDb: string;
  }
}

/** Migrates one template SQLite file through the real knex CLI; each test file copies it. */
export default function setup(project: TestProject): () => void {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'tropopass-test-'));
  const file = path.join(dir, 'template.sqlite');
  execFileSync(process.execPath, ['--import', 'tsx', 'node_modules/knex/bin/cli.js', '--knexfile', 'knexfile.ts', 'migrate:latest'], {
    env: { ...process.env, SQLITE_FILE: file, DATABASE_URL: '' },
    stdio: 'pipe',
  });
  // Fold the WAL into the main file so a plain copy of it is the whole migrated database.
  const conn = new Database(file);
  conn.pragma('wal_checkpoint(TRUNCATE)');
  conn.pragma('journal_mode = DELETE');
  conn.close();
  project.provide('templateDb', file);
  return () => fs.rmSync(dir, { recursive: true, force: true });
}
