import { describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import { strFromU8, unzipSync } from 'fflate';
import { call, makeWorkspace, sessionCookie, useTestDatabase } from '../../support/test-db';
import * as importsRoute from '@/app/api/v1/workspaces/[slug]/imports/route';
import { db } from '@/db/client';
import { runImportsToCompletion } from '@/lib/imports/worker';
import { HEADER, addScheduleLibrary, csv, goodRows, uploadRequest } from '../imports/support';
import { ROUTES, download, getView, post } from './support';

useTestDatabase();

/**
 * The same figures, up to the last bits of a floating-point sum: the running figures add the monthly
 * roll-ups, the frozen ones the flights, in another order (PostgreSQL showed 1 in the 16th digit).
 */
function expectSameFigures<T extends object>(a: T, b: T) {
  expect(Object.keys(a).sort()).toEqual(Object.keys(b).sort());
  for (const k of Object.keys(b)) {
    const [x, y] = [(a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k]];
    if (typeof x === 'number' && typeof y === 'number') expect(x, k).toBeCloseTo(y, 6);
    else expect(x, k).toEqual(y);
  }
}

const sha256 = (b: string | Uint8Array) => createHash('sha256').update(b).digest('hex');

async function importRows(slug: string, userId: number, rows: string[], fileName: string): Promise<number> {
  const r = await call<{ id: number }>(
    importsRoute.POST,
    uploadRequest(slug, csv(HEADER, ...rows), { cookie: await sessionCookie(userId), fileName }),
    { slug },
  );
  expect(r.status, JSON.stringify(r.body)).toBe(202);
  await runImportsToCompletion();
  return r.body.id;
}

/** Splits a CSV made by toCsv (no quoted new lines in these files) into rows of cells. */
const rowsOf = (text: string) =>
  text
    .trim()
    .split('\r\n')
    .map((l) => l.split(','));

describe('moving a quarter to review freezes it', () => {
  it('an import into the frozen quarter changes no frozen figure, is listed after sign-off, and the audit pack hash recomputes from its CSV', async () => {
    const ws = await makeWorkspace(['analyst', 'viewer']);
    await addScheduleLibrary(ws.id);
    const { analyst, viewer } = ws.members;
    await importRows(ws.slug, analyst.id, goodRows(6, 'TPA'), 'nov-a.csv');

    const before = await getView(ws.slug, '2026-Q4', analyst.id);
    expect(before.status).toBe(200);
    expect(before.body.period.state).toBe('open');
    expect(before.body.figures.source).toBe('running');
    expect(before.body.figures.total.flights).toBe(6);

    const review = await post(ROUTES.reviewRoute.POST, ws.slug, '2026-Q4', '/review', analyst.id);
    expect(review.status, JSON.stringify(review.body)).toBe(200);
    expect(review.body).toMatchObject({ state: 'review', frozenBy: expect.any(String) });

    const frozen = await getView(ws.slug, '2026-Q4', analyst.id);
    expect(frozen.body.figures.source).toBe('frozen');
    expectSameFigures(frozen.body.figures.total, before.body.figures.total);
    expect(frozen.body.frozenFlights).toHaveLength(6);
    expect(frozen.body.snapshot?.engineVersions.reduce((n, v) => n + v.flights, 0)).toBe(6);
    expect(frozen.body.changesAfterFreeze).toEqual([]);

    // Later flights dated in the frozen quarter: imported and screened, but held apart.
    await importRows(ws.slug, analyst.id, goodRows(3, 'LATE'), 'nov-late.csv');
    // And a re-screen of one frozen flight (what the re-screening writes: new figures, new time).
    const first = frozen.body.frozenFlights[0];
    await db()('flights')
      .where({ id: first.flightId })
      .update({ nox_above_kg: first.noxAboveKg * 2, screened_at: new Date(Date.now() + 1000).toISOString() });

    const after = await getView(ws.slug, '2026-Q4', analyst.id);
    expectSameFigures(after.body.figures.total, before.body.figures.total);
    expect(after.body.frozenFlights).toEqual(frozen.body.frozenFlights);
    const changes = after.body.changesAfterFreeze;
    expect(changes.filter((c) => c.kind === 'added').map((c) => c.flight.slice(0, 4))).toEqual([
      'LATE',
      'LATE',
      'LATE',
    ]);
    expect(changes.filter((c) => c.kind === 'rescreened').map((c) => c.flightId)).toEqual([first.flightId]);
    // The live figures did move: the month's running total now counts nine flights.
    const live = await getView(ws.slug, '2026-11', analyst.id);
    expect(live.body.figures.total.flights).toBe(9);

    // The owner signs; the recorded hash is the SHA-256 of the frozen audit CSV.
    const signed = await post(ROUTES.signRoute.POST, ws.slug, '2026-Q4', '/sign', ws.owner.id, {
      hash: frozen.body.snapshot?.csvSha256,
    });
    expect(signed.status, JSON.stringify(signed.body)).toBe(200);
    expect(signed.body).toMatchObject({ state: 'signed', signHash: frozen.body.snapshot?.csvSha256 });

    // A viewer downloads the audit pack.
    const res = await download(ROUTES.auditPackRoute.GET, ws.slug, '2026-Q4', '/audit-pack', viewer.id);
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toBe('application/zip');
    const files = unzipSync(new Uint8Array(await res.arrayBuffer()));
    expect(Object.keys(files).sort()).toEqual([
      'changes-after-sign-off.csv',
      'flights.csv',
      'method-notes.txt',
      'report.pdf',
      'sign-off.json',
    ]);
    const record = JSON.parse(strFromU8(files['sign-off.json'])) as Record<string, unknown>;
    expect(sha256(files['flights.csv'])).toBe(record.sha256);
    expect(record.sha256).toBe(signed.body.signHash);
    expect(record.signedBy).toBe(signed.body.signedBy);
    expect(strFromU8(files['report.pdf'].subarray(0, 5))).toBe('%PDF-');

    const flightRows = rowsOf(strFromU8(files['flights.csv']));
    expect(flightRows[0]).toContain('engine_version');
    expect(flightRows.slice(1)).toHaveLength(6);
    const urlCol = flightRows[0].indexOf('flight_page_url');
    const idCol = flightRows[0].indexOf('flight_id');
    for (const r of flightRows.slice(1)) expect(r[urlCol]).toMatch(new RegExp(`/w/${ws.slug}/flights/${r[idCol]}$`));
    // The frozen NOx above in the CSV sums to the frozen figure.
    const aboveCol = flightRows[0].indexOf('nox_above_tropopause_kg');
    const sum = flightRows.slice(1).reduce((n, r) => n + Number(r[aboveCol]), 0);
    expect(sum).toBeCloseTo(before.body.figures.total.noxAboveKg, 3);

    const changeRows = rowsOf(strFromU8(files['changes-after-sign-off.csv']));
    expect(
      changeRows
        .slice(1)
        .map((r) => r[0])
        .sort(),
    ).toEqual(['added', 'added', 'added', 'rescreened']);
    expect(strFromU8(files['method-notes.txt'])).toMatch(/Mateus, Mendes & Pires \(2022\)/);

    // The signed report PDF downloads for the viewer too.
    const pdf = await download(ROUTES.reportRoute.GET, ws.slug, '2026-Q4', '/report', viewer.id);
    expect(pdf.status).toBe(200);
    expect(pdf.headers.get('content-type')).toBe('application/pdf');
  });

  it('refuses to freeze while flights of the period are still screening, and reopening needs a reason and is audited', async () => {
    const ws = await makeWorkspace(['analyst']);
    await addScheduleLibrary(ws.id);
    await importRows(ws.slug, ws.members.analyst.id, goodRows(2, 'OK'), 'a.csv');
    const queued = await call(
      importsRoute.POST,
      uploadRequest(ws.slug, csv(HEADER, ...goodRows(2, 'WAIT')), {
        cookie: await sessionCookie(ws.members.analyst.id),
        fileName: 'b.csv',
      }),
      { slug: ws.slug },
    );
    expect(queued.status).toBe(202);
    const refused = await post(ROUTES.reviewRoute.POST, ws.slug, '2026-11', '/review', ws.members.analyst.id);
    expect(refused.status).toBe(409);
    expect(refused.body.error?.message).toMatch(/still being screened/);
    await runImportsToCompletion();

    expect((await post(ROUTES.reviewRoute.POST, ws.slug, '2026-11', '/review', ws.owner.id)).status).toBe(200);
    expect((await post(ROUTES.reviewRoute.POST, ws.slug, '2026-11', '/review', ws.owner.id)).status).toBe(409);
    // The audit pack is for signed periods only.
    expect((await download(ROUTES.auditPackRoute.GET, ws.slug, '2026-11', '/audit-pack', ws.owner.id)).status).toBe(
      409,
    );
    expect((await post(ROUTES.signRoute.POST, ws.slug, '2026-11', '/sign', ws.owner.id)).status).toBe(200);
    // A wrong hash never signs again, and a signed period cannot be signed twice.
    expect(
      (await post(ROUTES.signRoute.POST, ws.slug, '2026-11', '/sign', ws.owner.id, { hash: 'f'.repeat(64) })).status,
    ).toBe(409);

    const noReason = await post(ROUTES.reopenRoute.POST, ws.slug, '2026-11', '/reopen', ws.owner.id, {});
    expect(noReason.status).toBe(422);
    expect(noReason.body.error?.fields?.[0].path).toBe('reason');
    const reopened = await post(ROUTES.reopenRoute.POST, ws.slug, '2026-11', '/reopen', ws.owner.id, {
      reason: 'Late schedule corrections from the operations team',
    });
    expect(reopened.status).toBe(200);
    expect(reopened.body).toMatchObject({ state: 'open', signHash: null });
    const entries = await db()('audit_log').where({ workspace_id: ws.id, action: 'period.reopened' });
    expect(entries).toHaveLength(1);
    expect(JSON.parse(entries[0].detail)).toMatchObject({
      reason: 'Late schedule corrections from the operations team',
      previousState: 'signed',
      sha256: expect.stringMatching(/^[0-9a-f]{64}$/),
    });
    const view = await getView(ws.slug, '2026-11', ws.owner.id);
    expect(view.body.figures.source).toBe('running');
    expect(view.body.figures.total.flights).toBe(4);
  });

  it('an unknown custom period and another workspace are 404, a malformed reference too', async () => {
    const ws = await makeWorkspace(['viewer']);
    const other = await makeWorkspace([]);
    expect((await getView(ws.slug, 'c999999', ws.owner.id)).status).toBe(404);
    expect((await getView(ws.slug, '2026-Q9', ws.owner.id)).status).toBe(404);
    expect((await getView(other.slug, '2026-Q4', ws.owner.id)).status).toBe(404);
    expect((await getView(ws.slug, '2026-Q4', ws.members.viewer.id)).status).toBe(200);
  });
});
