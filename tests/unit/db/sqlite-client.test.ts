import { afterEach, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import knex, { type Knex } from 'knex';
import { STATEMENT_CACHE_SIZE, cachePreparedStatements, createSqliteClient } from '@/db/sqlite-client';

let open: Knex | null = null;
afterEach(async () => {
  await open?.destroy();
  open = null;
});

function fresh(): Knex {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'tropopass-client-'));
  open = knex({
    client: createSqliteClient() as never,
    connection: { filename: path.join(dir, 'x.sqlite') },
    useNullAsDefault: true,
    pool: { min: 1, max: 1 },
  });
  return open;
}

describe('prepared statements kept per connection', () => {
  it('hands back the same statement for the same SQL, and drops the least recently used beyond the limit', () => {
    let prepared = 0;
    const conn = { prepare: (sql: string) => ({ sql, n: ++prepared }) };
    cachePreparedStatements(conn);
    const a = conn.prepare('select 1');
    expect(conn.prepare('select 1')).toBe(a);
    expect(prepared).toBe(1);
    for (let i = 0; i < STATEMENT_CACHE_SIZE; i++) conn.prepare(`select ${i + 2}`);
    // 'select 1' was the least recently used when the cache overflowed.
    expect(conn.prepare('select 1')).not.toBe(a);
    expect(prepared).toBe(STATEMENT_CACHE_SIZE + 2);
  });

  it('gives right answers through knex with new bindings, writes, transactions and a schema change', async () => {
    const db = fresh();
    await db.schema.createTable('t', (t) => {
      t.increments('id');
      t.text('name');
    });
    for (const name of ['a', 'b', 'c']) await db('t').insert({ name });
    expect((await db('t').where({ name: 'b' }).first())?.id).toBe(2);
    expect((await db('t').where({ name: 'c' }).first())?.id).toBe(3);
    await db.transaction(async (trx) => {
      await trx('t').where({ name: 'a' }).update({ name: 'z' });
    });
    expect(await db('t').orderBy('id').pluck('name')).toEqual(['z', 'b', 'c']);
    // The same SQL after the table gained a column: SQLite re-prepares it, the new column shows.
    await db.schema.alterTable('t', (t) => {
      t.integer('size').defaultTo(7);
    });
    expect(await db('t').where({ name: 'b' }).first()).toEqual({ id: 2, name: 'b', size: 7 });
  });
});
