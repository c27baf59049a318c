import { describe, expect, it } from 'vitest';
import { apiRequest, call, makeWorkspace, sessionCookie, useTestDatabase } from '../../support/test-db';
import * as importsRoute from '@/app/api/v1/workspaces/[slug]/imports/route';
import * as importRoute from '@/app/api/v1/workspaces/[slug]/imports/[id]/route';
import * as templateRoute from '@/app/api/v1/workspaces/[slug]/imports/template/route';
import * as flightsRoute from '@/app/api/v1/workspaces/[slug]/flights/route';
import { db } from '@/db/client';
import { createApiKey } from '@/lib/auth/api-keys';
import { runImportsToCompletion } from '@/lib/imports/worker';
import { screenFlight } from '@/lib/screening';
import type { ImportDto } from '@/db/imports';
import type { FlightDto } from '@/db/flights';
import { HEADER, addScheduleLibrary, csv, goodRows, uploadRequest } from './support';

useTestDatabase();

type Problem = { line: number; column: string; message: string };
type Refusal = { problems: Problem[]; problemCount: number; warnings: Problem[] };

async function count(table: string, where: Record<string, unknown>): Promise<number> {
  const r = (await db()(table).where(where).count({ n: '*' }).first()) as { n: number | string };
  return Number(r.n);
}

async function analystWorkspace() {
  const ws = await makeWorkspace(['analyst', 'planner', 'viewer']);
  const lib = await addScheduleLibrary(ws.id);
  const cookie = await sessionCookie(ws.members.analyst.id);
  return { ws, lib, cookie };
}

