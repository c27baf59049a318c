import { spawn } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import {
  TEST_ORIGIN,
  apiRequest,
  call,
  makeWorkspace,
  onPostgres,
  sessionCookie,
  useTestDatabase,
} from '../../support/test-db';
import * as importsRoute from '@/app/api/v1/workspaces/[slug]/imports/route';
import * as tracksRoute from '@/app/api/v1/workspaces/[slug]/imports/tracks/route';
import * as trackTemplateRoute from '@/app/api/v1/workspaces/[slug]/imports/tracks/template/route';
import * as importRoute from '@/app/api/v1/workspaces/[slug]/imports/[id]/route';
import * as flightsRoute from '@/app/api/v1/workspaces/[slug]/flights/route';
import { db } from '@/db/client';
import { runImportsToCompletion } from '@/lib/imports/worker';
import { screenFlight } from '@/lib/screening';
import type { ImportDto } from '@/db/imports';
import { HEADER, addScheduleLibrary, csv, uploadRequest } from './support';

const { file } = useTestDatabase();

type Problem = { line: number; column: string; message: string };
type Refusal = { problems: Problem[]; problemCount: number };

const TRACK_HEADER = 'flight,date,time,lat,lon,altitude_ft,fuel_flow_kg_h,aircraft,origin,destination';

function trackUpload(slug: string, content: string, cookie: string, fileName = 'tracks.csv'): Request {
  const r = uploadRequest(slug, content, { cookie, fileName });
  return new Request(new URL(`/api/v1/workspaces/${slug}/imports/tracks`, TEST_ORIGIN), {
    method: 'POST',
    headers: r.headers,
    body: r.body,
    duplex: 'half',
  } as RequestInit);
}

/** `n` points of a flight along the meridian from 60N, one degree (111 km) every 8 minutes at FL370. */
function flightRows(flight: string, n: number, opts: { flow?: boolean; extra?: string; lon?: number } = {}): string[] {
  const out: string[] = [];
  for (let i = 0; i < n; i++) {
    const minutes = i * 8;
    const hh = String(10 + Math.floor(minutes / 60)).padStart(2, '0');
    const mm = String(minutes % 60).padStart(2, '0');
    out.push(
      `${flight},2026-11-03,${hh}:${mm}:00,${60 + i},${opts.lon ?? 10},37000,${opts.flow === false ? '' : '6000'},${opts.extra ?? 'T-LR,ENGM,BIKF'}`,
    );
  }
  return out;
}

async function analystWorkspace() {
  const ws = await makeWorkspace(['analyst', 'viewer']);
  await addScheduleLibrary(ws.id);
  const cookie = await sessionCookie(ws.members.analyst.id);
  return { ws, cookie };
}

