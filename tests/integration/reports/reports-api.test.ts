import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import Papa from 'papaparse';
import { PDFParse } from 'pdf-parse';
import { apiRequest, call, makeWorkspace, onPostgres, sessionCookie, useTestDatabase } from '../../support/test-db';
import { startSmtpFake, type SmtpFake } from '@/lib/fakes/smtp/server';
import * as reportsRoute from '@/app/api/v1/workspaces/[slug]/reports/route';
import * as reportRoute from '@/app/api/v1/workspaces/[slug]/reports/[id]/route';
import * as pdfRoute from '@/app/api/v1/workspaces/[slug]/reports/[id]/pdf/route';
import * as csvRoute from '@/app/api/v1/workspaces/[slug]/reports/[id]/csv/route';
import * as sendRoute from '@/app/api/v1/workspaces/[slug]/reports/[id]/send/route';
import { db } from '@/db/client';
import { formatMass, formatNumber } from '@/lib/format';
import { insertFleet, insertFlight, insertType } from '../fleets/flight-fixtures';
import { runDueLocalJobs } from '@/lib/jobs/local';
import { startBackgroundJobs, stopJobRunner } from '@/lib/jobs/start';

const mailEnv: Record<string, string> = {};
let fake: SmtpFake;
let fakeClosed = false;
beforeAll(async () => {
  fake = await startSmtpFake({ smtpPort: 0, httpPort: 0 });
  mailEnv.SMTP_PORT = String(fake.smtpPort);
});
afterAll(async () => {
  if (onPostgres()) await stopJobRunner();
  if (fake && !fakeClosed) await fake.close();
});
mailEnv.RATE_LIMIT_REPORT_SENDS_PER_HOUR = '4';
useTestDatabase(mailEnv);

let ws: Awaited<ReturnType<typeof makeWorkspace>>;
let analyst: string;
let fleetA: number;
let fleetB: number;
let fleetC: number;

beforeAll(async () => {
  ws = await makeWorkspace(['analyst', 'planner', 'viewer']);
  analyst = await sessionCookie(ws.members.analyst.id);
  fleetA = await insertFleet(ws.id, 'Polar A');
  // A hostile fleet name: it must come out of the CSV as text, never as a formula.
  fleetB = await insertFleet(ws.id, '=HYPERLINK("http://x.test","Polar, B")');
  fleetC = await insertFleet(ws.id, 'Unused');
  const t1 = await insertType(ws.id, 'LR-1', fleetA);
  const t2 = await insertType(ws.id, 'LR-2', fleetB);
  const rows: [number, string, string, number, number, number, number][] = [
    [t1, 'LR-1', '2026-09-05', 8000, 60000, 900, 450],
    [t1, 'LR-1', '2026-10-05', 7000, 52000, 800, 320],
    [t2, 'LR-2', '2026-10-15', 5000, 40000, 500, 100],
    [t2, 'LR-2', '2026-11-01', 5500, 42000, 520, 130],
  ];
  for (const [typeId, code, date, distanceKm, fuelKg, noxKg, noxAboveKg] of rows) {
    await insertFlight(ws.id, {
      date,
      flight: 'RP',
      typeId,
      code,
      distanceKm,
      fuelKg,
      noxKg,
      noxAboveKg,
      ozone: [noxAboveKg * 2, noxAboveKg * 0.4, noxAboveKg * 9],
    });
  }
});

const base = () => `/api/v1/workspaces/${ws.slug}/reports`;

const sendStatus = async (sendId: number): Promise<string | undefined> =>
  ((await db()('report_sends').where({ id: sendId }).first('status')) as { status: string } | undefined)?.status;

/**
 * Runs the queued report e-mails: on SQLite the in-process runner's due jobs, on PostgreSQL a pg-boss
 * runner for mail jobs in this process (started once), until every given send has left 'queued'.
 */
