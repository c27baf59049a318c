import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import Database from 'better-sqlite3';
import { describe, expect, it } from 'vitest';
import { apiRequest, call, makeWorkspace, onPostgres, sessionCookie, useTestDatabase } from '../support/test-db';
import { FLIGHT } from './security/fixtures';
import * as screeningsRoute from '@/app/api/v1/workspaces/[slug]/screenings/route';
import { backupDatabase, sqliteRowCounts } from '@/db/backup';
import { closeDb, db } from '@/db/client';
import { resetEnvForTests } from '@/lib/env';

const { file } = useTestDatabase();

async function countsThroughKnex(): Promise<Record<string, number>> {
  const names = (await db().raw(
    "select name from sqlite_master where type = 'table' and name not like 'sqlite_%' order by name",
  )) as { name: string }[];
  const out: Record<string, number> = {};
  for (const { name } of names) out[name] = Number(((await db()(name).count({ n: '*' }).first()) as { n: number }).n);
  return out;
}

// db:backup copies the SQLite file; on PostgreSQL the server's own tools (pg_dump) do that job.
describe.skipIf(onPostgres())('online backup (db:backup)', () => {
  it('copies a consistent snapshot while the app holds the database open, WAL included; a restore has the same rows', async () => {
    const ws = await makeWorkspace(['planner']);
    const cookie = await sessionCookie(ws.members.planner.id);
    for (let i = 0; i < 5; i++) {
      const r = await call(
        screeningsRoute.POST,
        apiRequest('POST', `/api/v1/workspaces/${ws.slug}/screenings`, {
          cookie,
          body: { ...FLIGHT, name: `backup ${i}` },
        }),
        { slug: ws.slug },
      );
      expect(r.status).toBe(201);
    }
    // The app's connection is open in WAL mode and has not checkpointed: the latest rows are only in the -wal file.
    expect(fs.existsSync(`${file()}-wal`)).toBe(true);
    expect(fs.statSync(`${file()}-wal`).size).toBeGreaterThan(0);
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'tropopass-backup-'));
    const naive = path.join(dir, 'naive.sqlite');
    fs.copyFileSync(file(), naive);
    const naiveConn = new Database(naive, { readonly: true });
    // A plain copy of the main file alone misses what is still in the WAL (no checkpoint has run: < 1000 pages written).
    expect((naiveConn.prepare('select count(*) as n from screenings').get() as { n: number }).n).toBeLessThan(5);
    naiveConn.close();
    const before = await countsThroughKnex();
    expect(before.screenings).toBe(5);
    expect(before.usage_events).toBe(5);

    const target = path.join(dir, 'copy.sqlite');
    const report = await backupDatabase({ source: file(), target });
    expect(report.integrity).toBe('ok');
    expect(report.rowCounts).toEqual(before);

    // The app keeps writing after the backup; the copy does not change.
    const more = await call(
      screeningsRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/screenings`, { cookie, body: FLIGHT }),
      { slug: ws.slug },
    );
    expect(more.status).toBe(201);
    const copy = new Database(target, { readonly: true });
    expect(sqliteRowCounts(copy)).toEqual(before);
    copy.close();

    // Restore: point the app at a copy of the backup and read it through the normal data layer.
    const restored = path.join(dir, 'restored.sqlite');
    fs.copyFileSync(target, restored);
    await closeDb();
    process.env.SQLITE_FILE = restored;
    resetEnvForTests();
    expect(await countsThroughKnex()).toEqual(before);
    const list = await call<{ items: { name: string }[] }>(
      screeningsRoute.GET,
      apiRequest('GET', `/api/v1/workspaces/${ws.slug}/screenings?limit=50`, { cookie }),
      { slug: ws.slug },
    );
    expect(list.body.items.map((i) => i.name).sort()).toEqual([
      'backup 0',
      'backup 1',
      'backup 2',
      'backup 3',
      'backup 4',
    ]);
    await closeDb();
    process.env.SQLITE_FILE = file();
    resetEnvForTests();
  });

  it('the npm script backs up the configured file and refuses to overwrite', () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'tropopass-backup-cli-'));
    const target = path.join(dir, 'cli.sqlite');
    const run = () =>
      execFileSync(process.execPath, ['--import', 'tsx', 'db/backup.ts', target], {
        env: { ...process.env, SQLITE_FILE: file(), DATABASE_URL: '' },
        encoding: 'utf8',
        stdio: 'pipe',
      });
    expect(run()).toMatch(/integrity_check: ok/);
    expect(fs.existsSync(target)).toBe(true);
    expect(run).toThrow(/already exists/);
  });
});
