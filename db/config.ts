import path from 'node:path';
import fs from 'node:fs';
import { Knex } from 'knex';
import { createRequire } from 'node:module';
import { createSqliteClient } from './sqlite-client';

/**
 * Connection settings shared by the app (`db/client.ts`), the knex CLI (`knexfile.ts`) and tests.
 * SQLite by default; `DATABASE_URL=postgres://...` switches to PostgreSQL.
 */
export function isPostgres(url = process.env.DATABASE_URL): boolean {
  return !!url && /^postgres(ql)?:\/\//.test(url);
}

export function knexConfig(overrides: { sqliteFile?: string; databaseUrl?: string } = {}): Knex.Config {
  const root = process.cwd();
  const migrations: Knex.MigratorConfig = {
    directory: path.join(/*turbopackIgnore: true*/ root, 'migrations'),
    extension: 'ts',
    loadExtensions: ['.ts'],
    tableName: 'knex_migrations',
  };
  const seeds: Knex.SeederConfig = {
    directory: path.join(/*turbopackIgnore: true*/ root, 'seeds'),
    loadExtensions: ['.ts'],
  };
  const databaseUrl = overrides.databaseUrl ?? process.env.DATABASE_URL;
  if (isPostgres(databaseUrl)) {
    parsePostgresNumbersAsPlainNumbers();
    return { client: 'pg', connection: databaseUrl, pool: { min: 0, max: 10 }, migrations, seeds };
  }
  const file = path.resolve(
    /*turbopackIgnore: true*/ root,
    overrides.sqliteFile ?? process.env.SQLITE_FILE ?? '.data/tropopass.sqlite',
  );
  fs.mkdirSync(path.dirname(file), { recursive: true });
  return {
    client: createSqliteClient() as unknown as typeof Knex.Client,
    connection: { filename: file },
    useNullAsDefault: true,
    // One connection per process: SQLite serialises writers anyway, and a single connection keeps
    // BEGIN IMMEDIATE from queueing behind itself.
    pool: {
      min: 1,
      max: 1,
      afterCreate(conn: SqlitePragmaConnection, done: (err: Error | null, conn: unknown) => void) {
        try {
          conn.pragma('journal_mode = WAL');
          conn.pragma('busy_timeout = 5000');
          conn.pragma('foreign_keys = ON');
          // Billing and import data must survive a power loss.
          conn.pragma('synchronous = FULL');
          done(null, conn);
        } catch (err) {
          done(err as Error, conn);
        }
      },
    },
    migrations,
    seeds,
  };
}

interface SqlitePragmaConnection {
  pragma(source: string): unknown;
}

/**
 * PostgreSQL returns `count(*)` and `sum()` of integers as int8 and `avg()` as numeric, which the
 * driver hands over as strings; SQLite gives numbers. Parse them as numbers on both (counts and
 * ledger sums stay far below 2^53).
 */
function parsePostgresNumbersAsPlainNumbers(): void {
  const pg = createRequire(import.meta.url)('pg') as {
    types: { setTypeParser(oid: number, parse: (v: string) => unknown): void };
  };
  const INT8 = 20;
  const NUMERIC = 1700;
  pg.types.setTypeParser(INT8, (v) => Number.parseInt(v, 10));
  pg.types.setTypeParser(NUMERIC, (v) => Number.parseFloat(v));
}
