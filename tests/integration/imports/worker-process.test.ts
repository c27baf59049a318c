import { spawn } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { call, makeWorkspace, sessionCookie, useTestDatabase } from '../../support/test-db';
import * as importsRoute from '@/app/api/v1/workspaces/[slug]/imports/route';
import { db } from '@/db/client';
import type { ImportDto } from '@/db/imports';
import { HEADER, addScheduleLibrary, csv, goodRows, uploadRequest } from './support';

const { file } = useTestDatabase();

describe('npm run worker', () => {
  it(
    'a standalone worker process screens an import the web side only accepted, in its threads, and stops cleanly on SIGTERM',
    { timeout: 120_000 },
    async () => {
      const ws = await makeWorkspace(['analyst']);
      await addScheduleLibrary(ws.id);
      const r = await call<ImportDto>(
        importsRoute.POST,
        uploadRequest(ws.slug, csv(HEADER, ...goodRows(2000, 'P')), {
          cookie: await sessionCookie(ws.members.analyst.id),
        }),
        { slug: ws.slug },
      );
      expect(r.status).toBe(202);
      // Nothing in this (web) process screens it.
      expect((await db()('imports').where({ id: r.body.id }).first()).status).toBe('queued');

      const child = spawn(process.execPath, ['--conditions=react-server', '--import', 'tsx', 'lib/worker/main.ts'], {
        cwd: process.cwd(),
        env: { ...process.env, SQLITE_FILE: file(), BILLING_SENDER: '0', SCREENING_THREADS: '1', LOG_LEVEL: 'silent' },
        stdio: ['ignore', 'pipe', 'pipe'],
      });
      let out = '';
      child.stdout.on('data', (d: Buffer) => (out += d.toString()));
      child.stderr.on('data', (d: Buffer) => (out += d.toString()));
      const exited = new Promise<number | null>((resolve) => child.on('exit', (code) => resolve(code)));
      try {
        const deadline = Date.now() + 90_000;
        for (;;) {
          const imp = await db()('imports').where({ id: r.body.id }).first();
          if (imp.status === 'complete' || imp.status === 'failed') break;
          if (Date.now() > deadline || child.exitCode !== null)
            throw new Error(`import not screened (${imp.status}, ${imp.rows_done} rows); worker said:\n${out}`);
          await new Promise((res) => setTimeout(res, 200));
        }
      } finally {
        child.kill('SIGTERM');
      }
      expect(await exited).toBe(0);
      expect(out).toMatch(/worker \d+ started \(imports: yes, usage sending: no\)/);
      const imp = await db()('imports').where({ id: r.body.id }).first();
      expect({ status: imp.status, rowsDone: Number(imp.rows_done) }).toEqual({ status: 'complete', rowsDone: 2000 });
      const units = (await db()('usage_events')
        .where({ workspace_id: ws.id, kind: 'imported_flight' })
        .count({ n: '*' })
        .first()) as { n: number | string };
      expect(Number(units.n)).toBe(2000);
    },
  );
});