describe('POST /workspaces/{slug}/imports/tracks', () => {
  it('202 queues a good file with two flights; the worker screens each and bills one unit per flight', async () => {
    const { ws, cookie } = await analystWorkspace();
    const file = csv(TRACK_HEADER, ...flightRows('TK1', 5), ...flightRows('TK2', 4, { lon: 12 }));
    const r = await call<ImportDto & { points: number }>(tracksRoute.POST, trackUpload(ws.slug, file, cookie), {
      slug: ws.slug,
    });
    expect(r.status).toBe(202);
    expect(r.body).toMatchObject({ kind: 'tracks', status: 'queued', rows: 2, points: 9 });
    // The upload queues its screening job at once, as a schedule upload does (SQLite's in-process queue).
    if (!onPostgres())
      expect(await db()('local_jobs').where({ name: 'import.screen' }).select('payload_json')).toEqual(
        expect.arrayContaining([
          expect.objectContaining({ payload_json: expect.stringContaining(`"importId":${r.body.id}`) }),
        ]),
      );
    expect(await db()('usage_events').where({ workspace_id: ws.id }).count({ n: '*' }).first()).toMatchObject({
      n: 0,
    });
    await runImportsToCompletion();
    const got = await call<ImportDto>(
      importRoute.GET,
      apiRequest('GET', `/api/v1/workspaces/${ws.slug}/imports/${r.body.id}`, { cookie }),
      { slug: ws.slug, id: String(r.body.id) },
    );
    expect(got.body).toMatchObject({ status: 'complete', rowsScreened: 2, rowsFailed: 0 });
    const flights = await db()('flights').where({ import_id: r.body.id }).orderBy('source_line');
    expect(flights.map((f) => [f.flight, f.basis, f.origin, f.destination, f.status, f.source_line])).toEqual([
      ['TK1', 'flown', 'ENGM', 'BIKF', 'screened', 2],
      ['TK2', 'flown', 'ENGM', 'BIKF', 'screened', 7],
    ]);
    // 4 legs of 8 min at 6000 kg/h: 3200 kg, integrated from the points' own fuel flow.
    expect(Number(flights[0].fuel_kg)).toBeCloseTo(3200, 6);
    const units = await db()('usage_events')
      .where({ workspace_id: ws.id, kind: 'imported_flight' })
      .select('source_id');
    expect(units.map((u) => Number(u.source_id)).sort((a, b) => a - b)).toEqual(flights.map((f) => Number(f.id)));
    // The stored figures are the engine's for the stored track input.
    const direct = screenFlight(JSON.parse(flights[0].input_json));
    expect(Number(flights[0].nox_above_kg)).toBeCloseTo(direct.noxAboveTropopauseKg, 9);

    // A second worker pass changes and bills nothing.
    await runImportsToCompletion();
    expect(await db()('usage_events').where({ workspace_id: ws.id }).count({ n: '*' }).first()).toMatchObject({ n: 2 });

    // The same flown flights again are refused by line, never billed twice.
    const again = await call<Refusal>(
      tracksRoute.POST,
      trackUpload(ws.slug, csv(TRACK_HEADER, ...flightRows('TK1', 5), ...flightRows('TK3', 3)), cookie),
      { slug: ws.slug },
    );
    expect(again.status).toBe(422);
    expect(again.body.problems).toEqual([expect.objectContaining({ line: 2, column: 'flight' })]);
  });

  it('a track takes origin, destination, aircraft and fuel from its planned flight when the file leaves them out', async () => {
    const { ws, cookie } = await analystWorkspace();
    const plan = await call<ImportDto>(
      importsRoute.POST,
      uploadRequest(ws.slug, csv(HEADER, '2026-11-03,TK9,ENGM,BIKF,T-LR,370,9000'), { cookie }),
      { slug: ws.slug },
    );
    expect(plan.status).toBe(202);
    await runImportsToCompletion();
    const rows = ['flight,date,time,lat,lon,flight_level'];
    for (let i = 0; i < 6; i++) rows.push(`TK9,2026-11-03,10:${String(i * 8).padStart(2, '0')}:00,${60 + i},10,370`);
    const r = await call<ImportDto>(tracksRoute.POST, trackUpload(ws.slug, csv(...rows), cookie), { slug: ws.slug });
    expect(r.status).toBe(202);
    await runImportsToCompletion();
    const flown = await db()('flights').where({ import_id: r.body.id }).first();
    expect([flown.origin, flown.destination, flown.aircraft_code, Number(flown.fuel_kg)]).toEqual([
      'ENGM',
      'BIKF',
      'T-LR',
      9000,
    ]);
    expect(flown.status).toBe('screened');
    const list = async (basis: string) =>
      (
        await call<{ items: { basis: string; id: number }[] }>(
          flightsRoute.GET,
          apiRequest('GET', `/api/v1/workspaces/${ws.slug}/flights?basis=${basis}`, { cookie }),
          { slug: ws.slug },
        )
      ).body.items;
    expect((await list('flown')).map((f) => [f.id, f.basis])).toEqual([[Number(flown.id), 'flown']]);
    expect((await list('planned')).map((f) => f.basis)).toEqual(['planned']);
  });

  it.each([
    [
      'a bad cell: latitude out of range',
      [TRACK_HEADER, ...flightRows('TK1', 2), 'TK1,2026-11-03,10:20:00,95,10,37000,6000,T-LR,ENGM,BIKF'],
      { line: 4, column: 'lat' },
    ],
    [
      'time running backwards',
      [TRACK_HEADER, ...flightRows('TK1', 3), 'TK1,2026-11-03,10:10:00,63.5,10,37000,6000,T-LR,ENGM,BIKF'],
      { line: 5, column: 'time' },
    ],
    [
      'a jump faster than Mach 3',
      [TRACK_HEADER, ...flightRows('TK1', 2), 'TK1,2026-11-03,10:09:00,80,10,37000,6000,T-LR,ENGM,BIKF'],
      { line: 4, column: 'time' },
    ],
    [
      'a fuel flow on some points only',
      [TRACK_HEADER, ...flightRows('TK1', 2), 'TK1,2026-11-03,10:20:00,62,10,37000,,T-LR,ENGM,BIKF'],
      { line: 4, column: 'fuel_flow_kg_h' },
    ],
    [
      'an aircraft type the workspace does not have',
      [TRACK_HEADER, ...flightRows('TK1', 3, { extra: 'NOPE,ENGM,BIKF' })],
      { line: 2, column: 'aircraft' },
    ],
    [
      'no fuel flow and no planned flight to take the fuel from',
      [TRACK_HEADER, ...flightRows('TK1', 3, { flow: false })],
      { line: 2, column: 'fuel_flow_kg_h' },
    ],
    ['a flight with one point', [TRACK_HEADER, ...flightRows('TK1', 1)], { line: 2, column: 'flight' }],
    [
      'no level column',
      ['flight,date,time,lat,lon', 'TK1,2026-11-03,10:00:00,60,10'],
      { line: 1, column: 'altitude_ft' },
    ],
    [
      'an altitude above FL660',
      [TRACK_HEADER, ...flightRows('TK1', 2), 'TK1,2026-11-03,10:20:00,62,10,70000,6000,T-LR,ENGM,BIKF'],
      { line: 4, column: 'altitude_ft' },
    ],
  ])('422 with the problem by line and column, nothing saved: %s', async (_, lines, where) => {
    const { ws, cookie } = await analystWorkspace();
    const r = await call<Refusal>(tracksRoute.POST, trackUpload(ws.slug, csv(...lines), cookie), { slug: ws.slug });
    expect(r.status).toBe(422);
    expect(r.body.problems).toContainEqual(expect.objectContaining(where));
    expect(await db()('imports').where({ workspace_id: ws.id }).count({ n: '*' }).first()).toMatchObject({ n: 0 });
    expect(await db()('flights').where({ workspace_id: ws.id }).count({ n: '*' }).first()).toMatchObject({ n: 0 });
  });

  it('413 past the track upload limit (80 MB, its own, above the schedule limit of 10 MB), before the body is read', async () => {
    const { ws, cookie } = await analystWorkspace();
    const req = trackUpload(ws.slug, csv(TRACK_HEADER, ...flightRows('TK1', 3)), cookie);
    const headers = new Headers(req.headers);
    headers.set('content-length', String(81 * 1024 * 1024));
    const big = new Request(req.url, { method: 'POST', headers, body: req.body, duplex: 'half' } as RequestInit);
    const r = await call<{ error: { message: string } }>(tracksRoute.POST, big, { slug: ws.slug });
    expect(r.status).toBe(413);
    expect(r.body.error.message).toContain('80 MB');
    // A 12 MB track file (over the schedule limit) is read: refused for its content, not its size.
    const rows = [TRACK_HEADER];
    const filler = 'x'.repeat(12 * 1024 * 1024);
    rows.push(...flightRows('TK1', 3), `TK2,2026-11-03,10:00:00,60,10,37000,6000,T-LR,ENGM,${filler}`);
    const large = await call<Refusal>(tracksRoute.POST, trackUpload(ws.slug, csv(...rows), cookie), { slug: ws.slug });
    expect(large.status).toBe(422);
  });

  it('a viewer may not upload (403); the template downloads and imports as it is', async () => {
    const { ws, cookie } = await analystWorkspace();
    const viewer = await sessionCookie(ws.members.viewer.id);
    const denied = await call(
      tracksRoute.POST,
      trackUpload(ws.slug, csv(TRACK_HEADER, ...flightRows('TK1', 3)), viewer),
      {
        slug: ws.slug,
      },
    );
    expect(denied.status).toBe(403);
    const t = await trackTemplateRoute.GET(
      apiRequest('GET', `/api/v1/workspaces/${ws.slug}/imports/tracks/template`, { cookie }),
      { params: Promise.resolve({ slug: ws.slug }) },
    );
    expect(t.status).toBe(200);
    const text = await t.text();
    expect(text.split('\r\n')[0]).toBe(TRACK_HEADER);
    const r = await call<ImportDto>(tracksRoute.POST, trackUpload(ws.slug, text, cookie), { slug: ws.slug });
    expect(r.status).toBe(202);
    expect(r.body.rows).toBe(2);
    await runImportsToCompletion();
    expect((await db()('imports').where({ id: r.body.id }).first()).status).toBe('complete');
  });
});

