import { beforeEach, describe, expect, it } from 'vitest';
import { apiRequest, call, makeWorkspace, onPostgres, sessionCookie, useTestDatabase } from '../../support/test-db';
import { HEADER, addScheduleLibrary, csv, goodRows, uploadRequest } from '../imports/support';
import * as importsRoute from '@/app/api/v1/workspaces/[slug]/imports/route';
import * as failedRoute from '@/app/api/v1/workspaces/[slug]/jobs/failed/route';
import { db } from '@/db/client';
import type { ImportDto } from '@/db/imports';
import { AppError } from '@/lib/errors';
import { defineJob, enqueue } from '@/lib/jobs';
import { runDueLocalJobs } from '@/lib/jobs/local';
import { listFailedJobs, retryFailedJob, type FailedJob } from '@/lib/jobs/failed-jobs';
import { COMPONENTS_BACKLOG_JOB, IMPORT_RESCREEN_JOB, IMPORT_SCREEN_JOB } from '@/lib/imports/jobs';
import { rescreenImport } from '@/lib/imports/rescreen';
import { ENGINE_VERSION } from '@/lib/screening';

useTestDatabase();

/** The in-process runner (the SQLite default); tests/integration/jobs/pg-boss.test.ts covers PostgreSQL. */
const sqliteOnly = onPostgres() ? describe.skip : describe;

async function queued(name: string) {
  return (await db()('local_jobs').where({ name }).select('*')) as {
    id: number;
    attempts: number;
    run_after: string;
    state: string;
    last_error: string | null;
  }[];
}

const later = (ms: number) => () => new Date(Date.now() + ms);

