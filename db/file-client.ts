import knexFactory from 'knex';
import { knexConfig } from './config';
import { closeDb } from './client';

const g = globalThis as unknown as { tropopassKnex?: unknown; tropopassKnexFile?: string };

/**
 * Points this thread's database singleton (db/client.ts) at one SQLite file, reopening it when the
 * file changes. A screening thread calls it before it writes a chunk, so it writes to the file its
 * caller uses (the caller's environment is copied to the thread when the thread starts, and tests
 * change files between runs).
 */
export async function openSqliteFile(file: string): Promise<void> {
  if (g.tropopassKnexFile === file && g.tropopassKnex) return;
  await closeDb();
  g.tropopassKnex = knexFactory(knexConfig({ sqliteFile: file, databaseUrl: '' }));
  g.tropopassKnexFile = file;
}