describe('track import worker', () => {
  // Timed against progress on the SQLite file, like the schedule import's kill test.
  it.skipIf(onPostgres())(
    'a worker killed mid-screening (SIGKILL) loses and doubles no flown flight (200 flights, chunks of 2); the next one resumes and bills each once',
    async () => {
      const { ws, cookie } = await analystWorkspace();
      const rows = [TRACK_HEADER];
      for (let f = 0; f < 200; f++) rows.push(...flightRows(`TK${f}`, 12, { lon: (f % 20) * 3 - 30 }));
      const r = await call<ImportDto>(tracksRoute.POST, trackUpload(ws.slug, csv(...rows), cookie), { slug: ws.slug });
      expect(r.status).toBe(202);
      const child = spawn(
        process.execPath,
        ['--conditions=react-server', '--import', 'tsx', 'tests/integration/imports/worker-child.ts', '2'],
        {
          cwd: process.cwd(),
          env: { ...process.env, SQLITE_FILE: file(), DATABASE_URL: '', LOG_LEVEL: 'silent' },
          stdio: ['ignore', 'pipe', 'pipe'],
        },
      );
      const exited = new Promise<NodeJS.Signals | null>((resolve) => child.on('exit', (_c, signal) => resolve(signal)));
      let chunks = 0;
      await new Promise<void>((resolve, reject) => {
        child.stdout.on('data', (d: Buffer) => {
          chunks += (d.toString().match(/^chunk/gm) ?? []).length;
          if (chunks >= 3 && child.exitCode === null) {
            child.kill('SIGKILL');
            resolve();
          }
          if (/done/.test(d.toString())) reject(new Error('the child finished before it could be killed'));
        });
      });
      expect(await exited).toBe('SIGKILL');
      const count = async (where: Record<string, unknown>) =>
        Number(
          (
            (await db()('flights')
              .where({ import_id: r.body.id, ...where })
              .count({ n: '*' })
              .first()) as { n: number }
          ).n,
        );
      const units = async () =>
        (await db()('usage_events as u')
          .join('flights as f', 'f.id', 'u.source_id')
          .where({ 'u.kind': 'imported_flight', 'f.import_id': r.body.id })
          .count({ n: '*' })
          .countDistinct({ d: 'u.source_id' })
          .first()) as { n: number; d: number };
      const midScreened = await count({ status: 'screened' });
      // At least the chunks the child reported were committed, each with its units; the rest still pending.
      expect(midScreened).toBeGreaterThanOrEqual(6);
      expect(midScreened).toBeLessThan(200);
      expect(await count({ status: 'failed' })).toBe(0);
      expect(await count({ status: 'pending' })).toBe(200 - midScreened);
      expect(Number((await units()).n)).toBe(midScreened);

      await runImportsToCompletion();
      expect(await count({ status: 'screened' })).toBe(200);
      const end = await units();
      expect([Number(end.n), Number(end.d)]).toEqual([200, 200]);
      expect((await db()('imports').where({ id: r.body.id }).first()).status).toBe('complete');
    },
    120_000,
  );
});
