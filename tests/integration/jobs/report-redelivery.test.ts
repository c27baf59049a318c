import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import { apiRequest, call, makeWorkspace, onPostgres, sessionCookie, useTestDatabase } from '../../support/test-db';
import { insertFleet, insertFlight, insertType } from '../fleets/flight-fixtures';
import { freePort } from '../../support/free-port';
import * as reportsRoute from '@/app/api/v1/workspaces/[slug]/reports/route';
import * as sendRoute from '@/app/api/v1/workspaces/[slug]/reports/[id]/send/route';
import { db } from '@/db/client';
import { startSmtpFake, type SmtpFake } from '@/lib/fakes/smtp/server';
import { runDueLocalJobs } from '@/lib/jobs/local';
import { listFailedJobs } from '@/lib/jobs/failed-jobs';
import { REPORT_REDELIVERY_JOB } from '@/lib/reports/jobs';

// The mail server's port is free at first: nothing listens there until a test starts the fake on it.
const smtpPort = await freePort();
useTestDatabase({ SMTP_PORT: String(smtpPort) });

let fake: SmtpFake | null = null;
afterAll(async () => {
  await fake?.close();
});

const sqliteOnly = onPostgres() ? describe.skip : describe;
const later = (ms: number) => () => new Date(Date.now() + ms);

async function reportToSend() {
  const ws = await makeWorkspace(['analyst']);
  const cookie = await sessionCookie(ws.members.analyst.id);
  const fleet = await insertFleet(ws.id, 'Redelivery fleet');
  const type = await insertType(ws.id, 'RD-1', fleet);
  await insertFlight(ws.id, {
    date: '2026-10-05',
    flight: 'RD',
    typeId: type,
    code: 'RD-1',
    distanceKm: 7000,
    fuelKg: 52000,
    noxKg: 800,
    noxAboveKg: 320,
  });
  const r = await call<{ id: number }>(
    reportsRoute.POST,
    apiRequest('POST', `/api/v1/workspaces/${ws.slug}/reports`, {
      cookie,
      body: { name: 'Redelivery', from: '2026-10-01', to: '2026-10-31', fleetIds: [fleet] },
    }),
    { slug: ws.slug },
  );
  expect(r.status).toBe(201);
  const send = () =>
    call<{ error?: { message: string } }>(
      sendRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/reports/${r.body.id}/send`, {
        cookie,
        body: { recipients: ['board@example.test'] },
      }),
      { slug: ws.slug, id: String(r.body.id) },
    );
  return { ws, reportId: r.body.id, send };
}

const sends = async (reportId: number) =>
  (await db()('report_sends').where({ report_id: reportId }).orderBy('id').select('status')) as { status: string }[];

sqliteOnly('report e-mails the mail server refused are delivered again as a job', () => {
  beforeEach(async () => {
    await db()('local_jobs').delete();
  });

  it('503 and a failed attempt at once; the queued job delivers it once the mail server is back, recorded as sent', async () => {
    const { reportId, send } = await reportToSend();
    const r = await send();
    expect(r.status).toBe(503);
    expect(r.body.error?.message).toMatch(/retried in the background/);
    expect(await sends(reportId)).toEqual([{ status: 'failed' }]);
    expect(await db()('local_jobs').where({ name: REPORT_REDELIVERY_JOB }).select('id')).toHaveLength(1);

    fake = await startSmtpFake({ smtpPort, httpPort: 0 });
    expect(await runDueLocalJobs({ asOf: later(60_000) })).toBe(1);
    expect(await sends(reportId)).toEqual([{ status: 'failed' }, { status: 'sent' }]);
    const mail = fake.messages().filter((m) => m.to.includes('board@example.test'));
    expect(mail).toHaveLength(1);
    expect(await db()('local_jobs').where({ name: REPORT_REDELIVERY_JOB }).select('id')).toEqual([]);
    await fake.close();
    fake = null;
  });

  it('a delivery that keeps failing ends as a dead letter in the owners’ list after 5 attempts', async () => {
    const { ws, reportId, send } = await reportToSend();
    expect((await send()).status).toBe(503);
    let runs = 0;
    for (let i = 0; i < 8; i += 1) runs += await runDueLocalJobs({ asOf: later(3_600_000) });
    expect(runs).toBe(5);
    expect(await sends(reportId)).toEqual([{ status: 'failed' }]);
    expect(await listFailedJobs({ workspaceId: ws.id })).toEqual([
      expect.objectContaining({
        jobName: REPORT_REDELIVERY_JOB,
        label: `E-mail of report #${reportId} to 1 recipient`,
        reason: 'The mail server did not accept the report e-mail.',
        attempts: 5,
      }),
    ]);
  });
});