describe('POST /workspaces/{slug}/imports', () => {
  it('202 queues a good file; the worker screens every flight with exactly one usage unit each', async () => {
    const { ws, lib, cookie } = await analystWorkspace();
    const file = csv(
      `${HEADER},steps,fleet,ei_nox_g_per_kg,mach`,
      '2026-11-03,TP1,EFHK,RJAA,T-LR,370,52400,350@0 370@2600 390@5200,,,',
      '2026-11-03,tp2,RJAA,HEL,t-lr,FL380,53100,,,,',
      '2026-11-04,TP3,LHR,SEA,T-LR,390,48800,,Study,,0.82',
      '2026-11-05,TP4,KEF,ANC,T-SST,560,36200,,,13.8,',
    );
    const r = await call<ImportDto>(importsRoute.POST, uploadRequest(ws.slug, file, { cookie, fileName: 'nov.csv' }), {
      slug: ws.slug,
    });
    expect(r.status).toBe(202);
    expect(r.body).toMatchObject({ status: 'queued', rows: 4, rowsDone: 0, problems: [], fileName: 'nov.csv' });
    expect(await count('flights', { import_id: r.body.id, status: 'pending' })).toBe(4);
    expect(await count('usage_events', { workspace_id: ws.id })).toBe(0);

    await runImportsToCompletion();

    const got = await call<ImportDto>(
      importRoute.GET,
      apiRequest('GET', `/api/v1/workspaces/${ws.slug}/imports/${r.body.id}`, { cookie }),
      { slug: ws.slug, id: String(r.body.id) },
    );
    expect(got.body).toMatchObject({
      status: 'complete',
      rows: 4,
      rowsDone: 4,
      rowsScreened: 4,
      rowsFailed: 0,
      secondsLeft: 0,
    });
    const flights = await db()('flights').where({ import_id: r.body.id }).orderBy('source_line');
    expect(flights.map((f) => f.status)).toEqual(['screened', 'screened', 'screened', 'screened']);
    const units = await db()('usage_events')
      .where({ workspace_id: ws.id, kind: 'imported_flight' })
      .select('source_id');
    expect(units.map((u) => Number(u.source_id)).sort((a, b) => a - b)).toEqual(
      flights.map((f) => Number(f.id)).sort((a, b) => a - b),
    );

    // Codes are stored as ICAO and upper case; the step climb and the row's fleet, EI and Mach are used.
    expect(flights.map((f) => [f.flight, f.origin, f.destination, f.cruise_fl, f.max_fl])).toEqual([
      ['TP1', 'EFHK', 'RJAA', 350, 390],
      ['TP2', 'RJAA', 'EFHK', 380, 380],
      ['TP3', 'EGLL', 'KSEA', 390, 390],
      ['TP4', 'BIKF', 'PANC', 560, 560],
    ]);
    expect(flights.map((f) => Number(f.fleet_id))).toEqual([
      lib.longHaulFleetId,
      lib.longHaulFleetId,
      lib.studyFleetId,
      lib.studyFleetId,
    ]);
    const sst = JSON.parse(flights[3].input_json);
    expect(sst.emission).toEqual({ eiNoxGPerKg: 13.8 });
    expect(sst.mach).toBe(1.7);
    // NOx = fuel x EI for a direct EI (the definition of the emission index).
    expect(Number(flights[3].nox_total_kg)).toBeCloseTo(36_200 * 13.8e-3, 6);
    // The stored figures are the engine's for the stored input.
    const again = screenFlight(JSON.parse(flights[0].input_json));
    expect(Number(flights[0].nox_above_kg)).toBeCloseTo(again.noxAboveTropopauseKg, 9);
    expect(Number(flights[0].distance_km)).toBeCloseTo(again.distanceKm, 9);

    // A second run finds nothing to do and bills nothing more.
    await runImportsToCompletion();
    expect(await count('usage_events', { workspace_id: ws.id })).toBe(4);
  });

  it('422 lists every bad row by line and column and saves nothing', async () => {
    const { ws, cookie } = await analystWorkspace();
    const file = csv(
      HEADER + ',fleet',
      '2026-11-03,TP1,EFHK,RJAA,T-LR,370,52400,',
      '2026-13-01,TP2,EFHK,RJAA,T-LR,370,52400,', // line 3: month 13
      '2026-11-03,TP3,ZZZZ,RJAA,T-LR,370,52400,', // line 4: unknown airport
      '2026-11-03,TP4,EFHK,RJAA,NOPE,370,52400,', // line 5: aircraft not in the workspace
      '2026-11-03,TP5,EFHK,RJAA,T-LR,700,52400,', // line 6: above FL660
      '2026-11-03,TP6,EFHK,RJAA,T-LR,370,900000,', // line 7: fuel above the engine limit
      '',
      '2026-11-03,TP7,EFHK,RJAA,T-LR,370,52400,Nowhere', // line 9 (a blank line 8 is counted): unknown fleet
      '2026-11-03,TP1,EFHK,RJAA,T-LR,370,52400,', // line 10: repeats line 2
      '2026-11-03,TP8,EFHK,EFHK,T-LR,370,52400,', // line 11: same airport twice
      '2026-11-03,TP9,EFHK,RJAA,T-BARE,370,52400,', // line 12: type with no emission data
    );
    const r = await call<Refusal>(importsRoute.POST, uploadRequest(ws.slug, file, { cookie }), { slug: ws.slug });
    expect(r.status).toBe(422);
    expect(r.body.error?.code).toBe('invalid_fields');
    expect(r.body.problems.map((p) => [p.line, p.column])).toEqual([
      [3, 'date'],
      [4, 'origin'],
      [5, 'aircraft'],
      [6, 'cruise_fl'],
      [7, 'fuel_kg'],
      [9, 'fleet'],
      [10, 'flight'],
      [11, 'destination'],
      [12, 'aircraft'],
    ]);
    expect(r.body.problems.find((p) => p.line === 10)?.message).toContain('line 2');
    expect(r.body.problems.find((p) => p.line === 7)?.message).toMatch(/fuel burn must be between 1 and 500000 kg/);
    expect(r.body.problemCount).toBe(9);
    expect(await count('imports', { workspace_id: ws.id })).toBe(0);
    expect(await count('flights', { workspace_id: ws.id })).toBe(0);
    expect(await count('usage_events', { workspace_id: ws.id })).toBe(0);
  });

  it('steps problems name the steps column and the step; missing columns are reported on line 1', async () => {
    const { ws, cookie } = await analystWorkspace();
    const steps = await call<Refusal>(
      importsRoute.POST,
      uploadRequest(
        ws.slug,
        csv(
          `${HEADER},steps`,
          '2026-11-03,TP1,EFHK,RJAA,T-LR,,52400,350@100 390@2100',
          '2026-11-03,TP2,EFHK,RJAA,T-LR,,52400,350-0',
        ),
        { cookie },
      ),
      { slug: ws.slug },
    );
    expect(steps.status).toBe(422);
    expect(steps.body.problems).toEqual([
      {
        line: 2,
        column: 'steps',
        message: expect.stringMatching(/^Step 1 \(350@100\): The first cruise step must start at 0 km/),
      },
      { line: 3, column: 'steps', message: expect.stringContaining('flight level@km') },
    ]);
    const header = await call<Refusal>(
      importsRoute.POST,
      uploadRequest(ws.slug, csv('date,flight,origin,aircraft,cruise_fl', '2026-11-03,TP1,EFHK,T-LR,370'), { cookie }),
      { slug: ws.slug },
    );
    expect(header.status).toBe(422);
    expect(header.body.problems.map((p) => [p.line, p.column])).toEqual([
      [1, 'destination'],
      [1, 'fuel_kg'],
    ]);
    const empty = await call<Refusal>(importsRoute.POST, uploadRequest(ws.slug, csv(HEADER), { cookie }), {
      slug: ws.slug,
    });
    expect(empty.status).toBe(422);
    expect(empty.body.problems[0].message).toContain('no flights');
  });

  it('a BOM, upper-case headers and a quoted cell are read; unknown columns are reported and ignored', async () => {
    const { ws, cookie } = await analystWorkspace();
    const file =
      '\uFEFF' +
      csv(
        'DATE,Flight,Origin,Destination,Aircraft,Cruise_FL,Fuel_kg,Remarks,',
        '2026-11-03,"TP,1",EFHK,RJAA,T-LR,370,52400,"crew note, ""long""",',
      );
    const r = await call<ImportDto>(importsRoute.POST, uploadRequest(ws.slug, file, { cookie }), { slug: ws.slug });
    expect(r.status).toBe(202);
    expect(r.body.problems).toEqual([
      { line: 1, column: 'Remarks', message: expect.stringContaining('Unknown column “Remarks”') },
      { line: 1, column: '(column 9)', message: expect.stringContaining('no name') },
    ]);
    expect((await db()('flights').where({ import_id: r.body.id }).first()).flight).toBe('TP,1');
  });

  it('409 for the same file again, naming the earlier import; nothing saved the second time', async () => {
    const { ws, cookie } = await analystWorkspace();
    const file = csv(HEADER, ...goodRows(3));
    const first = await call<ImportDto>(
      importsRoute.POST,
      uploadRequest(ws.slug, file, { cookie, fileName: 'a.csv' }),
      { slug: ws.slug },
    );
    expect(first.status).toBe(202);
    const second = await call<{ error: { import: { id: number; fileName: string } } }>(
      importsRoute.POST,
      uploadRequest(ws.slug, file, { cookie, fileName: 'renamed.csv' }),
      { slug: ws.slug },
    );
    expect(second.status).toBe(409);
    expect(second.body.error.import).toMatchObject({ id: first.body.id, fileName: 'a.csv' });
    expect(second.body.error.message).toContain(`#${first.body.id}`);
    expect(await count('imports', { workspace_id: ws.id })).toBe(1);
    expect(await count('flights', { workspace_id: ws.id })).toBe(3);
  });

  it('a flight already in the workspace is a problem, never imported or billed twice', async () => {
    const { ws, cookie } = await analystWorkspace();
    const first = await call<ImportDto>(
      importsRoute.POST,
      uploadRequest(ws.slug, csv(HEADER, ...goodRows(2)), { cookie }),
      { slug: ws.slug },
    );
    await runImportsToCompletion();
    const [, second] = goodRows(2);
    const overlap = csv(HEADER, second.replace('T-LR,360', 'T-LR,380'), '2026-11-20,NEW1,EFHK,RJAA,T-LR,370,52000');
    const r = await call<Refusal>(importsRoute.POST, uploadRequest(ws.slug, overlap, { cookie }), { slug: ws.slug });
    expect(r.status).toBe(422);
    expect(r.body.problems).toEqual([
      {
        line: 2,
        column: 'flight',
        message: expect.stringContaining(`already in this workspace (import #${first.body.id})`),
      },
    ]);
    expect(await count('flights', { workspace_id: ws.id })).toBe(2);
    expect(await count('usage_events', { workspace_id: ws.id })).toBe(2);
  });

  it('413 for a file over 10 MB and for more than 100 000 rows; nothing saved', async () => {
    const { ws, cookie } = await analystWorkspace();
    const row = '2026-11-03,TP1,EFHK,RJAA,T-LR,370,52400\r\n';
    const big = HEADER + '\r\n' + row.repeat(Math.ceil((10.5 * 1024 * 1024) / row.length));
    const tooBig = await call(importsRoute.POST, uploadRequest(ws.slug, big, { cookie }), { slug: ws.slug });
    expect(tooBig.status).toBe(413);
    expect(tooBig.body.error?.message).toContain('10 MB');
    // Short rows keep 100 001 rows under 10 MB; the rows are checked only after the row count.
    const tooMany = csv(
      'date,flight,origin,destination,aircraft,cruise_fl,fuel_kg',
      ...Array.from({ length: 100_001 }, (_, i) => `2026-11-03,F${i},A,B,X,1,1`),
    );
    expect(tooMany.length).toBeLessThan(10 * 1024 * 1024);
    const many = await call(importsRoute.POST, uploadRequest(ws.slug, tooMany, { cookie }), { slug: ws.slug });
    expect(many.status).toBe(413);
    expect(many.body.error?.message).toContain('100,000');
    expect(await count('imports', { workspace_id: ws.id })).toBe(0);
  });

  it('400 without a file field or multipart body; 422 for bytes that are not UTF-8', async () => {
    const { ws, cookie } = await analystWorkspace();
    const noField = await call(
      importsRoute.POST,
      uploadRequest(ws.slug, csv(HEADER, ...goodRows(1)), { cookie, field: 'upload' }),
      { slug: ws.slug },
    );
    expect(noField.status).toBe(400);
    expect(noField.body.error?.message).toContain('“file”');
    const json = await call(
      importsRoute.POST,
      apiRequest('POST', `/api/v1/workspaces/${ws.slug}/imports`, { cookie, body: { file: 'x' } }),
      { slug: ws.slug },
    );
    expect(json.status).toBe(400);
    const latin1 = new Uint8Array([
      ...new TextEncoder().encode(`${HEADER}\r\n2026-11-03,TP1,EFHK,RJAA,T-LR,370,52400,`),
      0xe9,
      0x0d,
      0x0a,
    ]);
    const bad = await call<Refusal>(importsRoute.POST, uploadRequest(ws.slug, latin1, { cookie }), { slug: ws.slug });
    expect(bad.status).toBe(422);
    expect(bad.body.problems[0].message).toContain('UTF-8');
  });

  it('401 signed out, 403 viewer, 404 for another workspace; a planner and an analyst API key may import', async () => {
    const { ws } = await analystWorkspace();
    const other = await makeWorkspace();
    const file = csv(HEADER, ...goodRows(1));
    expect((await call(importsRoute.POST, uploadRequest(ws.slug, file), { slug: ws.slug })).status).toBe(401);
    expect(
      (
        await call(
          importsRoute.POST,
          uploadRequest(ws.slug, file, { cookie: await sessionCookie(ws.members.viewer.id) }),
          { slug: ws.slug },
        )
      ).status,
    ).toBe(403);
    expect(
      (
        await call(importsRoute.POST, uploadRequest(ws.slug, file, { cookie: await sessionCookie(other.owner.id) }), {
          slug: ws.slug,
        })
      ).status,
    ).toBe(404);
    expect(
      (
        await call(
          importsRoute.POST,
          uploadRequest(ws.slug, file, { cookie: await sessionCookie(ws.members.planner.id) }),
          { slug: ws.slug },
        )
      ).status,
    ).toBe(202);
    const key = await createApiKey(
      { workspaceId: ws.id },
      { name: 'etl', role: 'analyst', createdBy: ws.owner.id, actor: 't' },
    );
    expect(
      (
        await call(importsRoute.POST, uploadRequest(ws.slug, csv(HEADER, ...goodRows(1, 'KEY')), { bearer: key.key }), {
          slug: ws.slug,
        })
      ).status,
    ).toBe(202);
    expect(await count('imports', { workspace_id: other.id })).toBe(0);
  });

  it('402 while the workspace is past due; nothing saved', async () => {
    const { ws, cookie } = await analystWorkspace();
    await db()('workspace_billing')
      .insert({ workspace_id: ws.id, plan_id: 'x', status: 'past_due', updated_at: new Date().toISOString() })
      .onConflict('workspace_id')
      .merge();
    const r = await call(importsRoute.POST, uploadRequest(ws.slug, csv(HEADER, ...goodRows(2)), { cookie }), {
      slug: ws.slug,
    });
    expect(r.status).toBe(402);
    expect(await count('imports', { workspace_id: ws.id })).toBe(0);
    expect(await count('flights', { workspace_id: ws.id })).toBe(0);
  });

  it('GET reports progress while screening: rows done, rows per second and time left', async () => {
    const { ws, cookie } = await analystWorkspace();
    const r = await call<ImportDto>(
      importsRoute.POST,
      uploadRequest(ws.slug, csv(HEADER, ...goodRows(60, 'P')), { cookie }),
      { slug: ws.slug },
    );
    const seen: ImportDto[] = [];
    await runImportsToCompletion({
      chunkSize: 20,
      onChunk: async ({ importId }) => {
        if (importId !== r.body.id) return;
        // Give the rate a measurable time base between chunks.
        await new Promise((done) => setTimeout(done, 300));
        const p = await call<ImportDto>(
          importRoute.GET,
          apiRequest('GET', `/api/v1/workspaces/${ws.slug}/imports/${r.body.id}`, { cookie }),
          { slug: ws.slug, id: String(r.body.id) },
        );
        seen.push(p.body);
      },
    });
    expect(seen.map((p) => p.rowsDone)).toEqual([20, 40, 60]);
    const mid = seen[1];
    expect(mid.status).toBe('screening');
    expect(mid.rowsPerSecond).toBeGreaterThan(0);
    // Time left is the rows still to do at the measured rate.
    expect(mid.secondsLeft).toBeCloseTo((60 - 40) / (mid.rowsPerSecond ?? 1), 6);
    const end = await call<ImportDto>(
      importRoute.GET,
      apiRequest('GET', `/api/v1/workspaces/${ws.slug}/imports/${r.body.id}`, { cookie }),
      { slug: ws.slug, id: String(r.body.id) },
    );
    expect(end.body).toMatchObject({ status: 'complete', rowsDone: 60, secondsLeft: 0 });
  });

  it('a flight the engine cannot screen is marked failed and listed; the import completes with the others', async () => {
    const { ws, cookie } = await analystWorkspace();
    const r = await call<ImportDto>(
      importsRoute.POST,
      uploadRequest(ws.slug, csv(HEADER, ...goodRows(3)), { cookie }),
      { slug: ws.slug },
    );
    // Stands in for a stored input the engine refuses (an airport missing from a later airport list).
    const victim = await db()('flights').where({ import_id: r.body.id, source_line: 3 }).first();
    const input = JSON.parse(victim.input_json);
    input.route.waypoints[1] = { airport: 'QQQQ' };
    await db()('flights')
      .where({ id: victim.id })
      .update({ input_json: JSON.stringify(input) });
    await runImportsToCompletion();
    const got = await call<ImportDto>(
      importRoute.GET,
      apiRequest('GET', `/api/v1/workspaces/${ws.slug}/imports/${r.body.id}`, { cookie }),
      { slug: ws.slug, id: String(r.body.id) },
    );
    expect(got.body).toMatchObject({ status: 'complete', rowsDone: 3, rowsScreened: 2, rowsFailed: 1 });
    expect(got.body.problems).toEqual([{ line: 3, column: '', message: expect.stringContaining('QQQQ') }]);
    expect(await count('usage_events', { workspace_id: ws.id })).toBe(2);
    expect((await db()('flights').where({ id: victim.id }).first()).status).toBe('failed');
  });

  it('an import none of whose flights can be screened ends failed with a reason', async () => {
    const { ws, cookie } = await analystWorkspace();
    const r = await call<ImportDto>(
      importsRoute.POST,
      uploadRequest(ws.slug, csv(HEADER, ...goodRows(2, 'BAD')), { cookie }),
      { slug: ws.slug },
    );
    await db()('flights').where({ import_id: r.body.id }).update({ input_json: '{"route":' });
    await runImportsToCompletion();
    const got = await call<ImportDto>(
      importRoute.GET,
      apiRequest('GET', `/api/v1/workspaces/${ws.slug}/imports/${r.body.id}`, { cookie }),
      { slug: ws.slug, id: String(r.body.id) },
    );
    expect(got.body.status).toBe('failed');
    expect(got.body.failureReason).toMatch(/None of the 2 flights could be screened/);
    expect(await count('usage_events', { workspace_id: ws.id })).toBe(0);
  });
});

