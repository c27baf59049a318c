import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { call, makeWorkspace, onPostgres, sessionCookie, useTestDatabase } from '../../support/test-db';
import { HEADER, addScheduleLibrary, csv, goodRows, uploadRequest } from '../imports/support';
import * as importsRoute from '@/app/api/v1/workspaces/[slug]/imports/route';
import { db } from '@/db/client';
import type { ImportDto } from '@/db/imports';
import { AppError } from '@/lib/errors';
import { defineJob, enqueue } from '@/lib/jobs';
import { listFailedJobs, retryFailedJob } from '@/lib/jobs/failed-jobs';
import { startBackgroundJobs, stopJobRunner } from '@/lib/jobs/start';

useTestDatabase();

/** The PostgreSQL runner (pg-boss): run by `npm run test:pg -- tests/integration/jobs`. */
const pgOnly = onPostgres() ? describe : describe.skip;

async function until<T>(what: string, probe: () => Promise<T | null | undefined | false>, ms = 45_000): Promise<T> {
  const end = Date.now() + ms;
  for (;;) {
    const v = await probe();
    if (v) return v;
    if (Date.now() > end) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 200));
  }
}

const runsOfAlways: number[] = [];
let alwaysFails = true;
defineJob<{ workspaceId: number }>(
  'test.pg.always',
  async () => {
    runsOfAlways.push(Date.now());
    if (alwaysFails) throw new AppError('unavailable', 'The archive service refused the file.');
  },
  {
    group: 'imports',
    maxAttempts: 3,
    retryDelaySeconds: 1,
    workspaceOf: (p) => p.workspaceId,
    describe: () => 'Archive run',
  },
);

let slowRuns = 0;
defineJob<{ key: string }>(
  'test.pg.slow',
  async () => {
    slowRuns += 1;
    await new Promise((r) => setTimeout(r, 1500));
  },
  { group: 'imports' },
);

const steps: number[] = [];
defineJob(
  'test.pg.steps',
  async (_p, ctx) => {
    steps.push(ctx.attempt);
    return steps.length < 3 ? 'again' : 'done';
  },
  { group: 'imports' },
);

pgOnly('pg-boss job runner', () => {
  beforeAll(async () => {
    await startBackgroundJobs(['imports']);
  });
  afterAll(async () => {
    await stopJobRunner();
  });

  it('retries with exponential back-off, then dead-letters: failed in pg-boss, copied to the dead-letter queue, listed for the owner; a retry runs it again', async () => {
    const ws = await makeWorkspace([]);
    expect(await enqueue('test.pg.always', { workspaceId: ws.id })).toBe(true);
    const [failed] = await until('the dead letter', async () => {
      const l = await listFailedJobs({ workspaceId: ws.id });
      return l.length ? l : null;
    });
    expect(failed).toMatchObject({
      jobName: 'test.pg.always',
      label: 'Archive run',
      reason: 'The archive service refused the file.',
      attempts: 3,
    });
    expect(runsOfAlways).toHaveLength(3);
    // pg-boss waits retryDelay x 2^n with jitter up to twice that: at least 1 s, then at least 2 s.
    expect(runsOfAlways[1] - runsOfAlways[0]).toBeGreaterThanOrEqual(1000);
    expect(runsOfAlways[2] - runsOfAlways[1]).toBeGreaterThanOrEqual(2000);
    const states = await until('the failed state', async () => {
      const r = await db().raw(`select state from pgboss.job where name = 'test.pg.always'`);
      const rows = (r as { rows: { state: string }[] }).rows;
      return rows.length && rows.every((x) => x.state === 'failed') ? rows : null;
    });
    expect(states).toHaveLength(1);
    const dead = await db().raw(`select count(*)::int as n from pgboss.job where name = 'test.pg.always__dead'`);
    expect((dead as { rows: { n: number }[] }).rows[0].n).toBe(1);

    alwaysFails = false;
    await retryFailedJob({ workspaceId: ws.id }, failed.id, { userId: ws.owner.id, label: 'owner' });
    expect(await listFailedJobs({ workspaceId: ws.id })).toEqual([]);
    await until('the retried run', async () => runsOfAlways.length === 4);
  });

  it('queues a singleton key once while it waits or runs, and again once it finished', async () => {
    expect(await enqueue('test.pg.slow', { key: 'a' }, { singletonKey: 'a' })).toBe(true);
    expect(await enqueue('test.pg.slow', { key: 'a' }, { singletonKey: 'a' })).toBe(false);
    await until('the slow job to start', async () => slowRuns === 1);
    expect(await enqueue('test.pg.slow', { key: 'a' }, { singletonKey: 'a' }), 'refused while it runs').toBe(false);
    expect(await enqueue('test.pg.slow', { key: 'b' }, { singletonKey: 'b' })).toBe(true);
    await until('both to finish', async () => {
      const r = await db().raw(
        `select count(*)::int as n from pgboss.job where name = 'test.pg.slow' and state = 'completed'`,
      );
      return (r as { rows: { n: number }[] }).rows[0].n === 2;
    });
    expect(slowRuns).toBe(2);
    expect(await enqueue('test.pg.slow', { key: 'a' }, { singletonKey: 'a' })).toBe(true);
  });

  it("queues the next step of a job that answers 'again', each with fresh attempts", async () => {
    await enqueue('test.pg.steps', {}, { singletonKey: 'steps' });
    await until('three steps', async () => steps.length === 3);
    expect(steps).toEqual([1, 1, 1]);
  });

  it('an uploaded import is screened through the queue: every flight once, one usage unit each', async () => {
    const ws = await makeWorkspace(['analyst']);
    await addScheduleLibrary(ws.id);
    const cookie = await sessionCookie(ws.members.analyst.id);
    const r = await call<ImportDto>(
      importsRoute.POST,
      uploadRequest(ws.slug, csv(HEADER, ...goodRows(40)), { cookie, fileName: 'pg-jobs.csv' }),
      { slug: ws.slug },
    );
    expect(r.status).toBe(202);
    await until('the import to complete', async () => {
      const row = (await db()('imports').where('id', r.body.id).first('status')) as { status: string };
      return row.status === 'complete';
    });
    const n = async (table: string, where: Record<string, unknown>) =>
      Number(((await db()(table).where(where).count({ n: '*' }).first()) as { n: number | string }).n);
    expect(await n('flights', { import_id: r.body.id, status: 'screened' })).toBe(40);
    expect(await n('usage_events', { workspace_id: ws.id })).toBe(40);
  });
});