sqliteOnly('in-process job runner', () => {
  // Each test starts from an empty queue (a job left by another test would count among its runs).
  beforeEach(async () => {
    await db()('local_jobs').delete();
  });

  it('retries a failing job with a doubling back-off and runs it again only when its time comes', async () => {
    let runs = 0;
    defineJob(
      'test.flaky',
      async () => {
        runs += 1;
        if (runs < 3) throw new Error(`flaky run ${runs}`);
      },
      { group: 'imports', maxAttempts: 4, retryDelaySeconds: 2 },
    );
    expect(await enqueue('test.flaky', {})).toBe(true);

    const before1 = Date.now();
    expect(await runDueLocalJobs()).toBe(1);
    let [row] = await queued('test.flaky');
    expect(row).toMatchObject({ attempts: 1, state: 'queued', last_error: 'flaky run 1' });
    // First retry waits retryDelaySeconds (2 s) from the failure.
    expect(Date.parse(row.run_after)).toBeGreaterThanOrEqual(before1 + 2000);
    expect(await runDueLocalJobs(), 'not due before its back-off').toBe(0);

    const before2 = Date.now();
    expect(await runDueLocalJobs({ asOf: later(2_500) })).toBe(1);
    [row] = await queued('test.flaky');
    expect(row).toMatchObject({ attempts: 2, last_error: 'flaky run 2' });
    // Second retry waits twice as long (4 s).
    expect(Date.parse(row.run_after)).toBeGreaterThanOrEqual(before2 + 4000);
    expect(await runDueLocalJobs({ asOf: later(3_000) }), 'still inside the doubled back-off').toBe(0);

    expect(await runDueLocalJobs({ asOf: later(10_000) })).toBe(1);
    expect(runs).toBe(3);
    expect(await queued('test.flaky'), 'a job that succeeded leaves the queue').toEqual([]);
  });

  it('makes a dead letter after max attempts: off the queue, recorded for its workspace owners with reason and attempts, clean-up run once', async () => {
    const ws = await makeWorkspace([]);
    const deadLetters: string[] = [];
    defineJob<{ workspaceId: number; n: number }>(
      'test.always',
      async () => {
        throw new AppError('unavailable', 'The archive service refused the file.');
      },
      {
        group: 'imports',
        maxAttempts: 3,
        retryDelaySeconds: 1,
        workspaceOf: (p) => p.workspaceId,
        describe: (p) => `Archive run ${p.n}`,
        onDeadLetter: async (_p, reason) => {
          deadLetters.push(reason);
        },
      },
    );
    await enqueue('test.always', { workspaceId: ws.id, n: 7 });
    let total = 0;
    for (let i = 0; i < 6; i += 1) total += await runDueLocalJobs({ asOf: later(3_600_000) });
    expect(total, 'three runs in all, then no more').toBe(3);
    expect(await queued('test.always')).toEqual([]);
    expect(deadLetters).toEqual(['The archive service refused the file.']);
    const failed = await listFailedJobs({ workspaceId: ws.id });
    expect(failed).toEqual([
      expect.objectContaining({
        jobName: 'test.always',
        label: 'Archive run 7',
        reason: 'The archive service refused the file.',
        attempts: 3,
      }),
    ]);
    expect(Date.parse(failed[0].failedAt)).toBeGreaterThan(Date.now() - 60_000);

    // The owner's list over HTTP: the same rows.
    const r = await call<{ items: FailedJob[] }>(
      failedRoute.GET,
      apiRequest('GET', `/api/v1/workspaces/${ws.slug}/jobs/failed`, { cookie: await sessionCookie(ws.owner.id) }),
      { slug: ws.slug },
    );
    expect(r.status).toBe(200);
    expect(r.body.items.map((j) => j.id)).toEqual([failed[0].id]);
  });

  it('names a database error by its code only, never its text', async () => {
    const ws = await makeWorkspace([]);
    defineJob<{ workspaceId: number }>(
      'test.dberror',
      async () => {
        throw Object.assign(new Error('SQLITE_CONSTRAINT: NOT NULL constraint failed: secret_table.secret_column'), {
          code: 'SQLITE_CONSTRAINT_NOTNULL',
        });
      },
      { group: 'imports', maxAttempts: 1, workspaceOf: (p) => p.workspaceId },
    );
    await enqueue('test.dberror', { workspaceId: ws.id });
    await runDueLocalJobs();
    const [f] = await listFailedJobs({ workspaceId: ws.id });
    expect(f.reason).toContain('SQLITE_CONSTRAINT_NOTNULL');
    expect(f.reason).not.toContain('secret_column');
  });

  it('a recurring job that fails leaves the queue without a dead letter (its next turn retries)', async () => {
    defineJob(
      'test.recurring',
      async () => {
        throw new Error('the payment service is away');
      },
      { group: 'usage', maxAttempts: 1, everyMs: () => 60_000 },
    );
    await enqueue('test.recurring', {}, { singletonKey: 'test.recurring' });
    expect(await runDueLocalJobs()).toBe(1);
    expect(await queued('test.recurring')).toEqual([]);
    expect(await db()('job_failures').where('job_name', 'test.recurring').select('id')).toEqual([]);
    expect(await enqueue('test.recurring', {}, { singletonKey: 'test.recurring' })).toBe(true);
  });

  it('queues a singleton key once while it waits or runs, and again after it finished', async () => {
    let runs = 0;
    let duringRun: boolean | null = null;
    defineJob<{ key: string }>(
      'test.single',
      async (p) => {
        runs += 1;
        if (p.key === 'k') duringRun = await enqueue('test.single', { key: 'k' }, { singletonKey: 'k' });
      },
      { group: 'imports' },
    );
    expect(await enqueue('test.single', { key: 'k' }, { singletonKey: 'k' })).toBe(true);
    expect(await enqueue('test.single', { key: 'k' }, { singletonKey: 'k' })).toBe(false);
    expect(await enqueue('test.single', { key: 'other' }, { singletonKey: 'other' })).toBe(true);
    expect(await queued('test.single')).toHaveLength(2);
    expect(await runDueLocalJobs()).toBe(2);
    expect(runs).toBe(2);
    expect(duringRun, 'refused while the job with that key runs').toBe(false);
    expect(await enqueue('test.single', { key: 'k' }, { singletonKey: 'k' })).toBe(true);
  });

  it("runs a job that answers 'again' once more with fresh attempts, until it is done", async () => {
    const seen: number[] = [];
    let steps = 0;
    defineJob(
      'test.steps',
      async (_p, ctx) => {
        seen.push(ctx.attempt);
        steps += 1;
        return steps < 3 ? 'again' : 'done';
      },
      { group: 'imports' },
    );
    await enqueue('test.steps', {});
    expect(await runDueLocalJobs()).toBe(3);
    expect(seen).toEqual([1, 1, 1]);
    expect(await queued('test.steps')).toEqual([]);
  });

  it('re-queues a job left running by a process that died when the runner starts', async () => {
    defineJob('test.orphan', async () => undefined, { group: 'usage' });
    await enqueue('test.orphan', {});
    await db()('local_jobs').where({ name: 'test.orphan' }).update({ state: 'active', attempts: 1 });
    expect(await runDueLocalJobs(), 'an active job is not taken twice').toBe(0);
    const { requeueAbandonedLocalJobs } = await import('@/db/jobs');
    expect(await requeueAbandonedLocalJobs()).toBe(1);
    expect(await runDueLocalJobs({ groups: ['imports'] }), 'a group this runner does not take stays queued').toBe(0);
    expect(await runDueLocalJobs({ groups: ['usage'], asOf: later(120_000) })).toBe(1);
    expect(await queued('test.orphan')).toEqual([]);
  });
});

