import { db } from '@/db/client';
import { isPostgres } from '@/db/config';

/** Every application table of the current database (SQLite or PostgreSQL). */
export async function tableNames(): Promise<string[]> {
  if (isPostgres()) {
    const r = (await db().raw(
      "select table_name as name from information_schema.tables where table_schema = current_schema() and table_type = 'BASE TABLE'",
    )) as { rows: { name: string }[] };
    return r.rows.map((x) => x.name).sort();
  }
  const rows = (await db().raw("select name from sqlite_master where type = 'table' and name not like 'sqlite_%'")) as {
    name: string;
  }[];
  return rows.map((x) => x.name).sort();
}

export async function rowCounts(): Promise<Record<string, number>> {
  const out: Record<string, number> = {};
  for (const name of await tableNames())
    out[name] = Number(((await db()(name).count({ n: '*' }).first()) as { n: number | string }).n);
  return out;
}