describe('GET and DELETE /workspaces/{slug}/imports/{id}', () => {
  it('lists imports; 404 for an unknown id or another workspace’s import', async () => {
    const { ws, cookie } = await analystWorkspace();
    const other = await analystWorkspace();
    const mine = await call<ImportDto>(
      importsRoute.POST,
      uploadRequest(ws.slug, csv(HEADER, ...goodRows(2)), { cookie }),
      { slug: ws.slug },
    );
    const list = await call<{ items: ImportDto[]; nextCursor: string | null }>(
      importsRoute.GET,
      apiRequest('GET', `/api/v1/workspaces/${ws.slug}/imports`, { cookie }),
      { slug: ws.slug },
    );
    expect(list.body.items.map((i) => i.id)).toEqual([mine.body.id]);
    const viewer = await call(
      importRoute.GET,
      apiRequest('GET', `/api/v1/workspaces/${ws.slug}/imports/${mine.body.id}`, {
        cookie: await sessionCookie(ws.members.viewer.id),
      }),
      { slug: ws.slug, id: String(mine.body.id) },
    );
    expect(viewer.status).toBe(200);
    expect(
      (
        await call(importRoute.GET, apiRequest('GET', `/api/v1/workspaces/${ws.slug}/imports/999999`, { cookie }), {
          slug: ws.slug,
          id: '999999',
        })
      ).status,
    ).toBe(404);
    const foreign = await call(
      importRoute.GET,
      apiRequest('GET', `/api/v1/workspaces/${other.ws.slug}/imports/${mine.body.id}`, { cookie: other.cookie }),
      { slug: other.ws.slug, id: String(mine.body.id) },
    );
    expect(foreign.status).toBe(404);
    const del = await call(
      importRoute.DELETE,
      apiRequest('DELETE', `/api/v1/workspaces/${other.ws.slug}/imports/${mine.body.id}`, { cookie: other.cookie }),
      { slug: other.ws.slug, id: String(mine.body.id) },
    );
    expect(del.status).toBe(404);
    expect(await count('flights', { import_id: mine.body.id })).toBe(2);
  });

  it('deletes the batch and its flights; units already billed stay in the ledger and the answer says so', async () => {
    const { ws, cookie } = await analystWorkspace();
    const r = await call<ImportDto>(
      importsRoute.POST,
      uploadRequest(ws.slug, csv(HEADER, ...goodRows(3)), { cookie }),
      { slug: ws.slug },
    );
    await runImportsToCompletion();
    const planner = await call(
      importRoute.DELETE,
      apiRequest('DELETE', `/api/v1/workspaces/${ws.slug}/imports/${r.body.id}`, {
        cookie: await sessionCookie(ws.members.planner.id),
      }),
      { slug: ws.slug, id: String(r.body.id) },
    );
    expect(planner.status).toBe(403);
    const del = await call<{ flightsDeleted: number; billedUnitsKept: number; message: string }>(
      importRoute.DELETE,
      apiRequest('DELETE', `/api/v1/workspaces/${ws.slug}/imports/${r.body.id}`, { cookie }),
      { slug: ws.slug, id: String(r.body.id) },
    );
    expect(del.status).toBe(200);
    expect(del.body).toMatchObject({ flightsDeleted: 3, billedUnitsKept: 3 });
    expect(del.body.message).toContain('stay billed');
    expect(await count('flights', { workspace_id: ws.id })).toBe(0);
    expect(await count('imports', { workspace_id: ws.id })).toBe(0);
    expect(await count('usage_events', { workspace_id: ws.id, kind: 'imported_flight' })).toBe(3);
    // The same file may be imported again once its import is gone.
    const again = await call(importsRoute.POST, uploadRequest(ws.slug, csv(HEADER, ...goodRows(3)), { cookie }), {
      slug: ws.slug,
    });
    expect(again.status).toBe(202);
  });

  it('the template downloads as CSV with the workspace’s own types and imports as it is', async () => {
    const { ws, cookie } = await analystWorkspace();
    const res = await (
      templateRoute.GET as unknown as (req: Request, ctx: { params: Promise<{ slug: string }> }) => Promise<Response>
    )(apiRequest('GET', `/api/v1/workspaces/${ws.slug}/imports/template`, { cookie }), {
      params: Promise.resolve({ slug: ws.slug }),
    });
    expect(res.status).toBe(200);
    expect(res.headers.get('content-disposition')).toContain('attachment');
    const text = await res.text();
    expect(text.split('\r\n')[0]).toBe(
      'date,flight,origin,destination,aircraft,cruise_fl,fuel_kg,steps,fleet,ei_nox_g_per_kg,mach,route',
    );
    const r = await call<ImportDto>(importsRoute.POST, uploadRequest(ws.slug, text, { cookie }), { slug: ws.slug });
    expect(r.status).toBe(202);
    expect(r.body.rows).toBe(5);
  });
});

