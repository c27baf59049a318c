/**
 * `npm run db:backup [target]`: an online backup of the SQLite database through SQLite's backup API
 * (better-sqlite3 `db.backup`), safe while the app is serving and writing: it copies a consistent
 * snapshot including what still sits in the WAL, which a plain file copy would miss. The copy is
 * checked with `PRAGMA integrity_check` and its row counts are printed.
 */
import fs from 'node:fs';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import Database from 'better-sqlite3';
import { isPostgres, knexConfig } from './config';

export interface BackupReport {
  source: string;
  target: string;
  bytes: number;
  pages: number;
  seconds: number;
  integrity: string;
  rowCounts: Record<string, number>;
}

/** Row counts of every table of an open SQLite connection. */
export function sqliteRowCounts(conn: Database.Database): Record<string, number> {
  const names = conn
    .prepare("select name from sqlite_master where type = 'table' and name not like 'sqlite_%' order by name")
    .all() as { name: string }[];
  const out: Record<string, number> = {};
  for (const { name } of names)
    out[name] = (conn.prepare(`select count(*) as n from "${name.replace(/"/g, '""')}"`).get() as { n: number }).n;
  return out;
}

/** The app's SQLite file, resolved exactly as the app and the knex CLI resolve it. */
export function configuredSqliteFile(): string {
  const conn = knexConfig().connection as { filename: string };
  return conn.filename;
}

export function defaultBackupTarget(source: string, now = new Date()): string {
  const stamp = now.toISOString().replace(/[:.]/g, '-');
  return path.join(path.dirname(source), 'backups', `${path.basename(source, path.extname(source))}-${stamp}.sqlite`);
}

export async function backupDatabase(opts: { source: string; target: string }): Promise<BackupReport> {
  if (!fs.existsSync(opts.source)) throw new Error(`No database at ${opts.source}.`);
  if (fs.existsSync(opts.target)) throw new Error(`${opts.target} already exists; choose a new file.`);
  fs.mkdirSync(path.dirname(opts.target), { recursive: true });
  const started = Date.now();
  const src = new Database(opts.source, { fileMustExist: true });
  let pages = 0;
  try {
    src.pragma('busy_timeout = 5000');
    const meta = await src.backup(opts.target);
    pages = meta.totalPages;
  } finally {
    src.close();
  }
  const copy = new Database(opts.target, { fileMustExist: true });
  try {
    // A backup is a single self-contained file: no WAL beside it.
    copy.pragma('journal_mode = DELETE');
    const integrity = String(copy.pragma('integrity_check', { simple: true }));
    const rowCounts = sqliteRowCounts(copy);
    return {
      source: opts.source,
      target: opts.target,
      bytes: fs.statSync(opts.target).size,
      pages,
      seconds: (Date.now() - started) / 1000,
      integrity,
      rowCounts,
    };
  } finally {
    copy.close();
  }
}

async function main(): Promise<number> {
  if (isPostgres()) {
    console.error(
      "DATABASE_URL points at PostgreSQL: back it up with pg_dump (or the server's own backup); db:backup copies the SQLite file.",
    );
    return 2;
  }
  const source = configuredSqliteFile();
  const target = path.resolve(process.argv[2] ?? defaultBackupTarget(source));
  const r = await backupDatabase({ source, target });
  const tables = Object.entries(r.rowCounts);
  console.log(`backup ${r.source} -> ${r.target}`);
  console.log(
    `${r.pages} pages, ${(r.bytes / 1024).toFixed(0)} KiB, ${r.seconds.toFixed(2)} s, integrity_check: ${r.integrity}`,
  );
  for (const [name, n] of tables) console.log(`  ${name.padEnd(28)} ${n}`);
  return r.integrity === 'ok' ? 0 : 1;
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  main().then(
    (code) => process.exit(code),
    (err: Error) => {
      console.error(`db:backup failed: ${err.message}`);
      process.exit(1);
    },
  );
}