let pgRunner = false;
async function kickJobs(): Promise<void> {
  if (!onPostgres()) {
    await runDueLocalJobs();
  } else if (!pgRunner) {
    pgRunner = true;
    await startBackgroundJobs(['mail']);
  }
}
async function runJobs(sendIds: number[]): Promise<void> {
  await kickJobs();
  const end = Date.now() + 30_000;
  for (;;) {
    const states = await Promise.all(sendIds.map(sendStatus));
    if (states.every((st) => st !== 'queued')) return;
    if (Date.now() > end) throw new Error(`sends ${sendIds.join(', ')} still queued: ${states.join(', ')}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}
const BODY = () => ({ name: 'Q4 polar fleets', from: '2026-09-01', to: '2026-11-20', fleetIds: [fleetA, fleetB] });

interface ReportJson {
  id: number;
  name: string;
  summary: {
    totals: { flights: number; noxTotalKg: number; noxAboveKg: number; fuelKg: number };
    fleets: { id: number; name: string }[];
    units: string;
  };
  links: { pdf: string; csv: string };
}

async function build(cookie = analyst, body: unknown = BODY()) {
  return call<ReportJson>(reportsRoute.POST, apiRequest('POST', base(), { cookie, body }), { slug: ws.slug });
}

async function download(route: unknown, id: number, kind: 'pdf' | 'csv', cookie = analyst): Promise<Response> {
  return (route as (r: Request, c: { params: Promise<Record<string, string>> }) => Promise<Response>)(
    apiRequest('GET', `${base()}/${id}/${kind}`, { cookie }),
    {
      params: Promise.resolve({ slug: ws.slug, id: String(id) }),
    },
  );
}

describe('reports: build, store, list', () => {
  it('201 stores the report with totals equal to the sum of its flights; listed and fetched', async () => {
    const r = await build();
    expect(r.status).toBe(201);
    expect(r.body.summary.totals.flights).toBe(4);
    expect(r.body.summary.totals.noxTotalKg).toBeCloseTo(900 + 800 + 500 + 520, 6);
    expect(r.body.summary.totals.noxAboveKg).toBeCloseTo(450 + 320 + 100 + 130, 6);
    expect(r.body.summary.fleets.map((f) => f.id).sort()).toEqual([fleetA, fleetB].sort());
    expect(r.body.links.pdf).toBe(`${base()}/${r.body.id}/pdf`);
    const list = await call<{ items: { id: number; name: string; fleetNames: string[] }[] }>(
      reportsRoute.GET,
      apiRequest('GET', base(), { cookie: await sessionCookie(ws.members.viewer.id) }),
      { slug: ws.slug },
    );
    expect(list.status).toBe(200);
    expect(list.body.items[0]).toMatchObject({ id: r.body.id, name: 'Q4 polar fleets' });
    const one = await call<ReportJson & { sendHistory: unknown[] }>(
      reportRoute.GET,
      apiRequest('GET', `${base()}/${r.body.id}`, { cookie: analyst }),
      { slug: ws.slug, id: String(r.body.id) },
    );
    expect(one.body.sendHistory).toEqual([]);
  });

  it('the PDF downloads as an attachment, parses, and holds the totals and the cautions', async () => {
    const r = await build();
    const res = await download(pdfRoute.GET, r.body.id, 'pdf');
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toBe('application/pdf');
    expect(res.headers.get('content-disposition')).toMatch(/^attachment; filename="q4-polar-fleets\.pdf"/);
    const bytes = Buffer.from(await res.arrayBuffer());
    expect(bytes.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    fs.writeFileSync(path.join(os.tmpdir(), 'tropopass-report-test.pdf'), bytes);
    const parser = new PDFParse({ data: new Uint8Array(bytes) });
    const text = (await parser.getText()).text.replace(/\s+/g, ' ');
    await parser.destroy();
    expect(text).toContain('Q4 polar fleets');
    expect(text).toContain('2026-09-01 to 2026-11-20');
    expect(text).toContain('Polar A');
    // The totals as the report's unit preference (metric) prints them.
    expect(text).toContain(formatMass(900 + 800 + 500 + 520, 'metric'));
    expect(text).toContain(formatMass(1000, 'metric'));
    expect(text).toContain(formatMass((60000 + 52000 + 40000 + 42000) * 3.16, 'metric'));
    expect(text).toContain(`Imported flights screened ${formatNumber(4)}`);
    expect(text).toMatch(/not a certified emissions inventory and not a regulatory method/);
    expect(text).toMatch(/gross catalytic loss/);
    expect(text).toMatch(/approved methods and the applicable regulation/);
    expect(text).toMatch(/Mateus, Mendes & Pires \(2022\)/);
    expect(text).toMatch(/Fuel Flow Method 2/);
    expect(text).toMatch(/OurAirports \(public domain\)/);
    expect(text).toMatch(/not applicable/);
  });

  it('the CSV is RFC 4180, neutralises formula cells and round-trips through papaparse', async () => {
    const r = await build();
    const res = await download(csvRoute.GET, r.body.id, 'csv');
    expect(res.headers.get('content-disposition')).toMatch(/^attachment; filename="q4-polar-fleets\.csv"/);
    const csv = await res.text();
    expect(csv.endsWith('\r\n')).toBe(true);
    expect(csv.replace(/\r\n/g, '')).not.toMatch(/\n/);
    const parsed = Papa.parse<Record<string, string>>(csv, { header: true, skipEmptyLines: true });
    expect(parsed.errors).toEqual([]);
    const hostile = parsed.data.filter((row) => row.fleet.includes('HYPERLINK'));
    expect(hostile.length).toBeGreaterThan(0);
    for (const row of hostile) expect(row.fleet).toBe(`'=HYPERLINK("http://x.test","Polar, B")`);
    const months = parsed.data.filter((row) => row.month !== 'total');
    expect(months.map((m) => m.month).sort()).toEqual(['2026-09', '2026-10', '2026-10', '2026-11']);
    const grand = parsed.data[parsed.data.length - 1];
    expect(grand).toMatchObject({ fleet: 'All fleets', month: 'total', flights: '4' });
    expect(Number(grand.nox_kg)).toBeCloseTo(2720, 6);
    expect(Number(grand.share_above)).toBeCloseTo(1000 / 2720, 9);
    const monthSum = months.reduce((s, m) => s + Number(m.nox_above_tropopause_kg), 0);
    expect(monthSum).toBeCloseTo(Number(grand.nox_above_tropopause_kg), 6);
  });

  it('422 names bad fields and unknown fleets and saves nothing; 400 broken JSON', async () => {
    const before = await db()('reports').where({ workspace_id: ws.id }).count({ n: '*' }).first();
    const bad = await build(analyst, { from: '2026-13-01', to: '2026-11-01', fleetIds: [] });
    expect(bad.status).toBe(422);
    expect(bad.body.error?.fields?.map((f) => f.path).sort()).toEqual(['fleetIds', 'from']);
    const order = await build(analyst, { ...BODY(), from: '2026-12-01' });
    expect(order.body.error?.fields?.[0]?.path).toBe('to');
    const other = await makeWorkspace();
    const foreignFleet = await insertFleet(other.id, 'Not yours');
    const foreign = await build(analyst, { ...BODY(), fleetIds: [fleetA, foreignFleet] });
    expect(foreign.status).toBe(422);
    expect(foreign.body.error?.fields?.[0]?.path).toBe('fleetIds.1');
    const broken = await call(
      reportsRoute.POST,
      apiRequest('POST', base(), { cookie: analyst, rawBody: '{', headers: { 'content-type': 'application/json' } }),
      { slug: ws.slug },
    );
    expect(broken.status).toBe(400);
    expect(await db()('reports').where({ workspace_id: ws.id }).count({ n: '*' }).first()).toEqual(before);
  });

  it('an empty selection still builds a report that says so', async () => {
    const r = await build(analyst, { ...BODY(), fleetIds: [fleetC] });
    expect(r.status).toBe(201);
    expect(r.body.summary.totals.flights).toBe(0);
    const parser = new PDFParse({
      data: new Uint8Array(await (await download(pdfRoute.GET, r.body.id, 'pdf')).arrayBuffer()),
    });
    expect((await parser.getText()).text).toMatch(/No screened flights of these fleets in this period/);
    await parser.destroy();
  });

  it('401, 403 (viewer and planner cannot build), 404 (stranger, unknown id)', async () => {
    const r = await build();
    expect(
      (await call(reportsRoute.POST, apiRequest('POST', base(), { body: BODY() }), { slug: ws.slug })).status,
    ).toBe(401);
    expect((await build(await sessionCookie(ws.members.viewer.id))).status).toBe(403);
    expect((await build(await sessionCookie(ws.members.planner.id))).status).toBe(403);
    const other = await makeWorkspace();
    const stranger = await sessionCookie(other.owner.id);
    expect((await download(pdfRoute.GET, r.body.id, 'pdf', stranger)).status).toBe(404);
    expect((await download(csvRoute.GET, 999999, 'csv')).status).toBe(404);
    expect(
      (
        await call(reportRoute.GET, apiRequest('GET', `${base()}/999999`, { cookie: analyst }), {
          slug: ws.slug,
          id: '999999',
        })
      ).status,
    ).toBe(404);
    // A viewer may read and download.
    expect((await download(pdfRoute.GET, r.body.id, 'pdf', await sessionCookie(ws.members.viewer.id))).status).toBe(
      200,
    );
  });
});

