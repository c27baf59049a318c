import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import { apiRequest, call, makeWorkspace, onPostgres, sessionCookie, useTestDatabase } from '../../support/test-db';
import { insertFleet, insertFlight, insertType } from '../fleets/flight-fixtures';
import { freePort } from '../../support/free-port';
import * as reportsRoute from '@/app/api/v1/workspaces/[slug]/reports/route';
import * as sendRoute from '@/app/api/v1/workspaces/[slug]/reports/[id]/send/route';
import { db } from '@/db/client';
import { startSmtpFake, type SmtpFake } from '@/lib/fakes/smtp/server';
import { enqueue } from '@/lib/jobs';
import { runDueLocalJobs } from '@/lib/jobs/local';
import { listFailedJobs, retryFailedJob } from '@/lib/jobs/failed-jobs';
import {
  LEGACY_REPORT_REDELIVERY_JOB,
  REPORT_SEND_JOB,
  STALE_SEND_MS,
  sweepQueuedReportSends,
} from '@/lib/reports/jobs';

// The mail server's port is free at first: nothing listens there until a test starts the fake on it.
const smtpPort = await freePort();
useTestDatabase({ SMTP_PORT: String(smtpPort) });

let fake: SmtpFake | null = null;
async function mailUp(): Promise<SmtpFake> {
  fake ??= await startSmtpFake({ smtpPort, httpPort: 0 });
  return fake;
}
async function mailDown(): Promise<void> {
  await fake?.close();
  fake = null;
}
afterAll(mailDown);

/** The in-process runner (SQLite); reports-api.test.ts also runs the happy path on PostgreSQL. */
const sqliteOnly = onPostgres() ? describe.skip : describe;
const later = (ms: number) => () => new Date(Date.now() + ms);

