import { describe, expect, it } from 'vitest';
import { call, makeWorkspace, onPostgres, sessionCookie, useTestDatabase } from '../../support/test-db';
import * as importsRoute from '@/app/api/v1/workspaces/[slug]/imports/route';
import { db } from '@/db/client';
import type { ImportDto } from '@/db/imports';
import { IMPORT_LOCK_KEYS, leaseImport } from '@/lib/imports/import-lock';
import { runImportsToCompletion } from '@/lib/imports/worker';
import { HEADER, addScheduleLibrary, csv, goodRows, uploadRequest } from './support';

useTestDatabase();

async function upload(rows: number, prefix: string): Promise<number> {
  const ws = await makeWorkspace(['analyst']);
  await addScheduleLibrary(ws.id);
  const r = await call<ImportDto>(
    importsRoute.POST,
    uploadRequest(ws.slug, csv(HEADER, ...goodRows(rows, prefix)), {
      cookie: await sessionCookie(ws.members.analyst.id),
    }),
    { slug: ws.slug },
  );
  expect(r.status).toBe(202);
  return r.body.id;
}

const pendingOf = async (importId: number) =>
  Number(
    (
      (await db()('flights').where({ import_id: importId, status: 'pending' }).count({ n: '*' }).first()) as {
        n: number | string;
      }
    ).n,
  );

describe.runIf(onPostgres())('one worker process per import (PostgreSQL advisory lock)', () => {
  it('an import another process is screening is left alone, and taken over once that process lets go', async () => {
    const importId = await upload(600, 'L');
    let release: () => void = () => undefined;
    const released = new Promise<void>((r) => (release = r));
    let held: () => void = () => undefined;
    const isHeld = new Promise<void>((r) => (held = r));
    // Another worker process's hold on the import: the same lock from another database session.
    const other = db().transaction(async (trx) => {
      await trx.raw('select pg_advisory_xact_lock(?, ?)', IMPORT_LOCK_KEYS(importId));
      held();
      await released;
    });
    await isHeld;
    expect(await leaseImport(importId)).toBeNull();
    expect(await runImportsToCompletion()).toEqual({ imports: 0, flights: 0 });
    expect(await pendingOf(importId)).toBe(600);

    release();
    await other;
    expect(await runImportsToCompletion()).toMatchObject({ imports: 1, flights: 600 });
    expect(await pendingOf(importId)).toBe(0);
    // The lease was given back: the lock is free again.
    const again = await leaseImport(importId);
    expect(again).not.toBeNull();
    await again?.release();
  });
});

describe.skipIf(onPostgres())('on SQLite (one process)', () => {
  it('every import can be leased, by any number of callers', async () => {
    const importId = await upload(10, 'S');
    const [a, b] = await Promise.all([leaseImport(importId), leaseImport(importId)]);
    expect(a).not.toBeNull();
    expect(b).not.toBeNull();
    expect(await runImportsToCompletion()).toMatchObject({ imports: 1, flights: 10 });
  });
});