describe('GET /workspaces/{slug}/flights', () => {
  it('filters by import, dates, fleet and aircraft, pages with a cursor, and carries the figures', async () => {
    const { ws, lib, cookie } = await analystWorkspace();
    const a = await call<ImportDto>(
      importsRoute.POST,
      uploadRequest(ws.slug, csv(HEADER, ...goodRows(12, 'A')), { cookie }),
      { slug: ws.slug },
    );
    const b = await call<ImportDto>(
      importsRoute.POST,
      uploadRequest(
        ws.slug,
        csv(
          `${HEADER},ei_nox_g_per_kg`,
          '2026-10-30,S1,KEF,ANC,T-SST,560,36200,12',
          '2026-10-31,S2,ANC,KEF,T-SST,580,36900,12',
        ),
        { cookie },
      ),
      { slug: ws.slug },
    );
    await runImportsToCompletion();
    const get = (qs: string) =>
      call<{ items: FlightDto[]; nextCursor: string | null }>(
        flightsRoute.GET,
        apiRequest('GET', `/api/v1/workspaces/${ws.slug}/flights?${qs}`, { cookie }),
        { slug: ws.slug },
      );

    const all = await get('limit=200');
    expect(all.body.items).toHaveLength(14);
    const dates = all.body.items.map((f) => f.date);
    expect(dates).toEqual([...dates].sort().reverse());
    const sst = all.body.items.find((f) => f.flight === 'S1');
    expect(sst).toMatchObject({
      origin: 'BIKF',
      destination: 'PANC',
      aircraft: 'T-SST',
      fleet: 'Study',
      cruiseFl: 560,
      status: 'screened',
    });
    expect(sst?.noxTotalKg).toBeCloseTo(36_200 * 12e-3, 6);
    expect(sst?.ozoneLoss?.centralKg).toBeGreaterThan(0);
    expect(sst?.fractionAboveTropopause).toBeGreaterThan(0);

    expect((await get(`import=${b.body.id}`)).body.items.map((f) => f.flight).sort()).toEqual(['S1', 'S2']);
    expect((await get(`import=${a.body.id}&aircraft=t-lr`)).body.items).toHaveLength(12);
    expect((await get(`fleet=${lib.studyFleetId}`)).body.items).toHaveLength(2);
    expect((await get('from=2026-10-31&to=2026-11-02')).body.items.map((f) => f.date).sort()).toEqual([
      '2026-10-31',
      '2026-11-01',
      '2026-11-02',
    ]);

    const seen: number[] = [];
    let cursor: string | null = '';
    let pages = 0;
    while (cursor !== null) {
      const page = await get(`limit=5${cursor ? `&cursor=${encodeURIComponent(cursor)}` : ''}`);
      seen.push(...page.body.items.map((f) => f.id));
      cursor = page.body.nextCursor;
      pages += 1;
    }
    expect(pages).toBe(3);
    expect(new Set(seen).size).toBe(14);

    const bad = await get('from=2026-11-31&limit=0');
    expect(bad.status).toBe(422);
    expect(bad.body.error?.fields?.map((f) => f.path).sort()).toEqual(['from', 'limit']);
    expect(
      (await call(flightsRoute.GET, apiRequest('GET', `/api/v1/workspaces/${ws.slug}/flights`), { slug: ws.slug }))
        .status,
    ).toBe(401);
  });
});