async function reportToSend() {
  const ws = await makeWorkspace(['analyst']);
  const cookie = await sessionCookie(ws.members.analyst.id);
  const fleet = await insertFleet(ws.id, 'Send fleet');
  const type = await insertType(ws.id, 'RS-1', fleet);
  await insertFlight(ws.id, {
    date: '2026-10-05',
    flight: 'RS',
    typeId: type,
    code: 'RS-1',
    distanceKm: 7000,
    fuelKg: 52000,
    noxKg: 800,
    noxAboveKg: 320,
  });
  const r = await call<{ id: number }>(
    reportsRoute.POST,
    apiRequest('POST', `/api/v1/workspaces/${ws.slug}/reports`, {
      cookie,
      body: { name: 'Queued send', from: '2026-10-01', to: '2026-10-31', fleetIds: [fleet] },
    }),
    { slug: ws.slug },
  );
  expect(r.status).toBe(201);
  const send = async (to = 'board@example.test') => {
    const res = await call<{ id: number; status: string }>(
      sendRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/reports/${r.body.id}/send`, {
        cookie,
        body: { recipients: [to] },
      }),
      { slug: ws.slug, id: String(r.body.id) },
    );
    expect(res.status).toBe(202);
    expect(res.body.status).toBe('queued');
    return res.body.id;
  };
  return { ws, reportId: r.body.id, send };
}

const row = async (sendId: number) =>
  (await db()('report_sends').where({ id: sendId }).first()) as {
    status: string;
    attempts: number;
    message_id: string | null;
    send_key: string;
    error: string | null;
  };
const mailsTo = (to: string) => (fake?.messages() ?? []).filter((m) => m.to.includes(to));
const queuedJobs = async () => db()('local_jobs').where({ name: REPORT_SEND_JOB }).select('id', 'payload_json');

sqliteOnly('report e-mails are report.send jobs', () => {
  beforeEach(async () => {
    await db()('local_jobs').delete();
  });

  it('a refused send is retried with back-off and dead-letters after 5 attempts: failed in the history, listed for the owner; the owner’s retry sends it once', async () => {
    await mailDown();
    const { ws, send } = await reportToSend();
    const id = await send('refused@example.test');
    expect(await runDueLocalJobs()).toBe(1);
    expect(await row(id)).toMatchObject({ status: 'queued', attempts: 1 });
    expect((await row(id)).error).toMatch(/did not accept.*Trying again/);
    expect(await runDueLocalJobs(), 'the first retry waits 30 s').toBe(0);
    let runs = 1;
    for (let i = 0; i < 8; i += 1) runs += await runDueLocalJobs({ asOf: later(3_600_000) });
    expect(runs).toBe(5);
    expect(await row(id)).toMatchObject({ status: 'failed', attempts: 5, message_id: null });
    expect((await row(id)).error).toMatch(/did not accept the report e-mail\. An owner can retry it/);
    expect(await queuedJobs()).toEqual([]);
    const [failed] = await listFailedJobs({ workspaceId: ws.id });
    expect(failed).toMatchObject({
      jobName: REPORT_SEND_JOB,
      reason: 'The mail server did not accept the report e-mail.',
      attempts: 5,
    });
    expect(failed.label).toMatch(/^E-mail of report #\d+ \(send #\d+\)$/);

    await mailUp();
    await retryFailedJob({ workspaceId: ws.id }, failed.id, { userId: ws.owner.id, label: 'owner' });
    expect(await row(id)).toMatchObject({ status: 'queued', error: null });
    expect(await runDueLocalJobs()).toBe(1);
    expect(await row(id)).toMatchObject({ status: 'sent', attempts: 6, error: null });
    expect(mailsTo('refused@example.test')).toHaveLength(1);
    expect(await listFailedJobs({ workspaceId: ws.id })).toEqual([]);
  });

  it('a job replayed after the sent record sends nothing', async () => {
    await mailUp();
    const { send } = await reportToSend();
    const id = await send('once@example.test');
    const [job] = await queuedJobs();
    expect(await runDueLocalJobs()).toBe(1);
    expect(await row(id)).toMatchObject({ status: 'sent', attempts: 1 });
    // The same job again (a run repeated after its worker died once it had recorded the send).
    await enqueue(REPORT_SEND_JOB, JSON.parse(String(job.payload_json)));
    expect(await runDueLocalJobs()).toBe(1);
    expect(mailsTo('once@example.test')).toHaveLength(1);
    expect(await row(id)).toMatchObject({ status: 'sent', attempts: 1 });
  });

  it('what stays at least once: a crash after the mail server accepted but before the record sends again, with the same Message-ID', async () => {
    await mailUp();
    const { send } = await reportToSend();
    const id = await send('twice@example.test');
    const [job] = await queuedJobs();
    expect(await runDueLocalJobs()).toBe(1);
    const first = await row(id);
    // As if the worker died before its record: the send is still queued, the attempt counted.
    await db()('report_sends').where({ id }).update({ status: 'queued', message_id: null });
    await enqueue(REPORT_SEND_JOB, JSON.parse(String(job.payload_json)));
    expect(await runDueLocalJobs()).toBe(1);
    const mails = mailsTo('twice@example.test');
    expect(mails).toHaveLength(2);
    expect(mails[0].messageId).toBe(`<${first.send_key}@tropopass.test>`);
    expect(mails[1].messageId, 'a receiving system can tell the copy by its Message-ID').toBe(mails[0].messageId);
    expect(await row(id)).toMatchObject({ status: 'sent', attempts: 2, message_id: mails[0].messageId });
  });

  it('a send recorded by a process that died before it queued the job is queued again by the sweep, with the same job, and sent once', async () => {
    await mailUp();
    const { send } = await reportToSend();
    const id = await send('lost@example.test');
    const [lost] = await queuedJobs();
    // As if the process died between the record and the enqueue: the send is queued, its job is not.
    await db()('local_jobs').delete();
    expect(await sweepQueuedReportSends(), 'a send just recorded is left to its request').toBe(0);
    const afterAMinute = new Date(Date.now() + STALE_SEND_MS + 1_000);
    expect(await sweepQueuedReportSends(afterAMinute)).toBe(1);
    const [again] = await queuedJobs();
    expect(JSON.parse(String(again.payload_json))).toEqual(JSON.parse(String(lost.payload_json)));
    expect(await sweepQueuedReportSends(afterAMinute), 'its job is waiting: no second one').toBe(0);
    expect(await runDueLocalJobs()).toBe(1);
    expect(await row(id)).toMatchObject({ status: 'sent', attempts: 1 });
    expect(await sweepQueuedReportSends(afterAMinute), 'sent: nothing left to queue').toBe(0);
    expect(mailsTo('lost@example.test')).toHaveLength(1);
  });

  it('a send whose report is deleted before its job runs ends without a mail or a dead letter', async () => {
    await mailUp();
    const { ws, reportId, send } = await reportToSend();
    await send('gone@example.test');
    await db()('report_sends').where({ report_id: reportId }).delete();
    await db()('reports').where({ id: reportId }).delete();
    expect(await runDueLocalJobs()).toBe(1);
    expect(await queuedJobs()).toEqual([]);
    expect(mailsTo('gone@example.test')).toEqual([]);
    expect(await listFailedJobs({ workspaceId: ws.id })).toEqual([]);
  });

  it('a report.redeliver job queued by an earlier release becomes a queued send that goes out', async () => {
    await mailUp();
    const { ws, reportId } = await reportToSend();
    await enqueue(LEGACY_REPORT_REDELIVERY_JOB, {
      workspaceId: ws.id,
      reportId,
      recipients: ['legacy@example.test'],
      sentBy: null,
      senderName: 'Earlier release',
      actor: 'e2e',
    });
    expect(await runDueLocalJobs()).toBe(2);
    const sends = await db()('report_sends').where({ report_id: reportId }).select('status');
    expect(sends).toEqual([{ status: 'sent' }]);
    expect(mailsTo('legacy@example.test')).toHaveLength(1);
    // Its report gone: nothing to send, no dead letter.
    await enqueue(LEGACY_REPORT_REDELIVERY_JOB, {
      workspaceId: ws.id,
      reportId: 987654,
      recipients: ['nobody@example.test'],
      sentBy: null,
      senderName: 'Earlier release',
      actor: 'e2e',
    });
    expect(await runDueLocalJobs()).toBe(1);
    expect(await listFailedJobs({ workspaceId: ws.id })).toEqual([]);
  });
});