sqliteOnly('imports through the in-process runner', () => {
  beforeEach(async () => {
    await db()('local_jobs').delete();
  });

  async function upload(rows: number) {
    const ws = await makeWorkspace(['analyst']);
    await addScheduleLibrary(ws.id);
    const cookie = await sessionCookie(ws.members.analyst.id);
    const r = await call<ImportDto>(
      importsRoute.POST,
      uploadRequest(ws.slug, csv(HEADER, ...goodRows(rows)), { cookie, fileName: 'jobs.csv' }),
      { slug: ws.slug },
    );
    expect(r.status).toBe(202);
    return { ws, importId: r.body.id };
  }

  const count = async (table: string, where: Record<string, unknown>) =>
    Number(((await db()(table).where(where).count({ n: '*' }).first()) as { n: number | string }).n);

  it('an upload queues one screening job; the runner screens every flight once with one usage unit each', async () => {
    const { ws, importId } = await upload(30);
    const jobs = await queued(IMPORT_SCREEN_JOB);
    expect(jobs).toHaveLength(1);
    while ((await runDueLocalJobs()) > 0);
    expect((await db()('imports').where('id', importId).first('status')) as { status: string }).toEqual({
      status: 'complete',
    });
    expect(await count('flights', { import_id: importId, status: 'screened' })).toBe(30);
    expect(await count('usage_events', { workspace_id: ws.id })).toBe(30);
    expect(await queued(IMPORT_SCREEN_JOB)).toEqual([]);
  });

  it('the components job builds the fleet-sampling components of screened flights once no import is left', async () => {
    const { ws, importId } = await upload(12);
    while ((await runDueLocalJobs()) > 0);
    expect(await count('flights', { import_id: importId, status: 'screened' })).toBe(12);
    await db()('flight_components').where({ workspace_id: ws.id }).delete();
    expect(await enqueue(COMPONENTS_BACKLOG_JOB, {})).toBe(true);
    while ((await runDueLocalJobs()) > 0);
    expect(await count('flight_components', { workspace_id: ws.id, engine_version: ENGINE_VERSION })).toBe(12);
  });

  it('a re-screen request queues one job; the runner puts every flight on the current engine and bills nothing more', async () => {
    const { ws, importId } = await upload(15);
    while ((await runDueLocalJobs()) > 0);
    await db()('flights').where({ import_id: importId }).update({ engine_version: '2000.1.1' });
    await rescreenImport({ workspaceId: ws.id }, importId, { userId: ws.owner.id, label: 'owner' });
    expect(await queued(IMPORT_RESCREEN_JOB)).toHaveLength(1);
    while ((await runDueLocalJobs()) > 0);
    expect(await count('flights', { import_id: importId, engine_version: ENGINE_VERSION })).toBe(15);
    expect(
      ((await db()('imports').where('id', importId).first('rescreen_status')) as { rescreen_status: string })
        .rescreen_status,
    ).toBe('complete');
    expect(
      await count('usage_events', { workspace_id: ws.id }),
      'one unit per flight, from the first screening only',
    ).toBe(15);
  });

  it('a screening the database keeps refusing ends failed, as a dead letter the owner sees and retries; the retry screens it once', async () => {
    const { ws, importId } = await upload(12);
    await db().raw(
      `CREATE TRIGGER refuse_import_${importId} BEFORE UPDATE ON flights WHEN NEW.import_id = ${importId}
       BEGIN SELECT RAISE(ABORT, 'writes refused for the test'); END`,
    );
    let runs = 0;
    for (let i = 0; i < 10; i += 1) runs += await runDueLocalJobs({ asOf: later(3_600_000) });
    expect(runs, 'five attempts (maxAttempts of import.screen)').toBe(5);
    const imp = (await db()('imports').where('id', importId).first('status', 'failure_reason')) as {
      status: string;
      failure_reason: string;
    };
    expect(imp.status).toBe('failed');
    expect(imp.failure_reason).toMatch(/Background jobs/);
    expect(await count('usage_events', { workspace_id: ws.id }), 'nothing billed').toBe(0);
    const [failed] = await listFailedJobs({ workspaceId: ws.id });
    expect(failed).toMatchObject({
      jobName: IMPORT_SCREEN_JOB,
      label: `Screening of import #${importId}`,
      attempts: 5,
    });
    expect(failed.reason).not.toContain('writes refused');

    await db().raw(`DROP TRIGGER refuse_import_${importId}`);
    const actor = { userId: ws.owner.id, label: 'owner' };
    await retryFailedJob({ workspaceId: ws.id }, failed.id, actor);
    await expect(retryFailedJob({ workspaceId: ws.id }, failed.id, actor), 'retried once').rejects.toMatchObject({
      code: 'not_found',
    });
    const other = await makeWorkspace([]);
    expect(await listFailedJobs({ workspaceId: other.id })).toEqual([]);
    expect(await listFailedJobs({ workspaceId: ws.id }), 'a retried failure leaves the list').toEqual([]);
    while ((await runDueLocalJobs()) > 0);
    expect(((await db()('imports').where('id', importId).first('status')) as { status: string }).status).toBe(
      'complete',
    );
    expect(await count('flights', { import_id: importId, status: 'screened' })).toBe(12);
    expect(await count('usage_events', { workspace_id: ws.id })).toBe(12);
  });
});
