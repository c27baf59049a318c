import type { Knex } from 'knex';
import { createRequire } from 'node:module';

const require = createRequire(import.meta.url);

type TransactionCtor = new (...args: unknown[]) => { query(conn: unknown, sql: string): Promise<unknown> };
type ClientCtor = new (config: Knex.Config) => { transaction(...args: unknown[]): unknown };

let cachedClient: ClientCtor | undefined;

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
  }
  cachedClient = ImmediateClient;
  return ImmediateClient;
}
