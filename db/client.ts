import 'server-only';
import knexFactory, { type Knex } from 'knex';
import { knexConfig, isPostgres } from './config';

const globalForDb = globalThis as unknown as { tropopassKnex?: Knex };

/** The Knex singleton, opened on first use and kept on `globalThis` so dev reloads reuse it. */
export function db(): Knex {
  if (!globalForDb.tropopassKnex) {
    globalForDb.tropopassKnex = knexFactory(knexConfig());
  }
  return globalForDb.tropopassKnex;
}

/** Closes the singleton (tests, scripts). */
export async function closeDb(): Promise<void> {
  const k = globalForDb.tropopassKnex;
  globalForDb.tropopassKnex = undefined;
  if (k) await k.destroy();
}

export const usingPostgres = (): boolean => isPostgres();

/** A write transaction: BEGIN IMMEDIATE on SQLite (see sqlite-client.ts), a plain one on PostgreSQL. */
export function writeTx<T>(fn: (trx: Knex.Transaction) => Promise<T>): Promise<T> {
  return db().transaction(fn);
}

export const nowIso = (): string => new Date().toISOString();

/** The id of a row just inserted, on SQLite and PostgreSQL alike. */
export async function insertId(query: Promise<unknown[]>): Promise<number> {
  const rows = (await query) as (number | { id: number })[];
  const first = rows[0];
  return typeof first === 'object' ? Number(first.id) : Number(first);
}