describe('reports: send by e-mail', () => {
  it('202 queued at once; the job sends it to the SMTP fake with the PDF attached and records it sent', async () => {
    const r = await build();
    const recipients = ['ops-lead@example.test', 'Board@Example.test'];
    const before = fake.messages().length;
    const sent = await call<{ id: number; status: string; recipients: string[] }>(
      sendRoute.POST,
      apiRequest('POST', `${base()}/${r.body.id}/send`, {
        cookie: analyst,
        body: { recipients, note: 'For the quarterly review.' },
      }),
      { slug: ws.slug, id: String(r.body.id) },
    );
    expect(sent.status).toBe(202);
    expect(sent.body).toEqual({
      id: expect.any(Number),
      recipients: ['ops-lead@example.test', 'board@example.test'],
      status: 'queued',
    });
    // Nothing went out in the request: the send waits as queued, with its per-send key.
    const queued = await db()('report_sends').where({ id: sent.body.id }).first();
    expect(queued).toMatchObject({ status: 'queued', sent_by: ws.members.analyst.id, message_id: null, attempts: 0 });
    expect(queued.send_key).toMatch(/^report-send-[0-9a-f-]{36}$/);
    expect(fake.messages().length).toBe(before);
    const whileQueued = await call<{ sends: number; sendHistory: { status: string; sentAt: string | null }[] }>(
      reportRoute.GET,
      apiRequest('GET', `${base()}/${r.body.id}`, { cookie: analyst }),
      { slug: ws.slug, id: String(r.body.id) },
    );
    expect(whileQueued.body.sends).toBe(0);
    expect(whileQueued.body.sendHistory).toEqual([expect.objectContaining({ status: 'queued', sentAt: null })]);

    await runJobs([sent.body.id]);
    const msg = fake.messages().find((m) => m.to.includes('ops-lead@example.test'));
    expect(msg?.subject).toBe('Fleet report: Q4 polar fleets');
    expect(msg?.to).toEqual(expect.arrayContaining(['ops-lead@example.test', 'board@example.test']));
    expect(msg?.text).toMatch(/For the quarterly review/);
    expect(msg?.text).toMatch(/not a certified emissions inventory/);
    expect(msg?.attachments).toHaveLength(1);
    expect(msg?.attachments[0]).toMatchObject({ filename: 'q4-polar-fleets.pdf', contentType: 'application/pdf' });
    const attached = Buffer.from(msg?.attachments[0].contentBase64 ?? '', 'base64');
    const stored = Buffer.from(await (await download(pdfRoute.GET, r.body.id, 'pdf')).arrayBuffer());
    expect(attached.equals(stored)).toBe(true);
    const row = await db()('report_sends').where({ id: sent.body.id }).first();
    expect(row).toMatchObject({ status: 'sent', sent_by: ws.members.analyst.id, error: null, attempts: 1 });
    // The Message-ID is the per-send key recorded before sending.
    expect(row.message_id).toBe(`<${queued.send_key}@tropopass.test>`);
    expect(msg?.messageId).toBe(row.message_id);
    const one = await call<{
      sends: number;
      sendHistory: { status: string; messageId: string; sentAt: string | null; queuedAt: string }[];
    }>(reportRoute.GET, apiRequest('GET', `${base()}/${r.body.id}`, { cookie: analyst }), {
      slug: ws.slug,
      id: String(r.body.id),
    });
    expect(one.body.sends).toBe(1);
    expect(one.body.sendHistory).toEqual([
      expect.objectContaining({ status: 'sent', messageId: row.message_id, sentAt: expect.any(String) }),
    ]);
    expect(Date.parse(one.body.sendHistory[0].sentAt!)).toBeGreaterThanOrEqual(
      Date.parse(one.body.sendHistory[0].queuedAt),
    );
  });

  it('recipients are validated (at most 20, each an address, no repeats); nothing is sent', async () => {
    const r = await build();
    const url = `${base()}/${r.body.id}/send`;
    const p = { slug: ws.slug, id: String(r.body.id) };
    const count = fake.messages().length;
    const many = Array.from({ length: 21 }, (_, i) => `r${i}@example.test`);
    const tooMany = await call(
      sendRoute.POST,
      apiRequest('POST', url, { cookie: analyst, body: { recipients: many } }),
      p,
    );
    expect(tooMany.status).toBe(422);
    expect(tooMany.body.error?.fields?.[0]?.path).toBe('recipients');
    const badOne = await call(
      sendRoute.POST,
      apiRequest('POST', url, { cookie: analyst, body: { recipients: ['a@example.test', 'not an address'] } }),
      p,
    );
    expect(badOne.body.error?.fields?.[0]?.path).toBe('recipients.1');
    const twice = await call(
      sendRoute.POST,
      apiRequest('POST', url, { cookie: analyst, body: { recipients: ['a@example.test', 'A@example.test'] } }),
      p,
    );
    expect(twice.body.error?.fields?.[0]?.path).toBe('recipients.1');
    const none = await call(sendRoute.POST, apiRequest('POST', url, { cookie: analyst, body: { recipients: [] } }), p);
    expect(none.status).toBe(422);
    expect(fake.messages().length).toBe(count);
    expect(await db()('report_sends').where({ report_id: r.body.id }).count({ n: '*' }).first()).toMatchObject({
      n: 0,
    });
  });

  it('a planner or viewer cannot send (403); a stranger gets 404; unknown report 404', async () => {
    const r = await build();
    const url = `${base()}/${r.body.id}/send`;
    const p = { slug: ws.slug, id: String(r.body.id) };
    const body = { recipients: ['x@example.test'] };
    expect(
      (
        await call(
          sendRoute.POST,
          apiRequest('POST', url, { cookie: await sessionCookie(ws.members.planner.id), body }),
          p,
        )
      ).status,
    ).toBe(403);
    expect(
      (
        await call(
          sendRoute.POST,
          apiRequest('POST', url, { cookie: await sessionCookie(ws.members.viewer.id), body }),
          p,
        )
      ).status,
    ).toBe(403);
    const other = await makeWorkspace();
    expect(
      (await call(sendRoute.POST, apiRequest('POST', url, { cookie: await sessionCookie(other.owner.id), body }), p))
        .status,
    ).toBe(404);
    expect(
      (
        await call(sendRoute.POST, apiRequest('POST', `${base()}/999999/send`, { cookie: analyst, body }), {
          slug: ws.slug,
          id: '999999',
        })
      ).status,
    ).toBe(404);
    expect(fake.messages().some((m) => m.to.includes('x@example.test'))).toBe(false);
  });

  it('report e-mails are limited per workspace per hour: 429 with Retry-After, nothing sent or recorded; other workspaces unaffected', async () => {
    const busy = await makeWorkspace(['analyst']);
    const cookie = await sessionCookie(busy.members.analyst.id);
    const fleet = await insertFleet(busy.id, 'Busy fleet');
    const built = await call<ReportJson>(
      reportsRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${busy.slug}/reports`, { cookie, body: { ...BODY(), fleetIds: [fleet] } }),
      { slug: busy.slug },
    );
    expect(built.status).toBe(201);
    const url = `/api/v1/workspaces/${busy.slug}/reports/${built.body.id}/send`;
    const p = { slug: busy.slug, id: String(built.body.id) };
    // The limit is 4 sends an hour in this file.
    for (let i = 0; i < 4; i++) {
      expect(
        (
          await call(
            sendRoute.POST,
            apiRequest('POST', url, { cookie, body: { recipients: [`burst${i}@example.test`] } }),
            p,
          )
        ).status,
      ).toBe(202);
    }
    const before = fake.messages().length;
    const refused = await sendRoute.POST(
      apiRequest('POST', url, { cookie, body: { recipients: ['one-more@example.test'] } }),
      { params: Promise.resolve(p) },
    );
    expect(refused.status).toBe(429);
    expect(Number(refused.headers.get('retry-after'))).toBeGreaterThan(0);
    expect(((await refused.json()) as { error: { message: string } }).error.message).toMatch(/report e-mails/);
    expect(fake.messages().length).toBe(before);
    expect(Number((await db()('report_sends').where({ report_id: built.body.id }).count({ n: '*' }).first())?.n)).toBe(
      4,
    );
    // Another workspace still sends.
    const r = await build();
    const ok = await call(
      sendRoute.POST,
      apiRequest('POST', `${base()}/${r.body.id}/send`, {
        cookie: analyst,
        body: { recipients: ['elsewhere@example.test'] },
      }),
      { slug: ws.slug, id: String(r.body.id) },
    );
    expect(ok.status).toBe(202);
  });

  it('a mail server that refuses: still 202 queued; the job notes the refusal and keeps it queued for a retry', async () => {
    const r = await build();
    await fake.close();
    fakeClosed = true;
    const res = await call<{ id: number; status: string }>(
      sendRoute.POST,
      apiRequest('POST', `${base()}/${r.body.id}/send`, {
        cookie: analyst,
        body: { recipients: ['late@example.test'] },
      }),
      { slug: ws.slug, id: String(r.body.id) },
    );
    expect(res.status).toBe(202);
    expect(res.body.status).toBe('queued');
    // One attempt: refused, noted, the send stays queued (its retry waits 30 s; the dead letter after
    // five attempts is in tests/integration/reports/report-send-jobs.test.ts).
    await kickJobs();
    const end = Date.now() + 30_000;
    let row = await db()('report_sends').where({ id: res.body.id }).first();
    while (Number(row.attempts) < 1 || !row.error) {
      if (Date.now() > end) throw new Error('the refused attempt was not recorded');
      await new Promise((done) => setTimeout(done, 100));
      row = await db()('report_sends').where({ id: res.body.id }).first();
    }
    expect(row).toMatchObject({ status: 'queued', message_id: null, attempts: 1 });
    expect(row.error).toMatch(/did not accept/);
  });
});

describe('reports: delete', () => {
  it('an analyst deletes a report: 204, then 404 everywhere; its files and e-mail history go; the audit log records it', async () => {
    const r = await build();
    const id = r.body.id;
    const p = { slug: ws.slug, id: String(id) };
    await db()('report_sends').insert({
      report_id: id,
      recipients: JSON.stringify(['kept@example.test']),
      sent_by: ws.members.analyst.id,
      status: 'sent',
      message_id: 'm-1',
      error: null,
      sent_at: new Date().toISOString(),
    });
    const keep = await build();
    const res = await reportRoute.DELETE(apiRequest('DELETE', `${base()}/${id}`, { cookie: analyst }), {
      params: Promise.resolve(p),
    });
    expect(res.status).toBe(204);
    expect((await call(reportRoute.GET, apiRequest('GET', `${base()}/${id}`, { cookie: analyst }), p)).status).toBe(
      404,
    );
    expect((await download(pdfRoute.GET, id, 'pdf')).status).toBe(404);
    expect((await download(csvRoute.GET, id, 'csv')).status).toBe(404);
    expect(await db()('reports').where({ id }).first()).toBeUndefined();
    expect(await db()('report_sends').where({ report_id: id }).first()).toBeUndefined();
    const audit = await db()('audit_log')
      .where({ workspace_id: ws.id, action: 'report.delete', target: `report:${id}` })
      .first();
    expect(audit).toBeDefined();
    expect(JSON.parse(String(audit.detail))).toMatchObject({ name: 'Q4 polar fleets', sends: 1 });
    // The other report is untouched; deleting again is 404.
    expect(
      (
        await call(reportRoute.GET, apiRequest('GET', `${base()}/${keep.body.id}`, { cookie: analyst }), {
          slug: ws.slug,
          id: String(keep.body.id),
        })
      ).status,
    ).toBe(200);
    expect(
      (
        await reportRoute.DELETE(apiRequest('DELETE', `${base()}/${id}`, { cookie: analyst }), {
          params: Promise.resolve(p),
        })
      ).status,
    ).toBe(404);
  });

  it('a planner or viewer cannot delete (403), a stranger gets 404, and the report stays', async () => {
    const r = await build();
    const p = { slug: ws.slug, id: String(r.body.id) };
    const url = `${base()}/${r.body.id}`;
    for (const who of [ws.members.planner.id, ws.members.viewer.id]) {
      expect(
        (
          await reportRoute.DELETE(apiRequest('DELETE', url, { cookie: await sessionCookie(who) }), {
            params: Promise.resolve(p),
          })
        ).status,
      ).toBe(403);
    }
    const other = await makeWorkspace();
    expect(
      (
        await reportRoute.DELETE(apiRequest('DELETE', url, { cookie: await sessionCookie(other.owner.id) }), {
          params: Promise.resolve(p),
        })
      ).status,
    ).toBe(404);
    expect(await db()('reports').where({ id: r.body.id }).first()).toBeDefined();
  });
});
