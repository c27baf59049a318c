import type { Knex } from 'knex';
import { createRequire } from 'node:module';

const require = createRequire(import.meta.url);

type TransactionCtor = new (...args: unknown[]) => { query(conn: unknown, sql: string): Promise<unknown> };
type ClientCtor = new (config: Knex.Config) => { transaction(...args: unknown[]): unknown };

let cachedClient: ClientCtor | undefined;

interface PreparingConnection {
  prepare(sql: string): unknown;
}

/** Statements kept per connection; queries with generated IN lists beyond this are prepared afresh. */
export const STATEMENT_CACHE_SIZE = 256;

/**
 * Knex prepares every query anew. better-sqlite3 statements can be run again with new bindings (and
 * SQLite re-prepares one itself after a schema change), so the connection keeps the most recently
 * used ones by SQL text. Knex runs each statement to completion with `all` or `run`, never leaving
 * one mid-iteration, so sharing a statement between queries is safe.
 */
export function cachePreparedStatements(conn: PreparingConnection): void {
  const prepare = conn.prepare.bind(conn);
  const cache = new Map<string, unknown>();
  conn.prepare = (sql: string) => {
    let st = cache.get(sql);
    if (st !== undefined) {
      cache.delete(sql);
    } else {
      st = prepare(sql);
      if (cache.size >= STATEMENT_CACHE_SIZE) cache.delete(cache.keys().next().value as string);
    }
    cache.set(sql, st);
    return st;
  };
}

/**
 * Knex's better-sqlite3 client opens transactions with a deferred `BEGIN`; a deferred transaction
 * that later writes can fail with SQLITE_BUSY without waiting. Every write here is a transaction,
 * so this client opens them with `BEGIN IMMEDIATE`, which takes the write lock up front and honours
 * `busy_timeout`.
 */
export function createSqliteClient(): ClientCtor {
  if (cachedClient) return cachedClient;
  const BaseClient = require('knex/lib/dialects/better-sqlite3/index.js') as ClientCtor;
  const BaseTransaction = require('knex/lib/dialects/sqlite3/execution/sqlite-transaction.js') as TransactionCtor;

  class ImmediateTransaction extends BaseTransaction {
    begin(conn: unknown) {
      return this.query(conn, 'BEGIN IMMEDIATE;');
    }
  }

  class ImmediateClient extends BaseClient {
    transaction(...args: unknown[]) {
      return new ImmediateTransaction(this, ...args);
    }

    async acquireRawConnection(): Promise<unknown> {
      const conn = (await (
        BaseClient.prototype as unknown as { acquireRawConnection(): Promise<unknown> }
      ).acquireRawConnection.call(this)) as PreparingConnection;
      cachePreparedStatements(conn);
      return conn;
    }
  }
  cachedClient = ImmediateClient;
  return ImmediateClient;
}
